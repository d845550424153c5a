package notebook

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
	"lixiv/engine/sample"
)

func TestTableFromText(t *testing.T) {
	tests := []struct {
		name, text string
		cols       int
		units      string
		rows       int
		cell       string // row 1, column 2 as kept
	}{
		{"csv with units row", "sample,Na,Ca\n,mg/L,mg/L\nA,1.5,<0.01\nB,2,3\n", 3, ",mg/L,mg/L", 2, "1.5"},
		{"units in header", "sample,Na (mg/L)\nA,1.5\n", 2, "", 1, "1.5"},
		{"semicolon decimal comma", "sample;Na\n;mg/L\nA;1,5\n", 2, ",mg/L", 1, "1,5"},
		{"tab pasted", "date\tQ\n\tm3/s\n2021-01-01\t0.5\n", 2, ",m3/s", 1, "0.5"},
		{"bom and blank line", "\ufeffsample,Na\nA,1\n\nB,2\n", 2, "", 2, "1"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tab, err := TableFromText(tt.text)
			if err != nil {
				t.Fatal(err)
			}
			if len(tab.Columns) != tt.cols || strings.Join(tab.Units, ",") != tt.units || len(tab.Rows) != tt.rows || tab.Cell(0, 1) != tt.cell {
				t.Errorf("got %d columns, units %q, %d rows, cell %q; want %d, %q, %d, %q",
					len(tab.Columns), strings.Join(tab.Units, ","), len(tab.Rows), tab.Cell(0, 1), tt.cols, tt.units, tt.rows, tt.cell)
			}
		})
	}
	if tab, err := TableFromText("a,b\n1,2,3\n"); err != nil || len(tab.Columns) != 3 || tab.Cell(0, 2) != "3" {
		t.Errorf("a long row keeps its cells under an unnamed column: got %v, %v", tab, err)
	}
	if _, err := ReadTable("x.csv", "\x00\x01"); err == nil || err.Error() != "x.csv: not a sample table; the file holds binary data, not text" {
		t.Errorf("a binary file: got %v", err)
	}
}

// The project's messy lab file (comment lines above the header, a units
// row, a blank line) splits as engine/sample reads it, and the table
// remembers the file's lines.
func TestReadTableMessy(t *testing.T) {
	b, err := os.ReadFile("../../testdata/samples-messy.csv")
	if err != nil {
		t.Fatal(err)
	}
	tab, err := ReadTable("samples-messy.csv", string(b))
	if err != nil {
		t.Fatal(err)
	}
	src := tab.Source
	if len(tab.Columns) != 21 || tab.Columns[0] != "Sample ID" || tab.Units[9] != "mg/L" || len(tab.Rows) != 8 ||
		src == nil || src.File != "samples-messy.csv" || src.Header != 3 || src.Units != 4 || len(src.Preamble) != 2 ||
		fmt.Sprint(src.Lines) != "[5 6 7 8 10 11 12 13]" {
		t.Errorf("got columns %q, units %q, %d rows, source %+v", tab.Columns, tab.Units, len(tab.Rows), src)
	}
}

func FuzzTableFromText(f *testing.F) {
	f.Add("sample,Na\n,mg/L\nA,1\n")
	f.Add("a;b\n1;2\n")
	f.Add("\"q,\"\"x\",b\n1,2\n")
	f.Fuzz(func(t *testing.T, text string) {
		defer watchdog.Start(text)()
		tab, err := TableFromText(text)
		if err != nil {
			return
		}
		if err := tab.check(); err != nil {
			t.Fatalf("TableFromText gave a table that fails its own check: %v", err)
		}
		// The samples cell reads the table as engine/sample reads the text.
		direct := sample.ParseText(text, "f", sample.Options{})
		kept := sample.ParseText(tab.TSV(), "f", sample.Options{Comma: '\t'})
		if len(direct.Samples) != len(kept.Samples) {
			t.Fatalf("%d samples read from the text, %d from the table:\n%q", len(direct.Samples), len(kept.Samples), tab.TSV())
		}
		// What it read survives the budget file unchanged.
		d := New("f")
		c := NewCell(KindSamples, "s", "")
		c.Table = tab
		if err := d.Insert(c, -1); err != nil {
			t.Fatal(err)
		}
		d2, err := Parse(d.Marshal(), "f")
		if err != nil {
			t.Fatalf("saved table does not load: %v", err)
		}
		got := d2.Cell("s").Table
		if got.CSV() != tab.CSV() {
			t.Fatalf("table changed through the file:\n%q\n%q", tab.CSV(), got.CSV())
		}
	})
}

func TestIsJSONNumber(t *testing.T) {
	for s, want := range map[string]bool{
		"0": true, "-0": true, "12": true, "3.860": true, "1e5": true, "1E+5": true, "-2.5e-3": true,
		"": false, "-": false, "01": false, "1.": false, ".5": false, "1e": false, "1e+": false, "+1": false,
		"0x10": false, "1,5": false, " 1": false, "NaN": false, "<0.01": false, "1.2.3": false,
	} {
		if got := isJSONNumber(s); got != want {
			t.Errorf("isJSONNumber(%q) = %v, want %v", s, got, want)
		}
	}
}
