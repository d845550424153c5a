package quantile

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestMidpoints(t *testing.T) {
	tests := []struct {
		name string
		x, w []float64
		p    float64
		want float64
	}{
		// Midpoint interpolation (common practice): the median of 1..4 is 2.5.
		{"median even", []float64{4, 1, 3, 2}, nil, 0.5, 2.5},
		{"median odd", []float64{3, 1, 2}, nil, 0.5, 2},
		{"low end holds", []float64{1, 2, 3}, nil, 0.01, 1},
		{"high end holds", []float64{1, 2, 3}, nil, 0.99, 3},
		{"NaN ignored", []float64{math.NaN(), 1, 3}, nil, 0.5, 2},
		// Weights 3 and 1: midpoints of the cumulative weights at 1.5 and 3.5, so
		// the 2-of-4 point lies a quarter of the way from 1 to 2.
		{"weights interpolate", []float64{1, 2}, []float64{3, 1}, 0.5, 1.25},
		{"equal weights as none", []float64{4, 1, 3, 2}, []float64{1, 1, 1, 1}, 0.5, 2.5},
		{"zero weight ignored", []float64{1, 100, 3}, []float64{1, 0, 1}, 0.5, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := (&Buf{}).Midpoints(tt.x, tt.w, tt.p)[0]; math.Abs(got-tt.want) > 1e-12 {
				t.Errorf("got %g, want %g", got, tt.want)
			}
		})
	}
	if got := (&Buf{}).Midpoints(nil, nil, 0.5)[0]; !math.IsNaN(got) {
		t.Errorf("empty: got %g, want NaN", got)
	}
	// The equal-weight path gives the same bits as the weighted one.
	x := []float64{0.3, 0.1, 0.7, 0.2, 0.9, 0.4, 0.8}
	w := []float64{1, 1, 1, 1, 1, 1, 1.0000000001}
	a, b := (&Buf{}).Midpoints(x, nil, 0.025, 0.5, 0.975), (&Buf{}).weighted(x, w, []float64{0.025, 0.5, 0.975})
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-9 {
			t.Errorf("quantile %d: equal %g, weighted %g", i, a[i], b[i])
		}
	}
	// Selection (the equal-weight path) and sorting (the weighted path with
	// weights of exactly 1) give identical bits, with ties and NaN, at
	// every size up to a few thousand draws.
	r := rand.New(rand.NewPCG(7, 8))
	for _, n := range []int{1, 2, 3, 39, 40, 41, 200, 1999, 2000} {
		x := make([]float64, n)
		ones := make([]float64, n)
		for i := range x {
			x[i], ones[i] = math.Round(r.NormFloat64()*50)/10, 1
			if i%11 == 5 {
				x[i] = math.NaN()
			}
		}
		ps := []float64{0, 0.025, 0.1, 0.5, 0.9, 0.975, 1}
		a := (&Buf{}).equal(slices.Clone(x), ps)
		b := (&Buf{}).weighted(x, ones, ps)
		for i := range a {
			if a[i] != b[i] && !(math.IsNaN(a[i]) && math.IsNaN(b[i])) {
				t.Errorf("n=%d p=%g: selection %v, sorting %v", n, ps[i], a[i], b[i])
			}
		}
	}
}

// TestLower95UnequalWeights checks Lower95 against its definition worked
// by sorting: for each p, the smallest value whose cumulative weight, in
// increasing order, reaches p of the total; with ties, zero weights and
// every size around the selection's cut-over to sorting.
func TestLower95UnequalWeights(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	var buf []Pair
	for _, n := range []int{1, 2, 3, 12, 13, 14, 25, 100, 1001, 4000} {
		for _, ties := range []bool{false, true} {
			v, w := make([]float64, n), make([]float64, n)
			for i := range v {
				v[i], w[i] = r.NormFloat64(), r.Float64()
				if ties {
					v[i] = math.Max(0, math.Round(v[i]*3)) // many at zero, as clamped amounts are
				}
				if i%7 == 3 {
					w[i] = 0
				}
			}
			ps := make([]Pair, 0, n)
			tot := 0.0
			for i := range v {
				if w[i] > 0 {
					ps = append(ps, Pair{v[i], w[i]})
					tot += w[i]
				}
			}
			slices.SortStableFunc(ps, byValue)
			ref := func(p float64) float64 {
				cum := 0.0
				for _, x := range ps {
					cum += x.W
					if cum >= p*tot*(1-1e-12) {
						return x.V
					}
				}
				return ps[len(ps)-1].V
			}
			vc, wc := slices.Clone(v), slices.Clone(w)
			got := Lower95(v, w, &buf)
			if !slices.Equal(v, vc) || !slices.Equal(w, wc) {
				t.Fatalf("n=%d: Lower95 changed its input", n)
			}
			if len(ps) == 0 {
				continue
			}
			if want := (Interval{ref(0.025), ref(0.5), ref(0.975)}); got != want {
				t.Errorf("n=%d ties=%v: got %v, want %v", n, ties, got, want)
			}
		}
	}
}

// TestMidpointsTinyWeights: weights too small beside the others to part
// their mid-points in floating point give a value between the draws, never
// NaN (a 0/0 in the interpolation).
func TestMidpointsTinyWeights(t *testing.T) {
	x := []float64{0, 1, 2, 3, 4, 5}
	w := []float64{1, 1e-300, 1e-300, 1e-300, 1e-300, 1}
	for i := 0; i <= 1000; i++ {
		p := float64(i) / 1000
		got := (&Buf{}).Midpoints(x, w, p)[0]
		if math.IsNaN(got) || got < 0 || got > 5 {
			t.Fatalf("p=%g: %g", p, got)
		}
	}
	// Beside a cumulative weight of 1e16 (spacing 2), weights of 1.5 move
	// the cumulative sum but not their own mid-points: at the median the
	// mid-points of the second and third draws are the same number.
	if got := (&Buf{}).Midpoints([]float64{0, 1, 2, 3}, []float64{1e16, 1.5, 1.5, 1e16}, 0.5)[0]; got != 2 {
		t.Errorf("mid-points that coincide: got %g, want 2", got)
	}
}
