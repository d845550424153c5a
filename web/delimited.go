package web

import (
	"lixiv/engine/notebook"
	"lixiv/engine/sample"
)

// ParseDelimited splits text copied from a spreadsheet, or read from a CSV
// or TSV file, into a notebook table kept as text, by engine/sample's rules
// (notebook.TableFromText): the delimiter is detected, comment lines above
// the header are set aside, quotes protect delimiters and line breaks, and a
// units row is recognised as the importer recognises it. When header is
// false every non-blank row is data. Nothing is converted: units and
// numbers are read by the engine, which reports problems by row and
// column. Text with no header row gives a table without columns.
func ParseDelimited(text string, header bool) *notebook.Table {
	if !header {
		return &notebook.Table{Rows: sample.SplitCells(text).Rows}
	}
	t, err := notebook.TableFromText(text)
	if err != nil {
		return &notebook.Table{}
	}
	return t
}

func pad(row []string, n int) []string {
	out := make([]string, n)
	copy(out, row)
	return out
}

// AppendRows adds the rows of a pasted block to t. An empty table takes
// the block's header, units row and rows as a file's are read. When the
// block's first
// row repeats t's column names it is taken as a header: its columns are
// matched to t's by name (unknown names, unnamed columns and names the
// header repeats become new columns) and a units row under it is used for
// new columns. Otherwise the cells go to t's
// columns in order, and a block wider than t gets unnamed extra columns.
// It returns how many rows were added.
func AppendRows(t *notebook.Table, text string) int {
	if len(t.Columns) == 0 && len(t.Rows) == 0 {
		// An empty table takes the block as a file is read: lines above
		// the header (a lab's comments) are set aside.
		if p := ParseDelimited(text, true); len(p.Columns) > 0 {
			t.Columns, t.Units, t.Rows = p.Columns, p.Units, p.Rows
			return len(p.Rows)
		}
	}
	p := ParseDelimited(text, false)
	if len(p.Rows) == 0 {
		return 0
	}
	rows := p.Rows
	colOf := make([]int, 0)
	if isHeader(t, rows[0]) || len(t.Columns) == 0 {
		hdr := rows[0]
		rows = rows[1:]
		var units []string
		if len(rows) > 0 && sample.IsUnitsRow(hdr, rows[0]) {
			units, rows = rows[0], rows[1:]
		}
		for j, name := range hdr {
			// An unnamed column, or a name this header already used, gets
			// a column of its own: matching it would put two pasted
			// columns into one.
			i := -1
			if name != "" {
				i = t.Column(name)
			}
			if i >= 0 && contains(colOf, i) {
				i = -1
			}
			if i < 0 {
				t.Columns = append(t.Columns, name)
				if len(t.Units) > 0 || (j < len(units) && units[j] != "") {
					t.Units = pad(t.Units, len(t.Columns)-1)
					u := ""
					if j < len(units) {
						u = units[j]
					}
					t.Units = append(t.Units, u)
				}
				i = len(t.Columns) - 1
			}
			colOf = append(colOf, i)
		}
	}
	for _, r := range rows {
		for len(colOf) < len(r) {
			if len(colOf) < len(t.Columns) && !contains(colOf, len(colOf)) {
				colOf = append(colOf, len(colOf))
				continue
			}
			t.Columns = append(t.Columns, "")
			if len(t.Units) > 0 {
				t.Units = append(t.Units, "")
			}
			colOf = append(colOf, len(t.Columns)-1)
		}
	}
	if len(t.Units) > 0 {
		t.Units = pad(t.Units, len(t.Columns))
	}
	for _, r := range rows {
		out := make([]string, len(t.Columns))
		for j, v := range r {
			out[colOf[j]] = v
		}
		t.Rows = append(t.Rows, out)
	}
	return len(rows)
}

func contains(xs []int, v int) bool {
	for _, x := range xs {
		if x == v {
			return true
		}
	}
	return false
}

// isHeader reports a row most of whose cells name columns of t.
func isHeader(t *notebook.Table, row []string) bool {
	hits := 0
	for _, c := range row {
		if c != "" && t.Column(c) >= 0 {
			hits++
		}
	}
	return hits > 0 && hits*2 >= len(row)
}
