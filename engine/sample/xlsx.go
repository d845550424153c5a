package sample

import (
	"archive/zip"
	"bytes"
	"encoding/binary"
	"encoding/csv"
	"encoding/xml"
	"errors"
	"fmt"
	"hash/crc32"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"lixiv/engine/internal/xlsxreader"
)

// Errors of workbook import. Test for them with errors.Is.
var (
	ErrNotWorkbook = errors.New("not an .xlsx workbook")
	ErrNoSheet     = errors.New("no such sheet")
	ErrBadRow      = errors.New("unreadable row")
)

// maxXLSXColumns is the widest sheet a workbook can hold (column XFD).
const maxXLSXColumns = 16384

// maxXLSXCells caps the cells of a sheet held in memory (about 200 MB of
// field slices), far above any table of water samples.
const maxXLSXCells = 1 << 23

// Sheets returns the names of the worksheets in an .xlsx workbook, in the
// workbook's order.
func Sheets(b []byte) ([]string, error) {
	x, _, err := openWorkbook(b, true)
	if err != nil {
		return nil, err
	}
	return x.Sheets, nil
}

// ReadXLSX imports a sample table from one sheet of an .xlsx workbook; an
// empty sheet name means the first sheet. The cells go through the same
// reading as text: Line in a Problem is the spreadsheet row number and Col
// the column number (A = 1). Numbers stay numbers; cells formatted as
// dates or times are read as the dates and times they show. name is used
// only in messages.
//
// A file that is not a workbook, or a sheet it does not hold, gives a
// *Problem (ErrNotWorkbook or ErrNoSheet) as the error, also listed in the
// returned table's Problems; everything wrong with the cells is in
// Table.Problems only, and the rest of the table still loads.
func ReadXLSX(b []byte, name, sheet string, opt Options) (*Table, error) {
	t := &Table{Name: name, Policy: opt.Policy}
	return t, readSheet(newImporter(t, opt), b, name, sheet)
}

// SheetGrid splits one sheet of a workbook into a Grid as ReadXLSX reads
// it (see ReadGrid): Lines and HeaderLine are spreadsheet row numbers. A
// file that is not a workbook, or a sheet it lacks, is the error, as with
// ReadXLSX; rows that cannot be read are in Grid.Problems.
func SheetGrid(b []byte, name, sheet string) (*Grid, error) {
	g := &Grid{Name: name}
	t := &Table{Name: name}
	im := newImporter(t, Options{})
	im.grid = g
	err := readSheet(im, b, name, sheet)
	g.Preamble, g.Comma = t.Preamble, 0
	g.Problems = append(g.Problems, t.Problems...)
	g.Notes = append(g.Notes, t.Notes...)
	return g, err
}

// readSheet runs the importer on one sheet.
func readSheet(im *importer, b []byte, name, sheet string) error {
	t := im.t
	sheet, rows, probs, notes, err := sheetRowsNotes(b, name, sheet)
	if err != nil {
		p := err.(*Problem)
		t.Problems = append(t.Problems, p)
		return p
	}
	for _, p := range probs {
		im.add(p)
	}
	for _, p := range notes {
		im.note(p)
	}
	var sample [][][]byte
	counts := map[int]int{}
	for _, r := range rows {
		if n := trimmedLen(r.cells); n > 0 && len(sample) < 60 {
			sample = append(sample, r.cells)
			counts[n]++
		}
	}
	if len(sample) == 0 {
		im.fileProblem(ErrNotTable, fmt.Sprintf("sheet %q is empty", sheet))
		return nil
	}
	modal, n := 1, 0
	for k, v := range counts {
		if k >= 2 && (v > n || v == n && k > modal) {
			modal, n = k, v
		}
	}
	im.run(&rowSource{rows: rows}, '\t', sample, modal)
	t.Comma = 0
	return nil
}

// SheetText returns one sheet of an .xlsx workbook (an empty name means
// the first) as tab-separated text, as its cells would be pasted, with
// fields quoted where they hold a tab, a quote or a line break. Cells are
// written as ReadXLSX reads them. Rows that cannot be read are left out and
// listed in the returned problems.
func SheetText(b []byte, name, sheet string) (string, ProblemList, error) {
	_, rows, probs, err := sheetRows(b, name, sheet)
	if err != nil {
		return "", nil, err
	}
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	w.Comma = '\t'
	rec := []string{}
	for _, r := range rows {
		rec = rec[:0]
		for _, c := range r.cells[:trimmedLen(r.cells)] {
			rec = append(rec, string(c))
		}
		if len(rec) == 0 {
			continue
		}
		if err := w.Write(rec); err != nil {
			return "", probs, err
		}
	}
	w.Flush()
	return buf.String(), probs, w.Error()
}

