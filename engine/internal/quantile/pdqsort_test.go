package quantile

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// tiedValues returns n weighted values, about a tenth of them 0 and some
// repeated, the rest normal, with weights spread over several orders of
// magnitude (seed picks the stream).
func tiedValues(n int, seed uint64) (v, w []float64) {
	rng := rand.New(rand.NewPCG(seed, 7))
	v, w = make([]float64, n), make([]float64, n)
	for i := range v {
		switch r := rng.Float64(); {
		case r < 0.1:
			v[i] = 0
		case r < 0.15:
			v[i] = float64(rng.IntN(5))
		default:
			v[i] = rng.NormFloat64()
		}
		w[i] = math.Exp(-5 * rng.Float64())
	}
	return v, w
}

// TestSortPairsAsSortFunc: sortPairs leaves every slice of finite pairs in
// the order slices.SortFunc with byValue leaves it, ties (whose weights
// differ) included, for sizes across the insertion-sort, pdqsort and
// heap-sort paths and for sorted, reversed and constant input.
func TestSortPairsAsSortFunc(t *testing.T) {
	for seed := uint64(1); seed <= 6; seed++ {
		for _, n := range []int{0, 1, 2, 5, 12, 13, 50, 100, 1000, 20000} {
			v, w := tiedValues(n, seed)
			base := make([]Pair, n)
			for i := range base {
				base[i] = Pair{v[i], w[i]}
			}
			inputs := map[string][]Pair{"random": base}
			up := slices.Clone(base)
			slices.SortStableFunc(up, byValue)
			inputs["sorted"] = up
			down := slices.Clone(up)
			slices.Reverse(down)
			inputs["reversed"] = down
			same := slices.Clone(base)
			for i := range same {
				same[i].V = 1
			}
			inputs["constant"] = same
			for name, in := range inputs {
				want, got := slices.Clone(in), slices.Clone(in)
				slices.SortFunc(want, byValue)
				sortPairs(got)
				for i := range want {
					if math.Float64bits(got[i].V) != math.Float64bits(want[i].V) || math.Float64bits(got[i].W) != math.Float64bits(want[i].W) {
						t.Fatalf("seed %d, %d %s pairs: position %d holds %v, slices.SortFunc puts %v there", seed, n, name, i, got[i], want[i])
					}
				}
			}
		}
	}
}
