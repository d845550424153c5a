package web

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"lixiv/engine/notebook"
)

// TableProblem is an engine message about one place in a cell's table, in
// the page's terms: a data row (from 0; -1 for the header or units row) and
// a column (from 0; -1 when the message names none).
type TableProblem struct {
	Row, Col int
	Text     string // "row 5, column Na: …"
}

// problemLine matches the engine's positioned messages about a table it was
// handed as text: "<cell id>:<line>[:<column>] [(<column name>)]: <message>".
var problemLine = regexp.MustCompile(`^([A-Za-z0-9_-]+):(\d+)(?::(\d+))?(?: \(([^)]*)\))?: (.*)$`)

// TableProblems splits a cell's warnings into those about places in its
// table (translated from lines of the text the engine read to rows of the
// table the user sees) and the rest.
func TableProblems(cell string, t *notebook.Table, warnings []string) (probs []TableProblem, rest []string) {
	if t == nil {
		return nil, warnings
	}
	header := 1
	for _, u := range t.Units {
		if u != "" {
			header = 2
			break
		}
	}
	for _, w := range warnings {
		m := problemLine.FindStringSubmatch(w)
		if m == nil || m[1] != cell {
			rest = append(rest, w)
			continue
		}
		line, _ := strconv.Atoi(m[2])
		p := TableProblem{Row: line - header - 1, Col: -1}
		if m[3] != "" {
			c, _ := strconv.Atoi(m[3])
			p.Col = c - 1
		}
		if p.Col < 0 && m[4] != "" {
			p.Col = t.Column(m[4])
		}
		var where []string
		switch {
		case p.Row >= 0:
			where = append(where, fmt.Sprintf("row %d", p.Row+1))
		case line == 1:
			where = append(where, "header row")
		default:
			where = append(where, "units row")
		}
		if p.Col >= 0 && p.Col < len(t.Columns) {
			where = append(where, "column "+strings.TrimSpace(t.Columns[p.Col]))
		} else if m[4] != "" {
			where = append(where, "column "+m[4])
		}
		p.Text = strings.Join(where, ", ") + ": " + m[5]
		probs = append(probs, p)
	}
	return probs, rest
}
