package web

import (
	"strings"

	"lixiv/engine/notebook"
)

// ParseDelimited splits text copied from a spreadsheet, or read from a CSV
// or TSV file, into a notebook table kept as text. The delimiter is the one
// of tab, semicolon and comma found most often in the first line; double
// quotes protect delimiters and line breaks; a UTF-8 byte order mark is
// dropped. When header is true the first row names the columns, and a
// second row without any number is taken as a units row. Blank lines are
// skipped. Nothing is converted: units and numbers are read by the engine,
// which reports problems by row and column.
func ParseDelimited(text string, header bool) *notebook.Table {
	text = strings.TrimPrefix(text, "\ufeff")
	rows := splitRows(text, delimiter(text))
	t := &notebook.Table{}
	if header && len(rows) > 0 {
		t.Columns = rows[0]
		rows = rows[1:]
		if len(rows) > 0 && looksLikeUnits(rows[0]) {
			t.Units = pad(rows[0], len(t.Columns))
			rows = rows[1:]
		}
	}
	t.Rows = rows
	return t
}

// delimiter picks tab, semicolon or comma by their count in the first line.
func delimiter(text string) rune {
	first, _, _ := strings.Cut(text, "\n")
	best, n := ',', strings.Count(first, ",")
	if c := strings.Count(first, ";"); c > n {
		best, n = ';', c
	}
	if c := strings.Count(first, "\t"); c > 0 && c >= n {
		best = '\t'
	}
	return best
}

func splitRows(text string, delim rune) [][]string {
	var rows [][]string
	var row []string
	var cell strings.Builder
	quoted, atStart := false, true
	endRow := func() {
		row = append(row, strings.TrimSpace(cell.String()))
		cell.Reset()
		blank := true
		for _, c := range row {
			if c != "" {
				blank = false
			}
		}
		if !blank {
			rows = append(rows, row)
		}
		row = nil
	}
	rs := []rune(text)
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		switch {
		case quoted && r == '"' && i+1 < len(rs) && rs[i+1] == '"':
			cell.WriteRune('"')
			i++
		case quoted && r == '"':
			quoted = false
		case quoted:
			cell.WriteRune(r)
		case r == '"' && atStart:
			quoted = true
		case r == delim:
			row = append(row, strings.TrimSpace(cell.String()))
			cell.Reset()
			atStart = true
			continue
		case r == '\r':
		case r == '\n':
			endRow()
			atStart = true
			continue
		default:
			cell.WriteRune(r)
			if r != ' ' {
				atStart = false
			}
			continue
		}
		atStart = false
	}
	if cell.Len() > 0 || len(row) > 0 {
		endRow()
	}
	return rows
}

// looksLikeUnits reports a row with no number in it and at least one cell
// that names a unit, such as "mg/L" or "µmol/L".
func looksLikeUnits(row []string) bool {
	unit := false
	for _, c := range row {
		if c == "" {
			continue
		}
		if strings.IndexAny(c, "0123456789") >= 0 && !strings.ContainsAny(c, "/³²") {
			return false
		}
		l := strings.ToLower(c)
		if strings.Contains(l, "/") || strings.Contains(l, "mol") || strings.Contains(l, "eq") || l == "ppm" || l == "ppb" {
			unit = true
		}
	}
	return unit
}

func pad(row []string, n int) []string {
	out := make([]string, n)
	copy(out, row)
	return out
}

// AppendRows adds the rows of a pasted block to t. When the block's first
// row repeats t's column names it is taken as a header: its columns are
// matched to t's by name (unknown names become new columns) and a units
// row under it is used for new columns. Otherwise the cells go to t's
// columns in order, and a block wider than t gets unnamed extra columns.
// It returns how many rows were added.
func AppendRows(t *notebook.Table, text string) int {
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
		if len(rows) > 0 && looksLikeUnits(rows[0]) {
			units, rows = rows[0], rows[1:]
		}
		for j, name := range hdr {
			i := t.Column(name)
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
