package web

import (
	"context"
	"os"
	"strings"
	"testing"

	"lixiv/engine/notebook"
)

func greyhopeBudget(t *testing.T) *notebook.Document {
	t.Helper()
	b, err := os.ReadFile("../examples/greyhope-beck/greyhope-beck.lixiv.json")
	if err != nil {
		t.Skip("no Greyhope budget:", err)
	}
	d, err := notebook.Parse(b, "greyhope-beck")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestWaterCharts: the carbonate and minerals cells draw their charts from
// their output tables: saturation indices and pCO2 against discharge with
// the cell's thresholds, minerals per sample above and below zero, and the
// CO2 of each mineral.
func TestWaterCharts(t *testing.T) {
	d := greyhopeBudget(t)
	var cc ChartCache
	for _, c := range []struct {
		id     string
		titles []string
		marks  [][]string // text each chart must hold
	}{
		{"carbonate", []string{"Saturation indices against discharge", "pCO2 against discharge"},
			[][]string{{"calcite", "aragonite", "dolomite", "flag: SI of calcite 0.5", "discharge at sampling (m³/s)"},
				{"the air (420 µatm)", "flag: 10 × the air", "pCO2 (µatm)"}}},
		{"minerals", []string{"Minerals per sample", "CO2 consumed by each mineral"},
			[][]string{{"plagioclase An30", "kaolinite", "magnesian calcite", "amount (µmol/L)"},
				{"K-feldspar", "mol/km²/yr", "95 % interval"}}},
	} {
		views := cc.For(d, d.Cell(c.id), d.Output(c.id))
		if len(views) != len(c.titles) {
			t.Fatalf("%s: %d charts, want %d", c.id, len(views), len(c.titles))
		}
		for i, v := range views {
			if !strings.HasPrefix(v.Title, c.titles[i]) {
				t.Errorf("%s chart %d: %q, want %q", c.id, i, v.Title, c.titles[i])
			}
			for _, m := range c.marks[i] {
				if !strings.Contains(v.SVG, m) {
					t.Errorf("%s: %q lacks %q", c.id, v.Title, m)
				}
			}
		}
	}
	// Kaolinite forms: its bars lie below zero, drawn as rectangles of
	// their own (one per sample, plus the legend's).
	v := cc.For(d, d.Cell("minerals"), d.Output("minerals"))[0]
	if n := strings.Count(v.SVG, "kaolinite: -"); n < 40 {
		t.Errorf("%d kaolinite bars below zero, want one per sample", n)
	}
}

// TestWaterLabels: the new kinds and their settings and columns read as
// words on the page.
func TestWaterLabels(t *testing.T) {
	if KindLabel(notebook.KindCarbonate) != "Carbonate system" || KindLabel(notebook.KindMinerals) != "Mineral balance" {
		t.Error("kind labels")
	}
	for key, want := range map[string]string{"atmospheric_pco2_uatm": "pCO2 of the air (µatm)", "fit_components": "components fitted"} {
		if got := notebook.SettingLabel(key); !strings.HasPrefix(got, want) {
			t.Errorf("%s: %q", key, got)
		}
	}
	for _, c := range []struct {
		kind             notebook.Kind
		table, col, want string
	}{
		{notebook.KindCarbonate, "carbonate", "SI_calcite", "SI of calcite"}, {notebook.KindMinerals, "period", "CO2_consumed_low", "CO2 consumed, 2.5 %"},
		{notebook.KindMinerals, "residuals", "SiO2", "SiO2 left"}, {notebook.KindCarbonate, "carbonate", "H2CO3", "H2CO3*"},
	} {
		if got := notebook.ColumnLabel(c.kind, c.table, c.col); got != c.want {
			t.Errorf("%s.%s: %q, want %q", c.table, c.col, got, c.want)
		}
	}
	if got, _ := options(notebook.KindCarbonate, "activity_model"); len(got) != 2 {
		t.Errorf("activity model choices %v", got)
	}
}
