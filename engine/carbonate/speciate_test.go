package carbonate

import (
	"errors"
	"math"
	"testing"
)

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// TestSpeciationCheckValues reproduces the speciation check values of the
// docs/methods.md §13 item 13 (computed there from the §10.1 constants):
// Alk 2.000 meq/L, pH 8.00, 25 °C, Ca 1.000 mmol/L, ideal and with Davies
// coefficients at I = 0.003 (A = 0.5085). Tolerance 1e-4 relative, as
// docs/methods.md gives it; SI to 5e-4.
func TestSpeciationCheckValues(t *testing.T) {
	k := At(25)
	g1 := math.Pow(10, LogGammaDavies(1, 0.003, 0.5085))
	g2 := math.Pow(10, LogGammaDavies(2, 0.003, 0.5085))
	davies := Gammas{H: g1, OH: g1, HCO3: g1, CO3: g2, Ca: g2, Mg: g2}
	for _, c := range []struct {
		name                 string
		g                    Gammas
		hco3, co3, h2co3     float64 // mol/L; NaN: not given
		pco2uatm, dic, siCal float64
	}{
		{"ideal", Unit(), 1.98042e-3, 9.2876e-6, 44.527e-6, 1307.9, 2.03424e-3, 0.4477},
		{"Davies I=0.003", davies, 1.97676e-3, 11.090e-6, math.NaN(), 1229.7, math.NaN(), 0.3172},
	} {
		s := Speciate(2e-3, 8, k, c.g)
		for _, v := range []struct {
			name      string
			got, want float64
		}{{"HCO3", s.HCO3, c.hco3}, {"CO3", s.CO3, c.co3}, {"H2CO3*", s.H2CO3, c.h2co3},
			{"pCO2 µatm", s.PCO2 * 1e6, c.pco2uatm}, {"DIC", s.DIC, c.dic}} {
			if !math.IsNaN(v.want) && relErr(v.got, v.want) > 1e-4 {
				t.Errorf("%s: %s = %.6g, want %.6g (docs/methods.md §13 item 13)", c.name, v.name, v.got, v.want)
			}
		}
		if si := SaturationIndex(1e-3, s.CO3, c.g, k.LogKcal); math.Abs(si-c.siCal) > 5e-4 {
			t.Errorf("%s: SI calcite = %.4f, want %+.4f (docs/methods.md §13 item 13)", c.name, si, c.siCal)
		}
		if c.name == "ideal" && math.Abs(math.Log10(s.PCO2)-(-2.8834)) > 5e-4 {
			t.Errorf("log pCO2 = %.4f, want −2.8834 (docs/methods.md §13 item 13)", math.Log10(s.PCO2))
		}
	}
}

// TestCalciteSolubility reproduces the calcite solubility of docs/methods.md
// §10.3 (computed there): 25 °C, pCO2 = 10^-3.4 atm, 0.4739 mmol/L
// for an ideal solution and 0.5174 mmol/L with Davies activities, iterated.
func TestCalciteSolubility(t *testing.T) {
	pco2 := math.Pow(10, -3.4)
	for _, c := range []struct {
		m    Model
		want float64
	}{{Ideal, 0.4739e-3}, {Davies, 0.5174e-3}} {
		if got := CalciteSolubility(25, pco2, c.m); math.Abs(got-c.want) > 0.00005e-3 {
			t.Errorf("%s: calcite solubility %.5f mmol/L, want %.4f (docs/methods.md §10.3)", c.m, got*1e3, c.want*1e3)
		}
	}
}

