package order

import (
	"math/rand/v2"
	"slices"
	"testing"

	"lixiv/engine/internal/watchdog"
)

// TestSelectMatchesSort checks every order statistic of sets with ties,
// runs and random values against a sorted copy.
func TestSelectMatchesSort(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	sets := map[string][]float64{
		"one":       {3},
		"two":       {2, 1},
		"ties":      {1, 1, 1, 2, 2, 0, 0, 1},
		"ascending": {1, 2, 3, 4, 5, 6, 7},
		"negative":  {-1, -5, 3, 0, -0.5},
	}
	for n := range []int{10, 101, 2000} {
		v := make([]float64, []int{10, 101, 2000}[n])
		for i := range v {
			v[i] = r.NormFloat64()
			if i%7 == 0 {
				v[i] = 0.25 // ties
			}
		}
		sets["random"+string(rune('a'+n))] = v
	}
	for name, v := range sets {
		want := slices.Clone(v)
		slices.Sort(want)
		for k := range v {
			w := slices.Clone(v)
			if got := Select(w, k); got != want[k] {
				t.Fatalf("%s: Select(k=%d) = %v, want %v", name, k, got, want[k])
			}
			for i := range w {
				if i < k && w[i] > w[k] || i > k && w[i] < w[k] {
					t.Fatalf("%s: after Select(k=%d) v[%d] = %v is on the wrong side of %v", name, k, i, w[i], w[k])
				}
			}
		}
		if Min(v) != want[0] || Max(v) != want[len(want)-1] {
			t.Errorf("%s: Min, Max = %v, %v; want %v, %v", name, Min(v), Max(v), want[0], want[len(want)-1])
		}
	}
}

// FuzzSelect checks Select against sorting on arbitrary sets.
func FuzzSelect(f *testing.F) {
	f.Add([]byte{3, 1, 2}, uint8(1))
	f.Fuzz(func(t *testing.T, b []byte, k uint8) {
		defer watchdog.Start([]any{b, k})()
		if len(b) == 0 {
			return
		}
		v := make([]float64, len(b))
		for i, x := range b {
			v[i] = float64(x%17) - 8
		}
		kk := int(k) % len(v)
		want := slices.Clone(v)
		slices.Sort(want)
		if got := Select(v, kk); got != want[kk] {
			t.Fatalf("Select(%v, %d) = %v, want %v", b, kk, got, want[kk])
		}
	})
}

func BenchmarkSelectMedian2000(b *testing.B) {
	r := rand.New(rand.NewPCG(3, 4))
	v := make([]float64, 2000)
	w := make([]float64, 2000)
	for i := range v {
		v[i] = r.NormFloat64()
	}
	for b.Loop() {
		copy(w, v)
		Select(w, 1000)
	}
}
