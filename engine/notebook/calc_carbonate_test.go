package notebook

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"lixiv/engine/carbonate"
	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// carbonateDoc is a samples cell and a carbonate cell over rows of
// sample, date, pH, temperature, Na, K, Ca, Mg, Cl, SO4, Alk (µmol/L, Alk
// µeq/L).
func carbonateDoc(t *testing.T, rows [][]string) *Document {
	t.Helper()
	d := New("carbonate")
	s := NewCell(KindSamples, "lab", "")
	s.Table = &Table{Columns: []string{"sample", "date", "pH", "temperature", "Na", "K", "Ca", "Mg", "Cl", "SO4", "Alk"},
		Units: []string{"", "", "", "°C", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µeq/L"}, Rows: rows}
	if err := d.Insert(s, -1); err != nil {
		t.Fatal(err)
	}
	if err := d.Insert(NewCell(KindCarbonate, "carb", ""), -1); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestCarbonateCell: the cell's numbers are the carbonate package's for
// each sample's measured values (µmol/L turned into mol/L); samples without
// pH, temperature or alkalinity are named and left out of this cell only;
// supersaturation and high pCO2 are flagged.
func TestCarbonateCell(t *testing.T) {
	d := carbonateDoc(t, [][]string{
		// The water of docs/methods.md §13 item 13 (Ca 1 mmol/L, Alk 2 meq/L,
		// pH 8.00, 25 °C) with its charge balanced by Na and Cl.
		{"A", "2021-05-01", "8.00", "25", "100", "10", "1000", "50", "200", "10", "2000"},
		{"noPH", "2021-05-02", "", "12", "100", "10", "200", "50", "50", "40", "450"},
		{"noT", "2021-05-03", "7.5", "", "100", "10", "200", "50", "50", "40", "450"},
		{"acid", "2021-05-04", "5.1", "8", "100", "10", "200", "50", "510", "40", "0"},
		{"soured", "2021-05-05", "6.2", "8", "100", "10", "300", "50", "50", "40", "750"},
	})
	o := d.Output("carb")
	if st, err := d.Status("carb"); st != UpToDate {
		t.Fatalf("carbonate cell: %v %v", st, err)
	}
	tab := o.Table("carbonate")
	if got := tab.Column("sample").Text; strings.Join(got, ",") != "A,soured" {
		t.Fatalf("samples %v, want A and soured", got)
	}
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.Cl], c[chem.SO4] = 100, 10, 1000, 50, 200, 10
	bg, _ := carbonate.Background(c)
	want, err := carbonate.Analyse(carbonate.Water{TempC: 25, PH: 8, Alk: 2e-3, Ca: 1e-3, Mg: 50e-6, Background: bg}, carbonate.Davies)
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range []struct {
		col       string
		got, want float64
	}{
		{"HCO3", tab.Column("HCO3").Num[0], want.HCO3 * 1e6}, {"CO3", tab.Column("CO3").Num[0], want.CO3 * 1e6},
		{"DIC", tab.Column("DIC").Num[0], want.DIC * 1e6}, {"pCO2", tab.Column("pCO2").Num[0], want.PCO2 * 1e6},
		{"SI_calcite", tab.Column("SI_calcite").Num[0], want.SICalcite}, {"SI_dolomite", tab.Column("SI_dolomite").Num[0], want.SIDolomite},
		{"ionic_strength", tab.Column("ionic_strength").Num[0], want.I}, {"pCO2_excess", tab.Column("pCO2_excess").Num[0], want.PCO2 * 1e6 / 420},
	} {
		if v.got != v.want {
			t.Errorf("%s = %g, carbonate.Analyse gives %g", v.col, v.got, v.want)
		}
	}
	// §13 item 13 with Davies at I ≈ 0.003: SI +0.32, pCO2 about 1230 µatm;
	// this water's ionic strength is a little higher.
	if si := tab.Column("SI_calcite").Num[0]; !(si > 0.25 && si < 0.35) {
		t.Errorf("SI calcite of the §13 water %g, want about 0.3", si)
	}
	flags := tab.Column("flag").Text
	if !strings.Contains(flags[0], "SI calcite above 0.5") == (tab.Column("SI_calcite").Num[0] > 0.5) {
		t.Errorf("flag %q for SI %g", flags[0], tab.Column("SI_calcite").Num[0])
	}
	if !strings.Contains(flags[1], "pCO2 above 10 × the air's") {
		t.Errorf("the soured sample (pH 6.2) is not flagged for pCO2: %q, %g µatm", flags[1], tab.Column("pCO2").Num[1])
	}
	// Each sample left out is a message placed at its line and the column
	// of what it lacks.
	cols := map[string]string{"noPH": "pH", "noT": "temperature", "acid": "Alk"}
	for _, m := range o.Messages {
		col, ok := cols[m.Sample]
		if !ok || m.Column != col || m.Line == 0 || !errors.Is(m, ErrNotSpeciated) || !strings.Contains(m.Text, "left out of this carbonate cell only") {
			t.Errorf("message %v (sample %q, column %q)", m, m.Sample, m.Column)
		}
		delete(cols, m.Sample)
	}
	if len(cols) > 0 {
		t.Errorf("no message for %v", cols)
	}
	if m := o.Messages[0]; m.Text != "sample noPH has no pH: left out of this carbonate cell only; it stays in the rest of the budget" || m.Line != 4 || m.Col != 3 {
		t.Errorf("first message %q at line %d column %d", m.Text, m.Line, m.Col)
	}
	if f := o.Figure("samples left out of this cell"); f == nil || f.Median != 3 {
		t.Errorf("samples left out: %v", f)
	}
	// The samples cell still hands every sample on.
	if n := len(d.Output("lab").Value.(*Samples).Used()); n != 5 {
		t.Errorf("the samples cell uses %d samples, want all 5", n)
	}
}

// TestCarbonateModelValidity: a brackish water beyond the extended
// Debye–Hückel range is computed and named; the Davies model holds it.
func TestCarbonateModelValidity(t *testing.T) {
	rows := [][]string{{"brackish", "2021-05-01", "7.9", "15", "100000", "2000", "3000", "10000", "120000", "5000", "2500"}}
	d := carbonateDoc(t, rows)
	if w := strings.Join(d.Output("carb").Warnings, "\n"); strings.Contains(w, "ionic strength above") {
		t.Errorf("Davies warns at I ≈ 0.15: %s", w)
	}
	if err := d.SetParam("carb", "activity_model", "extended-debye-huckel"); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	o := d.Output("carb")
	if w := strings.Join(o.Warnings, "\n"); !strings.Contains(w, "ionic strength above the 0.1 mol/L to which the extended-debye-huckel model holds") {
		t.Errorf("no validity warning: %s", w)
	}
	if !strings.Contains(o.Table("carbonate").Title, "valid to I ≈ 0.1 mol/L") {
		t.Errorf("title does not show the validity: %s", o.Table("carbonate").Title)
	}
	if err := d.SetParam("carb", "activity_model", "pitzer"); err == nil {
		t.Error("an unknown activity model was accepted")
	}
}

// TestCarbonateCellWithoutPH: a budget whose samples have no pH computes
// the cell to empty tables and a warning, not a problem.
func TestCarbonateCellWithoutPH(t *testing.T) {
	d := carbonateDoc(t, [][]string{{"A", "2021-05-01", "", "", "100", "10", "200", "50", "50", "40", "450"}})
	if st, err := d.Status("carb"); st != UpToDate {
		t.Fatalf("state %v %v", st, err)
	}
	if w := strings.Join(d.Output("carb").Warnings, "\n"); !strings.Contains(w, "nothing to compute") {
		t.Errorf("warnings %s", w)
	}
}

// TestSupersaturationCaution: the fluxes cell's caution follows the share
// of Σ Q × Ca carried by samples above the SI flag, with each sample's
// discharge at sampling or, without one, its day's mean.
func TestSupersaturationCaution(t *testing.T) {
	day := discharge.Date(2021, 1, 1)
	rec := discharge.NewRecord("q", day, []float64{1, 2, 10, 4})
	res := func(si float64) carbonate.Result { return carbonate.Result{SICalcite: si} }
	for _, c := range []struct {
		name string
		si   []float64
		q    []float64 // at sampling; NaN: the day's mean
		want bool
	}{
		{"supersaturated at high flow", []float64{0.1, 0.2, 0.9, 0.1}, []float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}, true},     // 10 of 17
		{"supersaturated at low flow", []float64{0.9, 0.9, 0.1, 0.1}, []float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}, false},     // 3 of 17
		{"discharge at sampling counts", []float64{0.9, 0.9, 0.1, 0.1}, []float64{30, math.NaN(), math.NaN(), math.NaN()}, true},            // 32 of 46
		{"a sample the fluxes do not use", []float64{0.1, 0.2, 0.9, 0.1}, []float64{math.NaN(), math.NaN(), math.NaN(), math.NaN()}, false}, // third left out
	} {
		a := &Apportioned{}
		cs := &CarbonateSystem{Settings: *defaultCarbonateSettings()}
		for i := range c.si {
			name := string(rune('A' + i))
			cs.Names, cs.Q, cs.Ca = append(cs.Names, name), append(cs.Q, c.q[i]), append(cs.Ca, 100)
			cs.Results = append(cs.Results, res(c.si[i]))
			if c.name == "a sample the fluxes do not use" && i == 2 {
				continue
			}
			a.Names, a.Days, a.Q = append(a.Names, name), append(a.Days, day+discharge.Day(i)), append(a.Q, c.q[i])
		}
		got := supersaturationCaution(&Fluxes{Record: rec, App: a}, &Output{Value: cs})
		if (got != "") != c.want {
			t.Errorf("%s: caution %q, want %v", c.name, got, c.want)
		}
	}
}
