package sample

import (
	"bytes"
	"math"
	"testing"

	"lixiv/engine/chem"
)

// sameTable reports the first difference between two tables' samples.
func sameTable(t *testing.T, a, b *Table) {
	t.Helper()
	if len(a.Samples) != len(b.Samples) {
		t.Fatalf("%d vs %d samples", len(a.Samples), len(b.Samples))
	}
	eq := func(x, y float64) bool { return x == y || math.IsNaN(x) && math.IsNaN(y) }
	for i := range a.Samples {
		x, y := a.Samples[i], b.Samples[i]
		if x.ID != y.ID || x.Site != y.Site || x.HasTime != y.HasTime || !x.Time.Equal(y.Time) || x.DateOnly != y.DateOnly {
			t.Fatalf("sample %d: %q %q %v %v vs %q %q %v %v", i, x.ID, x.Site, x.Time, x.HasTime, y.ID, y.Site, y.Time, y.HasTime)
		}
		for _, sp := range chem.All() {
			lx, cx := x.Limit(sp)
			ly, cy := y.Limit(sp)
			if !eq(x.C[sp], y.C[sp]) || cx != cy || !eq(lx, ly) {
				t.Fatalf("sample %d %s: %v (<%v %v) vs %v (<%v %v)", i, sp, x.C[sp], lx, cx, y.C[sp], ly, cy)
			}
		}
		for _, q := range [][2]float64{{x.Q, y.Q}, {x.PH, y.PH}, {x.Temp, y.Temp}, {x.Cond, y.Cond}, {x.Sr87Sr86, y.Sr87Sr86}} {
			if !eq(q[0], q[1]) {
				t.Fatalf("sample %d: %v vs %v", i, q[0], q[1])
			}
		}
		if len(x.Meta) != len(y.Meta) {
			t.Fatalf("sample %d: meta %v vs %v", i, x.Meta, y.Meta)
		}
	}
}

func TestWriteCSVRoundTrip(t *testing.T) {
	a := readFile(t, "../../testdata/samples-messy.csv", Options{})
	var buf bytes.Buffer
	if err := a.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	b := ParseText(buf.String(), "normalised.csv", Options{})
	if err := b.Problems.Err(); err != nil {
		t.Fatalf("the normalised table reads with problems: %v\n%s", err, buf.String())
	}
	sameTable(t, a, b)
	// Writing again gives the same bytes.
	var again bytes.Buffer
	if err := b.WriteCSV(&again); err != nil {
		t.Fatal(err)
	}
	if again.String() != buf.String() {
		t.Errorf("second write differs:\n%s\n---\n%s", buf.String(), again.String())
	}
}

func TestWriteCSVHeader(t *testing.T) {
	tb := ParseText("Sample,Date,Ca (mmol/L),Alk (meq/L),Note\nA,2024-03-05,1,<0.01,\"x, y\"\n", "w.csv", Options{})
	var buf bytes.Buffer
	if err := tb.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	want := "Sample,Site,Date,Ca (µmol/L),Alk (µeq/L),Note\nA,,2024-03-05,1000,<10,\"x, y\"\n"
	if buf.String() != want {
		t.Errorf("got\n%s\nwant\n%s", buf.String(), want)
	}
}
