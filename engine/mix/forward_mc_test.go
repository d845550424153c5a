package mix

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestQuantileUnsortedIsSorted checks that the quantiles of the forward
// Monte Carlo, taken by selection, are those of the sorted draws bit for
// bit: on hand-made sets with ties, zeros of both signs, infinities and
// subnormals, and on random sets drawn from a few values.
func TestQuantileUnsortedIsSorted(t *testing.T) {
	negZero := math.Copysign(0, -1)
	sets := [][]float64{
		{1},
		{2, 1},
		{0, negZero},
		{negZero, 0, negZero, 0},
		{negZero, negZero, 3, 0, -2},
		{5, negZero, 0, 5, 5, -1, negZero},
		{math.Inf(1), math.Inf(-1), 0, 1, math.Inf(1)},
		{math.Inf(1), math.Inf(1), math.Inf(1), 2},
		{5e-324, -5e-324, negZero, 0, 1e-310},
		{1e308, -1e308, 1e308, 3},
	}
	rng := rand.New(rand.NewPCG(3, 5))
	pool := []float64{negZero, 0, 1, -1, 0.1, 7.25, 1e-300, math.Inf(1), math.Inf(-1), 5e-324}
	for range 300 {
		n := 1 + rng.IntN(90)
		s := make([]float64, n)
		for i := range s {
			if rng.IntN(3) == 0 {
				s[i] = pool[rng.IntN(len(pool))]
			} else {
				s[i] = rng.NormFloat64()
			}
		}
		sets = append(sets, s)
	}
	for _, s := range sets {
		// Probabilities to check: the ends, the 95 % bounds the model reports and
		// two in between (common practice); no reference values.
		for _, p := range []float64{0, 0.025, 0.3, 0.5, 0.975, 1} {
			sorted := slices.Clone(s)
			slices.Sort(sorted)
			want := fwdQuantile(sorted, p)
			got := fwdQuantileUnsorted(slices.Clone(s), p)
			if math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%v, p %g: got %g (%#x), sorted gives %g (%#x)", s, p, got, math.Float64bits(got), want, math.Float64bits(want))
			}
		}
	}
}
