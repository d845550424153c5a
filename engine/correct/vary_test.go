package correct

import (
	"math"
	"testing"

	"lixiv/engine/chem"
)

// sameBits reports whether two compositions agree bit for bit (NaN
// included).
func sameBits(a, b chem.Composition) bool {
	for i := range a {
		if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
			return false
		}
	}
	return true
}

// TestVaryUnitIsApply checks that redoing a correction with multipliers of
// 1 gives Apply's numbers bit for bit, under every choice Vary repeats
// (an exact rain correction must leave the apportionment unchanged).
func TestVaryUnitIsApply(t *testing.T) {
	river := sample(map[chem.Species]float64{chem.Na: 300, chem.K: 12, chem.Ca: 400, chem.Mg: 90, chem.Cl: 320,
		chem.SO4: 80, chem.Alk: 900, chem.Sr: 0.9})
	lowNa := sample(map[chem.Species]float64{chem.Na: 100, chem.K: 1, chem.Ca: 50, chem.Mg: 20, chem.Cl: 200, chem.SO4: 5})
	rain := &Rain{Composition: sample(map[chem.Species]float64{chem.Na: 17, chem.Cl: 20, chem.K: 0.5, chem.Ca: 1, chem.Mg: 2, chem.SO4: 3}),
		P: 1000, ET: 600}
	cases := []struct {
		name string
		c    chem.Composition
		opt  Options
	}{
		{"sea salt, all Cl atmospheric", river, Options{}},
		{"sea salt, Cl* and halite", river, Options{ClCritical: 150}},
		{"human input, sulfide", river, Options{ClCritical: 150, Excess: HumanInput, Sulfate: Sulfide}},
		{"measured rain, isotope", river, Options{Rain: rain, Sulfate: Isotope, Delta34S: Delta34S{River: 5, Evaporite: 15, Sulfide: -10}}},
		{"negative residuals set to zero", lowNa, Options{}},
		{"negative residuals kept", lowNa, Options{Negative: Keep}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r, err := Apply(tc.c, &tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			k := Unit()
			v := r.Vary(&k)
			for _, p := range []struct {
				name      string
				got, want chem.Composition
			}{{"Atm", v.Atm, r.Atm}, {"Evap", v.Evap, r.Evap}, {"Human", v.Human, r.Human}, {"Residual", v.Residual, r.Residual}} {
				if !sameBits(p.got, p.want) {
					t.Errorf("%s: got %v, want %v", p.name, p.got, p.want)
				}
			}
			if v.ClExcess != r.ClExcess || v.SO4Sulf != r.SO4Sulf || v.Warnings != nil || v.Rejected {
				t.Errorf("ClExcess %g/%g, SO4Sulf %g/%g, warnings %v, rejected %v", v.ClExcess, r.ClExcess, v.SO4Sulf, r.SO4Sulf, v.Warnings, v.Rejected)
			}
		})
	}
}

// TestVaryScales checks the draw of a correction against hand-worked
// values built on the measured-rain example of the docs/methods.md §13 item
// 5 (Cl_rain 20, Na_rain 17, P 1000 mm, ET 600 mm: F 2.5, Cl* 50, Na_atm
// 42.5; river Cl 80: Cl_excess 30 to halite).
func TestVaryScales(t *testing.T) {
	rain := &Rain{Composition: sample(map[chem.Species]float64{chem.Na: 17, chem.Cl: 20}), P: 1000, ET: 600}
	river := sample(map[chem.Species]float64{chem.Na: 200, chem.Cl: 80, chem.Ca: 100})
	r, err := Apply(river, &Options{Rain: rain})
	if err != nil {
		t.Fatal(err)
	}
	if !near(r.Atm[chem.Na], 42.5, 1e-12) || !near(r.Evap[chem.Na], 30, 1e-12) {
		t.Fatalf("central: Na_atm %g (want 42.5), Na_evap %g (want 30)", r.Atm[chem.Na], r.Evap[chem.Na])
	}
	cases := []struct {
		name                    string
		naCl, cl                float64 // multipliers of Na/Cl and of Cl*
		clAtm, naAtm, naEv, naR float64 // µmol/L, worked by hand
	}{
		// Na/Cl × 1.2: Na_atm = 50 × 0.85 × 1.2 = 51; Na* = 200 − 51 − 30 = 119.
		{"Na/Cl up 20 %", 1.2, 1, 50, 51, 30, 119},
		// Cl* × 1.2 = 60 (F 3): Cl_atm 60, Na_atm 51, excess 20; Na* = 129.
		{"Cl* up 20 %", 1, 1.2, 60, 51, 20, 129},
		// Cl* × 2 = 100 > river Cl: all 80 atmospheric, Na_atm 68, no halite; Na* = 132.
		{"Cl* above river Cl", 1, 2, 80, 68, 0, 132},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			k := Unit()
			k.Ratios[chem.Na], k.ClCritical = tc.naCl, tc.cl
			v := r.Vary(&k)
			for _, c := range []struct {
				name      string
				got, want float64
			}{{"Cl_atm", v.Atm[chem.Cl], tc.clAtm}, {"Na_atm", v.Atm[chem.Na], tc.naAtm}, {"Na_evap", v.Evap[chem.Na], tc.naEv},
				{"Na*", v.Residual[chem.Na], tc.naR},
				// The rain lacks Ca, so Ca/Cl is the sea-salt ratio (Millero et al. 2008) and Cl* moves Ca_atm too.
				{"Ca*", v.Residual[chem.Ca], 100 - tc.clAtm*SeaSalt()[chem.Ca]}} {
				if !near(c.got, c.want, 1e-9) {
					t.Errorf("%s = %.12g, want %g", c.name, c.got, c.want)
				}
			}
			if !near(r.Atm[chem.Na], 42.5, 1e-12) || !near(r.ClCritical, 50, 1e-12) {
				t.Errorf("Vary changed the central result: Na_atm %g, Cl* %g", r.Atm[chem.Na], r.ClCritical)
			}
		})
	}
	t.Run("reject policy marks the draw", func(t *testing.T) {
		r, _ := Apply(river, &Options{Rain: rain, Negative: Reject})
		k := Unit()
		k.Ratios[chem.Na] = 5 // Na_atm 212.5 > Na − Na_evap
		if v := r.Vary(&k); !v.Rejected {
			t.Error("a negative Na* under Reject should mark the draw rejected")
		}
	})
}

func TestUncertaintyCheck(t *testing.T) {
	for _, tc := range []struct {
		u  Uncertainty
		ok bool
	}{{Uncertainty{}, true}, {Uncertainty{0.1, 0.05}, true}, {Uncertainty{-0.1, 0}, false}, {Uncertainty{0, math.NaN()}, false}, {Uncertainty{math.Inf(1), 0}, false}} {
		if err := tc.u.Check(); (err == nil) != tc.ok {
			t.Errorf("%+v: Check() = %v, want ok %v", tc.u, err, tc.ok)
		}
	}
	if !(Uncertainty{}).Zero() || (Uncertainty{Factor: 0.1}).Zero() {
		t.Error("Zero")
	}
}
