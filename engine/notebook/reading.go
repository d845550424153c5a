package notebook

import (
	"fmt"
	"sort"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/sample"
)

// Reading says how a cell read its data table: what each column was taken
// as, and what the importer substituted, inferred or left out. The samples
// and discharge cells give one in Output.Reading; it is for the reader and
// not part of the stored results.
type Reading struct {
	File    string          // the file the table was read from; "" when typed, pasted or loaded from a budget
	Rows    int             // data rows
	Columns []ColumnReading // one per column of the table, in order
	Notes   []string        // what was substituted, inferred or left out, in the importer's words
}

// ColumnReading is how one column of a table was read.
type ColumnReading struct {
	Header string // the column's name as written
	As     string // what it was read as, with the unit conversion: "Ca, mg/L → µmol/L"
	Used   bool   // false for a column kept as text and not used
	Note   string // why it is not used, or how it was read when that needs saying
}

// Mark ties one of a cell's warnings to a place in its data table, so a
// page can show the message beside that place.
type Mark struct {
	Warning int    // index in Output.Warnings
	Row     int    // data row, from 0; HeaderRow or UnitsRow for those
	Col     int    // column, from 0; -1 for the whole row
	Line    int    // line of the file the table was read from; 0 when it has none
	Text    string // the message without its place
}

// Rows of a table's header that a Mark can name.
const (
	HeaderRow = -1 // the row of column names
	UnitsRow  = -2 // the units row under them
)

// placeOf returns the row of t (from 0, or HeaderRow or UnitsRow) that
// line of the text TSV writes falls on.
func (t *Table) placeOf(line int) (row int, ok bool) {
	at := 1
	if line >= at && line <= at+lineBreaks(t.Columns) {
		return HeaderRow, true
	}
	at += 1 + lineBreaks(t.Columns)
	if t.hasUnits() {
		if line >= at && line <= at+lineBreaks(t.Units) {
			return UnitsRow, true
		}
		at += 1 + lineBreaks(t.Units)
	}
	for i, r := range t.Rows {
		if line >= at && line <= at+lineBreaks(r) {
			return i, true
		}
		at += 1 + lineBreaks(r)
	}
	return 0, false
}

// mark returns the Mark of warning w about line and col (from 1; 0 for
// none) of t's TSV text, and false when the line is not one of the table's.
func (t *Table) mark(w, line, col int, text string) (Mark, bool) {
	row, ok := t.placeOf(line)
	if !ok {
		return Mark{}, false
	}
	m := Mark{Warning: w, Row: row, Col: col - 1, Text: text}
	if m.Col >= len(t.Columns) {
		m.Col = -1
	}
	if l := t.fileLines(); l != nil {
		m.Line = l[line]
	}
	return m, true
}

// samplesMarks places the importer's problems (lines of t's TSV text, in
// the order of out.Warnings from first) in t.
func samplesMarks(t *Table, ps sample.ProblemList, first int) []Mark {
	var out []Mark
	for i, p := range ps {
		q := *p
		q.File, q.Line, q.Col, q.Header = "", 0, 0, ""
		if m, ok := t.mark(first+i, p.Line, p.Col, strings.TrimPrefix(q.Error(), ": ")); ok && p.Line > 0 {
			out = append(out, m)
		}
	}
	return out
}

// dischargeMarks does samplesMarks for the discharge importer.
func dischargeMarks(t *Table, ps discharge.Problems, first int) []Mark {
	var out []Mark
	for i, p := range ps {
		text := p.Err.Error()
		if p.Detail != "" {
			text += ": " + p.Detail
		}
		if m, ok := t.mark(first+i, p.Row, p.Col, text); ok && p.Row > 0 {
			out = append(out, m)
		}
	}
	return out
}

// sourceFile names the file t was read from, if its rows still match it.
func sourceFile(t *Table) string {
	if t.fileLines() == nil {
		return ""
	}
	return t.Source.File
}

// samplesReading says how the samples cell read its table.
func samplesReading(t *Table, tab *sample.Table, s *SamplesSettings, flags []string, marks int) *Reading {
	r := &Reading{File: sourceFile(t), Rows: len(t.Rows)}
	hasAlk := false
	for _, c := range tab.Columns {
		hasAlk = hasAlk || c.Kind == sample.Concentration && c.Species == chem.Alk
	}
	for _, c := range tab.Columns {
		cr := ColumnReading{Header: c.Header, As: strings.ReplaceAll(c.Mapping(), " -> ", " → "), Used: c.Kind != sample.Meta, Note: c.Note}
		switch {
		case c.Kind == sample.Meta && c.Note == "":
			cr.As, cr.Note = "not used", "not recognised; kept as text"
		case c.Kind == sample.Meta:
			cr.As = "not used"
		case c.Kind == sample.Concentration && c.Species == chem.HCO3 && !hasAlk:
			// qc.Balance takes HCO3 as the alkalinity when a sample has none.
			cr.Note = strings.TrimPrefix(cr.Note+"; taken as alkalinity in the charge balance, as the table has no alkalinity column", "; ")
		}
		r.Columns = append(r.Columns, cr)
	}
	if n := len(tab.Preamble); n > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("%s above the header set aside", plural(n, "line")))
	}
	if s.DefaultUnit != "" {
		r.Notes = append(r.Notes, "concentration columns without a unit read in "+s.DefaultUnit)
	}
	if n := tab.NCensored(); n > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("%s below the detection limit set to %s", plural(n, "value"), tab.Policy))
	}
	r.Notes = append(r.Notes, countFlags(flags)...)
	return withMarks(r, marks)
}

// withMarks adds to r a note of the places of the table a message is about.
func withMarks(r *Reading, marks int) *Reading {
	if marks > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("%s of the table with a message: each is marked in the table, with its message beside it", plural(marks, "place")))
	}
	return r
}

// countFlags sums up the samples' flags: "2 samples left out: no date".
func countFlags(flags []string) []string {
	n := map[string]int{}
	for _, f := range flags {
		if f != "" {
			n[f]++
		}
	}
	keys := make([]string, 0, len(n))
	for k := range n {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	out := make([]string, len(keys))
	for i, k := range keys {
		out[i] = plural(n[k], "sample") + ": " + k
	}
	return out
}

// dischargeReading says how the discharge cell read its table.
func dischargeReading(t *Table, im *discharge.Import, marks int) *Reading {
	r := &Reading{File: sourceFile(t), Rows: len(t.Rows)}
	for i, role := range discharge.Roles(t.Columns) {
		cr := ColumnReading{Header: t.Columns[i], As: role, Used: role != ""}
		switch role {
		case "":
			cr.As, cr.Note = "not used", "not recognised; kept as text"
		case "discharge":
			if im.Unit != discharge.NoUnit {
				cr.As = "discharge, " + im.Unit.String() + " → m³/s"
			}
		}
		r.Columns = append(r.Columns, cr)
	}
	for _, n := range im.Notes {
		// The importer reads the table as the cell holds it (tab-separated
		// text); how the file itself was split is not its to say.
		if !strings.HasPrefix(n, "columns separated by") {
			r.Notes = append(r.Notes, n)
		}
	}
	return withMarks(r, marks)
}
