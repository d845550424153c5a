package web

import (
	"reflect"
	"testing"

	"lixiv/engine/notebook"
)

func TestTableProblems(t *testing.T) {
	tab := &notebook.Table{Columns: []string{"sample", "date", "Na"}, Units: []string{"", "", "mg/L"},
		Rows: [][]string{{"A", "2021-01-01", "3"}, {"B", "2021-01-02", "abc"}}}
	warnings := []string{
		`samples:4:3 (Na): "abc": not a number`,
		`samples:2 (Na): unknown unit`,
		`other:4:1: not ours`,
		`no critical chloride set`,
	}
	probs, rest := TableProblems("samples", tab, warnings)
	want := []TableProblem{
		{Row: 1, Col: 2, Text: `row 2, column Na: "abc": not a number`},
		{Row: -1, Col: 2, Text: `units row, column Na: unknown unit`},
	}
	if !reflect.DeepEqual(probs, want) {
		t.Errorf("problems:\n got %+v\nwant %+v", probs, want)
	}
	if len(rest) != 2 {
		t.Errorf("other warnings: got %q, want 2", rest)
	}
	t.Run("no units row", func(t *testing.T) {
		tab := &notebook.Table{Columns: []string{"date", "Q"}, Rows: [][]string{{"x", "1"}}}
		probs, _ := TableProblems("flow", tab, []string{"flow:2:1 (date): not a date"})
		if len(probs) != 1 || probs[0].Row != 0 || probs[0].Col != 0 {
			t.Errorf("got %+v, want row 0, column 0", probs)
		}
	})
}
