package notebook

import (
	"bytes"
	"context"
	"errors"
	"math"
	"os"
	"sort"
	"strings"
	"testing"

	"lixiv/engine/sample"
)

// computeSamplesOf computes a samples cell holding tab on its own.
func computeSamplesOf(t *testing.T, tab *Table, order string) (*Output, error) {
	t.Helper()
	c := NewCell(KindSamples, "samples", "")
	c.Table = tab
	c.Settings.(*SamplesSettings).DateOrder = order
	return computeSamples(&Env{Cell: c})
}

// normalised returns what sample.Table.WriteCSV writes for t.
func normalised(t *testing.T, tab *sample.Table) string {
	t.Helper()
	var b bytes.Buffer
	if err := tab.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// The messy lab file read into a samples cell gives the samples, lines and
// messages that engine/sample's golden test holds for the file itself.
func TestSamplesCellReadsLikeTheImporter(t *testing.T) {
	const path = "../../testdata/samples-messy.csv"
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	want, err := sample.Read(bytes.NewReader(b), "samples-messy.csv", sample.Options{})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := ReadTable("samples-messy.csv", string(b))
	if err != nil {
		t.Fatal(err)
	}
	out, err := computeSamplesOf(t, tab, "auto")
	if err != nil {
		t.Fatal(err)
	}
	got := out.Value.(*Samples).Table
	if g, w := normalised(t, got), normalised(t, want); g != w {
		t.Errorf("samples differ:\n%s\nwant\n%s", g, w)
	}
	for i, s := range got.Samples {
		if s.Line != want.Samples[i].Line {
			t.Errorf("sample %s on line %d, want %d", s.ID, s.Line, want.Samples[i].Line)
		}
	}
	// From engine/sample/testdata/samples-messy.golden.
	var wantMsgs, gotMsgs []string
	for _, p := range append(want.Problems, want.Notes...) {
		wantMsgs = append(wantMsgs, p.Error())
	}
	sort.Strings(wantMsgs)
	for _, m := range out.Messages {
		if errors.Is(m, ErrChargeBalance) || errors.Is(m, ErrMissingIon) {
			continue // the cell's own
		}
		gotMsgs = append(gotMsgs, m.Error())
	}
	sort.Strings(gotMsgs)
	if strings.Join(gotMsgs, "\n") != strings.Join(wantMsgs, "\n") {
		t.Errorf("messages\n%s\nwant the importer's\n%s", strings.Join(gotMsgs, "\n"), strings.Join(wantMsgs, "\n"))
	}
	if strings.Join(got.Preamble, "\n") != strings.Join(want.Preamble, "\n") {
		t.Errorf("preamble %q, want %q", got.Preamble, want.Preamble)
	}
}

// When no sample can enter the budget the cell says why, and keeps the
// samples table with its flag column and the import warnings.
func TestSamplesCellNoneUsed(t *testing.T) {
	tests := []struct {
		name, text, order string
		why               []string // parts of the error
		flag              string   // flag of the first sample
		warned            bool     // the import has warnings to keep
	}{
		{"ambiguous dates", "Sample,Date,Na (mg/L),Cl (mg/L),Alkalinity (meq/L)\nA1,01/02/2024,4.1,5,0.2\nA2,03/04/2024,4.2,5.5,0.2\n", "auto",
			[]string{"left out: no date (2 samples)", `ambig.csv:2:2 (Date): "01/02/2024": ambiguous date order`, `set "date order" to day-first or month-first`},
			"left out: no date", true},
		{"headers not recognised", "Sample,When,Sodum,Potasium,Chlor\nA1,2024-01-01,4.1,0.4,5\n", "auto",
			[]string{"left out: no date (1 sample)", "no column was recognised as a species concentration",
				"no column was recognised as the sampling date", `headers not recognised: "When", "Sodum", "Potasium", "Chlor"`},
			"left out: no date", true},
		{"no Na column", "Sample,Date,Sodum,Cl (mg/L)\nA1,2024-01-01,4.1,5\n", "auto",
			[]string{"left out: no Na (1 sample)", `no column was read as Na, which the budget needs; headers not recognised: "Sodum"`},
			"left out: no Na", false},
		{"Na without a unit", "Sample,Date,Na,Cl (mg/L)\nA1,2024-01-01,4.1,5\n", "auto",
			[]string{"left out: no Na (1 sample)", `ambig.csv:1:3 (Na): no unit given; no unit for Na`, `or set "default unit"`},
			"left out: no Na", true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tab, err := ReadTable("ambig.csv", tt.text)
			if err != nil {
				t.Fatal(err)
			}
			out, err := computeSamplesOf(t, tab, tt.order)
			if err == nil {
				t.Fatal("no error when every sample is left out")
			}
			for _, w := range tt.why {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not say %q", err, w)
				}
			}
			st := out.Table("samples")
			if st == nil || st.Column("flag") == nil || st.Column("flag").Text[0] != tt.flag {
				t.Fatalf("samples table %+v, want a flag column starting %q", st, tt.flag)
			}
			if tt.warned && out.Messages.Count(sample.ErrNotTable)+out.Messages.Count(sample.ErrNoColumn)+out.Messages.Count(sample.ErrAmbiguousDate)+out.Messages.Count(sample.ErrNoUnit) == 0 {
				t.Error("the import warnings were dropped")
			}
		})
	}
	// The date order chosen on the cell resolves the first case.
	tab, _ := ReadTable("ambig.csv", tests[0].text)
	if _, err := computeSamplesOf(t, tab, "day-first"); err != nil {
		t.Errorf("day-first: %v", err)
	}
}

