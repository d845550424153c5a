package sample

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/internal/golden"
	"lixiv/engine/internal/watchdog"
)

// xc is one cell of a test worksheet: ref such as "B3", t the cell type
// attribute ("" number, "s" shared string, "inlineStr", "b", "str"), s the
// style index (1 = date, numFmtId 14; 2 = time "h:mm", custom 164), v the
// stored value (for "s" the string itself; the builder indexes it).
type xc struct {
	ref, t string
	s      int
	v      string
}

// buildXLSX writes a minimal workbook (Office Open XML, ECMA-376 part 1:
// content types, package and workbook relationships, workbook, styles,
// shared strings and one worksheet per sheet) holding the given sheets.
// Extra text, such as a workbookPr element, goes into the workbook before
// its sheets.
func buildXLSX(t testing.TB, names []string, sheets [][][]xc, extra ...string) []byte {
	t.Helper()
	var shared []string
	index := map[string]int{}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	put := func(name, body string) {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write([]byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" + body)); err != nil {
			t.Fatal(err)
		}
	}
	const main = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	const rel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
	var ct, wb, wbRels strings.Builder
	ct.WriteString(`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>` +
		`<Default Extension="xml" ContentType="application/xml"/>` +
		`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>` +
		`<Override PartName="/xl/styles.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml"/>` +
		`<Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/>`)
	wb.WriteString(`<workbook ` + main + ` xmlns:r="` + rel + `">` + strings.Join(extra, "") + `<sheets>`)
	wbRels.WriteString(`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`)
	for i, name := range names {
		n := strconv.Itoa(i + 1)
		fmt.Fprintf(&ct, `<Override PartName="/xl/worksheets/sheet%s.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>`, n)
		fmt.Fprintf(&wb, `<sheet name="%s" sheetId="%s" r:id="rId%s"/>`, name, n, n)
		fmt.Fprintf(&wbRels, `<Relationship Id="rId%s" Type="%s/worksheet" Target="worksheets/sheet%s.xml"/>`, n, rel, n)
		var sh strings.Builder
		sh.WriteString(`<worksheet ` + main + `><sheetData>`)
		for _, row := range sheets[i] {
			if len(row) == 0 {
				continue
			}
			fmt.Fprintf(&sh, `<row r="%s">`, strings.TrimLeft(row[0].ref, "ABCDEFGHIJKLMNOPQRSTUVWXYZ"))
			for _, c := range row {
				attr := fmt.Sprintf(`r="%s"`, c.ref)
				if c.t != "" {
					attr += fmt.Sprintf(` t="%s"`, c.t)
				}
				if c.s != 0 {
					attr += fmt.Sprintf(` s="%d"`, c.s)
				}
				var esc bytes.Buffer
				xmlEscape(&esc, c.v)
				switch c.t {
				case "inlineStr":
					fmt.Fprintf(&sh, `<c %s><is><t xml:space="preserve">%s</t></is></c>`, attr, esc.String())
				case "s":
					k, ok := index[c.v]
					if !ok {
						k = len(shared)
						index[c.v] = k
						shared = append(shared, c.v)
					}
					fmt.Fprintf(&sh, `<c %s><v>%d</v></c>`, attr, k)
				default:
					fmt.Fprintf(&sh, `<c %s><v>%s</v></c>`, attr, esc.String())
				}
			}
			sh.WriteString(`</row>`)
		}
		sh.WriteString(`</sheetData></worksheet>`)
		put("xl/worksheets/sheet"+n+".xml", sh.String())
	}
	ct.WriteString(`</Types>`)
	wb.WriteString(`</sheets></workbook>`)
	fmt.Fprintf(&wbRels, `<Relationship Id="rIdS" Type="%s/styles" Target="styles.xml"/>`+
		`<Relationship Id="rIdT" Type="%s/sharedStrings" Target="sharedStrings.xml"/></Relationships>`, rel, rel)
	put("[Content_Types].xml", ct.String())
	put("_rels/.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	put("xl/workbook.xml", wb.String())
	put("xl/_rels/workbook.xml.rels", wbRels.String())
	// Style 0 general, 1 built-in date format 14, 2 custom time format.
	put("xl/styles.xml", `<styleSheet `+main+`><numFmts count="1"><numFmt numFmtId="164" formatCode="h:mm"/></numFmts>`+
		`<cellXfs count="3"><xf numFmtId="0"/><xf numFmtId="14"/><xf numFmtId="164"/></cellXfs></styleSheet>`)
	var ss strings.Builder
	fmt.Fprintf(&ss, `<sst %s count="%d" uniqueCount="%d">`, main, len(shared), len(shared))
	for _, s := range shared {
		var esc bytes.Buffer
		xmlEscape(&esc, s)
		fmt.Fprintf(&ss, `<si><t xml:space="preserve">%s</t></si>`, esc.String())
	}
	ss.WriteString(`</sst>`)
	put("xl/sharedStrings.xml", ss.String())
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func xmlEscape(b *bytes.Buffer, s string) {
	for _, r := range s {
		switch r {
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '&':
			b.WriteString("&amp;")
		case '"':
			b.WriteString("&quot;")
		default:
			b.WriteRune(r)
		}
	}
}

// The test workbook: invented samples from the fictional Corrie Vale burn.
// Serial days count from 1899-12-30 (common practice, Excel's 1900 date
// system): 45356 is 2024-03-05, 45370 is 2024-03-19, 45384 is 2024-04-02;
// 0.4375 of a day is 10:30 and 691/1440 is 11:31.
var corrieVale = [][]xc{
	{{"A1", "s", 0, "Corrie Vale burn, spring 2024"}},
	{{"A2", "s", 0, "Sample"}, {"B2", "s", 0, "Date"}, {"C2", "s", 0, "Time"}, {"D2", "s", 0, "Ca (mg/L)"},
		{"E2", "inlineStr", 0, "Na (mg/L)"}, {"F2", "s", 0, "Cl (µmol/L)"}, {"G2", "s", 0, "Note"}},
	{{"A3", "s", 0, "CV-01"}, {"B3", "", 1, "45356"}, {"C3", "", 2, "0.4375"}, {"D3", "", 0, "4.5"},
		{"E3", "", 0, "3.2"}, {"F3", "s", 0, "<5"}, {"G3", "s", 0, "clear,\tlow flow\nafter frost"}},
	{{"A4", "s", 0, "CV-02"}, {"B4", "", 1, "45370"}, {"C4", "", 2, strconv.FormatFloat(691.0/1440, 'g', 17, 64)},
		{"D4", "", 0, "5.0999999999999996"}, {"E4", "", 0, "1.2E-5"}, {"F4", "", 0, "88"}},
	// row 5 is empty and absent, as spreadsheets store it
	{{"A6", "inlineStr", 0, "CV-03"}, {"B6", "", 1, "45384"}, {"D6", "s", 0, "high"}, {"E6", "", 0, "-1"},
		{"F6", "s", 0, "n.d."}, {"G6", "b", 0, "1"}},
}

// corrieValeCSV is the same sheet as text, as a user would save it.
const corrieValeCSV = "Corrie Vale burn, spring 2024\n" +
	"Sample,Date,Time,Ca (mg/L),Na (mg/L),Cl (µmol/L),Note\n" +
	"CV-01,2024-03-05,10:30,4.5,3.2,<5,\"clear,\tlow flow\nafter frost\"\n" +
	"CV-02,2024-03-19,11:31,5.1,0.000012,88,\n" +
	"\n" +
	"CV-03,2024-04-02,,high,-1,n.d.,TRUE\n"

var notesSheet = [][]xc{
	{{"A1", "s", 0, "Site"}, {"B1", "s", 0, "K (mg/L)"}},
	{{"A2", "s", 0, "Corrie Vale weir"}, {"B2", "", 0, "0.41"}},
}

func corrieValeBook(t testing.TB) []byte {
	return buildXLSX(t, []string{"Samples", "Field notes"}, [][][]xc{corrieVale, notesSheet})
}

func normalised(t *testing.T, tb *Table) string {
	t.Helper()
	var buf bytes.Buffer
	if err := tb.WriteCSV(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

func problemsNoLine(l ProblemList) string {
	var b strings.Builder
	for _, p := range l {
		q := *p
		q.Line = 1 // keep the column in the message
		b.WriteString(q.Error() + "\n")
	}
	return b.String()
}

func TestSheets(t *testing.T) {
	got, err := Sheets(corrieValeBook(t))
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"Samples", "Field notes"}; strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("Sheets = %q, want %q", got, want)
	}
}

func TestReadXLSXMatchesCSV(t *testing.T) {
	book := corrieValeBook(t)
	for _, sheet := range []string{"", "Samples"} {
		t.Run("sheet="+sheet, func(t *testing.T) {
			got, err := ReadXLSX(book, "vale.xlsx", sheet, Options{})
			if err != nil {
				t.Fatal(err)
			}
			want := ParseText(corrieValeCSV, "vale.xlsx", Options{})
			if g, w := normalised(t, got), normalised(t, want); g != w {
				t.Errorf("normalised table\ngot:\n%s\nwant:\n%s", g, w)
			}
			// Lines differ: the text's quoted note spans two lines
			// (TestReadXLSXCells checks the spreadsheet rows).
			if g, w := problemsNoLine(got.Problems), problemsNoLine(want.Problems); g != w {
				t.Errorf("problems\ngot:  %s\nwant: %s", g, w)
			}
			if g, w := strings.Join(got.Preamble, "|"), strings.Join(want.Preamble, "|"); g != w {
				t.Errorf("preamble %q, want %q", g, w)
			}
		})
	}
}

func TestReadXLSXCells(t *testing.T) {
	tb, err := ReadXLSX(corrieValeBook(t), "vale.xlsx", "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(tb.Samples) != 3 {
		t.Fatalf("%d samples, want 3", len(tb.Samples))
	}
	s := tb.Samples[1]
	tests := []struct {
		name string
		got  string
		want string
	}{
		{"line of CV-02 is its spreadsheet row", strconv.Itoa(s.Line), "4"},
		{"line of CV-03 after the empty row", strconv.Itoa(tb.Samples[2].Line), "6"},
		{"date and time cells joined", s.Time.Format("2006-01-02 15:04:05.000"), "2024-03-19 11:31:00.000"},
		{"note with tab and line break kept", tb.Samples[0].Meta["Note"], "clear,\tlow flow\nafter frost"},
		{"boolean cell", tb.Samples[2].Meta["Note"], "TRUE"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if tt.got != tt.want {
				t.Errorf("got %q, want %q", tt.got, tt.want)
			}
		})
	}
	// 1.2E-5 mg/L Na in µmol/L: 1.2e-2 µg/L / 22.98976928 g/mol (IUPAC
	// standard atomic weight) = 5.2197e-4 µmol/L.
	na := tb.Samples[1].C[tb.Columns[4].Species]
	if want := 1.2e-5 * 1000 / 22.98976928; math.Abs(na-want) > 1e-12 {
		t.Errorf("Na = %v µmol/L, want %v", na, want)
	}
	type pos struct {
		line, col int
		err       error
	}
	wantProbs := []pos{{6, 4, ErrNotNumber}, {6, 5, ErrNegative}}
	if len(tb.Problems) != len(wantProbs) {
		t.Fatalf("problems %v, want %d", tb.Problems, len(wantProbs))
	}
	for i, w := range wantProbs {
		p := tb.Problems[i]
		if p.Line != w.line || p.Col != w.col || !errors.Is(p, w.err) || p.File != "vale.xlsx" {
			t.Errorf("problem %d = %v, want vale.xlsx:%d:%d %v", i, p, w.line, w.col, w.err)
		}
	}
}

func TestReadXLSXSecondSheet(t *testing.T) {
	tb, err := ReadXLSX(corrieValeBook(t), "vale.xlsx", "Field notes", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(tb.Samples) != 1 || tb.Samples[0].Site != "Corrie Vale weir" {
		t.Fatalf("samples %+v, want the one weir sample", tb.Samples)
	}
	// 0.41 mg/L K / 39.0983 g/mol (IUPAC standard atomic weight) = 10.4863 µmol/L.
	k := tb.Samples[0].C[tb.Columns[1].Species]
	if want := 410 / 39.0983; math.Abs(k-want) > 1e-9 {
		t.Errorf("K = %v µmol/L, want %v", k, want)
	}
}

func TestReadXLSXBad(t *testing.T) {
	var other bytes.Buffer
	zw := zip.NewWriter(&other)
	w, _ := zw.Create("notes.txt")
	w.Write([]byte("Corrie Vale"))
	zw.Close()
	tests := []struct {
		name  string
		in    []byte
		sheet string
		err   error
		want  string
	}{
		{"text file", []byte("Sample,Ca (mg/L)\nA,1\n"), "", ErrNotWorkbook,
			`bad.xlsx: not an .xlsx workbook; zip: not a valid zip file`},
		{"empty file", nil, "", ErrNotWorkbook,
			`bad.xlsx: not an .xlsx workbook; zip: not a valid zip file`},
		{"zip without a workbook", other.Bytes(), "", ErrNotWorkbook,
			`bad.xlsx: not an .xlsx workbook; unable to initialise file: unable to get worksheets: unable to get workbook file: file not found: xl/workbook.xml`},
		{"missing sheet", corrieValeBook(t), "Chemistry", ErrNoSheet,
			`bad.xlsx: no such sheet; sheet "Chemistry" is not in the workbook, which holds "Samples", "Field notes"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tb, err := ReadXLSX(tt.in, "bad.xlsx", tt.sheet, Options{})
			if !errors.Is(err, tt.err) {
				t.Fatalf("error %v, want %v", err, tt.err)
			}
			if err.Error() != tt.want {
				t.Errorf("message\ngot:  %s\nwant: %s", err, tt.want)
			}
			if tb == nil || len(tb.Problems) != 1 || tb.Problems[0] != err {
				t.Errorf("table problems %v, want the error", tb.Problems)
			}
		})
	}
}

// TestReadXLSXBrokenSheet cuts a sheet's XML short: the rows before the
// break load and the break is reported, not passed over.
func TestReadXLSXBrokenSheet(t *testing.T) {
	book := corrieValeBook(t)
	zr, err := zip.NewReader(bytes.NewReader(book), int64(len(book)))
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, f := range zr.File {
		rc, _ := f.Open()
		var body bytes.Buffer
		body.ReadFrom(rc)
		rc.Close()
		b := body.Bytes()
		if f.Name == "xl/worksheets/sheet1.xml" {
			i := bytes.Index(b, []byte(`<row r="6">`))
			b = append(b[:i:i], []byte(`<row r="6"><c r="A6" t="inlineStr"><is><t>CV-03</t></is></c></row><row </sheetData>`)...)
		}
		w, _ := zw.Create(f.Name)
		w.Write(b)
	}
	zw.Close()
	tb, err := ReadXLSX(buf.Bytes(), "cut.xlsx", "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(tb.Samples) != 3 {
		t.Errorf("%d samples, want the 3 before the break", len(tb.Samples))
	}
	if n := tb.Problems.Count(ErrBadRow); n != 1 {
		t.Errorf("problems %v, want one ErrBadRow", tb.Problems)
	}
	want := `cut.xlsx: unreadable row; sheet "Samples": the sheet's XML breaks off near byte`
	if len(tb.Problems) == 0 || !strings.HasPrefix(tb.Problems[0].Error(), want) {
		t.Errorf("first problem %v, want it to start %q", tb.Problems, want)
	}
}

func TestSheetText(t *testing.T) {
	book := corrieValeBook(t)
	text, probs, err := SheetText(book, "vale.xlsx", "")
	if err != nil || len(probs) > 0 {
		t.Fatal(err, probs)
	}
	got := ParseText(text, "vale.xlsx", Options{})
	want, _ := ReadXLSX(book, "vale.xlsx", "", Options{})
	if g, w := normalised(t, got), normalised(t, want); g != w {
		t.Errorf("sheet text reads as\n%s\nwant\n%s\ntext:\n%s", g, w, text)
	}
	if _, _, err := SheetText(book, "vale.xlsx", "Chemistry"); !errors.Is(err, ErrNoSheet) {
		t.Errorf("missing sheet: error %v, want ErrNoSheet", err)
	}
}

// TestReadXLSX1904 reads a workbook in the 1904 date system: serial day
// 43894 counts from 1904-01-01 (common practice) and is 2024-03-05, as
// 45356 is in the 1900 system; a time of day alone is the same in both.
func TestReadXLSX1904(t *testing.T) {
	sheet := [][]xc{
		{{"A1", "s", 0, "Sample"}, {"B1", "s", 0, "Date"}, {"C1", "s", 0, "Time"}, {"D1", "s", 0, "Ca (mg/L)"}},
		{{"A2", "s", 0, "CV-01"}, {"B2", "", 1, "43894"}, {"C2", "", 2, "0.4375"}, {"D2", "", 0, "4.5"}},
		{{"A3", "s", 0, "CV-02"}, {"B3", "", 1, "43894.5"}, {"D3", "", 0, "4.6"}},
	}
	tests := []struct {
		name  string
		extra string
		want  []string
	}{
		{"1904", `<workbookPr date1904="1"/>`, []string{"2024-03-05 10:30", "2024-03-05 12:00"}},
		{"1904 false", `<workbookPr date1904="false"/>`, []string{"2020-03-04 10:30", "2020-03-04 12:00"}},
		{"1900", ``, []string{"2020-03-04 10:30", "2020-03-04 12:00"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tb, err := ReadXLSX(buildXLSX(t, []string{"S"}, [][][]xc{sheet}, tt.extra), "mac.xlsx", "", Options{})
			if err != nil || len(tb.Samples) != 2 || len(tb.Problems) > 0 {
				t.Fatalf("%v, %d samples, problems %v", err, len(tb.Samples), tb.Problems)
			}
			for i, s := range tb.Samples {
				if got := s.Time.Format("2006-01-02 15:04"); !s.HasTime || got != tt.want[i] {
					t.Errorf("sample %d: time %q, want %q", i, got, tt.want[i])
				}
			}
		})
	}
}

func TestSerialText(t *testing.T) {
	// Serial days from 1899-12-30 (common practice, Excel's 1900 date system).
	tests := []struct {
		v    float64
		want string
	}{
		{45356, "2024-03-05"},
		{0.4375, "10:30:00"},
		{45356.4375, "2024-03-05T10:30:00"},
		{45356 + 691.0/1440, "2024-03-05T11:31:00"},
		{0.5 + 1.5/86400, "12:00:01.500"},
	}
	for _, tt := range tests {
		t.Run(tt.want, func(t *testing.T) {
			got, ok := serialText(tt.v)
			if !ok || got != tt.want {
				t.Errorf("serialText(%v) = %q, %v, want %q", tt.v, got, ok, tt.want)
			}
		})
	}
	if _, ok := serialText(-1); ok {
		t.Errorf("serialText(-1) accepted")
	}
}

// FuzzReadXLSX feeds arbitrary bytes to the workbook importer: it must
// never panic, a failure must be a Problem naming the file, and every
// problem must carry a sentinel.
func FuzzReadXLSX(f *testing.F) {
	f.Add(corrieValeBook(f), "")
	f.Add(corrieValeBook(f), "Field notes")
	f.Add(buildXLSX(f, []string{"S"}, [][][]xc{{{{"XFD1", "", 0, "1"}, {"A", "s", 0, "x"}}, {{"B0", "", 1, "-5"}}}}), "S")
	f.Add([]byte("PK\x03\x04"), "")
	f.Add(mergedWorkbook(f), "")
	f.Add(mergedWorkbook(f), "Notes")
	sentinels := []error{ErrNotTable, ErrNotNumber, ErrNegative, ErrOutOfRange, ErrDuplicateColumn, ErrUnitConflict,
		ErrUnknownUnit, ErrNoUnit, ErrUnitMismatch, ErrBadDate, ErrAmbiguousDate, ErrFieldCount, ErrQuote, ErrTooMany,
		ErrNotWorkbook, ErrNoSheet, ErrBadRow}
	f.Fuzz(func(t *testing.T, in []byte, sheet string) {
		defer watchdog.Start([]any{in, sheet})()
		tb, err := ReadXLSX(in, "fuzz.xlsx", sheet, Options{})
		if tb == nil {
			t.Fatal("nil table")
		}
		if err != nil {
			var p *Problem
			if !errors.As(err, &p) || p.File != "fuzz.xlsx" {
				t.Fatalf("error is not a problem naming the file: %v", err)
			}
		}
		for _, p := range tb.Problems {
			known := false
			for _, s := range sentinels {
				known = known || errors.Is(p, s)
			}
			if !known || p.File != "fuzz.xlsx" {
				t.Fatalf("problem without a sentinel or file: %v", p)
			}
		}
		for _, s := range tb.Samples {
			for _, v := range s.C {
				if v < 0 || math.IsInf(v, 0) {
					t.Fatalf("concentration %v", v)
				}
			}
		}
	})
}

// BenchmarkReadXLSX reads a sheet of 5,000 invented Corrie Vale samples
// (shared-string IDs, date-formatted serial days, eight numbers a row).
func BenchmarkReadXLSX(b *testing.B) {
	rows := [][]xc{{{"A1", "s", 0, "Sample"}, {"B1", "s", 0, "Date"}, {"C1", "s", 0, "Na (mg/L)"}, {"D1", "s", 0, "K (mg/L)"},
		{"E1", "s", 0, "Ca (mg/L)"}, {"F1", "s", 0, "Mg (mg/L)"}, {"G1", "s", 0, "Cl (mg/L)"}, {"H1", "s", 0, "SO4 (mg/L)"},
		{"I1", "s", 0, "Alk (meq/L)"}, {"J1", "s", 0, "SiO2 (mg/L)"}}}
	for i := 0; i < 5000; i++ {
		n := strconv.Itoa(i + 2)
		row := []xc{{"A" + n, "s", 0, "CV-" + strconv.Itoa(i)}, {"B" + n, "", 1, strconv.Itoa(40000 + i)}}
		for j, col := range "CDEFGHIJ" {
			row = append(row, xc{string(col) + n, "", 0, strconv.FormatFloat(0.5+float64((i*7+j*13)%97)/10, 'f', -1, 64)})
		}
		rows = append(rows, row)
	}
	book := buildXLSX(b, []string{"Samples"}, [][][]xc{rows})
	b.SetBytes(int64(len(book)))
	b.ResetTimer()
	for b.Loop() {
		tb, err := ReadXLSX(book, "bench.xlsx", "", Options{})
		if err != nil || len(tb.Samples) != 5000 {
			b.Fatalf("%v, %d samples", err, len(tb.Samples))
		}
	}
}

// replaceParts returns book with the named parts' contents replaced.
func replaceParts(t testing.TB, book []byte, parts map[string][]byte) []byte {
	zr, err := zip.NewReader(bytes.NewReader(book), int64(len(book)))
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, f := range zr.File {
		b, ok := parts[f.Name]
		if !ok {
			rc, _ := f.Open()
			var body bytes.Buffer
			body.ReadFrom(rc)
			rc.Close()
			b = body.Bytes()
		}
		w, _ := zw.Create(f.Name)
		w.Write(b)
	}
	zw.Close()
	return buf.Bytes()
}

// FuzzXLSXParts feeds arbitrary worksheet, shared-strings and styles XML,
// inside a sound zip, to the workbook importer: it must never panic, and
// a failure must be a Problem naming the file.
func FuzzXLSXParts(f *testing.F) {
	book := corrieValeBook(f)
	zr, err := zip.NewReader(bytes.NewReader(book), int64(len(book)))
	if err != nil {
		f.Fatal(err)
	}
	part := func(name string) []byte {
		for _, z := range zr.File {
			if z.Name == name {
				rc, _ := z.Open()
				var b bytes.Buffer
				b.ReadFrom(rc)
				rc.Close()
				return b.Bytes()
			}
		}
		f.Fatalf("no part %s", name)
		return nil
	}
	f.Add(part("xl/worksheets/sheet1.xml"), part("xl/sharedStrings.xml"), part("xl/styles.xml"))
	f.Add([]byte(`<worksheet><sheetData><row><c t="s"><v>0</v></c><c><v>1e400</v></c></row></sheetData></worksheet>`),
		[]byte(`<sst count="-1"><si><t>x</t></si></sst>`), []byte(`<styleSheet><cellXfs><xf numFmtId="14"/></cellXfs></styleSheet>`))
	// A header over two rows of merged cells, with ranges out of order and
	// beyond the sheet.
	f.Add([]byte(`<worksheet><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>Sample</t></is></c>`+
		`<c r="B1" t="inlineStr"><is><t>Major ions (mg/L)</t></is></c></row><row r="2"><c r="B2" t="inlineStr"><is><t>Na</t></is></c>`+
		`<c r="C2" t="inlineStr"><is><t>Ca</t></is></c></row><row r="3"><c r="A3" t="inlineStr"><is><t>S1</t></is></c><c r="B3"><v>2.3</v></c>`+
		`<c r="C3"><v>40</v></c></row></sheetData><mergeCells><mergeCell ref="A1:A2"/><mergeCell ref="B1:C1"/><mergeCell ref="D9:C1"/>`+
		`<mergeCell ref="A1:XFD1"/></mergeCells></worksheet>`), part("xl/sharedStrings.xml"), part("xl/styles.xml"))
	f.Fuzz(func(t *testing.T, sheet, shared, styles []byte) {
		defer watchdog.Start([]any{sheet, shared, styles})()
		in := replaceParts(t, book, map[string][]byte{"xl/worksheets/sheet1.xml": sheet, "xl/sharedStrings.xml": shared, "xl/styles.xml": styles})
		tb, err := ReadXLSX(in, "fuzz.xlsx", "", Options{})
		if tb == nil {
			t.Fatal("nil table")
		}
		var p *Problem
		if err != nil && (!errors.As(err, &p) || p.File != "fuzz.xlsx") {
			t.Fatalf("error is not a problem naming the file: %v", err)
		}
		for _, s := range tb.Samples {
			for _, v := range s.C {
				if v < 0 || math.IsInf(v, 0) {
					t.Fatalf("concentration %v", v)
				}
			}
		}
	})
}

// TestXLSXTestdata keeps testdata/corrie-vale.xlsx, written from corrieVale
// by this test with -update, reading as the generator's workbook does, and
// its reading in testdata/corrie-vale-xlsx.golden.
func TestXLSXTestdata(t *testing.T) {
	path := filepath.Join("testdata", "corrie-vale.xlsx")
	gen := corrieValeBook(t)
	if *golden.Update {
		if err := os.WriteFile(path, gen, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	got, err := ReadXLSX(b, "corrie-vale.xlsx", "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	want, _ := ReadXLSX(gen, "corrie-vale.xlsx", "", Options{})
	if g, w := dump(got), dump(want); g != w {
		t.Errorf("committed workbook reads\n%s\nthe generator's reads\n%s", g, w)
	}
	golden.Check(t, "corrie-vale-xlsx.golden", []byte(dump(got)))
}
