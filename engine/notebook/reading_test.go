package notebook

import (
	"context"
	"os"
	"strings"
	"testing"
)

// sallowmere returns a new budget holding the invented Sallowmere Water
// files of testdata/sallowmere, read as the page reads an opened file.
func sallowmere(t *testing.T) *Document {
	t.Helper()
	d := NewBudget("Sallowmere Water")
	for id, file := range map[string]string{"samples": "sallowmere-samples.csv", "discharge": "sallowmere-discharge.csv"} {
		b, err := os.ReadFile("../../testdata/sallowmere/" + file)
		if err != nil {
			t.Fatal(err)
		}
		tab, err := ReadTable(file, string(b))
		if err != nil {
			t.Fatal(err)
		}
		if err := d.SetTable(id, tab); err != nil {
			t.Fatal(err)
		}
	}
	return d
}

func TestSamplesReading(t *testing.T) {
	d := sallowmere(t)
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("samples")
	r := o.Reading
	if r == nil || r.File != "sallowmere-samples.csv" || r.Rows != 36 || len(r.Columns) != 13 {
		t.Fatalf("reading: got %+v, want the file, 36 rows and 13 columns", r)
	}
	byHeader := map[string]ColumnReading{}
	for _, c := range r.Columns {
		byHeader[c.Header] = c
	}
	tests := []struct {
		header, as, note string
		used             bool
	}{
		{"Na (mg/L)", "Na, mg/L → µmol/L", "", true},
		{"HCO3 (mg/L)", "HCO3, mg/L → µmol/L", "taken as alkalinity in the charge balance", true},
		{"Lab", "not used", "not recognised", false},
		{"Remarks", "not used", "", false},
	}
	for _, tt := range tests {
		c := byHeader[tt.header]
		if c.As != tt.as || c.Used != tt.used || !strings.Contains(c.Note, tt.note) {
			t.Errorf("%s: got %+v, want read as %q (used %v) with a note holding %q", tt.header, c, tt.as, tt.used, tt.note)
		}
	}
	notes := strings.Join(r.Notes, "\n")
	for _, want := range []string{"1 value below the detection limit set to half the limit", "1 place of the table with a message"} {
		if !strings.Contains(notes, want) {
			t.Errorf("notes: got %q, want %q", notes, want)
		}
	}
	// SM-07's potassium "O.95" (line 8 of the file) is marked in its place.
	if len(o.Marks) != 1 {
		t.Fatalf("marks: got %+v, want one", o.Marks)
	}
	m := o.Marks[0]
	if m.Row != 6 || m.Col != 4 || m.Line != 8 || !strings.Contains(m.Text, `"O.95": not a number`) {
		t.Errorf("mark: got %+v, want row 6, column 4 (K), line 8, the value named", m)
	}
	if w := o.Warnings[m.Warning]; !strings.Contains(w, "sallowmere-samples.csv:8:5") {
		t.Errorf("the mark's warning: got %q, want the file's line and column", w)
	}
	// The lab gave HCO3: the samples table shows it, not an empty Alk.
	hco3 := o.Table("samples").Column("HCO3")
	if hco3 == nil || countFinite(hco3.Num) != 36 {
		t.Errorf("samples table: got HCO3 column %v, want 36 values", hco3)
	}
}

func TestDischargeReading(t *testing.T) {
	d := sallowmere(t)
	if err := d.SetParam("site", "area_km2", "250"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("discharge")
	r := o.Reading
	if r == nil || r.File != "sallowmere-discharge.csv" || r.Rows != 1095 {
		t.Fatalf("reading: got %+v", r)
	}
	want := []ColumnReading{
		{Header: "Date", As: "date", Used: true},
		{Header: "Discharge (m3/s)", As: "discharge, m3/s → m³/s", Used: true},
		{Header: "Quality", As: "not used", Note: "not recognised; kept as text"},
	}
	for i, w := range want {
		if i >= len(r.Columns) || r.Columns[i] != w {
			t.Errorf("column %d: got %+v, want %+v", i, r.Columns, w)
		}
	}
	// The two runoffs say how each was formed.
	rec, est := o.Figure("runoff"), d.Output("fluxes").Figure("runoff")
	if rec == nil || est == nil || !strings.Contains(rec.Note, "from the record") || !strings.Contains(est.Note, "discharge and area errors") {
		t.Errorf("runoff notes: record %+v, flux estimate %+v", rec, est)
	}
}

func TestMarkPlaces(t *testing.T) {
	tab := &Table{Columns: []string{"date", "Q"}, Units: []string{"", "m3/s"},
		Rows: [][]string{{"2021-01-01", "1.5"}, {"2021-01-02", "-2"}, {"2021-01-03", "x"}}}
	tests := []struct {
		line, col, row, wantCol int
		ok                      bool
	}{
		{1, 2, HeaderRow, 1, true},
		{2, 2, UnitsRow, 1, true},
		{3, 0, 0, -1, true},
		{4, 2, 1, 1, true},
		{5, 2, 2, 1, true},
		{6, 1, 0, 0, false},
		{4, 9, 1, -1, true},
	}
	for _, tt := range tests {
		m, ok := tab.mark(0, tt.line, tt.col, "x")
		if ok != tt.ok || ok && (m.Row != tt.row || m.Col != tt.wantCol || m.Line != 0) {
			t.Errorf("line %d, column %d: got %+v %v, want row %d, column %d", tt.line, tt.col, m, ok, tt.row, tt.wantCol)
		}
	}
}
