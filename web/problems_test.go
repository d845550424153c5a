package web

import (
	"reflect"
	"testing"

	"lixiv/engine/notebook"
)

func TestTableProblems(t *testing.T) {
	tab := &notebook.Table{Columns: []string{"sample", "date", "Na"}, Units: []string{"", "", "mg/L"},
		Rows:   [][]string{{"A", "2021-01-01", "3"}, {"B", "2021-01-02", "abc"}},
		Source: &notebook.Source{File: "lab.csv", Header: 3, Units: 4, Lines: []int{5, 7}}}
	o := &notebook.Output{
		Warnings: []string{`lab.csv:7:3 (Na): "abc": not a number`, `lab.csv:4 (Na): unknown unit`, `no critical chloride set`},
		Marks: []notebook.Mark{
			{Warning: 0, Row: 1, Col: 2, Line: 7, Text: `"abc": not a number`},
			{Warning: 1, Row: notebook.UnitsRow, Col: 2, Line: 4, Text: "unknown unit"},
		},
	}
	probs, rest := TableProblems(tab, o)
	want := []TableProblem{
		{Row: 1, Col: 2, Text: `row 2 (line 7 of lab.csv), column Na: "abc": not a number`},
		{Row: notebook.UnitsRow, Col: 2, Text: `units row (line 4 of lab.csv), column Na: unknown unit`},
	}
	if !reflect.DeepEqual(probs, want) {
		t.Errorf("problems:\n got %+v\nwant %+v", probs, want)
	}
	if !reflect.DeepEqual(rest, []string{"no critical chloride set"}) {
		t.Errorf("other warnings: got %q", rest)
	}
	t.Run("typed table", func(t *testing.T) {
		tab := &notebook.Table{Columns: []string{"date", "Q"}, Rows: [][]string{{"x", "1"}}}
		o := &notebook.Output{Warnings: []string{"flow:2:1 (date): not a date"}, Marks: []notebook.Mark{{Row: 0, Col: 0, Text: "not a date"}}}
		probs, rest := TableProblems(tab, o)
		if len(probs) != 1 || probs[0].Text != "row 1, column date: not a date" || len(rest) != 0 {
			t.Errorf("got %+v and %q, want row 1, column date", probs, rest)
		}
	})
}
