package mix

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBoundaryAgainstSlowReference checks boundary3 and boundary4 against
// the exhaustive reference solver on random problems whose unconstrained
// optimum lies outside the simplex, including singular ones (fewer tracers
// than end-members minus one, or repeated end-members).
func TestBoundaryAgainstSlowReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 4))
	for _, n := range []int{3, 4} {
		for _, m := range []int{1, 2, 3, 5} {
			checked := 0
			for trial := 0; trial < 400; trial++ {
				E := make([][]float64, m)
				w := make([]float64, m)
				d := make([]float64, m)
				for r := range E {
					E[r] = make([]float64, n)
					for j := range E[r] {
						E[r][j] = math.Pow(10, -2+4*rng.Float64())
					}
					if trial%7 == 0 { // a repeated end-member
						E[r][1] = E[r][0]
					}
					w[r] = math.Pow(10, -1+2*rng.Float64())
					d[r] = math.Pow(10, -2+4*rng.Float64())
				}
				// Reduced problem with the last end-member as reference.
				var H [3][3]float64
				var b [3]float64
				for r := 0; r < m; r++ {
					er := E[r][n-1]
					for i := 0; i < n-1; i++ {
						ui := E[r][i] - er
						b[i] += w[r] * ui * (d[r] - er)
						for j := 0; j < n-1; j++ {
							H[i][j] += w[r] * ui * (E[r][j] - er)
						}
					}
				}
				a := make([]float64, n)
				if n == 3 {
					y0, y1 := boundary3(H[0][0], H[1][0], H[1][1], b[0], b[1])
					a[0], a[1], a[2] = y0, y1, max(0, 1-y0-y1)
				} else {
					y0, y1, y2 := boundary4(H[0][0], H[1][0], H[1][1], H[2][0], H[2][1], H[2][2], b[0], b[1], b[2])
					a[0], a[1], a[2], a[3] = y0, y1, y2, max(0, 1-y0-y1-y2)
				}
				_, want := slowSimplexLS(E, w, d)
				got := 0.0
				scale := 0.0
				for r := 0; r < m; r++ {
					v := -d[r]
					big := d[r]
					for j := range a {
						v += E[r][j] * a[j]
						big = math.Max(big, E[r][j])
					}
					got += w[r] * v * v
					scale += w[r] * big * big
				}
				for _, v := range a {
					if v < 0 {
						t.Fatalf("n=%d m=%d trial %d: alpha %v off the simplex", n, m, trial, a)
					}
				}
				// The boundary minimum is never below the global one, and
				// equals it unless the global one is interior (checked by
				// the kernels before they call these).
				if got < want-1e-12*scale {
					t.Fatalf("n=%d m=%d trial %d: boundary chi2 %g below the minimum %g", n, m, trial, got, want)
				}
				slowA, _ := slowSimplexLS(E, w, d)
				interior := true
				for _, v := range slowA {
					if v < 1e-9 {
						interior = false
					}
				}
				if !interior {
					checked++
					if got > want*(1+1e-9)+1e-12*scale {
						t.Fatalf("n=%d m=%d trial %d: boundary chi2 %.12g, reference %.12g (alpha %v vs %v)", n, m, trial, got, want, a, slowA)
					}
				}
			}
			if checked < 100 {
				t.Errorf("n=%d m=%d: only %d boundary cases checked", n, m, checked)
			}
		}
	}
}
