package mix

import (
	"math"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat"
	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

func TestRainScales(t *testing.T) {
	t.Run("zero uncertainty is exactly 1", func(t *testing.T) {
		for d, k := range RainScales(50, 7, correct.Uncertainty{}, true) {
			if k != correct.Unit() {
				t.Fatalf("draw %d: %+v, want every multiplier exactly 1", d, k)
			}
		}
	})
	t.Run("log-normal with the stated sigma", func(t *testing.T) {
		// exp(σ z) with z standard normal: ln has mean 0 and sd σ (common
		// practice); 20,000 draws give a standard error of the sd near σ/200.
		const n, sigma = 20000, 0.1
		sc := RainScales(n, 3, correct.Uncertainty{Ratios: sigma, Factor: 0.2}, false)
		for _, sp := range []chem.Species{chem.Na, chem.Ca, chem.SO4} {
			ln := make([]float64, n)
			for d := range sc {
				ln[d] = math.Log(sc[d].Ratios[sp])
			}
			m, sd := stat.Mean(ln, nil), fwdStdDev(ln)
			if math.Abs(m) > 0.003 || math.Abs(sd-sigma) > 0.003 {
				t.Errorf("%s: ln multiplier mean %.4g sd %.4g, want 0 and %g", sp, m, sd, sigma)
			}
			sort.Float64s(ln)
			if med := ln[n/2]; math.Abs(med) > 0.003 {
				t.Errorf("%s: median multiplier exp(%.4g), want 1", sp, med)
			}
		}
		if sc[0].ClCritical != 1 || sc[0].Ratios[chem.Cl] != 1 {
			t.Errorf("Cl* multiplier %g without scaleCl, Cl/Cl %g; want 1", sc[0].ClCritical, sc[0].Ratios[chem.Cl])
		}
		if a, b := sc[0].Ratios[chem.Na], sc[0].Ratios[chem.K]; a == b {
			t.Error("species share a multiplier; want one each")
		}
	})
}
