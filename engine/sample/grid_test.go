package sample

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
)

func TestSplitText(t *testing.T) {
	messy, err := os.ReadFile("../../testdata/samples-messy.csv")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, text          string
		header, units, rows string // header and units row joined by "|", rows by "/"
		lines               string // HeaderLine, UnitsLine, Lines
		preamble            int
	}{
		{"messy lab file", string(messy), "Sample ID|Site|Date|Time|Q|pH_field|pH_lab|EC|Temp|Na|K|Ca|Mg|Sr|Cl-|SO4 2-|NO3-N|Alkalinity as CaCO3|SiO2|87Sr/86Sr|Comments",
			"||dd/mm/yyyy|hh:mm|L/s|||µS/cm|°C|mg/L|mg/L|mg/L|mg/L|µg/L|µmol/L|µmol/L|mg/L|mg/L|mg/L||", "", "3 4 [5 6 7 8 10 11 12 13]", 2},
		{"semicolons, decimal commas, quoted line break", "Sample;Na (mg/L);Note\r\nA;0,5;\"two\nlines\"\r\n\r\nB;1,5;x\r\n",
			"Sample|Na (mg/L)|Note", "", "A|0,5|two\nlines/B|1,5|x", "1 0 [2 5]", 0},
		{"tab pasted, units row", "date\tQ\n\tm3/s\n2021-01-01\t0.5\n", "date|Q", "|m3/s", "2021-01-01|0.5", "1 2 [3]", 0},
		{"long row kept", "a,b\n1,2,3\n", "a|b", "", "1|2|3", "1 0 [2]", 0},
		// A logger's note above a two-column header, with a comma in it.
		{"comment lines with commas", "# gauge 7, Corrie Vale\n# m3/s, daily\ndate,Q\n2021-01-01,0.5\n", "date|Q", "", "2021-01-01|0.5", "3 0 [4]", 2},
		{"no header", "", "", "", "", "0 0 []", 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			g := SplitText(tt.text, "f.csv", Options{})
			rows := make([]string, len(g.Rows))
			for i, r := range g.Rows {
				rows[i] = strings.Join(r, "|")
			}
			if tt.rows == "" && tt.name == "messy lab file" {
				rows = nil
			}
			got := []string{strings.Join(g.Header, "|"), strings.Join(g.Units, "|"), fmt.Sprint(g.HeaderLine, g.UnitsLine, g.Lines)}
			want := []string{tt.header, tt.units, tt.lines}
			if tt.name != "messy lab file" {
				got, want = append(got, strings.Join(rows, "/")), append(want, tt.rows)
			} else if len(g.Rows) != 8 || g.Rows[1][20] != "storm, rising limb" {
				t.Errorf("rows %q", g.Rows)
			}
			if strings.Join(got, "\n") != strings.Join(want, "\n") || len(g.Preamble) != tt.preamble {
				t.Errorf("got\n%q, preamble %q\nwant\n%q", got, g.Preamble, want)
			}
		})
	}
	if g := SplitText("\x00bin", "f.csv", Options{}); g.Header != nil || g.Problems.Count(ErrNotTable) != 1 {
		t.Errorf("binary text: %+v", g)
	}
}

func TestSplitCells(t *testing.T) {
	g := SplitCells("x\t1\n\ny\t\"2\t3\"\n")
	if fmt.Sprint(g.Rows, g.Lines) != "[[x 1] [y 2\t3]] [1 3]" || g.Header != nil {
		t.Errorf("got %q %v", g.Rows, g.Lines)
	}
}

func TestIsUnitsRow(t *testing.T) {
	tests := []struct {
		header, row []string
		want        bool
	}{
		{[]string{"Sample", "Na", "Q"}, []string{"", "mg/L", "L/s"}, true},
		{[]string{"Sample", "Na", "Q"}, []string{"A", "1.5", "3"}, false},
		{[]string{"Sample", "Na"}, []string{"", "mg/L 2"}, false},
		{[]string{"Date", "Note"}, []string{"dd/mm/yyyy", ""}, true},
	}
	for _, tt := range tests {
		if got := IsUnitsRow(tt.header, tt.row); got != tt.want {
			t.Errorf("IsUnitsRow(%q, %q) = %v, want %v", tt.header, tt.row, got, tt.want)
		}
	}
}

// A sheet splits with spreadsheet row numbers, as ReadXLSX numbers them.
func TestSheetGrid(t *testing.T) {
	b, err := os.ReadFile("testdata/corrie-vale.xlsx")
	if err != nil {
		t.Fatal(err)
	}
	tb, err := ReadXLSX(b, "corrie-vale.xlsx", "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	g, err := SheetGrid(b, "corrie-vale.xlsx", "")
	if err != nil {
		t.Fatal(err)
	}
	if len(g.Rows) != len(tb.Samples) || g.HeaderLine != tb.Header {
		t.Fatalf("%d rows under line %d, want %d under %d", len(g.Rows), g.HeaderLine, len(tb.Samples), tb.Header)
	}
	for i, s := range tb.Samples {
		if g.Lines[i] != s.Line {
			t.Errorf("row %d on line %d, want %d", i, g.Lines[i], s.Line)
		}
	}
}

// FuzzSplitText: splitting never panics, every row has a line after the
// header's, lines increase, and a units row has one cell per header cell.
func FuzzSplitText(f *testing.F) {
	for _, s := range []string{"# note\nSample,Na (mg/L)\n,mg/L\nA,1\n", "a;b\n1;2;3\n\"open\n", "", "\ufeffx\ty\n1\t2\n"} {
		f.Add(s)
	}
	for _, b := range awkwardFiles(f) {
		f.Add(string(b))
	}
	f.Fuzz(func(t *testing.T, text string) {
		defer watchdog.Start(text)()
		for _, g := range []*Grid{SplitText(text, "f.csv", Options{}), SplitCells(text)} {
			if len(g.Lines) != len(g.Rows) {
				t.Fatalf("%d lines for %d rows", len(g.Lines), len(g.Rows))
			}
			prev := g.HeaderLine
			if g.UnitsLine > 0 {
				if g.UnitsLine <= prev || len(g.Units) != len(g.Header) {
					t.Fatalf("units row on line %d (%d cells) under header on %d (%d cells)", g.UnitsLine, len(g.Units), prev, len(g.Header))
				}
				prev = g.UnitsLine
			}
			for _, l := range g.Lines {
				if l <= prev {
					t.Fatalf("lines %v after %d", g.Lines, prev)
				}
				prev = l
			}
		}
	})
}
