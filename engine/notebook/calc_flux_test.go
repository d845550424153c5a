package notebook

import (
	"context"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/flux"
)

// TestMeanTableTonnes checks the mass columns of the fluxes cell's mean
// table: t/yr and t/km²/yr are mol/yr and mol/km²/yr times the molar mass
// (docs/methods.md §8.5: mass yield = Y × M × 1e-6; IUPAC 2021 molar masses,
// docs/methods.md §2.2), for the median and both bounds, and cation sums, which
// have no single molar mass, have none.
func TestMeanTableTonnes(t *testing.T) {
	d, err := loadFile("../../testdata/budgets/small-rain.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	_, o := d.firstOf(KindFluxes)
	mt := o.Table("mean")
	if mt == nil {
		t.Fatal("no mean table")
	}
	mass := map[string]float64{"Na": chem.Na.MolarMass(), "Ca": chem.Ca.MolarMass(), "Ca_silicate": chem.Ca.MolarMass(),
		"Mg_carbonate": chem.Mg.MolarMass(), "silicate cations": math.NaN()}
	seen := 0
	for i, name := range mt.Column("series").Text {
		m, ok := mass[name]
		if !ok {
			continue
		}
		seen++
		for _, pair := range [][2]string{{"flux", "mass_flux"}, {"yield", "mass_yield"}} {
			for _, end := range []string{"", "_low", "_high"} {
				mol, tonnes := mt.Column(pair[0] + end).Num[i], mt.Column(pair[1] + end).Num[i]
				want := mol * m * 1e-6
				if math.IsNaN(m) {
					if !math.IsNaN(tonnes) {
						t.Errorf("%s %s%s = %g t, want none for a cation sum", name, pair[1], end, tonnes)
					}
					continue
				}
				if math.IsNaN(mol) || math.Abs(tonnes-want) > 1e-9*math.Abs(want) {
					t.Errorf("%s %s%s = %g, want %g (%g mol × %g g/mol)", name, pair[1], end, tonnes, want, mol, m)
				}
			}
		}
	}
	if seen != len(mass) {
		t.Errorf("found %d of the %d series", seen, len(mass))
	}
	if u := mt.Column("mass_yield").Unit; u != "t/km²/yr" {
		t.Errorf("mass_yield unit %q", u)
	}
}

func TestFlowCoverage(t *testing.T) {
	// Limits: a tenth of the flow unbracketed in time or discharge, a
	// highest sample reached on more than 5 % of days (common practice).
	tests := []struct {
		held, outside, top float64
		warn               []string
	}{
		{0.05, 0.08, 0.01, nil},
		{0.10, 0.10, 0.05, nil},
		{0.25, 0.02, 0.01, []string{"25 % of the flow passed before the first or after the last sample"}},
		{0.02, 0.30, 0.01, []string{"30 % of the flow passed on days with discharge outside the sampled range, where the rating curve extrapolates"}},
		{0.02, 0.02, 0.20, []string{"the highest sampled discharge is reached on 20 % of days: the floods went unsampled"}},
	}
	for _, tc := range tests {
		figs, warns := flowCoverage(&flux.Result{Method: flux.Rating, HeldFlow: tc.held, OutsideFlow: tc.outside, TopSampled: tc.top})
		if len(figs) != 3 || figs[0].Median != tc.held || figs[1].Median != tc.outside || figs[2].Median != tc.top {
			t.Errorf("figures %+v", figs)
		}
		if len(warns) != len(tc.warn) {
			t.Errorf("%+v: warnings %q, want %q", tc, warns, tc.warn)
			continue
		}
		for i, w := range tc.warn {
			if !strings.HasPrefix(warns[i], w) {
				t.Errorf("warning %q, want it to start %q", warns[i], w)
			}
		}
	}
}

// TestWeatheringRateReplicates checks the weathering rates against
// hand-worked values: each replicate's rate is its parts' mass fluxes over
// its own area, and the interval is taken over replicates; without
// replicates (the quick pass) the rate is a point value.
func TestWeatheringRateReplicates(t *testing.T) {
	// Molar masses, docs/methods.md §2.2 (IUPAC 2021): Ca 40.078, Mg 24.305,
	// HCO3 61.016 g/mol. CWR with carbon, §6.1: Ca M_Ca + Mg M_Mg + (Ca +
	// Mg) M_HCO3.
	mass := func(ca, mg, area float64) float64 { return (ca*40.078 + mg*24.305 + (ca+mg)*61.016) * 1e-6 / area }
	parts := weatheringRates[3].parts
	points := map[string]float64{"Ca_carbonate": 1e6, "Mg_carbonate": 2e5}
	ca := []float64{1e6, 2e6, 3e6}
	mg := []float64{1e5, 2e5, math.NaN()} // a failed replicate is left out
	area := []float64{10, 10, 10}
	reps := map[string]*flux.Uncertainty{
		"Ca_carbonate": {MeanMol: ca, Area: area},
		"Mg_carbonate": {MeanMol: mg, Area: area},
	}
	f, ok := weatheringRate("cwr", parts, points, reps, 10)
	if !ok {
		t.Fatal("no rate")
	}
	// Two usable replicates: the median lies halfway between them.
	r1, r2 := mass(1e6, 1e5, 10), mass(2e6, 2e5, 10)
	if math.Abs(f.Median-(r1+r2)/2) > 1e-12 || !(f.Low >= r1 && f.High <= r2 && f.Low < f.High) {
		t.Errorf("interval %g [%g, %g], want median %g within [%g, %g]", f.Median, f.Low, f.High, (r1+r2)/2, r1, r2)
	}
	delete(reps, "Mg_carbonate")
	f, _ = weatheringRate("cwr", parts, points, reps, 10)
	if want := mass(1e6, 2e5, 10); math.Abs(f.Median-want) > 1e-12 || !math.IsNaN(f.Low) || !math.IsNaN(f.High) {
		t.Errorf("without replicates: %g [%g, %g], want the point value %g alone", f.Median, f.Low, f.High, want)
	}
	if _, ok := weatheringRate("swr", weatheringRates[1].parts, points, reps, 10); ok {
		t.Error("a rate whose series are absent should be left out")
	}
}

// TestUncertaintyBySource checks the "uncertainty by source" tables of the
// demo budget (Corrie Vale: inverse apportionment with draws, discharge
// error 7 %, area error 2 %, series_bootstrap 200): every headline figure
// has its all-sources row, the headline interval itself, and one row per
// source alone with BreakdownReplicates replicates; the discharge and area
// rows have the widths their normal errors give; the quick pass and
// series_bootstrap 0 leave the table out.
func TestUncertaintyBySource(t *testing.T) {
	const path = "../../examples/corrie-vale/corrie-vale.lixiv.json"
	d, err := loadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	sources := []string{"all sources"}
	for _, us := range uncertaintySources {
		sources = append(sources, us.name)
	}
	for _, c := range []struct {
		kind    Kind
		figures []string
	}{
		{KindFluxes, []string{"silicate cations yield", "carbonate cations yield"}},
		{KindCO2, []string{"silicate CO2 consumption per km²", "carbonate CO2 consumption per km²"}},
	} {
		_, o := d.firstOf(c.kind)
		tb := o.Table("by-source")
		if tb == nil {
			t.Fatalf("%v: no by-source table", c.kind)
		}
		if !strings.Contains(tb.Title, "do not add up to the total") || !strings.Contains(tb.Title, "200 replicates") {
			t.Errorf("%v: title %q should give the replicates and say the widths do not add up", c.kind, tb.Title)
		}
		fig, src := tb.Column("figure").Text, tb.Column("source").Text
		med, lo, hi := tb.Column("median").Num, tb.Column("low").Num, tb.Column("high").Num
		rel, reps := tb.Column("relative_width").Num, tb.Column("replicates").Num
		if len(fig) != len(c.figures)*len(sources) {
			t.Fatalf("%v: %d rows, want %d", c.kind, len(fig), len(c.figures)*len(sources))
		}
		for i := range fig {
			f, s := c.figures[i/len(sources)], sources[i%len(sources)]
			if fig[i] != f || src[i] != s {
				t.Errorf("%v row %d: %q / %q, want %q / %q", c.kind, i, fig[i], src[i], f, s)
				continue
			}
			if !(lo[i] < med[i] && med[i] < hi[i]) || math.Abs(rel[i]-(hi[i]-lo[i])/med[i]) > 1e-12 {
				t.Errorf("%v %s, %s: %g [%g, %g], relative width %g", c.kind, f, s, med[i], lo[i], hi[i], rel[i])
			}
			if s == "all sources" {
				// The headline figure's own interval.
				found := false
				for _, h := range o.Figures {
					if h.Name != f {
						continue
					}
					found = true
					if h.Median != med[i] || h.Low != lo[i] || h.High != hi[i] {
						t.Errorf("%v %s: all sources %g [%g, %g], headline %g [%g, %g]", c.kind, f, med[i], lo[i], hi[i], h.Median, h.Low, h.High)
					}
				}
				if !found {
					t.Errorf("%v: no headline figure %q", c.kind, f)
				}
				continue
			}
			if reps[i] > BreakdownReplicates || reps[i] < 0.95*BreakdownReplicates {
				t.Errorf("%v %s, %s: %g replicates, want %d less a few failed fits", c.kind, f, s, reps[i], BreakdownReplicates)
			}
			// Normal quantiles ±1.96 (common practice): the discharge error
			// (7 %) alone gives a width of 3.92 × 0.07 = 0.274 of the
			// median, the area error (2 %) 1/(1 − 0.0392) − 1/(1 + 0.0392)
			// = 0.0785 of the yield; 15 % for the quantiles of 200 draws.
			want := map[string]float64{"discharge (systematic error)": 3.92 * 0.07, "catchment area": 1/(1-0.0392) - 1/(1+0.0392)}[s]
			if want > 0 && math.Abs(rel[i]/want-1) > 0.15 {
				t.Errorf("%v %s, %s: relative width %.4f, want about %.4f", c.kind, f, s, rel[i], want)
			}
		}
	}

	// series_bootstrap 0 turns the breakdown off.
	if err := d.SetParam("fluxes", "series_bootstrap", "0"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, k := range []Kind{KindFluxes, KindCO2} {
		if _, o := d.firstOf(k); o.Table("by-source") != nil {
			t.Errorf("%v: a by-source table with series_bootstrap 0", k)
		}
	}

	// The quick pass leaves it out too.
	d, err = loadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d.Quick = true
	for more := true; more; {
		stale := false
		for _, id := range d.Pending() {
			if st, _ := d.Status(id); st == Stale {
				stale = true
			}
		}
		if !stale {
			break
		}
		if more, err = d.Step(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	for _, k := range []Kind{KindFluxes, KindCO2} {
		if _, o := d.firstOf(k); o == nil || !o.Rough || o.Table("by-source") != nil {
			t.Errorf("%v after the quick pass: want a rough output without a by-source table", k)
		}
	}
}
