package notebook

import (
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mineral"
)

func greyhope(t *testing.T) *Document {
	t.Helper()
	d, err := loadFile("../../examples/greyhope-beck/greyhope-beck.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestMineralsCell: each sample's amounts and residuals are the mineral
// package's balance of its water less the rain input; the tables the
// page, the report and the charts read are there.
func TestMineralsCell(t *testing.T) {
	d := greyhope(t)
	if st, err := d.Status("minerals"); st != UpToDate {
		t.Fatalf("minerals: %v %v", st, err)
	}
	o := d.Output("minerals")
	v := o.Value.(*MineralBalance)
	atm := d.Output("rain").Value.(*Atmosphere)
	ps, _, err := mineralPhases(d.Cell("minerals").Settings.(*MineralSettings))
	if err != nil {
		t.Fatal(err)
	}
	b, err := mineral.NewBalance(ps)
	if err != nil {
		t.Fatal(err)
	}
	b.Relative, b.Floor = 0.05, MineralFloor
	amounts := o.Table("amounts")
	for k, i := range atm.Use {
		sm := atm.Samples.Table.Samples[i]
		r, err := correct.Apply(sm.C, &atm.Options)
		if err != nil {
			t.Fatal(err)
		}
		// The water: measured less rain (no human input in this budget),
		// alkalinity as HCO3.
		w := v.Water[k]
		for _, c := range []struct {
			c  mineral.Component
			sp chem.Species
		}{{mineral.Na, chem.Na}, {mineral.Ca, chem.Ca}, {mineral.SO4, chem.SO4}, {mineral.HCO3, chem.Alk}, {mineral.SiO2, chem.SiO2}} {
			if want := r.Input[c.sp] - r.Atm[c.sp]; c.sp == chem.Alk || c.sp == chem.SiO2 {
				if w[c.c] != r.Input[c.sp] {
					t.Fatalf("%s: %v %g, want %g", sm.ID, c.c, w[c.c], r.Input[c.sp])
				}
			} else if w[c.c] != want {
				t.Fatalf("%s: %v* %g, want %g", sm.ID, c.c, w[c.c], want)
			}
		}
		s := b.Solve(w)
		for j, p := range b.Phases {
			if got := amounts.Column(p.Key).Num[k]; got != s.Amount[j] && !(math.IsNaN(got) && math.IsNaN(s.Amount[j])) {
				t.Errorf("%s %s: %g µmol/L, the balance gives %g", sm.ID, p.Key, got, s.Amount[j])
			}
		}
		if got := o.Table("residuals").Column("SiO2").Num[k]; got != s.Residual[mineral.SiO2] {
			t.Errorf("%s: SiO2 residual %g, want %g", sm.ID, got, s.Residual[mineral.SiO2])
		}
	}
	for _, name := range []string{"minerals", "amounts", "residuals", "period", "catalogue"} {
		if o.Table(name) == nil {
			t.Errorf("no %s table", name)
		}
	}
	if f := o.Figure("CO2 consumed by the minerals balanced, per km²"); f == nil || !(f.Low < f.Median && f.Median < f.High) {
		t.Errorf("CO2 figure %+v, want a median inside an interval", f)
	}
	// The CO2 the minerals consumed is the CO2 cell's silicate and
	// carbonate consumption to within their intervals (the same water,
	// two routes: minerals and end-members).
	co := d.Output("co2")
	sum := co.Figure("silicate CO2 consumption per km²").Median + co.Figure("carbonate CO2 consumption per km²").Median
	if f := o.Figure("CO2 consumed by the minerals balanced, per km²"); !(f.Low < sum && sum < f.High) {
		t.Errorf("minerals' CO2 %g [%g, %g], the co2 cell's %g", f.Median, f.Low, f.High, sum)
	}
	// The reactions shown balance (the mineral package tests each), and
	// the typed magnesian calcite has its formula.
	mt := o.Table("minerals")
	if got := mt.Column("formula").Text[3]; got != "Ca0.85Mg0.15CO3" {
		t.Errorf("typed formula %q", got)
	}
}

// TestMineralsCellSaysWhy: settings the balance cannot take are a problem
// of the cell that names the setting, the entry and the position, and the
// setting keeps what was typed.
func TestMineralsCellSaysWhy(t *testing.T) {
	d := greyhope(t)
	for _, c := range []struct{ key, value, msg string }{
		{"primary_minerals", "albite, quartzz", `primary_minerals: "quartzz" is not a mineral of the table`},
		{"primary_minerals", "albite, x = Na(Al", "position 3"},
		{"secondary_minerals", "calcite", "the Al of plagioclase An30, K-feldspar, biotite has nowhere to go"},
		{"primary_minerals", "albite, albite", "albite is named twice"},
	} {
		e := d.Clone()
		if err := e.SetParam("minerals", c.key, c.value); err != nil {
			t.Fatalf("%s = %q refused: %v", c.key, c.value, err)
		}
		e.Recompute(context.Background(), nil)
		st, err := e.Status("minerals")
		if st != Problem || err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s = %q: %v %v; want a problem saying %q", c.key, c.value, st, err, c.msg)
		}
		if got := strings.Join(e.Cell("minerals").Settings.(*MineralSettings).Primary, ", "); c.key == "primary_minerals" && got != c.value {
			t.Errorf("setting now %q, typed %q", got, c.value)
		}
	}
	long := strings.TrimSuffix(strings.Repeat("albite, ", 17), ", ")
	if err := d.SetParam("minerals", "primary_minerals", long); err == nil {
		t.Error("17 minerals were accepted")
	}
}

// TestReportHasWaterSections: the JSON report carries the carbonate and
// mineral sections of a budget that has those cells, and none of one
// that has not.
func TestReportHasWaterSections(t *testing.T) {
	d := greyhope(t)
	var r map[string]any
	if err := json.Unmarshal(d.Report().JSON(), &r); err != nil {
		t.Fatal(err)
	}
	cs, ok := r["carbonate_system"].(map[string]any)
	if !ok || len(cs["samples"].([]any)) != 49 || len(cs["left_out"].([]any)) != 2 || cs["activity_model"] != "davies" {
		t.Errorf("carbonate_system: %v", cs != nil)
	}
	mb, ok := r["mineral_balance"].(map[string]any)
	if !ok || len(mb["minerals"].([]any)) != 5 || len(mb["samples"].([]any)) != 51 {
		t.Fatalf("mineral_balance: %v", mb != nil)
	}
	first := mb["minerals"].([]any)[0].(map[string]any)
	if first["mineral"] != "plagioclase An30" || first["mol_per_km2_per_yr"] == nil || !strings.Contains(first["reaction"].(string), "→") {
		t.Errorf("first mineral %v", first)
	}
	e, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	e.Recompute(context.Background(), nil)
	if s := string(e.Report().JSON()); strings.Contains(s, "carbonate_system") || strings.Contains(s, "mineral_balance") {
		t.Error("a budget without the cells reports them")
	}
}

// TestLeansHigh: a primary mineral held at zero in more than a tenth of
// the samples is named as leaning high; one held at zero less often is not.
func TestLeansHigh(t *testing.T) {
	ps, _, err := mineralPhases(defaultMineralSettings())
	if err != nil {
		t.Fatal(err)
	}
	b, err := mineral.NewBalance(ps)
	if err != nil {
		t.Fatal(err)
	}
	v := &MineralBalance{Balance: b}
	for i := 0; i < 20; i++ {
		s := mineral.Solution{Fit: mineral.LeastSquares}
		if i < 3 { // biotite (phase 2) in 3 of 20
			s.HeldAtZero = []int{2}
		}
		if i == 5 { // K-feldspar (phase 1) in 1 of 20
			s.HeldAtZero = append(s.HeldAtZero, 1)
		}
		v.Solution = append(v.Solution, s)
	}
	w := v.leansHigh()
	if len(w) != 1 || !strings.HasPrefix(w[0], "biotite is held at zero in 3 of 20 samples") {
		t.Errorf("warnings %q", w)
	}
}
