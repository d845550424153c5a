package notebook

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"strconv"
	"strings"

	"lixiv/engine/sample"
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

// TableFromText reads CSV, TSV or semicolon-separated text (a file saved
// by a spreadsheet, or cells pasted from one) into a Table by the rules of
// engine/sample (sample.SplitText): the delimiter is detected, lines above
// the header row (a lab's comment lines) are set aside, a units row under
// the header is recognised as the importer recognises it, blank lines are
// skipped and quoted cells may hold delimiters and line breaks. Cells are
// kept as written, so the samples cell reads the table as sample.Read
// reads the file. A row longer than the header gets unnamed columns, so
// that no cell is lost.
func TableFromText(text string) (*Table, error) { return ReadTable("", text) }

// ReadTable is TableFromText for the file called name: messages name it,
// and the table remembers the file and the line of each row
// (Table.Source), so that the samples cell's messages count rows as the
// file does.
func ReadTable(name, text string) (*Table, error) {
	return TableFromGrid(sample.SplitText(text, name, sample.Options{}))
}

// TableFromGrid turns cells split by engine/sample (sample.SplitText,
// sample.SheetGrid) into a Table. When the grid has a name, the table
// remembers the file and the line of each row (Table.Source).
func TableFromGrid(g *sample.Grid) (*Table, error) {
	name := g.Name
	if g.Header != nil && strings.Join(g.Header, "") == "" {
		return nil, fmt.Errorf("%s:%d: the header row has no names", textName(name), g.HeaderLine)
	}
	if g.Header == nil {
		return nil, fmt.Errorf("%s: %s", textName(name), problemText(g.Problems))
	}
	n := g.Width()
	if n > MaxColumns || len(g.Rows) > MaxRows {
		return nil, fmt.Errorf("%s: the table is larger than %d columns by %d rows", textName(name), MaxColumns, MaxRows)
	}
	t := &Table{Columns: widen(g.Header, n), Rows: g.Rows}
	if g.Units != nil {
		t.Units = widen(g.Units, n)
	}
	if name != "" {
		t.Source = &Source{File: name, Preamble: g.Preamble, Header: g.HeaderLine, Units: g.UnitsLine, Lines: g.Lines, Notes: g.Notes}
	}
	return t, nil
}

// widen pads cells with empty ones to n.
func widen(cells []string, n int) []string {
	out := make([]string, n)
	copy(out, cells)
	return out
}

func textName(name string) string {
	if name == "" {
		return "the text"
	}
	return name
}

// problemText gives the reason a text is not a table, without the file
// name the caller adds.
func problemText(l sample.ProblemList) string {
	if len(l) == 0 {
		return "no table found"
	}
	p := *l[0]
	p.File = ""
	return strings.TrimPrefix(p.Error(), ": ")
}
