package notebook

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/problem"
	"lixiv/engine/sample"
)

// TestAwkwardFilesThroughTheCell reads every awkward laboratory file of
// engine/sample as the page and the command line do (ReadTable, then the
// samples cell): the cell gives every message the importer gives for the
// file itself, with the file's name and lines, and the same samples.
func TestAwkwardFilesThroughTheCell(t *testing.T) {
	files, err := filepath.Glob("../sample/testdata/awkward/*.*")
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, f := range files {
		if strings.HasSuffix(f, ".md") {
			continue
		}
		n++
		name := filepath.Base(f)
		t.Run(name, func(t *testing.T) {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			want, err := sample.Read(bytes.NewReader(b), name, sample.Options{})
			if err != nil {
				t.Fatal(err)
			}
			tab, err := ReadTable(name, string(b))
			if err != nil {
				t.Fatal(err)
			}
			out, _ := computeSamplesOf(t, tab, "auto")
			if out == nil {
				t.Fatal("no output")
			}
			got := map[string]bool{}
			for _, m := range out.Messages {
				got[m.Error()] = true
				if m.File != name {
					t.Errorf("message names %q, want the file %q: %v", m.File, name, m)
				}
			}
			for _, p := range append(want.Problems, want.Notes...) {
				if errors.Is(p, sample.ErrNoColumn) && strings.Contains(p.Detail, "sampling date") {
					continue
				}
				if !got[p.Error()] {
					t.Errorf("the cell lacks the importer's %s", p)
				}
			}
			if v, ok := out.Value.(*Samples); ok {
				if g, w := normalised(t, v.Table), normalised(t, want); g != w && out.Messages.Count(ErrTakenAs) == 0 {
					t.Errorf("samples differ:\n%s\nwant\n%s", g, w)
				}
			}
		})
	}
	if n < 30 {
		t.Errorf("%d awkward files, want at least 30", n)
	}
}

