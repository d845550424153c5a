package sample

import (
	"archive/zip"
	"encoding/xml"
	"fmt"
	"io"
	"strings"
)

// span is a range of merged cells: rows r1..r2 (spreadsheet rows) and
// columns c1..c2 (from 0).
type span struct{ r1, r2, c1, c2 int }

// mergedSpans reads the merged cell ranges of a sheet part
// (<mergeCell ref="C1:F1"/>). A sheet it cannot read has none.
func mergedSpans(f *zip.File) []span {
	if f == nil {
		return nil
	}
	rc, err := f.Open()
	if err != nil {
		return nil
	}
	defer rc.Close()
	d := xml.NewDecoder(io.LimitReader(rc, 256<<20))
	var out []span
	for {
		tok, err := d.Token()
		if err != nil {
			return out
		}
		se, ok := tok.(xml.StartElement)
		if !ok || se.Name.Local != "mergeCell" {
			continue
		}
		for _, a := range se.Attr {
			if a.Name.Local != "ref" {
				continue
			}
			from, to, ok := strings.Cut(a.Value, ":")
			c1, r1, ok1 := cellRef(from)
			c2, r2, ok2 := cellRef(to)
			if ok && ok1 && ok2 && r2 >= r1 && c2 >= c1 && c2 < maxXLSXColumns && len(out) < 10000 {
				out = append(out, span{r1, r2, c1, c2})
			}
		}
	}
}

// cellRef reads "C12" as column 2 (from 0) and row 12.
func cellRef(s string) (col, row int, ok bool) {
	i := 0
	for i < len(s) && s[i] >= 'A' && s[i] <= 'Z' && i < 3 {
		col = col*26 + int(s[i]-'A'+1)
		i++
	}
	r, j, n := digits([]byte(s), i)
	if i == 0 || n == 0 || j != len(s) || r < 1 {
		return 0, 0, false
	}
	return col - 1, r, true
}

// maxHeaderRows is the most rows a header of merged cells may span; a
// range merged further down is cut there (a header is a few rows).
const maxHeaderRows = 8

// mergeHeader joins a header written over several rows with merged cells
// (a heading such as "Major cations (mg/L)" merged over the columns Na, K,
// Ca, Mg of the row below, and "Sample" merged down both rows) into one
// header row: each column is named by its lowest cell, and takes the unit
// of a merged heading above it when its name gives none. It returns the
// rows with the header rows replaced by the joined one (on the line of the
// last header row) and a note saying what was joined; rows unchanged and
// nil when the sheet's first row has no merged cells.
func mergeHeader(rows []sheetRow, spans []span, name, sheet string) ([]sheetRow, *Problem) {
	if len(rows) == 0 || len(spans) == 0 {
		return rows, nil
	}
	top := rows[0].line
	end := top
	across := false
	for _, s := range spans {
		if s.r1 != top {
			continue
		}
		end = max(end, s.r2)
		across = across || s.c2 > s.c1
	}
	if across {
		end = max(end, top+1) // the names under a heading merged across
	}
	end = min(end, top+maxHeaderRows-1)
	if end == top {
		return rows, nil
	}
	k := 0
	for k < len(rows) && rows[k].line <= end {
		k++
	}
	head := rows[:k]
	width := 0
	for _, r := range head {
		width = max(width, len(r.cells))
	}
	for _, s := range spans {
		if s.r1 >= top && s.r1 <= end {
			width = max(width, s.c2+1)
		}
	}
	// Fill each merged range with its top-left cell.
	grid := make([][]string, end-top+1)
	for i := range grid {
		grid[i] = make([]string, width)
	}
	for _, r := range head {
		for j, c := range r.cells {
			grid[r.line-top][j] = strings.TrimSpace(string(c))
		}
	}
	for _, s := range spans {
		if s.r1 < top || s.r1 > end {
			continue
		}
		v := grid[s.r1-top][s.c1]
		for r := s.r1; r <= min(s.r2, end); r++ {
			for c := s.c1; c <= s.c2; c++ {
				grid[r-top][c] = v
			}
		}
	}
	joined := make([][]byte, width)
	var took []string
	for j := 0; j < width; j++ {
		nm, group := "", ""
		for i := range grid {
			v := grid[i][j]
			if v == "" || v == nm {
				continue
			}
			if nm != "" {
				group = nm
			}
			nm = v
		}
		if group != "" {
			if _, inner, ok := splitBracket(group); ok && classify(nm).unit == "" {
				if hd := classify(nm + " (" + inner + ")"); hd.kind != Meta && hd.unit != "" {
					took = append(took, fmt.Sprintf("%q", nm+" ("+inner+")"))
					nm += " (" + inner + ")"
				}
			}
		}
		joined[j] = []byte(nm)
	}
	d := fmt.Sprintf("sheet %q: the header is written over rows %d to %d with merged cells; read as one row", sheet, top, end)
	if len(took) > 0 {
		d += ", the columns taking the unit of the merged heading above them: " + strings.Join(took, ", ")
	}
	p := &Problem{File: name, Line: end, Err: ErrMergedHeader, Detail: d}
	p.classify()
	out := append([]sheetRow{{line: end, cells: joined}}, rows[k:]...)
	return out, p
}
