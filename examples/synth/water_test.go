package synth

import (
	"context"
	"math"
	"os"
	"strings"
	"testing"

	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

func loadGreyhope(t *testing.T) *notebook.Document {
	t.Helper()
	f, err := os.Open("../greyhope-beck/greyhope-beck.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	d, err := notebook.Load(f, "greyhope-beck.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestGreyhopeRecoversTruth runs the Greyhope example against its invented
// truth. The carbonate cell must give back each sample's invented pCO2 to
// within the rounding of the pH written to the table (0.005 pH is 1.2 % of
// pCO2; with the 0.05 °C rounding of the temperature, 2 % is allowed).
// The mineral cell's 95 % interval of each mineral's mean annual yield
// must hold the truth's (the minerals the truth weathers, day by day at
// the day's discharge, over the complete water years the budget averages),
// and its median be within 15 % of it (30 % for biotite, which leans high).
func TestGreyhopeRecoversTruth(t *testing.T) {
	d := loadGreyhope(t)
	tr := Greyhope()
	q := tr.Discharge()
	ss := tr.Samples(q)
	ct := d.Output("carbonate").Table("carbonate")
	got := map[string]float64{}
	for i, n := range ct.Column("sample").Text {
		got[n] = ct.Column("pCO2").Num[i]
	}
	checked := 0
	for _, s := range ss {
		if x, ok := got[s.ID]; ok {
			checked++
			if math.Abs(x/s.PCO2-1) > 0.02 {
				t.Errorf("%s: pCO2 %.1f µatm, invented %.1f", s.ID, x, s.PCO2)
			}
		}
	}
	if checked < 45 {
		t.Errorf("only %d samples compared", checked)
	}
	// The budget averages complete water years: October 2021 to September 2023.
	truth := GreyhopeYields(tr, discharge.Date(2023, 10, 1))
	pt := d.Output("minerals").Table("period")
	if pt == nil {
		t.Fatal("no period table")
	}
	for i, name := range pt.Column("mineral").Text {
		key := strings.TrimSuffix(strings.Split(name, " = ")[0], " ")
		want := truth[key]
		med, lo, hi := pt.Column("yield").Num[i], pt.Column("yield_low").Num[i], pt.Column("yield_high").Num[i]
		t.Logf("%s: %.4g [%.4g, %.4g] mol/km²/yr, truth %.4g", name, med, lo, hi, want)
		if !(lo <= want && want <= hi) {
			t.Errorf("%s: 95 %% interval [%.4g, %.4g] misses the truth %.4g mol/km²/yr", name, lo, hi, want)
		}
		// Biotite, small against the noise and held at zero where noise
		// would make it negative, leans high (docs/validation.md): one
		// budget may miss it by more.
		allowed := 0.15
		if key == "biotite" {
			allowed = 0.3
		}
		if math.Abs(med/want-1) > allowed {
			t.Errorf("%s: median %.4g is %.0f %% of the truth %.4g", name, med, 100*med/want, want)
		}
	}
}

// TestGreyhopeFluxesCaution: with the SI flag at 0 the supersaturated
// samples carry most of the load and the fluxes cell cautions; at the
// example's 0.5 they do not.
func TestGreyhopeFluxesCaution(t *testing.T) {
	d := loadGreyhope(t)
	has := func() bool {
		return strings.Contains(strings.Join(d.Output("fluxes").Warnings, "\n"), "SI of calcite above")
	}
	if has() {
		t.Error("the example cautions at SI 0.5")
	}
	if err := d.SetParam("carbonate", "si_calcite_flag", "0"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if !has() {
		t.Errorf("no caution at SI 0: %q", d.Output("fluxes").Warnings)
	}
}
