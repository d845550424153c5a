package mix

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// slowNNLS minimises ||y − A n||² over n >= 0 by solving the unconstrained
// least squares (gonum's QR) on every subset of free unknowns and keeping
// the feasible one with the smallest misfit: slow, and obviously right.
func slowNNLS(a [][]float64, y []float64) (n []float64, chi2 float64) {
	r, k := len(a), len(a[0])
	chi2 = math.Inf(1)
	for mask := 0; mask < 1<<k; mask++ {
		var cols []int
		for j := 0; j < k; j++ {
			if mask&(1<<j) != 0 {
				cols = append(cols, j)
			}
		}
		x := make([]float64, k)
		if len(cols) > 0 {
			if len(cols) > r {
				continue
			}
			A := mat.NewDense(r, len(cols), nil)
			for i := range r {
				for c, j := range cols {
					A.Set(i, c, a[i][j])
				}
			}
			var sol mat.VecDense
			if err := sol.SolveVec(A, mat.NewVecDense(r, y)); err != nil {
				continue
			}
			ok := true
			for c, j := range cols {
				x[j] = sol.AtVec(c)
				ok = ok && x[j] >= 0
			}
			if !ok {
				continue
			}
		}
		if m := misfitOf(a, y, x); m < chi2 {
			n, chi2 = x, m
		}
	}
	return n, chi2
}

func misfitOf(a [][]float64, y, x []float64) float64 {
	m := 0.0
	for i := range a {
		v := y[i]
		for j, aj := range a[i] {
			v -= aj * x[j]
		}
		m += v * v
	}
	return m
}

// checkNNLS solves a problem with nnls and compares it with slowNNLS.
func checkNNLS(t *testing.T, a [][]float64, y []float64) {
	t.Helper()
	k := len(a[0])
	var H mat6
	var b, n vec6
	for i := range k {
		for j := range k {
			for p := range a {
				H[i][j] += a[p][i] * a[p][j]
			}
		}
		for p := range a {
			b[i] += a[p][i] * y[p]
		}
	}
	nnls(k, &H, &b, &n)
	x := make([]float64, k)
	for j := range k {
		if n[j] < 0 || math.IsNaN(n[j]) {
			t.Fatalf("amount %d = %g, want >= 0", j, n[j])
		}
		x[j] = n[j]
	}
	got := misfitOf(a, y, x)
	_, want := slowNNLS(a, y)
	// Rounding floor: the normal equations carry terms up to (max A)² |n|²;
	// allow 1e-10 of the scale of the problem.
	scale := 0.0
	for i := range a {
		scale += y[i] * y[i]
	}
	if got > want*(1+1e-7)+1e-10*scale {
		t.Fatalf("misfit %g above the reference minimum %g (n = %v)", got, want, x)
	}
}

func TestNNLSAgainstReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 9))
	for trial := range 3000 {
		k := 1 + trial%MaxEndMembers
		r := 1 + rng.IntN(maxRows)
		a := make([][]float64, r)
		y := make([]float64, r)
		for i := range a {
			a[i] = make([]float64, k)
			for j := range a[i] {
				a[i][j] = math.Exp(3 * rng.NormFloat64())
			}
			y[i] = 50 * rng.NormFloat64()
		}
		if trial%7 == 0 && k > 1 { // two identical end-members
			for i := range a {
				a[i][1] = a[i][0]
			}
		}
		checkNNLS(t, a, y)
	}
}

// TestNNLSExactZeros checks that an unknown absent from the data comes
// back exactly zero, so a source can be absent from a draw.
func TestNNLSExactZeros(t *testing.T) {
	a := [][]float64{{1, 1, 1}, {0.35, 50, 0.15}, {0.24, 15, 0.02}, {2, 120, 0.3}}
	truth := []float64{100, 0, 0}
	y := make([]float64, len(a))
	for i := range a {
		for j := range truth {
			y[i] += a[i][j] * truth[j]
		}
	}
	y[1] -= 1 // a little less Ca than silicate alone brings
	var H mat6
	var b, n vec6
	for i := range 3 {
		for j := range 3 {
			for p := range a {
				H[i][j] += a[p][i] * a[p][j]
			}
		}
		for p := range a {
			b[i] += a[p][i] * y[p]
		}
	}
	nnls(3, &H, &b, &n)
	if n[1] != 0 {
		t.Errorf("carbonate amount %g, want exactly 0", n[1])
	}
	if math.Abs(n[0]-100) > 1 {
		t.Errorf("silicate amount %g, want about 100", n[0])
	}
}
