package mix

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// slowSimplexLS is a literal reference for simplexLS, in the spirit of the
// standard library's slowPaeth: it visits every face of the simplex, solves
// the bordered KKT system of the weighted least-squares problem on that face
// with gonum's dense LU solver, computes the misfit from the residual vector
// itself, and keeps the feasible solution with the smallest misfit. It
// shares no code with the fast solver.
func slowSimplexLS(E [][]float64, w, d []float64) (alpha []float64, chi2 float64) {
	m, n := len(E), len(E[0])
	chi2 = math.Inf(1)
	for mask := 1; mask < 1<<n; mask++ {
		var idx []int
		for j := 0; j < n; j++ {
			if mask&(1<<j) != 0 {
				idx = append(idx, j)
			}
		}
		k := len(idx)
		kkt := mat.NewDense(k+1, k+1, nil)
		rhs := mat.NewVecDense(k+1, nil)
		for a, ja := range idx {
			for b, jb := range idx {
				s := 0.0
				for r := 0; r < m; r++ {
					s += w[r] * E[r][ja] * E[r][jb]
				}
				kkt.Set(a, b, 2*s)
			}
			s := 0.0
			for r := 0; r < m; r++ {
				s += w[r] * E[r][ja] * d[r]
			}
			rhs.SetVec(a, 2*s)
			kkt.Set(a, k, 1)
			kkt.Set(k, a, 1)
		}
		rhs.SetVec(k, 1)
		var x mat.VecDense
		if err := x.SolveVec(kkt, rhs); err != nil {
			continue
		}
		a := make([]float64, n)
		ok := true
		for i, j := range idx {
			a[j] = x.AtVec(i)
			if a[j] < -1e-9 {
				ok = false
			}
		}
		if !ok {
			continue
		}
		c := 0.0
		for r := 0; r < m; r++ {
			v := -d[r]
			for j := 0; j < n; j++ {
				v += E[r][j] * a[j]
			}
			c += w[r] * v * v
		}
		if c < chi2 {
			chi2, alpha = c, a
		}
	}
	return alpha, chi2
}

func fastSimplexLS(E [][]float64, w, d []float64) (alpha []float64, chi2 float64) {
	m, n := len(E), len(E[0])
	q := simplexLS{n: n}
	for r := 0; r < m; r++ {
		for i := 0; i < n; i++ {
			q.g[i] += w[r] * E[r][i] * d[r]
			for j := 0; j <= i; j++ {
				q.G[i][j] += w[r] * E[r][i] * E[r][j]
			}
		}
	}
	q.sym()
	var a [MaxEndMembers]float64
	if ok, _ := q.solve(&a, 0, math.Inf(1)); !ok {
		return nil, math.NaN()
	}
	for r := 0; r < m; r++ {
		v := -d[r]
		for j := 0; j < n; j++ {
			v += E[r][j] * a[j]
		}
		chi2 += w[r] * v * v
	}
	return a[:n], chi2
}

func TestSimplexLSAgainstSlowReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	cases := []struct {
		name       string
		n, m       int
		inside     bool // data drawn inside the simplex (plus noise) or anywhere
		underdeter bool
	}{
		{"2 end-members, 1 tracer, inside", 2, 1, true, false},
		{"3 end-members, 2 tracers, anywhere", 3, 2, false, false},
		{"3 end-members, 5 tracers, inside", 3, 5, true, false},
		{"4 end-members, 6 tracers, inside", 4, 6, true, false},
		{"4 end-members, 6 tracers, anywhere", 4, 6, false, false},
		{"5 end-members, 7 tracers, anywhere", 5, 7, false, false},
		{"6 end-members, 7 tracers, inside", 6, 7, true, false},
		{"4 end-members, 2 tracers (under-determined)", 4, 2, false, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for trial := 0; trial < 300; trial++ {
				E := make([][]float64, tc.m)
				w := make([]float64, tc.m)
				d := make([]float64, tc.m)
				for r := range E {
					E[r] = make([]float64, tc.n)
					for j := range E[r] {
						E[r][j] = math.Pow(10, -2+4*rng.Float64())
					}
					w[r] = math.Pow(10, -1+3*rng.Float64())
				}
				a := make([]float64, tc.n)
				s := 0.0
				for j := range a {
					a[j] = -math.Log(rng.Float64())
					if rng.IntN(4) == 0 {
						a[j] = 0 // truth on a face
					}
					s += a[j]
				}
				for r := range d {
					if tc.inside && s > 0 {
						for j := range a {
							d[r] += E[r][j] * a[j] / s
						}
						d[r] *= 1 + 0.05*rng.NormFloat64()
					} else {
						d[r] = math.Pow(10, -2+4*rng.Float64())
					}
				}
				ga, gc := fastSimplexLS(E, w, d)
				wa, wc := slowSimplexLS(E, w, d)
				if ga == nil {
					t.Fatalf("trial %d: fast solver failed", trial)
				}
				sum := 0.0
				for j, v := range ga {
					if v < 0 {
						t.Fatalf("trial %d: alpha[%d] = %g < 0", trial, j, v)
					}
					sum += v
				}
				if math.Abs(sum-1) > 1e-12 {
					t.Fatalf("trial %d: sum alpha = %.17g, want 1 (tolerance 1e-12)", trial, sum)
				}
				// Same minimum misfit (relative 1e-7 plus an absolute floor).
				if math.Abs(gc-wc) > 1e-7*wc+1e-9 {
					t.Fatalf("trial %d: chi2 got %.12g want %.12g (alpha got %v want %v)", trial, gc, wc, ga, wa)
				}
				if tc.underdeter {
					continue // minimiser not unique
				}
				for j := range ga {
					if math.Abs(ga[j]-wa[j]) > 1e-5 {
						t.Fatalf("trial %d: alpha got %v want %v", trial, ga, wa)
					}
				}
			}
		})
	}
}
