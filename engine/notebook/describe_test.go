package notebook_test

import (
	"context"
	"os"
	"slices"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/notebook/notebooktest"
)

func TestFakeKindAndEstimatorThroughDescriptors(t *testing.T) {
	remove := notebooktest.DescribeFakes()
	d := notebook.NewBudget("test")
	c, err := d.Add("glaze", -1)
	if err != nil {
		t.Fatalf("the described kind cannot be added: %v", err)
	}
	// Validation reads the choices.
	if err := d.SetParam(c.ID, "finish", "gloss"); err != nil {
		t.Errorf("finish gloss refused: %v", err)
	}
	if err := d.SetParam(c.ID, "finish", "satin"); err == nil || !strings.Contains(err.Error(), `"satin" is not one of ["matt" "gloss"]`) {
		t.Errorf("finish satin: %v, want refused", err)
	}
	if err := d.SetParam(c.ID, "depth_mm", "20"); err == nil {
		t.Error("depth 20 mm accepted")
	}
	if err := d.SetParam("fluxes", "estimator", "window-mean"); err != nil {
		t.Errorf("the added estimator is refused: %v", err)
	}
	// The cell computes by the descriptor's function.
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if o := d.Output(c.ID); o == nil || o.Table("coats") == nil {
		t.Errorf("the glaze cell did not compute: %v", o)
	}
	// The schema check misses both until they are documented.
	b, err := os.ReadFile("SCHEMA.md")
	if err != nil {
		t.Fatal(err)
	}
	gaps := notebook.SchemaGaps(string(b))
	want := []string{"fluxes setting estimator choice window-mean", "no section for kind glaze"}
	if !slices.Equal(gaps, want) {
		t.Errorf("schema gaps %q, want %q", gaps, want)
	}
	doc := notebooktest.Document(string(b))
	if gaps := notebook.SchemaGaps(doc); len(gaps) > 0 {
		t.Errorf("documented, the schema check still finds %q", gaps)
	}
	// Removed, they are gone.
	remove()
	if notebook.DescriptorOf("glaze") != nil || slices.Contains(notebook.Kinds, "glaze") || notebook.DescriptorOf(notebook.KindFluxes).Accepts("estimator", "window-mean") {
		t.Error("the test kind or estimator is still registered")
	}
	if gaps := notebook.SchemaGaps(string(b)); len(gaps) > 0 {
		t.Errorf("after removal: %q", gaps)
	}
}

func TestFigureRank(t *testing.T) {
	tests := []struct {
		k    notebook.Kind
		name string
		want int
	}{
		{notebook.KindCO2, "silicate CO2 consumption per km²", 0},
		{notebook.KindCO2, "carbonate CO2 consumption per km² with the sulfate from sulfide oxidation", 1},
		{notebook.KindFluxes, "silicate weathering rate (cations + SiO2)", 2},
		{notebook.KindFluxes, "runoff over the complete years of the budget period", 3},
		{notebook.KindCO2, "silicate CO2 consumption as carbon", 5},
		{notebook.KindCO2, "silicate CO2 consumption", 6},
		{notebook.KindSite, "catchment area", notebook.Unranked},
		{"no such kind", "x", notebook.Unranked},
	}
	for _, tt := range tests {
		if got := notebook.FigureRank(tt.k, tt.name); got != tt.want {
			t.Errorf("%s %q: rank %d, want %d", tt.k, tt.name, got, tt.want)
		}
	}
}

func TestIdleAndReadsTable(t *testing.T) {
	app := func(model, sulfate string) notebook.Settings {
		s := notebook.DefaultSettings(notebook.KindApportionment).(*notebook.ApportionmentSettings)
		s.Model, s.Sulfate = model, sulfate
		return s
	}
	tests := []struct {
		s    notebook.Settings
		key  string
		want bool
	}{
		{app("inverse", "gypsum"), "d34s_river_permil", true},
		{app("inverse", "isotope"), "d34s_river_permil", false},
		{app("inverse", "gypsum"), "draws", false},
		{app("forward", "gypsum"), "tracers", true},
		{app("inverse", "gypsum"), "tracers", false},
		{app("catchment", "gypsum"), "tracers", false},
		{app("catchment", "gypsum"), "target_ess", true},
		{app("inverse", "gypsum"), "target_ess", false},
		{app("forward", "gypsum"), "max_draws", true},
		{notebook.DefaultSettings(notebook.KindAtmosphere), "method", false},
	}
	for _, tt := range tests {
		if got := notebook.Idle(tt.s, tt.key); got != tt.want {
			t.Errorf("Idle(%+v, %s) = %v, want %v", tt.s, tt.key, got, tt.want)
		}
	}
	atm := notebook.DefaultSettings(notebook.KindAtmosphere).(*notebook.AtmosphereSettings)
	if notebook.ReadsTable(atm) {
		t.Error("the sea-salt method reads the rain table")
	}
	atm.Method = "rain"
	if !notebook.ReadsTable(atm) || !notebook.ReadsTable(notebook.DefaultSettings(notebook.KindSamples)) || notebook.ReadsTable(notebook.DefaultSettings(notebook.KindSite)) {
		t.Error("ReadsTable")
	}
}
