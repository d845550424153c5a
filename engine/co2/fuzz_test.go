package co2

import (
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/internal/watchdog"
	"lixiv/engine/mix"
)

// FuzzChain runs arbitrary samples through correct.Apply (default Zero
// policy), mix.Forward and Consumption. It must never panic, and for every
// sample that passes: no share is negative, the sources never exceed the
// measured value (Misfit <= 0, common practice: zeroing a negative residual
// can only lose mass), and phi_total is independent of the sulfur split
// (docs/methods.md §9.3).
func FuzzChain(f *testing.F) {
	f.Add(125.7736, 20.56099, 435.56508, 106.90273, 30.0, 1.551756, 0.0, uint8(0))
	f.Add(100.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, uint8(1))
	f.Add(0.0, 0.0, 1000.0, 0.0, 0.0, 1000.0, 0.0, uint8(3))
	f.Add(50.0, 3.0, 10.0, 5.0, 400.0, 90.0, 120.0, uint8(2))
	f.Fuzz(func(t *testing.T, na, k, ca, mg, cl, so4, clStar float64, mode uint8) {
		defer watchdog.Start([]any{na, k, ca, mg, cl, so4, clStar, mode})()
		for _, v := range []float64{na, k, ca, mg, cl, so4} {
			if v > 1e12 { // far beyond any water; keeps the arithmetic exact enough
				return
			}
		}
		c := chem.NewComposition()
		c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.Cl], c[chem.SO4] = na, k, ca, mg, cl, so4
		cr, err := correct.Apply(c, &correct.Options{ClCritical: clStar, Sulfate: correct.Sulfate(mode % 2), Excess: correct.Excess(mode >> 1 & 1)})
		if err != nil {
			return
		}
		fr, err := mix.Forward(&cr, nil)
		if err != nil {
			return
		}
		for s := range fr.Split {
			for i, v := range fr.Split[s] {
				if v < 0 {
					t.Errorf("%s %s = %g < 0", mix.Source(s), mix.Cations[i], v)
				}
			}
		}
		for i, m := range fr.Misfit {
			if m > 1e-9*math.Max(c[mix.Cations[i]], 1) {
				t.Errorf("%s misfit %g > 0", mix.Cations[i], m)
			}
		}
		a, err := Consumption(&fr.Split, cr.SO4Sulf, &Options{Sulfur: Proportional})
		if err != nil {
			t.Fatal(err)
		}
		b, err := Consumption(&fr.Split, cr.SO4Sulf, &Options{Sulfur: AllCarbonate})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(a.PhiTotal-b.PhiTotal) > 1e-9*math.Max(math.Abs(a.PhiTotal), 1) {
			t.Errorf("phi_total depends on the split: %g vs %g", a.PhiTotal, b.PhiTotal)
		}
	})
}