// TestSamplesCellNoneUsedShown follows a samples cell where no sample
// enters the budget through the document: its output (the table with the
// flag column) is there for the page, its state is a problem, and the
// cells below it wait.
func TestSamplesCellNoneUsedShown(t *testing.T) {
	d := New("none used")
	sc, err := d.Add(KindSamples, -1)
	if err != nil {
		t.Fatal(err)
	}
	rc, err := d.Add(KindAtmosphere, -1)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := ReadTable("ambig.csv", "Sample,Date,Na (mg/L),Cl (mg/L),Alkalinity (meq/L)\nA1,01/02/2024,4.1,5,0.2\n")
	if err != nil {
		t.Fatal(err)
	}
	if err = d.SetTable(sc.ID, tab); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	if st, err := d.Status(sc.ID); st != Problem || err == nil {
		t.Fatalf("samples cell: %v, %v; want a problem", st, err)
	}
	out := d.Output(sc.ID)
	if out == nil || out.Table("samples").Column("flag") == nil {
		t.Fatalf("the samples cell's output is not shown with its problem: %+v", out)
	}
	if st, _ := d.Status(rc.ID); st != Waiting {
		t.Errorf("the cell below is %v, want waiting", st)
	}
}

// TestSamplesCellIncomplete: a sample without alkalinity has no charge
// balance; it is kept in the budget and flagged as missing a major ion.
func TestSamplesCellIncomplete(t *testing.T) {
	tab, err := ReadTable("incomplete.csv", "Sample,Date,Na (mg/L),K (mg/L),Ca (mg/L),Mg (mg/L),Cl (mg/L),SO4 (mg/L)\nA1,2024-01-01,4.1,0.4,6,1.2,5,3\n")
	if err != nil {
		t.Fatal(err)
	}
	out, err := computeSamplesOf(t, tab, "auto")
	if err != nil {
		t.Fatal(err)
	}
	st := out.Table("samples")
	if f := st.Column("flag").Text[0]; !strings.Contains(f, "missing major ion(s)") || !strings.Contains(f, "alkalinity") {
		t.Errorf("flag %q, want missing major ion(s) naming alkalinity", f)
	}
	if v := st.Column("NICB").Num[0]; !math.IsNaN(v) {
		t.Errorf("NICB %v without alkalinity, want none", v)
	}
	if out.Figure("samples flagged").Median != 1 || out.Figure("samples left out").Median != 0 {
		t.Errorf("flagged %v, left out %v; want 1 and 0", out.Figure("samples flagged").Median, out.Figure("samples left out").Median)
	}
}
