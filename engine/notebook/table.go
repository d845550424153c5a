package notebook

import (
	"fmt"
	"strings"

	"lixiv/engine/sample"
)

// Table is a data table typed or pasted by the user, kept as text so that
// nothing the laboratory wrote ("<0.01", "n.d.", "0,25") is lost. Columns
// holds the header names, Units the unit of each column ("" where none) and
// Rows one slice of cells per data row.
type Table struct {
	Columns []string   // column names as written
	Units   []string   // unit of each column, "" where none
	Rows    [][]string // cells, row by row
	Source  *Source    // the file the table was read from; nil when typed, pasted or loaded from a budget
}

// Source says where a table's rows came from, so that messages about them
// name the file and count lines as the file does. Budget files do not
// store it, and it is used only while the table has one row per entry of
// Lines: code that adds or removes rows should set Table.Source to nil.
type Source struct {
	File     string   // file name
	Preamble []string // lines above the header row, as written
	Header   int      // line of the header row
	Units    int      // line of the units row, 0 when none
	Lines    []int    // line on which each row starts
	// Notes says how the file was read before its cells reached the
	// table (a workbook's header joined from merged cells, the sheet
	// read); the cells reading the table list them with their own.
	Notes sample.ProblemList
}

// lineBreaks counts the line breaks inside the cells of a row.
func lineBreaks(cells []string) int {
	n := 0
	for _, c := range cells {
		n += strings.Count(c, "\n")
	}
	return n
}

// Clone returns a deep copy of t.
func (t *Table) Clone() *Table {
	if t == nil {
		return nil
	}
	c := &Table{
		Source:  t.Source, // never changed in place
		Columns: append([]string(nil), t.Columns...),
		Units:   append([]string(nil), t.Units...),
		Rows:    make([][]string, len(t.Rows)),
	}
	for i, r := range t.Rows {
		c.Rows[i] = append([]string(nil), r...)
	}
	return c
}

// Column returns the index of the column named name (case-insensitive), or -1.
func (t *Table) Column(name string) int {
	for i, c := range t.Columns {
		if strings.EqualFold(strings.TrimSpace(c), name) {
			return i
		}
	}
	return -1
}

// Cell returns row r, column c, or "" when the row is short.
func (t *Table) Cell(r, c int) string {
	if r < 0 || r >= len(t.Rows) || c < 0 || c >= len(t.Rows[r]) {
		return ""
	}
	return t.Rows[r][c]
}

// CSV renders the table as comma-separated text: the header row, then the
// units row when any unit is set, then the data rows. Cells holding a
// comma, semicolon, tab, quote or line break are quoted, so that the text
// reads back (TableFromText) with the same delimiter and cells.
func (t *Table) CSV() string { return t.delimited(',') }

// TSV renders the table as tab-separated text, as a spreadsheet copies it,
// quoted as CSV is.
func (t *Table) TSV() string { return t.delimited('\t') }

func (t *Table) delimited(sep byte) string {
	var b strings.Builder
	writeCSVRow(&b, t.Columns, sep)
	if t.hasUnits() {
		writeCSVRow(&b, t.Units, sep)
	}
	for _, r := range t.Rows {
		writeCSVRow(&b, r, sep)
	}
	return b.String()
}

// hasUnits reports whether any column has a unit: only then is the units
// row written.
func (t *Table) hasUnits() bool {
	for _, u := range t.Units {
		if u != "" {
			return true
		}
	}
	return false
}

func writeCSVRow(b *strings.Builder, cells []string, sep byte) {
	for i, c := range cells {
		if i > 0 {
			b.WriteByte(sep)
		}
		// Quoted: a cell holding a quote or a line break, one holding any
		// delimiter the readers detect (not only sep), so that the text
		// reads back with the same delimiter and the same cells, and one
		// holding a byte-order mark, which a reader drops at the start of a
		// file.
		if strings.ContainsAny(c, "\t;,\"\r\n\ufeff") {
			b.WriteByte('"')
			b.WriteString(strings.ReplaceAll(c, `"`, `""`))
			b.WriteByte('"')
		} else {
			b.WriteString(c)
		}
	}
	b.WriteByte('\n')
}

// check reports a table whose units row or data rows do not match its header.
func (t *Table) check() error {
	if t == nil {
		return nil
	}
	if len(t.Columns) > MaxColumns || len(t.Rows) > MaxRows {
		return fmt.Errorf("the table has %s columns and %s rows, above the limit of %s columns or %s rows",
			grouped(len(t.Columns)), grouped(len(t.Rows)), grouped(MaxColumns), grouped(MaxRows))
	}
	if len(t.Units) != 0 && len(t.Units) != len(t.Columns) {
		return fmt.Errorf("units row has %d cells for %d columns", len(t.Units), len(t.Columns))
	}
	for i, r := range t.Rows {
		if len(r) > len(t.Columns) {
			return fmt.Errorf("row %d has %d cells for %d columns", i+1, len(r), len(t.Columns))
		}
	}
	return nil
}
