package notebook

import (
	"context"
	"os"
	"strings"
	"testing"

	"lixiv/engine/sample"
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
		{"HCO3 (mg/L)", "HCO3, mg/L → µmol/L", "", true},
		{"Lab", "not used", "not recognised", false},
		{"Remarks", "not used", "", false},
	}
	for _, tt := range tests {
		c := byHeader[tt.header]
		if c.As != tt.as || c.Used != tt.used || !strings.Contains(c.Note, tt.note) {
			t.Errorf("%s: got %+v, want read as %q (used %v) with a note holding %q", tt.header, c, tt.as, tt.used, tt.note)
		}
	}
	// SM-07's potassium "O.95" (line 8 of the file) is a message placed at
	// its row and column; HCO3 is taken as alkalinity, and said so.
	var k *Message
	for _, m := range o.Messages {
		if m.Value == "O.95" {
			k = m
		}
	}
	if k == nil || k.Row != 6 || k.Col != 5 || k.Line != 8 || k.File != "sallowmere-samples.csv" {
		t.Errorf("the message about O.95: got %+v, want row 6, column 5 (K), line 8 of the file", k)
	}
	if n := o.Messages.Count(sample.ErrCensored); n != 1 {
		t.Errorf("values below detection: got %d messages, want 1", n)
	}
	if alk := o.Table("samples").Column("Alk"); alk == nil || countFinite(alk.Num) != 36 {
		t.Errorf("samples table: got Alk column %v, want 36 values from HCO3", alk)
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
	rec, est := o.Figure(RecordRunoffFigure), d.Output("fluxes").Figure(RunoffFigure)
	if rec == nil || est == nil || !strings.Contains(rec.Note, "from the record") || !strings.Contains(est.Note, "discharge and area errors") {
		t.Errorf("runoff notes: record %+v, flux estimate %+v", rec, est)
	}
}
