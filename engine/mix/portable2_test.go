package mix

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestPortableErfcAndChi2(t *testing.T) {
	// Press et al. (1992) give a fractional error below 1.2e-7 for erfcc.
	for x := -6.0; x <= 9; x += 0.0625 {
		if got, want := perfc(x), math.Erfc(x); math.Abs(got-want) > 1.2e-7*want {
			t.Errorf("perfc(%g) = %.10g, math.Erfc %.10g", x, got, want)
		}
	}
	for nu := 1; nu <= 12; nu++ {
		for _, x := range []float64{0, 0.01, 0.3, 1, 2.5, 5, 9.49, 15, 30, 60, 120} {
			want := 1 - distuv.ChiSquared{K: float64(nu)}.CDF(x) // gonum
			if got := chi2Survival(nu, x); math.Abs(got-want) > 1e-6*math.Max(want, 1e-3) {
				t.Errorf("chi2Survival(%d, %g) = %.9g, gonum %.9g", nu, x, got, want)
			}
		}
	}
}
