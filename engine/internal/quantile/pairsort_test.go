package quantile

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSortByRadix: sortByRadix leaves the values in increasing order and
// each with its own weight, for sizes around its cut-over to the library's
// sort, with many ties, with sorted and reversed input, and with an organ
// pipe.
func TestSortByRadix(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 22))
	inputs := map[string]func(n int) []Pair{
		"random": func(n int) []Pair {
			ps := make([]Pair, n)
			for i := range ps {
				ps[i] = Pair{r.NormFloat64(), float64(i)}
			}
			return ps
		},
		"ties": func(n int) []Pair {
			ps := make([]Pair, n)
			for i := range ps {
				ps[i] = Pair{math.Max(0, math.Round(r.NormFloat64())), float64(i)}
			}
			return ps
		},
		"sorted": func(n int) []Pair {
			ps := make([]Pair, n)
			for i := range ps {
				ps[i] = Pair{float64(i), float64(i)}
			}
			return ps
		},
		"reversed": func(n int) []Pair {
			ps := make([]Pair, n)
			for i := range ps {
				ps[i] = Pair{float64(n - i), float64(i)}
			}
			return ps
		},
		"organ pipe": func(n int) []Pair {
			ps := make([]Pair, n)
			for i := range ps {
				ps[i] = Pair{float64(min(i, n-i)), float64(i)}
			}
			return ps
		},
	}
	for name, input := range inputs {
		for _, n := range []int{0, 1, 2, 12, 13, 14, 100, 255, 256, 257, 1000, 1001, 5000, 5001} {
			ps := input(n)
			valueOf := map[float64]float64{} // each pair's weight is its own place: the value it came with
			for _, p := range ps {
				valueOf[p.W] = p.V
			}
			want := slices.Clone(ps)
			slices.SortStableFunc(want, byValue)
			(&Buf{}).sortByRadix(ps)
			for i := range ps {
				if ps[i].V != want[i].V {
					t.Fatalf("%s n=%d: value %d is %g, want %g", name, n, i, ps[i].V, want[i].V)
				}
			}
			// Each weight still beside its value, and every pair once.
			seen := map[float64]bool{}
			for _, p := range ps {
				if v, ok := valueOf[p.W]; !ok || v != p.V || seen[p.W] {
					t.Fatalf("%s n=%d: the pair of weight %g holds %g, came with %g (seen before: %v)", name, n, p.W, p.V, v, seen[p.W])
				}
				seen[p.W] = true
			}
		}
	}
}

// BenchmarkSortPairsFunc is the library's sort by a comparison function
// on 4,000 weighted draws, beside BenchmarkSortByRadix.
func BenchmarkSortPairsFunc(b *testing.B) {
	benchmarkSort(b, func(ps []Pair) { slices.SortFunc(ps, byValue) })
}

func benchmarkSort(b *testing.B, sort func([]Pair)) {
	rng := rand.New(rand.NewPCG(1, 2))
	src := make([]Pair, 4000)
	for i := range src {
		src[i] = Pair{rng.NormFloat64(), rng.Float64()}
	}
	ps := make([]Pair, len(src))
	for b.Loop() {
		copy(ps, src)
		sort(ps)
	}
}

// BenchmarkSortByRadix is the radix sort on the same draws.
func BenchmarkSortByRadix(b *testing.B) {
	var buf Buf
	benchmarkSort(b, buf.sortByRadix)
}
