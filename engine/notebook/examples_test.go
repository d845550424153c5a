package notebook_test

import (
	"bytes"
	"context"
	"math"
	"os"
	"path/filepath"
	"testing"

	"lixiv/engine/notebook"
)

// budgetFiles lists the example budgets and the golden budgets under the
// root testdata/.
func budgetFiles(t *testing.T) []string {
	t.Helper()
	var files []string
	for _, pat := range []string{"../../examples/*/*.lixiv.json", "../../testdata/budgets/*.lixiv.json"} {
		m, err := filepath.Glob(pat)
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, m...)
	}
	if len(files) < 3 {
		t.Fatalf("found %d budget files, want the two examples and the golden budgets", len(files))
	}
	return files
}

func load(t *testing.T, path string) (*notebook.Document, []byte) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	d, err := notebook.Parse(data, filepath.Base(path))
	if err != nil {
		t.Fatal(err)
	}
	return d, data
}

// TestStoredResultsReproduce reruns every example and golden budget and
// checks the rerun against the results stored in the file.
func TestStoredResultsReproduce(t *testing.T) {
	for _, path := range budgetFiles(t) {
		t.Run(filepath.Base(path), func(t *testing.T) {
			d, _ := load(t, path)
			if d.Stored == nil {
				t.Fatalf("%s holds no results snapshot", path)
			}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			v, err := d.Verify()
			if err != nil {
				t.Fatal(err)
			}
			if !v.Match {
				t.Errorf("rerun does not match the stored results (stored %s, rerun %s):\n%v\nIf the engine changed on purpose, run: go run ./examples/gen && go test ./engine/cmd/lixiv -update",
					v.Stored, v.Rerun, v.Differ)
			}
			// Every message names the cell whose output holds it, and every
			// table is one its kind's descriptor describes.
			for _, c := range d.Cells {
				if o := d.Output(c.ID); o != nil {
					describedTables(t, c.Kind, o)
					for _, m := range o.Messages {
						if m.Cell != c.ID {
							t.Errorf("cell %s: message %q names cell %q", c.ID, m.Error(), m.Cell)
						}
					}
				}
			}
		})
	}
}

// TestRoundTripExamples loads, saves and loads again: the file and its
// stored results are unchanged. That the same bytes compute the same
// results is TestStoredResultsReproduce's check (the rerun against the
// snapshot stored by another process), so nothing is computed here.
func TestRoundTripExamples(t *testing.T) {
	for _, path := range budgetFiles(t) {
		t.Run(filepath.Base(path), func(t *testing.T) {
			d1, data := load(t, path)
			saved := d1.Marshal()
			if !bytes.Equal(saved, data) {
				t.Fatalf("saving %s changed it; run go run ./examples/gen (or -update) after a format change", path)
			}
			d2, err := notebook.Parse(saved, "saved")
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(d2.Marshal(), saved) {
				t.Errorf("second save differs from the first")
			}
			if d1.Stored == nil || d2.Stored == nil || d1.Stored.Checksum != d2.Stored.Checksum || d1.Stored.Engine != d2.Stored.Engine || len(d1.Stored.Figures) != len(d2.Stored.Figures) {
				t.Errorf("the stored results did not survive the round trip")
			}
		})
	}
}

// sameOutputs requires every number of two outputs to have the same bits.
func sameOutputs(t *testing.T, id string, a, b *notebook.Output) {
	t.Helper()
	if len(a.Figures) != len(b.Figures) || len(a.Tables) != len(b.Tables) {
		t.Fatalf("cell %s: outputs differ in shape", id)
	}
	for i, f := range a.Figures {
		g := b.Figures[i]
		for _, p := range [][2]float64{{f.Median, g.Median}, {f.Low, g.Low}, {f.High, g.High}} {
			if math.Float64bits(p[0]) != math.Float64bits(p[1]) {
				t.Errorf("cell %s figure %s: %v vs %v, want identical bits", id, f.Name, p[0], p[1])
			}
		}
	}
	for i, tab := range a.Tables {
		for j, col := range tab.Columns {
			other := b.Tables[i].Columns[j]
			for k := range col.Num {
				if math.Float64bits(col.Num[k]) != math.Float64bits(other.Num[k]) {
					t.Fatalf("cell %s table %s column %s row %d: %v vs %v", id, tab.Name, col.Name, k+1, col.Num[k], other.Num[k])
				}
			}
			for k := range col.Text {
				if col.Text[k] != other.Text[k] {
					t.Fatalf("cell %s table %s column %s row %d: %q vs %q", id, tab.Name, col.Name, k+1, col.Text[k], other.Text[k])
				}
			}
		}
	}
}

// TestRainEditRerunsDownstreamOnly edits the atmosphere cell of the demo
// budget and counts which cells compute again.
func TestRainEditRerunsDownstreamOnly(t *testing.T) {
	d, _ := load(t, "../../examples/corrie-vale/corrie-vale.lixiv.json")
	ctx := context.Background()
	if err := d.Recompute(ctx, nil); err != nil {
		t.Fatal(err)
	}
	before := d.Output("co2").Figure("silicate CO2 consumption per km²").Median
	rev := d.Revision()
	if err := d.SetParam("rain", "na_per_cl", "0.95"); err != nil {
		t.Fatal(err)
	}
	if d.Revision() == rev {
		t.Errorf("revision did not change after the edit")
	}
	if err := d.Recompute(ctx, nil); err != nil {
		t.Fatal(err)
	}
	want := map[string]int{"note-1": 1, "site": 1, "samples": 1, "discharge": 1, "sources": 1,
		"rain": 2, "apportionment": 2, "fluxes": 2, "co2": 2}
	for id, w := range want {
		if got := d.Runs(id); got != w {
			t.Errorf("cell %s computed %d times, want %d", id, got, w)
		}
	}
	after := d.Output("co2").Figure("silicate CO2 consumption per km²").Median
	// More Na booked to rain leaves less silicate Na, so less silicate CO2 consumption.
	if !(after < before) {
		t.Errorf("silicate CO2 consumption %g after raising rain Na/Cl, was %g; want lower", after, before)
	}
	if v, _ := d.Verify(); v.Match {
		t.Errorf("an edited budget still matches the stored snapshot")
	}
}

// describedTables checks o's tables against the descriptor of kind k: each
// is named there, with the described columns and units first (and only
// those, unless the table is open).
func describedTables(t *testing.T, k notebook.Kind, o *notebook.Output) {
	t.Helper()
	for _, tab := range o.Tables {
		var info *notebook.TableInfo
		for i, ti := range notebook.DescriptorOf(k).Tables {
			if ti.Name == tab.Name {
				info = &notebook.DescriptorOf(k).Tables[i]
			}
		}
		if info == nil {
			t.Errorf("%s table %q is not described", k, tab.Name)
			continue
		}
		if len(tab.Columns) < len(info.Columns) || !info.Open && len(tab.Columns) != len(info.Columns) {
			t.Errorf("%s table %q has %d columns, described %d (open %v)", k, tab.Name, len(tab.Columns), len(info.Columns), info.Open)
			continue
		}
		for i, c := range info.Columns {
			if got := tab.Columns[i]; got.Name != c.Name || got.Unit != c.Unit {
				t.Errorf("%s table %q column %d is %q (%s), described %q (%s)", k, tab.Name, i, got.Name, got.Unit, c.Name, c.Unit)
			}
		}
	}
}