// sheetRow is one non-empty row of a worksheet.
type sheetRow struct {
	line  int      // spreadsheet row number
	cells [][]byte // by column, A first; empty where the sheet has none
}

// rowSource hands the rows of a sheet to the importer.
type rowSource struct {
	rows []sheetRow
	i    int
}

func (r *rowSource) next() ([][]byte, int, bool) {
	if r.i >= len(r.rows) {
		return nil, 0, false
	}
	row := r.rows[r.i]
	r.i++
	return row.cells, row.line, true
}

func (r *rowSource) unclosedQuote() bool { return false }

// emptyStyles stands in for the workbook's styles when reading raw cell
// values, so that date cells come as the serial numbers stored.
var emptyStyles = func() *zip.File {
	b := storedZip("xl/styles.xml", []byte(`<?xml version="1.0" encoding="UTF-8"?><styleSheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"></styleSheet>`))
	r, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		panic(err) // written just above
	}
	return r.File[0]
}()

// storedZip is a zip archive of one file, stored uncompressed, dated
// 1980-01-01 (the format's first day). It is written here, as the
// format's specification lays it out, rather than with archive/zip's
// writer, which the page would otherwise carry for this alone.
func storedZip(name string, data []byte) []byte {
	le := binary.LittleEndian
	crc := crc32.ChecksumIEEE(data)
	// entry is what the local header and the central directory's entry
	// share: from the version needed to the length of the extra field.
	entry := func(b []byte) []byte {
		b = le.AppendUint16(b, 20) // version needed: 2.0
		b = le.AppendUint16(b, 0)  // flags
		b = le.AppendUint16(b, 0)  // method: stored
		b = le.AppendUint16(b, 0)  // time
		b = le.AppendUint16(b, 0x21)
		b = le.AppendUint32(b, crc)
		b = le.AppendUint32(b, uint32(len(data))) // compressed
		b = le.AppendUint32(b, uint32(len(data)))
		b = le.AppendUint16(b, uint16(len(name)))
		return le.AppendUint16(b, 0) // extra
	}
	// The local file header, then the data.
	b := le.AppendUint32(nil, 0x04034b50)
	b = entry(b)
	b = append(b, name...)
	b = append(b, data...)
	// The central directory's one entry.
	dir := len(b)
	b = le.AppendUint32(b, 0x02014b50)
	b = le.AppendUint16(b, 20) // version made by
	b = entry(b)
	b = le.AppendUint16(b, 0) // comment
	b = le.AppendUint16(b, 0) // disk
	b = le.AppendUint16(b, 0) // internal attributes
	b = le.AppendUint32(b, 0) // external attributes
	b = le.AppendUint32(b, 0) // offset of the local header
	b = append(b, name...)
	// The end of the central directory.
	end := len(b)
	b = le.AppendUint32(b, 0x06054b50)
	b = le.AppendUint16(b, 0)
	b = le.AppendUint16(b, 0)
	b = le.AppendUint16(b, 1)
	b = le.AppendUint16(b, 1)
	b = le.AppendUint32(b, uint32(end-dir))
	b = le.AppendUint32(b, uint32(dir))
	return le.AppendUint16(b, 0) // comment
}

// openWorkbook opens b, with its own styles when styled is true (cells
// formatted as dates are then marked as such) or without them (every cell
// as stored). A workbook without styles is read as unstyled.
func openWorkbook(b []byte, styled bool) (*xlsxreader.XlsxFile, bool, error) {
	zr, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		return nil, false, fmt.Errorf("%w: %v", ErrNotWorkbook, err)
	}
	files := make([]*zip.File, 0, len(zr.File)+1)
	hasStyles := false
	for _, f := range zr.File {
		if f.Name == "xl/styles.xml" {
			if !styled {
				continue
			}
			hasStyles = true
		}
		files = append(files, f)
	}
	if !hasStyles {
		files = append(files, emptyStyles)
	}
	if err := checkSharedStrings(files); err != nil {
		return nil, false, fmt.Errorf("%w: %v", ErrNotWorkbook, err)
	}
	x, err := xlsxreader.NewReaderZip(&zip.Reader{File: files})
	if err != nil {
		return nil, false, fmt.Errorf("%w: %v", ErrNotWorkbook, err)
	}
	return x, hasStyles, nil
}

