package notebook

import (
	"math"
	"testing"

	"lixiv/engine/co2"
	"lixiv/engine/mix"
)

func TestCO2PairLongTerm(t *testing.T) {
	// Silicate Na 100, K 0, Ca 35, Mg 24 (the methods brief §13 item 8
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
	tests := []struct {
		name           string
		so4            float64
		opt            co2.Options
		long           bool
		wantSil, wantC float64
	}{
		{"short, carbonic acid", 0, co2.Options{}, false, 218, 480},
		{"long, carbonic acid", 0, co2.Options{}, true, 59, 0},
		{"long, sulfide, proportional", 117.8, co2.Options{}, true, 59 - 11.8, -96},
		{"long, sulfide, all to carbonate", 117.8, co2.Options{Sulfur: co2.AllCarbonate}, true, 59, -117.8},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sil, carb, err := co2Pair(&s, tc.so4, &tc.opt, tc.long)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(sil-tc.wantSil) > 1e-9 || math.Abs(carb-tc.wantC) > 1e-9 {
				t.Errorf("silicate %g, carbonate %g; want %g, %g", sil, carb, tc.wantSil, tc.wantC)
			}
		})
	}
	// The alkalinity-based figure shown beside it: Alk_sil/2 = (218 − 2 ×
	// 21.8)/2 = 87.2.
	if got := alkalinityLongSil(&s, 117.8, &co2.Options{}); math.Abs(got-87.2) > 1e-9 {
		t.Errorf("alkalinity-based long-term silicate %g, want 87.2", got)
	}
}

func TestImplausibleSilicate(t *testing.T) {
	// Methods brief §9.4: silicate CO2 consumption in single catchments spans
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
