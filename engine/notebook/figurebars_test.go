package notebook

import (
	"strings"
	"testing"
)

// TestFigureBarsLabels: each bar is labelled by the rest of its figure's
// name, and a CO2 figure under another sulfate origin by its source and
// the origin's short name; figures of other units or words are left out.
func TestFigureBarsLabels(t *testing.T) {
	words := "CO2 consumption per km²"
	o := &Output{Figures: []Figure{
		{Name: "silicate " + words, Unit: "mol/km²/yr"},
		{Name: "silicate " + words, Unit: "mol/yr"},
		{Name: "carbonate CO2 consumption", Unit: "mol/km²/yr"},
		{Name: "silicate " + words + otherOriginWords + sulfateOrigins["sulfide"], Unit: "mol/km²/yr"},
		{Name: "carbonate " + words + otherOriginWords + sulfateOrigins["gypsum"], Unit: "mol/km²/yr"},
		{Name: "silicate " + words + otherOriginWords + sulfateOrigins["isotope"], Unit: "mol/km²/yr"},
	}}
	var got []string
	for _, b := range FigureBars(o, "mol/km²/yr", words) {
		got = append(got, b.Label)
	}
	want := []string{"silicate", "silicate, SO4 from sulfide", "carbonate, SO4 from gypsum", "silicate, SO4 from δ34S"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("labels %q, want %q", got, want)
	}
	for k, v := range sulfateOrigins {
		if shortOrigins[v] == "" {
			t.Errorf("sulfate origin %s (%q) has no short name for chart labels", k, v)
		}
	}
	if FigureBars(nil, "mol/km²/yr", words) != nil {
		t.Error("bars of no output")
	}
}
