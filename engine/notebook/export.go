package notebook

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"lixiv/engine/chem"
)

func numText(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// CSV returns the table as comma-separated text: a header row, a units row
// and one row per line. Numbers are written in full (they read back to the
// same float64); missing values are empty.
func (t *ResultTable) CSV() []byte {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	names, units := make([]string, len(t.Columns)), make([]string, len(t.Columns))
	for i, c := range t.Columns {
		names[i], units[i] = c.Name, c.Unit
	}
	w.Write(names)
	w.Write(units)
	row := make([]string, len(t.Columns))
	for r := 0; r < t.Len(); r++ {
		for i, c := range t.Columns {
			if c.Text != nil {
				row[i] = c.Text[r]
			} else {
				row[i] = numText(c.Num[r])
			}
		}
		w.Write(row)
	}
	w.Flush()
	return b.Bytes()
}

// JSON returns the table as a JSON object in the layout of budget-file
// tables: "columns", "units", then "rows" with one row per line (missing
// numbers are null). cell names the cell it comes from.
func (t *ResultTable) JSON(cell string) []byte {
	var o object
	o.add("cell", cell)
	o.add("table", t.Name)
	o.add("title", t.Title)
	cols, units := array{}, array{}
	for _, c := range t.Columns {
		cols, units = append(cols, c.Name), append(units, c.Unit)
	}
	o.add("columns", cols)
	o.add("units", units)
	rows := array{}
	for r := 0; r < t.Len(); r++ {
		row := array{}
		for _, c := range t.Columns {
			if c.Text != nil {
				row = append(row, c.Text[r])
			} else {
				row = append(row, num(c.Num[r]))
			}
		}
		rows = append(rows, row)
	}
	o.add("rows", rows)
	var b bytes.Buffer
	writeValue(&b, o, "")
	b.WriteByte('\n')
	return b.Bytes()
}

// TableFromText splits a CSV, TSV or semicolon-separated text (as saved by
// a spreadsheet) into a Table: the first line names the columns; a second
// line that holds units ("mg/L", "µeq/L", "m3/s") and no numbers becomes the
// units row. Cells are kept as written.
//
// Text that is not valid UTF-8 is read as Latin-1, as older spreadsheets
// save it, so that the table holds exactly the characters shown.
func TableFromText(text string) (*Table, error) {
	if !utf8.ValidString(text) {
		r := make([]rune, len(text))
		for i := 0; i < len(text); i++ {
			r[i] = rune(text[i])
		}
		text = string(r)
	}
	text = strings.TrimPrefix(text, "\ufeff")
	first, _, _ := strings.Cut(text, "\n")
	sep := ','
	switch {
	case strings.Count(first, "\t") > 0:
		sep = '\t'
	case strings.Count(first, ";") > strings.Count(first, ","):
		sep = ';'
	}
	r := csv.NewReader(strings.NewReader(text))
	r.Comma, r.FieldsPerRecord, r.LazyQuotes = sep, -1, true
	recs, err := r.ReadAll()
	if err != nil {
		return nil, fmt.Errorf("not a table: %v", err)
	}
	if len(recs) == 0 {
		return nil, fmt.Errorf("not a table: the text is empty")
	}
	t := &Table{Columns: recs[0]}
	rows := recs[1:]
	if len(rows) > 0 && unitsRow(rows[0]) {
		t.Units, rows = rows[0], rows[1:]
		for len(t.Units) < len(t.Columns) {
			t.Units = append(t.Units, "")
		}
		t.Units = t.Units[:len(t.Columns)]
	}
	if len(t.Columns) > MaxColumns || len(rows) > MaxRows {
		return nil, fmt.Errorf("the table is larger than %d columns by %d rows", MaxColumns, MaxRows)
	}
	for i, row := range rows {
		if len(row) > len(t.Columns) {
			return nil, fmt.Errorf("row %d has %d cells for %d columns", i+2, len(row), len(t.Columns))
		}
		if len(row) == 1 && row[0] == "" {
			continue
		}
		t.Rows = append(t.Rows, row)
	}
	return t, nil
}

// unitsRow reports whether a row reads as units: no number, and at least
// one cell a concentration or discharge unit.
func unitsRow(row []string) bool {
	unit := false
	for _, c := range row {
		c = strings.TrimSpace(c)
		if c == "" {
			continue
		}
		if _, err := strconv.ParseFloat(strings.ReplaceAll(c, ",", "."), 64); err == nil {
			return false
		}
		if _, err := chem.ParseUnit(c); err == nil || strings.Contains(c, "/s") || strings.Contains(c, "/day") {
			unit = true
		}
	}
	return unit
}
