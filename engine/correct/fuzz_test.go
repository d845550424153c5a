package correct

import (
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/internal/watchdog"
)

// FuzzApply feeds arbitrary concentrations and options to Apply: it must
// never panic, and whenever it succeeds under the Keep policy the removed
// parts and the residual must add back to the measured value (common
// practice: a correction only moves amounts between reservoirs).
func FuzzApply(f *testing.F) {
	f.Add(100.0, 120.0, 10.0, 300.0, 80.0, 60.0, 0.0, uint8(0))
	// Seed inputs are invented µmol/L values (no source; any values do for a fuzz seed).
	f.Add(565.7647, 486.0597, 10.5797, 10.6568, 54.7421, 29.2643, 0.0, uint8(1))
	f.Add(80.0, 200.0, 20.0, 100.0, 40.0, 30.0, 50.0, uint8(2))
	f.Add(0.0, 0.0, 0.0, 1000.0, 0.0, 500.0, 1e-300, uint8(5))
	f.Fuzz(func(t *testing.T, cl, na, k, ca, mg, so4, clStar float64, mode uint8) {
		defer watchdog.Start([]any{cl, na, k, ca, mg, so4, clStar, mode})()
		c := chem.NewComposition()
		c[chem.Cl], c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.SO4] = cl, na, k, ca, mg, so4
		opt := &Options{
			ClCritical: clStar,
			Excess:     Excess(mode & 1),
			Sulfate:    Sulfate((mode >> 1) % 3),
			Negative:   Keep,
			Delta34S:   Delta34S{River: float64(mode), Evaporite: 20, Sulfide: -10},
		}
		r, err := Apply(c, opt)
		if err != nil {
			return
		}
		for s := range c {
			if math.IsNaN(c[s]) || math.IsInf(c[s], 0) || c[s] > 1e300 {
				continue
			}
			sum := r.Atm[s] + r.Evap[s] + r.Human[s] + r.Residual[s]
			if math.Abs(sum-c[s]) > 1e-9*math.Max(math.Abs(c[s]), 1) {
				t.Errorf("%s: parts add to %g, want %g", chem.Species(s), sum, c[s])
			}
		}
	})
}
