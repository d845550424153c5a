package notebook

import (
	"sort"
	"strconv"
	"strings"

	"lixiv/engine/discharge"
	"lixiv/engine/problem"
	"lixiv/engine/sample"
)

// Message says how a cell read its input, positioned at the file, line,
// column and value it concerns (problem.Problem, the engine's one problem
// type; Cell is the id of the cell whose output holds it). The page shows a
// cell's messages beside its table, the command line lists them in its
// summary, and the report writes them under "problems" (severity problem)
// and "warnings".
type Message = problem.Problem

// Messages is a cell's list of messages, in the order of the file.
type Messages = problem.List

// sortMessages orders messages by line, then column, keeping the order of
// those at one place; messages with no line come last.
func sortMessages(l Messages) {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i], l[j]
		if (a.Line == 0) != (b.Line == 0) {
			return b.Line == 0
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// placer names the lines of a cell's table: the importers read its TSV
// text, and messages name the lines of the file the table was read from
// (Table.Source) or, for a table typed, pasted or loaded from a budget,
// the lines of that text, under the cell's id.
type placer struct {
	name string      // file name, or the cell id
	file map[int]int // TSV line -> file line; nil when there is no file
	rows map[int]int // named line -> row index (-1 header, -2 units row)
}

// newPlacer returns the placer of t, held by cell id.
func newPlacer(id string, t *Table) *placer {
	p := &placer{name: id}
	tsv := map[int]int{1: -1} // TSV line -> row
	at := 2 + lineBreaks(t.Columns)
	if t.hasUnits() {
		tsv[at] = -2
		at += 1 + lineBreaks(t.Units)
	}
	for i, r := range t.Rows {
		tsv[at] = i
		at += 1 + lineBreaks(r)
	}
	p.rows = tsv
	if s := t.Source; s != nil && s.File != "" && len(s.Lines) == len(t.Rows) {
		p.name, p.file, p.rows = s.File, map[int]int{}, map[int]int{}
		for l, r := range tsv {
			fl := s.Header
			switch {
			case r == -2:
				fl = s.Units
			case r >= 0:
				fl = s.Lines[r]
			}
			p.file[l], p.rows[fl] = fl, r
		}
	}
	return p
}

// line maps a line of the TSV text to the line to name (Options.Line of
// the importers); nil when they are the same.
func (p *placer) line() func(int) int {
	if p.file == nil {
		return nil
	}
	return func(l int) int {
		if fl, ok := p.file[l]; ok {
			return fl
		}
		return l
	}
}

// row returns the index in the table of the data row on named line l, or
// -1 when l is no data row.
func (p *placer) row(l int) int {
	if r, ok := p.rows[l]; ok && l > 0 && r >= 0 {
		return r
	}
	return -1
}

// fromSample turns importer problems into messages placed by p.
func (p *placer) fromSample(l sample.ProblemList) Messages {
	out := make(Messages, 0, len(l))
	for _, x := range l {
		row, line := p.row(x.Line), x.Line
		out = append(out, &Message{Severity: x.Severity, Effect: x.Effect, File: p.name, Line: line, Col: x.Col,
			Column: x.Header, Value: x.Value, Text: sampleText(x), Row: row, Err: x.Err})
	}
	return out
}

// sampleText is what a problem says without its position: the sentinel
// and the detail.
func sampleText(x *sample.Problem) string {
	c := *x
	c.File, c.Line, c.Col, c.Header, c.Value = "", 0, 0, "", ""
	return strings.TrimPrefix(c.Error(), ": ")
}

// sourceNotes returns the notes of the file t was read from, when the
// messages name that file.
func (p *placer) sourceNotes(t *Table) Messages {
	if p.file == nil {
		return nil
	}
	return p.fromSample(t.Source.Notes)
}

// fromDischarge turns discharge import problems into messages placed by p.
func (p *placer) fromDischarge(l discharge.Problems) Messages {
	out := make(Messages, 0, len(l))
	for _, x := range l {
		row, line := p.row(x.Row), x.Row
		c := *x
		c.File, c.Row, c.Col, c.Column = "-", 0, 0, ""
		text := strings.TrimPrefix(c.Error(), "-: ")
		out = append(out, &Message{Severity: x.Severity, Effect: x.Effect, File: p.name, Line: line, Col: x.Col,
			Column: x.Column, Value: x.Value, Text: text, Row: row, Err: x.Err})
	}
	return out
}

// messageSettings are the settings this package's messages name (besides
// those the importer names, sample.SettingLabels).
var messageSettings = []string{"nicb_flag_percent", "nicb_reject_percent", "sulfate"}

// MessageLabels lists every setting key that messages name, for a check
// that they name them as the page does (SettingLabel).
func MessageLabels() []string {
	keys := append([]string(nil), messageSettings...)
	for k := range sample.SettingLabels {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// quoteSetting quotes a setting's label for a message.
func quoteSetting(key string) string { return strconv.Quote(SettingLabel(key)) }
