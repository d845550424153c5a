package web

import (
	"bytes"
	"context"
	"os"
	"reflect"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
	"lixiv/engine/sample"
)

func TestParseDelimited(t *testing.T) {
	tests := []struct {
		name  string
		text  string
		cols  []string
		units []string
		rows  [][]string
	}{
		{"tab separated with units row", "sample\tNa\tCa\n\tmg/L\tmg/L\nCV-1\t3.1\t1.9\n",
			[]string{"sample", "Na", "Ca"}, []string{"", "mg/L", "mg/L"}, [][]string{{"CV-1", "3.1", "1.9"}}},
		{"comma with quotes and BOM", "\ufeffsample,note\n\"CV,1\",\"said \"\"hi\"\"\"\n",
			[]string{"sample", "note"}, nil, [][]string{{"CV,1", `said "hi"`}}},
		{"semicolon and decimal comma kept as text", "sample;Na\nCV-1;3,1\r\nCV-2;<0,5\r\n",
			[]string{"sample", "Na"}, nil, [][]string{{"CV-1", "3,1"}, {"CV-2", "<0,5"}}},
		{"blank lines skipped", "a,b\n\n1,2\n,\n3,4",
			[]string{"a", "b"}, nil, [][]string{{"1", "2"}, {"3", "4"}}},
		{"line break inside quotes", "a,b\n\"x\ny\",2\n",
			[]string{"a", "b"}, nil, [][]string{{"x\ny", "2"}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := ParseDelimited(tt.text, true)
			if !reflect.DeepEqual(got.Columns, tt.cols) {
				t.Errorf("columns: got %q, want %q", got.Columns, tt.cols)
			}
			if !reflect.DeepEqual(got.Units, tt.units) {
				t.Errorf("units: got %q, want %q", got.Units, tt.units)
			}
			if !reflect.DeepEqual(got.Rows, tt.rows) {
				t.Errorf("rows: got %q, want %q", got.Rows, tt.rows)
			}
		})
	}
}

func TestAppendRows(t *testing.T) {
	base := func() *notebook.Table {
		return &notebook.Table{Columns: []string{"sample", "date", "Na"}, Units: []string{"", "", "mg/L"},
			Rows: [][]string{{"CV-1", "2021-01-01", "3"}}}
	}
	tests := []struct {
		name    string
		text    string
		added   int
		columns []string
		last    []string
	}{
		{"plain rows in column order", "CV-2\t2021-02-01\t2.9\nCV-3\t2021-03-01\t2.8\n", 2,
			[]string{"sample", "date", "Na"}, []string{"CV-3", "2021-03-01", "2.8"}},
		{"header matched by name, in another order", "Na\tsample\tdate\n3.3\tCV-4\t2021-04-01\n", 1,
			[]string{"sample", "date", "Na"}, []string{"CV-4", "2021-04-01", "3.3"}},
		{"header with a new column", "sample\tdate\tNa\tCa\nCV-5\t2021-05-01\t3\t1.9\n", 1,
			[]string{"sample", "date", "Na", "Ca"}, []string{"CV-5", "2021-05-01", "3", "1.9"}},
		{"wider block gets an unnamed column", "CV-6\t2021-06-01\t3\textra\n", 1,
			[]string{"sample", "date", "Na", ""}, []string{"CV-6", "2021-06-01", "3", "extra"}},
		{"a repeated name keeps both columns", "sample\tNa\tNa\nCV-7\t3.1\t3.2\n", 1,
			[]string{"sample", "date", "Na", "Na"}, []string{"CV-7", "", "3.1", "3.2"}},
		{"an unnamed header cell gets its own column", "sample\tNa\t\nCV-8\t1\tx\n", 1,
			[]string{"sample", "date", "Na", ""}, []string{"CV-8", "", "1", "x"}},
		{"nothing pasted", "\n\n", 0, []string{"sample", "date", "Na"}, []string{"CV-1", "2021-01-01", "3"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tab := base()
			if got := AppendRows(tab, tt.text); got != tt.added {
				t.Errorf("added: got %d, want %d", got, tt.added)
			}
			if !reflect.DeepEqual(tab.Columns, tt.columns) {
				t.Errorf("columns: got %q, want %q", tab.Columns, tt.columns)
			}
			if len(tab.Units) != len(tab.Columns) {
				t.Errorf("units: got %d for %d columns", len(tab.Units), len(tab.Columns))
			}
			last := tab.Rows[len(tab.Rows)-1]
			if !reflect.DeepEqual(last, tt.last) {
				t.Errorf("last row: got %q, want %q", last, tt.last)
			}
		})
	}
}

// The project's messy lab file opened on the page gives the samples
// engine/sample reads from the file itself (its golden test).
func TestParseDelimitedMessyFile(t *testing.T) {
	b, err := os.ReadFile("../testdata/samples-messy.csv")
	if err != nil {
		t.Fatal(err)
	}
	want, _ := sample.Read(bytes.NewReader(b), "samples-messy.csv", sample.Options{})
	tab := ParseDelimited(string(b), true)
	if notebook.TableKind(tab) != notebook.KindSamples {
		t.Fatalf("read as a %s table", notebook.TableKind(tab))
	}
	d := notebook.New("messy")
	c := notebook.NewCell(notebook.KindSamples, "samples", "")
	c.Table = tab
	if err := d.Insert(c, -1); err != nil {
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
	// The page shows the problems at their rows of the table: MF-04 is row 8.
	probs, _ := TableProblems("samples", tab, o.Messages)
	var bad []TableProblem
	for _, p := range probs {
		if p.Severity == problem.Error {
			bad = append(bad, p)
		}
	}
	if len(bad) != 2 || bad[0].Row != 7 || bad[0].Col != 5 || bad[1].Col != 9 {
		t.Errorf("table problems %+v", bad)
	}
}
