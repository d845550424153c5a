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
// (science.md §8.5: mass yield = Y × M × 1e-6; IUPAC 2021 molar masses,
// science.md §2.2), for the median and both bounds, and cation sums, which
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
	// Molar masses, methods brief §2.2 (IUPAC 2021): Ca 40.078, Mg 24.305,
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