// TestCalciteSaturatedWater checks the textbook worked example of water in
// equilibrium with calcite and the atmosphere at 25 °C: pH about 8.3 with
// Ca about 0.5 mmol/L (alkalinity 1 meq/L) at pCO2 about 10^-3.5 atm
// (Stumm & Morgan 1996, Aquatic Chemistry, 3rd ed., ch. 7, "open system
// CaCO3–CO2–H2O"; Drever 1997, The Geochemistry of Natural Waters, ch. 4;
// both from memory, to the rounding the books give). Speciating that water
// must give SI calcite near 0 and log pCO2 near −3.5, to ±0.1, the rounding
// of the quoted pH and Ca.
func TestCalciteSaturatedWater(t *testing.T) {
	r, err := Analyse(Water{TempC: 25, PH: 8.3, Alk: 1e-3, Ca: 0.5e-3, Mg: math.NaN(), Background: 3 * 0.5e-3 * 0.5}, Davies)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.SICalcite) > 0.1 || math.Abs(r.LogPCO2-(-3.5)) > 0.1 {
		t.Errorf("SI calcite %.3f (want 0 ± 0.1), log pCO2 %.3f (want −3.5 ± 0.1): Stumm & Morgan 1996, from memory", r.SICalcite, r.LogPCO2)
	}
}

// TestRainwaterPH checks the textbook pH of pure water in equilibrium with
// atmospheric CO2 at pCO2 = 10^-3.5 atm and 25 °C: 5.66 (Stumm & Morgan
// 1996, Aquatic Chemistry, ch. 4, from memory; often quoted as 5.6 or 5.65).
func TestRainwaterPH(t *testing.T) {
	ph, err := PH(0, math.Pow(10, -3.5), At(25), Unit())
	if err != nil || math.Abs(ph-5.66) > 0.006 {
		t.Errorf("pH of rain = %.4f (%v), want 5.66 (Stumm & Morgan 1996, from memory)", ph, err)
	}
}

// TestPHInvertsSpeciate is an exact identity: the pH PH finds for an
// alkalinity and a pCO2 gives back that pCO2 and alkalinity in Speciate.
func TestPHInvertsSpeciate(t *testing.T) {
	for _, tC := range []float64{0.5, 12, 25, 60} {
		k := At(tC)
		for _, m := range []Model{Ideal, Davies, ExtendedDH} {
			g := m.Gammas(0.005, tC)
			for _, alk := range []float64{50e-6, 1e-3, 5e-3} {
				for _, lp := range []float64{-3.6, -3, -2} {
					pco2 := math.Pow(10, lp)
					ph, err := PH(alk, pco2, k, g)
					if err != nil {
						t.Fatalf("%g °C %s alk %g pCO2 %g: %v", tC, m, alk, pco2, err)
					}
					s := Speciate(alk, ph, k, g)
					if relErr(s.PCO2, pco2) > 1e-9 || relErr(s.HCO3+2*s.CO3+s.OH-s.H, alk) > 1e-9 {
						t.Errorf("%g °C %s alk %g pCO2 %g: back %g, alkalinity %g", tC, m, alk, pco2, s.PCO2, s.HCO3+2*s.CO3+s.OH-s.H)
					}
				}
			}
		}
	}
	// More acid than a pH of 0 holds.
	if _, err := PH(-2, 1e-3, At(25), Unit()); !errors.Is(err, ErrNoMatch) {
		t.Errorf("−2 eq/L of alkalinity at 10^-3 atm: err %v, want ErrNoMatch", err)
	}
}

// TestSaturationIdentity: a water holding exactly the Ca that balances the
// calcite solubility product has SI 0; ten times that has SI 1.
func TestSaturationIdentity(t *testing.T) {
	k := At(17)
	g := Davies.Gammas(0.004, 17)
	s := Speciate(2.2e-3, 7.9, k, g)
	ca := math.Pow(10, k.LogKcal) / (g.Ca * g.CO3 * s.CO3)
	for _, c := range []struct{ f, want float64 }{{1, 0}, {10, 1}, {0.1, -1}} {
		if si := SaturationIndex(c.f*ca, s.CO3, g, k.LogKcal); math.Abs(si-c.want) > 1e-12 {
			t.Errorf("%g × saturation: SI %.15f, want %g", c.f, si, c.want)
		}
	}
	mg := math.Pow(10, k.LogKdol) / (g.Ca * ca * g.Mg * g.CO3 * g.CO3 * s.CO3 * s.CO3)
	if si := SaturationIndexDolomite(ca, mg, s.CO3, g, k.LogKdol); math.Abs(si) > 1e-12 {
		t.Errorf("dolomite at saturation: SI %g", si)
	}
}
