package mix

import (
	"context"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// docs/methods.md §13 item 15: end-members (Ca/Na, Mg/Na, HCO3/Na, 1000
// Sr/Na, 87Sr/86Sr) silicate (0.35, 0.24, 2, 3, 0.7200), carbonate (50, 10,
// 120, 50, 0.7080), evaporite (0.17, 0.02, 0.3, 1.0, 0.7075) — illustrative
// test values, not a recommendation. The evaporite takes part only with
// the Cl/Na tracer (§7.9), so it is given halite's Cl/Na of 1 and the
// rocks none.
func item15EndMembers(spread float64) []EndMember {
	mk := func(name string, src Source, ca, mg, hco3, sr1000, r, cl float64) EndMember {
		p := func(v float64) Prior {
			if spread == 0 || v == 0 {
				return FixedRatio(v)
			}
			return Spread(v, spread)
		}
		e := EndMember{Name: name, Source: src}
		e.Ratio[CaNa], e.Ratio[MgNa], e.Ratio[HCO3Na] = p(ca), p(mg), p(hco3)
		e.Ratio[SrNa], e.Ratio[Sr87Sr86], e.Ratio[ClNa] = p(sr1000/1000), p(r), p(cl)
		return e
	}
	return []EndMember{
		mk("silicate", Silicate, 0.35, 0.24, 2, 3, 0.7200, 0),
		mk("carbonate", Carbonate, 50, 10, 120, 50, 0.7080, 0),
		mk("evaporite", Evaporite, 0.17, 0.02, 0.3, 1.0, 0.7075, 1),
	}
}

var item15Tracers = []Tracer{CaNa, MgNa, HCO3Na, ClNa, SrNa, Sr87Sr86}

// mixWater mixes end-members (at their central values) with Na fractions
// alpha into a raw water of the given Na (µmol/L).
func mixWater(name string, em []EndMember, alpha []float64, na float64) Water {
	c := chem.NewComposition()
	c[chem.Na] = na
	sp := map[Tracer]chem.Species{CaNa: chem.Ca, MgNa: chem.Mg, KNa: chem.K, HCO3Na: chem.HCO3, ClNa: chem.Cl, SrNa: chem.Sr}
	for t, s := range sp {
		v := 0.0
		for j := range em {
			v += alpha[j] * em[j].Ratio[t].Value
		}
		c[s] = v * na
	}
	num, den := 0.0, 0.0
	for j := range em {
		num += alpha[j] * em[j].Ratio[SrNa].Value * em[j].Ratio[Sr87Sr86].Value
		den += alpha[j] * em[j].Ratio[SrNa].Value
	}
	return Water{Name: name, Conc: c, Sr87Sr86: num / den}
}

func TestItem15MixtureValues(t *testing.T) {
	w := mixWater("item 15", item15EndMembers(0), []float64{0.6, 0.1, 0.3}, 100)
	// docs/methods.md §13 item 15: mixture ratios (5.261, 1.15, 13.29,
	// 7.1) and 87Sr/86Sr 0.7110211 (1000 Sr/Na for the fourth).
	for _, tc := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"Ca/Na", w.Conc[chem.Ca] / 100, 5.261, 1e-12},
		{"Mg/Na", w.Conc[chem.Mg] / 100, 1.15, 1e-12},
		{"HCO3/Na", w.Conc[chem.HCO3] / 100, 13.29, 1e-12},
		{"1000 Sr/Na", 1000 * w.Conc[chem.Sr] / 100, 7.1, 1e-12},
		{"87Sr/86Sr", w.Sr87Sr86, 0.7110211, 5e-8},
	} {
		if math.Abs(tc.got-tc.want) > tc.tol*math.Max(1, math.Abs(tc.want)) {
			t.Errorf("%s: got %.10g want %.10g", tc.name, tc.got, tc.want)
		}
	}
}

// TestItem15RecoversFractions: noise-free data of fixed end-members (and a
// precision of 1e-9 µmol/L) return the fractions (0.6, 0.1, 0.3) to 1e-6;
// with 1 % priors and the default precision of 3 %, the 95 % intervals
// contain them (docs/methods.md §13 item 15).
func TestItem15RecoversFractions(t *testing.T) {
	want := []float64{0.6, 0.1, 0.3}
	exact := correct.UniformPrecision(0, 1e-9, 1e-12)
	for _, tc := range []struct {
		name   string
		spread float64
		opt    Options
		tol    float64
	}{
		{"fixed end-members, exact data", 0, Options{Seed: 1, TargetESS: 200, Precision: &exact, IsoErr: 1e-12}, 1e-6},
		{"1 % priors, 3 % data", 0.01, Options{Seed: 1}, -1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			em := item15EndMembers(tc.spread)
			p := Problem{EndMembers: em, Tracers: item15Tracers, Waters: []Water{mixWater("item 15", em, want, 100)}}
			res, err := Invert(context.Background(), p, &tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			sr := &res.Samples[0]
			if sr.Status != Fits {
				t.Fatalf("%v: %s", sr.Status, sr.Verdict)
			}
			for j := range want {
				a := sr.Alpha[j]
				if tc.tol > 0 && math.Abs(a.Median-want[j]) > tc.tol {
					t.Errorf("%s: median fraction %.10f, want %.1f (tolerance %g)", em[j].Name, a.Median, want[j], tc.tol)
				}
				if !(a.Lo <= want[j] && want[j] <= a.Hi) {
					t.Errorf("%s: 95 %% interval [%.4f, %.4f] misses %.1f", em[j].Name, a.Lo, a.Hi, want[j])
				}
			}
		})
	}
}
