package web

import (
	"fmt"
	"strings"

	"lixiv/engine/notebook"
)

// TableProblem is an engine message about one place in a cell's table, in
// the page's terms: a data row (from 0; notebook.HeaderRow or
// notebook.UnitsRow for those) and a column (from 0; -1 when the message
// names none).
type TableProblem struct {
	Row, Col int
	Text     string // "row 7 (line 8 of samples.csv), column K (mg/L): …"
}

// TableProblems splits a cell's warnings into those the engine placed in
// its table (notebook.Output.Marks), worded with the row and column the
// user sees, and the rest.
func TableProblems(t *notebook.Table, o *notebook.Output) (probs []TableProblem, rest []string) {
	if t == nil || len(o.Marks) == 0 {
		return nil, o.Warnings
	}
	placed := make(map[int]bool, len(o.Marks))
	for _, m := range o.Marks {
		placed[m.Warning] = true
		var where []string
		switch m.Row {
		case notebook.HeaderRow:
			where = append(where, "header row")
		case notebook.UnitsRow:
			where = append(where, "units row")
		default:
			where = append(where, fmt.Sprintf("row %d", m.Row+1))
		}
		if m.Line > 0 && t.Source != nil {
			where[0] += fmt.Sprintf(" (line %d of %s)", m.Line, t.Source.File)
		}
		if m.Col >= 0 && m.Col < len(t.Columns) {
			where = append(where, "column "+strings.TrimSpace(t.Columns[m.Col]))
		}
		probs = append(probs, TableProblem{Row: m.Row, Col: m.Col, Text: strings.Join(where, ", ") + ": " + m.Text})
	}
	for i, w := range o.Warnings {
		if !placed[i] {
			rest = append(rest, w)
		}
	}
	return probs, rest
}