// checkSharedStrings refuses a shared-strings part whose declared count is
// negative or larger than the part itself: the reader would reserve that
// many strings before reading one.
func checkSharedStrings(files []*zip.File) error {
	for _, f := range files {
		if f.Name != "xl/sharedStrings.xml" && f.Name != "xl/SharedStrings.xml" {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			return err
		}
		d := xml.NewDecoder(io.LimitReader(rc, 1<<16))
		for {
			tok, err := d.Token()
			if err != nil {
				break // the reader reports it
			}
			se, ok := tok.(xml.StartElement)
			if !ok {
				continue
			}
			for _, a := range se.Attr {
				if a.Name.Local != "count" {
					continue
				}
				if n, err := strconv.Atoi(a.Value); err == nil && (n < 0 || uint64(n) > f.UncompressedSize64) {
					rc.Close()
					return fmt.Errorf("the shared strings declare %d strings in %d bytes", n, f.UncompressedSize64)
				}
			}
			break
		}
		rc.Close()
		return nil // the reader uses the first such part
	}
	return nil
}

// sheetRows reads the rows of a sheet ("" for the first) into cells as the
// importer reads them. A file-level failure is a *Problem; rows that cannot
// be read are left out and listed in the problems.
func sheetRows(b []byte, name, sheet string) (used string, rows []sheetRow, probs []*Problem, err error) {
	used, rows, probs, _, err = sheetRowsNotes(b, name, sheet)
	return used, rows, probs, err
}

// sheetRowsNotes is sheetRows with the notes on how the sheet was read: a
// header over several rows joined, other sheets left unread.
func sheetRowsNotes(b []byte, name, sheet string) (used string, rows []sheetRow, probs, notes []*Problem, err error) {
	fail := func(e error, detail string) (string, []sheetRow, []*Problem, []*Problem, error) {
		p := &Problem{File: name, Err: e, Detail: detail}
		p.classify()
		return sheet, nil, nil, nil, p
	}
	asked := sheet
	raw, _, err := openWorkbook(b, false)
	if err != nil {
		return fail(ErrNotWorkbook, strings.TrimPrefix(err.Error(), ErrNotWorkbook.Error()+": "))
	}
	if len(raw.Sheets) == 0 {
		return fail(ErrNoSheet, "the workbook holds no worksheet")
	}
	if sheet == "" {
		sheet = raw.Sheets[0]
	}
	found := false
	for _, s := range raw.Sheets {
		found = found || s == sheet
	}
	if !found {
		return fail(ErrNoSheet, fmt.Sprintf("sheet %q is not in the workbook, which holds %s", sheet, quoteList(raw.Sheets)))
	}
	epoch1904 := date1904(b)
	// Which cells are formatted as dates: from a second, styled reading.
	var dates []map[int]bool
	var dateLines []int
	if styled, has, err := openWorkbook(b, true); err == nil && has {
		for r := range styled.ReadRows(sheet) {
			var m map[int]bool
			for _, c := range r.Cells {
				if c.Type == xlsxreader.TypeDateTime {
					if m == nil {
						m = map[int]bool{}
					}
					m[c.ColumnIndex()] = true
				}
			}
			dates = append(dates, m)
			dateLines = append(dateLines, r.Index)
		}
	}
	line, k, slots := 0, -1, 0
	for r := range raw.ReadRows(sheet) {
		k++
		var isDate map[int]bool
		if k < len(dates) && dateLines[k] == r.Index {
			isDate = dates[k]
		}
		if r.Index > 0 {
			line = r.Index
		} else {
			line++
		}
		if r.Error != nil {
			probs = append(probs, &Problem{File: name, Line: line, Err: ErrBadRow,
				Detail: fmt.Sprintf("sheet %q: row left out: %v", sheet, r.Error)})
			continue
		}
		var cells [][]byte
		col := -1
		for _, c := range r.Cells {
			if c.Column == "" {
				col++
			} else {
				col = c.ColumnIndex()
			}
			if col < 0 || col >= maxXLSXColumns {
				probs = append(probs, &Problem{File: name, Line: line, Value: c.Value, Err: ErrBadRow,
					Detail: fmt.Sprintf("sheet %q: a cell beyond column XFD is left out", sheet)})
				col = maxXLSXColumns
				continue
			}
			for len(cells) <= col {
				cells = append(cells, nil)
			}
			cells[col] = []byte(xlsxCell(c, isDate[col], epoch1904))
		}
		slots += len(cells)
		if slots > maxXLSXCells {
			err = &Problem{File: name, Line: line, Err: ErrNotWorkbook,
				Detail: fmt.Sprintf("sheet %q holds more than %d cells, counting empty ones left of a filled cell", sheet, maxXLSXCells)}
			continue // drain the reader
		}
		rows = append(rows, sheetRow{line: line, cells: cells})
	}
	if err != nil {
		return sheet, nil, nil, nil, err
	}
	// The reader stops quietly where a sheet's XML breaks off; say so.
	f := (&xlsxreader.XlsxFileCloser{XlsxFile: *raw}).GetSheetFileForSheetName(sheet)
	if f != nil {
		if err := checkXML(f); err != nil {
			probs = append(probs, &Problem{File: name, Err: ErrBadRow,
				Detail: fmt.Sprintf("sheet %q: %v; rows after that point are not read", sheet, err)})
		}
	}
	for _, p := range probs {
		p.classify()
	}
	var joined *Problem
	if rows, joined = mergeHeader(rows, mergedSpans(f), name, sheet); joined != nil {
		notes = append(notes, joined)
	}
	if asked == "" && len(raw.Sheets) > 1 {
		p := &Problem{File: name, Err: ErrOtherSheets, Detail: fmt.Sprintf("read sheet %q, the first of the workbook's %d; not read: %s; to read another, name it (-sheet on the command line) or move it to the front",
			sheet, len(raw.Sheets), quoteList(raw.Sheets[1:]))}
		p.classify()
		notes = append(notes, p)
	}
	return sheet, rows, probs, notes, nil
}

