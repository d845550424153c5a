package web

import (
	"reflect"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
)

func TestTableProblems(t *testing.T) {
	tab := &notebook.Table{Columns: []string{"sample", "date", "Na"}, Units: []string{"", "", "mg/L"},
		Rows: [][]string{{"A", "2021-01-01", "3"}, {"B", "2021-01-02", "abc"}}}
	msgs := notebook.Messages{
		{Severity: problem.Error, File: "samples", Line: 4, Col: 3, Column: "Na", Value: "abc", Row: 1, Text: "not a number"},
		{Severity: problem.Error, File: "samples", Line: 2, Col: 3, Column: "Na", Row: -1, Text: "unknown unit"},
		{Severity: problem.Note, File: "samples", Line: 1, Row: -1, Text: "units read: Na in mg/L"},
		{Severity: problem.Warning, File: "lab.csv", Line: 4, Row: -1, Text: "sample B has no Cl value"},
	}
	probs, rest := TableProblems("samples", tab, msgs)
	want := []TableProblem{
		{Row: 1, Col: 2, Severity: problem.Error, Text: `row 2, column Na: "abc": not a number`},
		{Row: -1, Col: 2, Severity: problem.Error, Text: `units row, column Na: unknown unit`},
		{Row: -1, Col: -1, Severity: problem.Note, Text: `header row: units read: Na in mg/L`},
	}
	if !reflect.DeepEqual(probs, want) {
		t.Errorf("problems:\n got %+v\nwant %+v", probs, want)
	}
	if len(rest) != 1 || !strings.HasPrefix(rest[0], "lab.csv:4: sample B") {
		t.Errorf("other messages: got %q, want the one about lab.csv", rest)
	}
	t.Run("read from a file", func(t *testing.T) {
		tab := &notebook.Table{Columns: []string{"date", "Q"}, Rows: [][]string{{"x", "1"}},
			Source: &notebook.Source{File: "flow.csv", Header: 3, Lines: []int{5}}}
		probs, _ := TableProblems("flow", tab, notebook.Messages{{File: "flow.csv", Line: 5, Col: 1, Row: 0, Text: "not a date"},
			{File: "flow.csv", Line: 3, Col: 2, Row: -1, Text: "no unit"}})
		if len(probs) != 2 || probs[0].Row != 0 || probs[0].Col != 0 || probs[0].Text != "row 1 (line 5), column date: not a date" || probs[1].Text != "header row, column Q: no unit" {
			t.Errorf("got %+v, want row 0 column 0, then the header", probs)
		}
	})
}
