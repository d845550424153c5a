package main

import (
	"bytes"
	"context"
	"os"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/sample"
)

// The project's messy lab file gives a quick budget the samples that
// engine/sample reads from the file itself (its golden test), and the
// messages name the file, its lines and the column.
func TestQuickMessyFile(t *testing.T) {
	const path = "../../../testdata/samples-messy.csv"
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := sample.Read(bytes.NewReader(b), "samples-messy.csv", sample.Options{})
	d, err := quickBudget(path, "", "", 0)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("samples")
	if o == nil {
		st, err := d.Status("samples")
		t.Fatalf("samples cell %s: %v", st, err)
	}
	var got, exp bytes.Buffer
	o.Value.(*notebook.Samples).Table.WriteCSV(&got)
	want.WriteCSV(&exp)
	if got.String() != exp.String() {
		t.Errorf("samples differ:\n%s\nwant\n%s", got.String(), exp.String())
	}
	got2 := map[string]bool{}
	for _, m := range o.Messages {
		got2[m.Error()] = true
	}
	for _, p := range append(want.Problems, want.Notes...) {
		if !got2[p.Error()] {
			t.Errorf("messages lack the importer's %s", p)
		}
	}
}

// A quick budget whose samples cannot enter it says why.
func TestQuickNoSampleUsed(t *testing.T) {
	dir := t.TempDir()
	path := dir + "/ambig.csv"
	os.WriteFile(path, []byte("Sample,Date,Na (mg/L),Cl (mg/L),Alkalinity (meq/L)\nA1,01/02/2024,4.1,5,0.2\nA2,03/04/2024,4.2,5.5,0.2\n"), 0o644)
	var stdout, stderr bytes.Buffer
	run([]string{"quick", "-samples", path}, &stdout, &stderr) // the exit status is main_test's concern
	for _, w := range []string{"no sample enters the budget; left out: no date (2 samples)", `ambig.csv:2:2 (Date): "01/02/2024": ambiguous date order`,
		`set "date order" to day-first or month-first`, "problem: ambig.csv:2:2 (Date)", "warning: ambig.csv:2: sample A1 has no date"} {
		if !strings.Contains(stdout.String(), w) {
			t.Errorf("output does not say %q:\n%s", w, stdout.String())
		}
	}
}
