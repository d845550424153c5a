package notebook

import (
	"context"
	"math"
	"strings"
	"testing"

	"lixiv/engine/co2"
	"lixiv/engine/mix"
)

func TestCO2PairLongTerm(t *testing.T) {
	// Silicate Na 100, K 0, Ca 35, Mg 24 (the docs/methods.md §13 item 8
	// silicate part) and carbonate Ca 400, Mg 80. Long term the silicate
	// figure is the conventional sink (Ca+Mg)_sil = 59 under carbonic acid
	// (§9.2); with sulfide-derived sulfate the Ca+Mg share of S_sil comes
	// off (§9.3: silicate weathering by H2SO4 consumes no CO2), and the
	// carbonate figure is −S_carb.
	var s mix.Split
	s[mix.Silicate] = [mix.NCations]float64{100, 0, 35, 24}
	s[mix.Carbonate] = [mix.NCations]float64{0, 0, 400, 80}
	// Equivalents: silicate 100 + 70 + 48 = 218, carbonate 960. With
	// SO4_sulf 117.8 (proportional): S_sil = 117.8 × 218/1178 = 21.8, S_carb
	// = 96; Ca+Mg share of S_sil = 21.8 × 118/218 = 11.8.
	// The alkalinity-based convention counts ½ Alk_sil = ½(Na+K)_sil +
	// (Ca+Mg)_sil − S_sil: 218/2 = 109 under carbonic acid, (218 − 2 ×
	// 21.8)/2 = 87.2 with the proportional sulfide split (§9.3).
	tests := []struct {
		name           string
		so4            float64
		opt            co2.Options
		scale          string
		wantSil, wantC float64
	}{
		{"short, carbonic acid", 0, co2.Options{}, "short", 218, 480},
		{"long, carbonic acid", 0, co2.Options{}, "conventional", 59, 0},
		{"long, sulfide, proportional", 117.8, co2.Options{}, "conventional", 59 - 11.8, -96},
		{"long, sulfide, all to carbonate", 117.8, co2.Options{Sulfur: co2.AllCarbonate}, "conventional", 59, -117.8},
		{"long alkalinity-based, carbonic acid", 0, co2.Options{}, "alkalinity", 109, 0},
		{"long alkalinity-based, sulfide, proportional", 117.8, co2.Options{}, "alkalinity", 87.2, -96},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sil, carb, err := co2Pair(&s, tc.so4, &tc.opt, tc.scale)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(sil-tc.wantSil) > 1e-9 || math.Abs(carb-tc.wantC) > 1e-9 {
				t.Errorf("silicate %g, carbonate %g; want %g, %g", sil, carb, tc.wantSil, tc.wantC)
			}
		})
	}
	// The other convention is shown beside the chosen one.
	if got := otherLongSil(&s, 117.8, &co2.Options{}, "conventional"); math.Abs(got-87.2) > 1e-9 {
		t.Errorf("alkalinity-based long-term silicate beside the conventional one %g, want 87.2", got)
	}
	if got := otherLongSil(&s, 117.8, &co2.Options{}, "alkalinity"); math.Abs(got-47.2) > 1e-9 {
		t.Errorf("conventional long-term silicate beside the alkalinity-based one %g, want 47.2", got)
	}
	// docs/methods.md §13 item 7, pure albite-to-kaolinite water (Na_sil 100,
	// no Ca, Mg): conventional long-term sink 0, alkalinity-based 50.
	var ab mix.Split
	ab[mix.Silicate] = [mix.NCations]float64{100, 0, 0, 0}
	for scale, want := range map[string]float64{"conventional": 0, "alkalinity": 50} {
		if sil, _, _ := co2Pair(&ab, 0, &co2.Options{}, scale); math.Abs(sil-want) > 1e-12 {
			t.Errorf("albite water, %s: %g, want %g", scale, sil, want)
		}
	}
}

// TestLongTermConventionSetting checks that the co2 cell's setting picks
// the long-term figure and that the figure names say which one is used,
// with the other convention beside it.
func TestLongTermConventionSetting(t *testing.T) {
	d, err := loadFile("../../testdata/budgets/small-forward.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]map[string]float64{}
	for _, conv := range []string{"conventional", "alkalinity"} {
		if err := d.SetParam("co2", "long_term_convention", conv); err != nil {
			t.Fatal(err)
		}
		if err := d.Recompute(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
		got[conv] = map[string]float64{}
		for _, f := range d.Output("co2").Figures {
			got[conv][f.Name] = f.Median
		}
		want := LongTermConventionOf(d.Cell("co2").Settings.(*CO2Settings))
		if !strings.Contains(d.Output("co2").Table("per-litre").Title, want) {
			t.Errorf("%s: per-litre title %q does not name %q", conv, d.Output("co2").Table("per-litre").Title, want)
		}
		if got := d.Report().Convention; got != want {
			t.Errorf("%s: the report names the convention %q, want %q", conv, got, want)
		}
	}
	const conv, alk = "median silicate CO2 consumption per litre (long-term, (Ca+Mg)_sil)", "median silicate CO2 consumption per litre (long-term, ½ Alk_sil)"
	c, a := got["conventional"][conv], got["alkalinity"][alk]
	if !(c > 0) || !(a > c) {
		t.Errorf("long-term silicate per litre: conventional %g, alkalinity-based %g; want 0 < conventional < alkalinity-based (it adds ½(Na+K)_sil)", c, a)
	}
	if b := got["conventional"]["median silicate CO2 consumption per litre under the other long-term convention (½ Alk_sil)"]; b != a {
		t.Errorf("the alkalinity-based figure beside the conventional one is %g, want %g", b, a)
	}
	if !(got["alkalinity"]["silicate CO2 consumption per km²"] > got["conventional"]["silicate CO2 consumption per km²"]) {
		t.Error("the alkalinity-based convention should raise the silicate flux")
	}
}

func TestImplausibleSilicate(t *testing.T) {
	// docs/methods.md §9.4: silicate CO2 consumption in single catchments spans
	// about 1e3 to 1e6 mol/km²/yr (from memory); above about 5e6 it is
	// flagged for review (common practice, no source).
	tests := []struct {
		perKm2 float64
		warn   bool
	}{
		{6.00445e4, false}, // §13 item 9
		{1e6, false}, {5e6, false}, {5.1e6, true}, {2e7, true}, {math.NaN(), false},
	}
	for _, tc := range tests {
		if got := implausibleSilicate(tc.perKm2); (got != "") != tc.warn {
			t.Errorf("%g mol/km²/yr: warning %q, want one: %v", tc.perKm2, got, tc.warn)
		}
	}
	if got := implausibleSilicate(2e7); got != "silicate CO2 consumption of 2e+07 mol/km²/yr is above 5e+06, beyond what single catchments show (about 1e3 to 1e6); "+
		"check the catchment area, the units of the samples and the silicate end-member ratios" {
		t.Errorf("message %q", got)
	}
}
