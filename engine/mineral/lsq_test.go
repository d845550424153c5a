package mineral

import (
	"math"
	"math/rand/v2"
	"testing"
)

func objective(a [][]float64, b, x []float64) float64 {
	s := 0.0
	for i := range b {
		r := b[i]
		for j := range a {
			r -= a[j][i] * x[j]
		}
		s += r * r
	}
	return s
}

// TestNNLSAgainstEnumeration: on random problems with free and bounded
// variables, the active-set solution reaches the least misfit over every
// choice of bounded variables held at zero (the exhaustive search a convex
// problem's optimum must match), to 1e-9 relative, and is feasible.
func TestNNLSAgainstEnumeration(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 1))
	for trial := 0; trial < 300; trial++ {
		m := 2 + r.IntN(7)
		n := 1 + r.IntN(min(m, 6))
		a := make([][]float64, n)
		for j := range a {
			a[j] = make([]float64, m)
			for i := range a[j] {
				if r.Float64() < 0.7 {
					a[j][i] = r.NormFloat64() * math.Pow(10, r.Float64()*2-1)
				}
			}
		}
		b := make([]float64, m)
		for i := range b {
			b[i] = 100 * r.NormFloat64()
		}
		free := make([]bool, n)
		for j := range free {
			free[j] = r.Float64() < 0.3
		}
		if q := factor(a, seq(n), m, true); q.rank() < n {
			continue
		}
		x, w, ok := nnls(a, b, free)
		if !ok {
			t.Fatalf("trial %d: no convergence", trial)
		}
		best := math.Inf(1)
		for mask := 0; mask < 1<<n; mask++ {
			set := make([]bool, n)
			skip := false
			for j := range set {
				set[j] = mask&(1<<j) != 0
				if free[j] && !set[j] {
					skip = true
				}
			}
			if skip {
				continue
			}
			z, ok := lsq(a, b, set)
			if !ok {
				continue
			}
			feasible := true
			for j := range z {
				if !free[j] && z[j] < -1e-12 {
					feasible = false
				}
			}
			if feasible {
				best = math.Min(best, objective(a, b, z))
			}
		}
		got := objective(a, b, x)
		if math.Abs(got-best) > 1e-9*math.Max(best, 1) {
			t.Errorf("trial %d (%d×%d): misfit %.12g, best %.12g", trial, m, n, got, best)
		}
		for j := range x {
			if !free[j] && x[j] < 0 {
				t.Errorf("trial %d: x[%d] = %g below zero", trial, j, x[j])
			}
			if !free[j] && x[j] == 0 && w[j] > 1e-6 {
				t.Errorf("trial %d: x[%d] at zero with gradient %g: not optimal", trial, j, w[j])
			}
		}
	}
}

// TestRank: the pivoted QR finds the rank of dependent columns.
func TestRank(t *testing.T) {
	a := [][]float64{{1, 0, 2}, {0, 1, 1}, {2, 3, 7}, {1, 1, 3}}
	if r := factor(a, seq(4), 3, true).rank(); r != 2 {
		t.Errorf("rank %d, want 2", r)
	}
}
