package web

import (
	"strconv"
	"strings"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
)

// TableProblem is an engine message about a cell's own table, in the
// page's terms: a data row (from 0; -1 for the header, the units row or
// the table as a whole) and a column (from 0; -1 when the message names
// none).
type TableProblem struct {
	Row, Col int
	Severity problem.Severity
	Text     string // "row 5, column Na: …"
}

// Class is the list item's css class: its severity ("problem", "warning",
// "note").
func (p TableProblem) Class() string { return p.Severity.String() }

// Placed reports a problem the page can show in the table: one of a data
// row, or of a column.
func (p TableProblem) Placed() bool { return p.Row >= 0 || p.Col >= 0 }

// TableProblems splits a cell's messages into those about its own table
// (named by the file the table was read from, or by the cell's id), placed
// at rows and columns of the table the user sees ("row 2 (line 5)" for a
// table read from a file, whose lines the message counts), and the rest,
// as text.
// It reads the messages' fields; it never parses their text.
func TableProblems(cell string, t *notebook.Table, msgs notebook.Messages) (probs []TableProblem, rest []string) {
	name, header, units, file := cell, 1, 0, false
	if t != nil && t.Source != nil && t.Source.File != "" && len(t.Source.Lines) == len(t.Rows) {
		name, header, units, file = t.Source.File, t.Source.Header, t.Source.Units, true
	} else if t != nil {
		for _, u := range t.Units {
			if u != "" {
				units = 2
				break
			}
		}
	}
	for _, m := range msgs {
		if t == nil || m.File != name {
			rest = append(rest, severityWord(m)+m.Error())
			continue
		}
		p := TableProblem{Row: m.Row, Col: m.Col - 1, Severity: m.Severity}
		if p.Col >= len(t.Columns) {
			p.Col = -1
		}
		var where []string
		switch {
		case p.Row >= 0 && file:
			where = append(where, "row "+strconv.Itoa(p.Row+1)+" (line "+strconv.Itoa(m.Line)+")")
		case p.Row >= 0:
			where = append(where, "row "+strconv.Itoa(p.Row+1))
		case m.Line == header && m.Line > 0:
			where = append(where, "header row")
		case m.Line == units && m.Line > 0:
			where = append(where, "units row")
		case m.Line > 0:
			where = append(where, "line "+strconv.Itoa(m.Line))
		}
		if p.Col >= 0 {
			where = append(where, "column "+strings.TrimSpace(t.Columns[p.Col]))
		} else if m.Column != "" {
			where = append(where, "column "+m.Column)
		}
		text := m.Text
		if m.Value != "" {
			text = strconv.Quote(m.Value) + ": " + text
		}
		if len(where) > 0 {
			text = strings.Join(where, ", ") + ": " + text
		}
		p.Text = text
		probs = append(probs, p)
	}
	return probs, rest
}

// severityWord prefixes a message shown among a cell's warnings with its
// severity when it is not a warning.
func severityWord(m *notebook.Message) string {
	if m.Severity == problem.Warning {
		return ""
	}
	return m.Severity.String() + ": "
}
