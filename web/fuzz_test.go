package web

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/sample"
)

// FuzzParseDelimited feeds arbitrary text to the page's table readers: they
// must never panic, every row must fit the header, and pasting must never
// lose a row or leave rows wider than the table.
func FuzzParseDelimited(f *testing.F) {
	for _, s := range []string{
		"sample\tNa\n\tmg/L\nCV-1\t3.1\n",
		"\ufeffa,b\n\"x\"\"y\",2\n",
		"a;b\n1;2;3\n\"unterminated\n",
		"",
		"\n\n\t\t\n",
	} {
		f.Add(s)
	}
	// The awkward laboratory and discharge files of the engine's tests.
	for _, dir := range []string{"../engine/sample/testdata/awkward", "../engine/discharge/testdata/awkward"} {
		names, _ := filepath.Glob(filepath.Join(dir, "*.*"))
		for _, n := range names {
			if b, err := os.ReadFile(n); err == nil && !strings.HasSuffix(n, ".md") {
				f.Add(string(b))
			}
		}
	}
	f.Fuzz(func(t *testing.T, text string) {
		tab := ParseDelimited(text, true)
		if len(tab.Units) != 0 && len(tab.Units) != len(tab.Columns) {
			t.Fatalf("units %d for %d columns", len(tab.Units), len(tab.Columns))
		}
		base := &notebook.Table{Columns: []string{"sample", "Na"}, Units: []string{"", "mg/L"}}
		n := AppendRows(base, text)
		if n != len(base.Rows) {
			t.Fatalf("AppendRows said %d, table has %d rows", n, len(base.Rows))
		}
		for i, r := range base.Rows {
			if len(r) != len(base.Columns) {
				t.Fatalf("row %d has %d cells for %d columns", i, len(r), len(base.Columns))
			}
		}
		if len(base.Units) != len(base.Columns) {
			t.Fatalf("units %d for %d columns after a paste", len(base.Units), len(base.Columns))
		}
		// Messages at odd places (past the table, on no row) must not panic.
		k := len(text)
		TableProblems("samples", base, notebook.Messages{{File: "samples", Line: k % 7, Col: k % 5, Row: k%4 - 2, Text: text}})
	})
}

// FuzzPasteRoundTrip pastes text into an empty table, copies the table out
// as a spreadsheet does (tab-separated) and pastes that into another empty
// table: the samples cell must read the same samples from both.
func FuzzPasteRoundTrip(f *testing.F) {
	for _, s := range []string{
		"sample\tdate\tNa\n\t\tmg/L\nA\t2021-05-01\t1,5\nB\t2021-05-02\t<0.01\n",
		"sample,date,Na (µmol/L)\nA,2021-05-01,12\n",
		"sample\tnote\tNa\nA\t\"two\nlines\"\t1\nB\t\"a, b; c\"\t2\n",
		"sample;Na;;\nA;1;;\n\nB;2;;x\n",
		"0\n\"\n\",",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		t1 := &notebook.Table{}
		if AppendRows(t1, text) == 0 && len(t1.Columns) == 0 {
			return
		}
		copied := t1.TSV()
		t2 := &notebook.Table{}
		AppendRows(t2, copied)
		if a, b := pastedSamples(t1), pastedSamples(t2); a != b {
			t.Fatalf("samples differ after copying the table out as\n%q\nfirst:\n%s\nthen:\n%s", copied, a, b)
		}
	})
}

// pastedSamples is what the samples cell reads from t.
func pastedSamples(t *notebook.Table) string {
	return sample.ParseText(t.TSV(), "f", sample.Options{Comma: '\t'}).SamplesText()
}