// xlsxCell is a cell as the text importer reads it: numbers in plain
// decimal notation, dates in ISO 8601, times as hh:mm:ss, booleans as
// TRUE or FALSE. epoch1904 says the workbook counts days from 1904.
func xlsxCell(c xlsxreader.Cell, date, epoch1904 bool) string {
	switch c.Type {
	case xlsxreader.TypeBoolean:
		switch c.Value {
		case "1":
			return "TRUE"
		case "0":
			return "FALSE"
		}
	case xlsxreader.TypeNumerical:
		v, err := strconv.ParseFloat(strings.TrimSpace(c.Value), 64)
		if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
			return c.Value
		}
		if date {
			if epoch1904 && v >= 1 {
				v += days1904 // a time of day alone is the same in both systems
			}
			if s, ok := serialText(v); ok {
				return s
			}
		}
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return c.Value
}

// serialText writes an Excel serial day (days since 1899-12-30, common
// practice for the 1900 date system after February 1900) as ISO 8601, to
// the millisecond: a date alone, a time of day alone for values below 1,
// or both.
func serialText(v float64) (string, bool) {
	if v < 0 || v > 2958465 { // 9999-12-31
		return "", false
	}
	ms := int64(math.Round(v * 86400e3))
	t := excelEpoch.Add(time.Duration(ms) * time.Millisecond)
	clock := "15:04:05"
	if ms%1000 != 0 {
		clock = "15:04:05.000"
	}
	switch {
	case ms < 86400e3:
		return t.Format(clock), true
	case ms%86400e3 == 0:
		return t.Format("2006-01-02"), true
	}
	return t.Format("2006-01-02T" + clock), true
}

// checkXML reads an XML part to its end and returns the first error.
func checkXML(f *zip.File) error {
	rc, err := f.Open()
	if err != nil {
		return err
	}
	defer rc.Close()
	d := xml.NewDecoder(rc)
	for {
		if _, err := d.Token(); err == io.EOF {
			return nil
		} else if err != nil {
			return fmt.Errorf("the sheet's XML breaks off near byte %d (%v)", d.InputOffset(), err)
		}
	}
}

// days1904 is the serial day of 1904-01-01 in the 1900 date system: a
// workbook in the 1904 system (older Mac spreadsheets) counts its serial
// days from there (common practice).
const days1904 = 1462

// date1904 reports whether a workbook uses the 1904 date system
// (workbookPr date1904 in xl/workbook.xml).
func date1904(b []byte) bool {
	zr, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		return false
	}
	for _, f := range zr.File {
		if f.Name != "xl/workbook.xml" {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			return false
		}
		defer rc.Close()
		d := xml.NewDecoder(io.LimitReader(rc, 1<<20))
		for {
			tok, err := d.Token()
			if err != nil {
				return false
			}
			se, ok := tok.(xml.StartElement)
			if !ok {
				continue
			}
			switch se.Name.Local {
			case "workbookPr":
				for _, a := range se.Attr {
					if a.Name.Local == "date1904" {
						return a.Value == "1" || a.Value == "true"
					}
				}
				return false
			case "sheets":
				return false // workbookPr comes before the sheets
			}
		}
	}
	return false
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = strconv.Quote(x)
	}
	return strings.Join(q, ", ")
}
