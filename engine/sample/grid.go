package sample

import (
	"io"
	"strings"
)

// Grid is a table split into cells by the rules Read uses, before any cell
// is converted: steps 1 to 3 of the package documentation and the units
// row of step 4. Callers that keep a table as the user wrote it (the
// notebook, the page) read text through it, so that a file Read accepts is
// split the same way there. Cells are trimmed of surrounding spaces; blank
// rows are skipped; rows may be longer or shorter than the header.
type Grid struct {
	Name       string     // file name as given, for messages
	Preamble   []string   // lines above the header row, kept as written
	Header     []string   // the header row; nil when none was found
	HeaderLine int        // line of the header row in the file
	Units      []string   // the units row, one cell per header cell; nil when there is none
	UnitsLine  int        // line of the units row, 0 when there is none
	Rows       [][]string // data rows
	Lines      []int      // line in the file on which each data row starts
	Comma      rune       // field delimiter read (detected or given)
	Problems   ProblemList
	// Notes says how a workbook's sheet was read: a header over several
	// rows of merged cells joined into one, other sheets left unread.
	Notes ProblemList
	raw   bool // no header: every record is a row (SplitCells)
}

// ReadGrid splits r into a header, a units row and data rows as Read would
// (Options.Comma fixes the delimiter; the other options are not used).
// The returned error is non-nil only when r cannot be read; a text with no
// header row, a binary file or an .xlsx workbook is reported in
// Grid.Problems with ErrNotTable.
func ReadGrid(r io.Reader, name string, opt Options) (*Grid, error) {
	g := &Grid{Name: name}
	err := g.read(r, opt)
	return g, err
}

// SplitText is ReadGrid for text in memory.
func SplitText(text, name string, opt Options) *Grid {
	g, _ := ReadGrid(strings.NewReader(text), name, opt)
	return g
}

// SplitCells splits text into rows of cells with Read's decoding, delimiter
// and quoting rules but without looking for a header: every non-blank
// record is a row. It suits a block of cells pasted under a table.
func SplitCells(text string) *Grid {
	g := &Grid{raw: true}
	g.read(strings.NewReader(text), Options{})
	return g
}

func (g *Grid) read(r io.Reader, opt Options) error {
	t := &Table{Name: g.Name}
	im := newImporter(t, opt)
	im.grid = g
	err := im.read(r)
	g.Preamble = t.Preamble
	g.Problems = append(g.Problems, t.Problems...)
	return err
}

// rows reads the remaining records of lr into the grid.
func (g *Grid) rows(lr records) {
	for {
		fs, line, ok := lr.next()
		if !ok {
			return
		}
		if lr.unclosedQuote() {
			g.Problems = append(g.Problems, &Problem{File: g.Name, Line: line, Err: ErrQuote,
				Detail: "a quoted field is not closed before the end of the file"})
		}
		g.row(fs, line)
	}
}

// row adds one record unless it is blank. Cells are trimmed as Read trims
// them (spaces, tabs and no-break spaces), so that a row Read counts stays
// a row.
func (g *Grid) row(fs [][]byte, line int) {
	if trimmedLen(fs) == 0 {
		return
	}
	cells := make([]string, len(fs))
	for i, f := range fs {
		cells[i] = string(trimSpace(f))
	}
	g.Rows = append(g.Rows, cells)
	g.Lines = append(g.Lines, line)
}

// Width returns the number of columns: the longest of the header and the
// rows.
func (g *Grid) Width() int {
	n := len(g.Header)
	for _, r := range g.Rows {
		n = max(n, len(r))
	}
	return n
}

// IsUnitsRow reports whether row, under a header row, reads as a units row
// by Read's rule: at least one cell reads as a unit for its column and no
// number stands under a numeric column.
func IsUnitsRow(header, row []string) bool {
	heads := make([]heading, len(header))
	for i, h := range header {
		heads[i] = classify(strings.TrimSpace(h))
	}
	fs := make([][]byte, len(row))
	for i, c := range row {
		fs[i] = []byte(c)
	}
	return isUnitsRow(fs, heads)
}
