package notebook

import (
	"strings"

	"lixiv/engine/discharge"
	"lixiv/engine/sample"
)

// Reading says what a cell took each column of its data table as. What the
// importer substituted, inferred or left out on the way is in the cell's
// Messages; a message about a whole column (Row -1, Col set) belongs with
// the column here. The samples and discharge cells give one in
// Output.Reading; it is for the reader and not part of the stored results.
type Reading struct {
	File    string          // the file the table was read from; "" when typed, pasted or loaded from a budget
	Rows    int             // data rows
	Columns []ColumnReading // one per column of the table, in order
}

// ColumnReading is how one column of a table was read.
type ColumnReading struct {
	Header string // the column's name as written
	As     string // what it was read as, with the unit conversion: "Ca, mg/L → µmol/L"
	Used   bool   // false for a column kept as text and not used
	Note   string // why it is not used, or how it was read when that needs saying
}

// sourceFile names the file t was read from, if its rows still match it.
func sourceFile(t *Table) string {
	if s := t.Source; s != nil && len(s.Lines) == len(t.Rows) {
		return s.File
	}
	return ""
}

// samplesReading says what the samples cell took each column as, by the
// importer's record of it (sample.Column).
func samplesReading(t *Table, tab *sample.Table) *Reading {
	r := &Reading{File: sourceFile(t), Rows: len(t.Rows)}
	for _, c := range tab.Columns {
		cr := ColumnReading{Header: c.Header, As: strings.ReplaceAll(c.Mapping(), " -> ", " → "), Used: c.Kind != sample.Meta, Note: c.Note}
		if c.Kind == sample.Meta {
			cr.As = "not used"
			if cr.Note == "" {
				cr.Note = "not recognised; kept as text"
			}
		}
		r.Columns = append(r.Columns, cr)
	}
	return r
}

// dischargeReading says what the discharge cell took each column as.
func dischargeReading(t *Table, im *discharge.Import) *Reading {
	r := &Reading{File: sourceFile(t), Rows: len(t.Rows)}
	for i, role := range discharge.Roles(t.Columns) {
		cr := ColumnReading{Header: t.Columns[i], As: role, Used: role != ""}
		switch {
		case role == "":
			cr.As, cr.Note = "not used", "not recognised; kept as text"
		case role == "discharge" && im.Unit != discharge.NoUnit:
			cr.As = "discharge, " + im.Unit.String() + " → m³/s"
		}
		r.Columns = append(r.Columns, cr)
	}
	return r
}
