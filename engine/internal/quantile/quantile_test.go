package quantile

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestSorted(t *testing.T) {
	// Type-7 quantiles (Hyndman & Fan 1996, from memory): for 1..5,
	// p = 0.025 -> 1.1, p = 0.975 -> 4.9, p = 0.5 -> 3.
	x := []float64{1, 2, 3, 4, 5}
	for _, tc := range []struct{ p, want float64 }{{0.025, 1.1}, {0.5, 3}, {0.975, 4.9}, {0, 1}, {1, 5}} {
		if got := Sorted(x, tc.p); math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("p %g: got %g, want %g", tc.p, got, tc.want)
		}
	}
}

// TestSelectIsSorted checks that Select gives the quantiles are those of the sorted draws bit for
// bit: on hand-made sets with ties, zeros of both signs, infinities and
// subnormals, and on random sets drawn from a few values.
func TestSelectIsSorted(t *testing.T) {
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
			want := Sorted(sorted, p)
			got := Select(slices.Clone(s), p)
			if math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("%v, p %g: got %g (%#x), sorted gives %g (%#x)", s, p, got, math.Float64bits(got), want, math.Float64bits(want))
			}
		}
	}
}

func TestOf95AndLower95AgainstSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 3))
	for _, n := range []int{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 39, 40, 41, 42, 80, 81, 1000, 1001} {
		for _, dup := range []bool{false, true} {
			v := make([]float64, n)
			for i := range v {
				v[i] = rng.NormFloat64()
				if dup {
					v[i] = math.Round(v[i]) // many ties, as with alphas clamped to 0
				}
			}
			s := slices.Clone(v)
			slices.Sort(s)
			ref := func(p float64) float64 { // type 7, literal
				h := p * float64(n-1)
				i := int(math.Floor(h))
				if i+1 >= n {
					return s[n-1]
				}
				return s[i] + (h-float64(i))*(s[i+1]-s[i])
			}
			got := Of95(slices.Clone(v))
			want := Interval{ref(0.025), ref(0.5), ref(0.975)}
			if math.Abs(got.Lo-want.Lo) > 1e-12 || math.Abs(got.Median-want.Median) > 1e-12 || math.Abs(got.Hi-want.Hi) > 1e-12 {
				t.Errorf("n=%d dup=%v: got %v want %v", n, dup, got, want)
			}
			// Equal weights: the weighted quantile is the order statistic
			// at ceil(pn).
			w := make([]float64, n)
			for i := range w {
				w[i] = 1
			}
			var idx []Pair
			wi := Lower95(v, w, &idx)
			at := func(p float64) float64 { return s[max(0, int(math.Ceil(p*float64(n)-1e-9))-1)] }
			if wi.Lo != at(0.025) || wi.Median != at(0.5) || wi.Hi != at(0.975) {
				t.Errorf("n=%d dup=%v weighted: got %v want %v %v %v", n, dup, wi, at(0.025), at(0.5), at(0.975))
			}
		}
	}
}

func TestStdDev(t *testing.T) {
	// 2, 4, 4, 4, 5, 5, 7, 9: mean 5, sum of squares 32, s² = 32/7 (common
	// practice, worked by hand).
	if got, want := StdDev([]float64{2, 4, 4, 4, 5, 5, 7, 9}), math.Sqrt(32.0/7); math.Abs(got-want) > 1e-15 {
		t.Errorf("got %g, want %g", got, want)
	}
	if !math.IsNaN(StdDev([]float64{1})) {
		t.Error("one value has a standard deviation")
	}
}
