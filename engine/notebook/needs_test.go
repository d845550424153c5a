package notebook

import (
	"context"
	"errors"
	"reflect"
	"strings"
	"testing"

	"lixiv/engine/sample"
)

func TestNewBudgetWaitsForWhatItNeeds(t *testing.T) {
	d := NewBudget("new")
	var kinds []Kind
	for _, c := range d.Cells {
		kinds = append(kinds, c.Kind)
	}
	if want := []Kind{KindSite, KindSamples, KindDischarge, KindAtmosphere, KindSources, KindApportionment, KindFluxes, KindCO2}; !reflect.DeepEqual(kinds, want) {
		t.Fatalf("cells: got %v, want %v", kinds, want)
	}
	if PresetOf(d.Cell("sources").Table) != "global" {
		t.Errorf("end-members: want the global preset's table")
	}
	// What each cell waits for, known before anything is computed.
	needs := func(id string) []string {
		var out []string
		for _, n := range d.Needs(id) {
			out = append(out, n.Cell+"/"+n.Key)
		}
		return out
	}
	tests := []struct {
		cell string
		want []string
	}{
		{"site", []string{"site/area_km2"}},
		{"samples", []string{"samples/"}},
		{"discharge", []string{"discharge/"}}, // the site is an optional input
		{"rain", []string{"samples/"}},
		{"sources", nil},
		{"apportionment", []string{"samples/"}},
		{"fluxes", []string{"site/area_km2", "samples/", "discharge/"}},
		{"co2", []string{"samples/"}}, // the fluxes are an optional input
	}
	for _, tt := range tests {
		if got := needs(tt.cell); !reflect.DeepEqual(got, tt.want) {
			t.Errorf("needs of %s: got %v, want %v", tt.cell, got, tt.want)
		}
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, tt := range tests {
		st, err := d.Status(tt.cell)
		want := Waiting
		if tt.want == nil {
			want = UpToDate
		}
		if st != want {
			t.Errorf("%s: got state %v (%v), want %v", tt.cell, st, err, want)
		}
	}
	_, err := d.Status("site")
	var ne *NeedError
	if !errors.As(err, &ne) || ne.Key != "area_km2" || !strings.Contains(err.Error(), "catchment area") {
		t.Errorf("site: got %v, want it to need the catchment area", err)
	}
	if _, err := d.Status("co2"); err == nil || !strings.Contains(err.Error(), "waits for what it needs") {
		t.Errorf("co2: got %v, want it waiting on a cell that waits", err)
	}
	// With the samples and the discharge record but no area, the cells
	// that can compute do, without the inputs that wait, and say so.
	full := sallowmere(t)
	if err := full.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, c := range full.Cells {
		st, err := full.Status(c.ID)
		if want := c.ID == "site" || c.ID == "fluxes"; (st == Waiting) != want {
			t.Errorf("%s without the area: got %v (%v)", c.ID, st, err)
		}
	}
	for id, want := range map[string]string{
		"discharge": `computed without cell "site", which waits for the catchment area (km²)`,
		"co2":       `computed without cell "fluxes", which waits for the catchment area (km²)`,
	} {
		if w := strings.Join(full.Output(id).Warnings, "\n"); !strings.Contains(w, want) {
			t.Errorf("%s warnings: got %q, want %q", id, w, want)
		}
	}
	if full.Output("discharge").Figure("runoff") != nil {
		t.Errorf("a runoff without the area")
	}
	// Given the area, nothing waits.
	if err := full.SetParam("site", "area_km2", "250"); err != nil {
		t.Fatal(err)
	}
	if n := full.Needs("co2"); len(n) != 0 {
		t.Errorf("needs with area, samples and discharge: got %v, want none", n)
	}
	if err := full.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, id := range []string{"discharge", "co2"} {
		if w := strings.Join(full.Output(id).Warnings, "\n"); strings.Contains(w, "computed without") {
			t.Errorf("%s with the area: %q", id, w)
		}
	}
}

func TestBlankMeansUnknown(t *testing.T) {
	d := NewBudget("blank")
	for _, key := range []string{"precipitation_mm", "evapotranspiration_mm"} {
		if err := d.SetParam("site", key, "800"); err != nil {
			t.Fatal(err)
		}
		if err := d.SetParam("site", key, " "); err != nil {
			t.Errorf("%s: a blank field was refused: %v", key, err)
		}
	}
	for _, p := range Params(d.Cell("site").Settings) {
		switch p.Key {
		case "precipitation_mm", "evapotranspiration_mm":
			if p.Value != "" || p.Blank != "unknown" {
				t.Errorf("%s: got value %q, blank %q; want an empty field that means unknown", p.Key, p.Value, p.Blank)
			}
		case "area_km2":
			if p.Value != "" || p.Blank != "needed" {
				t.Errorf("area of a new budget: got value %q, blank %q; want an empty field the budget needs", p.Value, p.Blank)
			}
		case "area_uncertainty_percent":
			if p.Blank != "" {
				t.Errorf("%s may not be blank", p.Key)
			}
		}
	}
	if err := d.SetParam("site", "area_uncertainty_percent", ""); err == nil {
		t.Errorf("a blank area uncertainty was accepted")
	}
}

func TestMessagesUseLabels(t *testing.T) {
	d := NewBudget("labels")
	tests := []struct {
		key, value, want string
	}{
		{"evapotranspiration_mm", "lots", `evapotranspiration, ET (mm/yr): "lots" is not a number`},
		{"area_km2", "-3", "area (km²): -3 is outside [0, 1e+08]"},
		{"water_year_start_month", "13", "reporting year starts: 13 is outside [1, 12]"},
	}
	for _, tt := range tests {
		err := d.SetParam("site", tt.key, tt.value)
		if err == nil || !strings.Contains(err.Error(), tt.want) || strings.Contains(err.Error(), tt.key) {
			t.Errorf("%s = %q: got %v, want %q without the key", tt.key, tt.value, err, tt.want)
		}
	}
	// ET at or above P is a problem of the site cell, in labels too.
	d.SetParam("site", "area_km2", "10")
	d.SetParam("site", "precipitation_mm", "500")
	d.SetParam("site", "evapotranspiration_mm", "600")
	d.Recompute(context.Background(), nil)
	if _, err := d.Status("site"); err == nil || !strings.Contains(err.Error(), "evapotranspiration, ET (mm/yr): 600 must be below the precipitation, P (mm/yr), 500") {
		t.Errorf("site: got %v", err)
	}
}

func TestSettingLabel(t *testing.T) {
	tests := []struct{ key, want string }{
		{"area_km2", "area (km²)"},
		{"na_per_cl", "Na/Cl (mol/mol)"},
		{"so4_per_cl", "SO4/Cl (mol/mol)"},
		{"discharge_uncertainty_percent", "discharge uncertainty (%)"},
		{"critical_chloride_umol", "critical chloride (µmol/L)"},
		{"nicb_flag_percent", "NICB flag (%)"},
		{"d34s_river_permil", "δ34S river (‰)"},
		{"draws", "prior draws (first stage)"},
	}
	for _, tt := range tests {
		if got := SettingLabel(tt.key); got != tt.want {
			t.Errorf("SettingLabel(%q): got %q, want %q", tt.key, got, tt.want)
		}
	}
	// The importer's messages name its settings as the page does.
	for _, k := range MessageLabels() {
		if l, ok := sample.SettingLabels[k]; ok && SettingLabel(k) != l {
			t.Errorf("setting %s: the page shows %q, the importer's messages say %q", k, SettingLabel(k), l)
		}
		if SettingLabel(k) == k {
			t.Errorf("setting %s has no label", k)
		}
	}
}

func TestTableKind(t *testing.T) {
	tests := []struct {
		cols []string
		want Kind
	}{
		{[]string{"Date", "Discharge (m3/s)", "Quality"}, KindDischarge},
		{[]string{"date", "Q"}, KindDischarge},
		{[]string{"Sample", "Date", "Na (mg/L)", "Q (L/s)"}, KindSamples},
		{[]string{"Sample", "Date", "HCO3"}, KindSamples},
		{[]string{"anything"}, KindSamples},
		{[]string{"Date", "discharge_m3s"}, KindDischarge},
		{[]string{"date", "Q", "Ca"}, KindSamples},
	}
	for _, tt := range tests {
		if got := TableKind(&Table{Columns: tt.cols}); got != tt.want {
			t.Errorf("%v: got %s, want %s", tt.cols, got, tt.want)
		}
	}
}

func TestPresetOf(t *testing.T) {
	for _, p := range Presets {
		tab, err := SourcesTable(p)
		if err != nil {
			t.Fatal(err)
		}
		if got := PresetOf(tab); got != p {
			t.Errorf("%s table: got preset %q", p, got)
		}
		tab.Rows[0][4] = "0.41"
		if got := PresetOf(tab); got != "" {
			t.Errorf("edited %s table: got preset %q, want none", p, got)
		}
	}
}