// TestMissingIonsLeaveSamplesOut builds a budget from a file where one
// sample lacks Cl ("n.d."), one lacks Ca, one has a charge balance beyond
// the flag limit, one beyond the reject limit, and the alkalinity is given
// as HCO3: each is named where it is left out or flagged, the rest of the
// budget computes, and the command-line report lists them.
func TestMissingIonsLeaveSamplesOut(t *testing.T) {
	// Na 100, K 10, Ca 200, Mg 50, Cl 50, SO4 40, NO3 10 µmol/L and 450
	// µeq/L of alkalinity give TZ+ 610, TZ− 590 µeq/L and NICB +3.2787 %
	// (docs/methods.md §13 item 4: NICB = (TZ+ − TZ−)/TZ+); 520 µeq/L gives
	// −8.20 % (flagged at 5 %) and 900 gives −70.49 % (left out at 10 %).
	text := "Sample,Date,Na (umol/L),K (umol/L),Ca (umol/L),Mg (umol/L),Cl (umol/L),SO4 (umol/L),NO3 (umol/L),HCO3 (umol/L)\n" +
		"S1,2024-03-05,100,10,200,50,50,40,10,450\n" +
		"S2,2024-03-12,100,10,200,50,n.d.,40,10,450\n" +
		"S3,2024-03-19,100,10,,50,50,40,10,450\n" +
		"S4,2024-03-26,100,10,200,50,50,40,10,520\n" +
		"S5,2024-04-02,100,10,200,50,50,40,10,900\n" +
		"S6,2024-04-09,110,11,210,52,52,41,10,470\n"
	tab, err := ReadTable("lab.csv", text)
	if err != nil {
		t.Fatal(err)
	}
	d := New("missing ions")
	for _, c := range []struct {
		k  Kind
		id string
	}{{KindSamples, "samples"}, {KindAtmosphere, "rain"}, {KindSources, "sources"}, {KindApportionment, "apportionment"}, {KindCO2, "co2"}} {
		cell := NewCell(c.k, c.id, "")
		if err := d.Insert(cell, -1); err != nil {
			t.Fatal(err)
		}
	}
	d.Cell("samples").Table = tab
	if d.Cell("sources").Table, err = SourcesTable("global"); err != nil {
		t.Fatal(err)
	}
	d.Cell("apportionment").Settings.(*ApportionmentSettings).Draws = 200
	d.Recompute(context.Background(), nil)
	for _, id := range []string{"samples", "rain", "apportionment", "co2"} {
		if st, err := d.Status(id); st != UpToDate {
			t.Fatalf("cell %s: %s %v", id, st, err)
		}
	}
	type want struct {
		cell   string
		sev    problem.Severity
		eff    problem.Effect
		line   int
		column string
		value  string
		words  string
	}
	wants := []want{
		{"samples", problem.Note, problem.Inferred, 1, "HCO3 (umol/L)", "", "HCO3 taken as alkalinity in 6 samples (1 µmol/L of HCO3 is 1 µeq/L)"},
		{"samples", problem.Warning, problem.LeftOut, 3, "Cl (umol/L)", "n.d.", `1 cell read as missing, not as zero (line 3 "n.d.")`},
		{"samples", problem.Warning, problem.Flagged, 5, "NICB", "-8.20 %", `sample S4: charge balance (NICB) -8.20 %, beyond the flag limit of 5 % (setting "NICB flag (%)"): kept and flagged`},
		{"samples", problem.Warning, problem.LeftOut, 6, "NICB", "-70.49 %", `sample S5: charge balance (NICB) -70.49 %, beyond the reject limit of 10 % (setting "NICB reject (%)"): left out of the budget`},
		{"rain", problem.Warning, problem.LeftOut, 3, "Cl (umol/L)", "n.d.", "sample S2 has no Cl value: left out of the atmospheric correction"},
		{"apportionment", problem.Warning, problem.LeftOut, 4, "Ca (umol/L)", "", `sample S3 has no Ca value: left out of the apportionment and of the cells that read it (fluxes, CO2); its sulfate above the rain's share goes partly to gypsum, which brings as much Ca; give its Ca, or set "sulfate source" to sulfide`},
	}
	for _, w := range wants {
		found := false
		for _, m := range d.Output(w.cell).Messages {
			found = found || m.Severity == w.sev && m.Effect == w.eff && m.Line == w.line && m.Column == w.column &&
				m.Value == w.value && m.File == "lab.csv" && strings.Contains(m.Text, w.words)
		}
		if !found {
			t.Errorf("cell %s has no %s at line %d (%s) %q saying %q; it has\n%v", w.cell, w.sev, w.line, w.column, w.value, w.words, d.Output(w.cell).Messages)
		}
	}
	// S1, S4 and S6 are apportioned: S2 has no Cl, S3 no Ca, S5 is left out.
	a := d.Output("apportionment").Value.(*Apportioned)
	names := append([]string(nil), a.Names...)
	sort.Strings(names)
	if strings.Join(names, " ") != "S1 S4 S6" {
		t.Errorf("apportioned %v, want S1 S4 S6", names)
	}
	// HCO3 shows in the samples table's Alk column.
	if alk := d.Output("samples").Table("samples").Column("Alk").Num[0]; alk != 450 {
		t.Errorf("Alk of S1 %v, want 450 (HCO3 taken as alkalinity)", alk)
	}
	if !d.Output("samples").Value.(*Samples).Table.Samples[0].C.Has(chem.Alk) {
		t.Error("S1 has no alkalinity")
	}
	// The report lists them: the flagged sample under warnings and messages.
	r := d.Report()
	var flagged, leftCl bool
	for _, m := range r.Messages {
		flagged = flagged || m.Cell == "samples" && m.Sample == "S4" && m.Effect == "flagged" && m.Line == 5
		leftCl = leftCl || m.Cell == "rain" && m.Sample == "S2" && m.Effect == "left out" && m.Value == "n.d."
	}
	if !flagged || !leftCl {
		t.Errorf("report messages lack S4 flagged (%v) or S2 left out of the rain cell (%v): %+v", flagged, leftCl, r.Messages)
	}
	if ws := strings.Join(r.Warnings["samples"], "\n"); !strings.Contains(ws, "lab.csv:5 (NICB): \"-8.20 %\": sample S4") {
		t.Errorf("report warnings lack S4:\n%s", ws)
	}
}

// TestDuplicateColumnsRefusedThenChosen: two Ca columns are refused,
// naming both, until use_columns picks one.
func TestDuplicateColumnsRefusedThenChosen(t *testing.T) {
	text := "Sample,Date,Na (mg/L),Cl (mg/L),Ca (mg/L),Ca2+ (umol/L)\nS1,2024-03-05,2.298977,3.545,40.078,990\n"
	tab, err := ReadTable("dup.csv", text)
	if err != nil {
		t.Fatal(err)
	}
	out, _ := computeSamplesOf(t, tab, "auto")
	var refused *Message
	for _, m := range out.Messages {
		if errors.Is(m, sample.ErrDuplicateColumn) {
			refused = m
		}
	}
	if refused == nil || refused.Severity != problem.Error || refused.Effect != problem.Refused || refused.Line != 1 || refused.Col != 5 ||
		!strings.Contains(refused.Text, `Ca is in column 5 "Ca (mg/L)" and column 6 "Ca2+ (umol/L)"; none is read`) {
		t.Fatalf("refusal %+v", refused)
	}
	c := NewCell(KindSamples, "samples", "")
	c.Table = tab
	c.Settings.(*SamplesSettings).UseColumns = []string{"Ca2+ (umol/L)"}
	out, err = computeSamples(&Env{Cell: c})
	if err != nil {
		t.Fatal(err)
	}
	if ca := out.Value.(*Samples).Table.Samples[0].C[chem.Ca]; ca != 990 {
		t.Errorf("Ca %v, want 990 from the chosen column", ca)
	}
	if out.Messages.Count(sample.ErrDuplicateColumn) != 0 || out.Messages.Count(sample.ErrChosenColumn) != 1 {
		t.Errorf("messages after choosing: %v", out.Messages)
	}
}
