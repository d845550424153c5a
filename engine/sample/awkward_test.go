package sample

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/problem"
)

// value is a concentration an awkward file must give: sample index,
// species, µmol/L (µeq/L for Alk) and relative tolerance. want NaN means
// the value must be missing.
type value struct {
	sample int
	sp     chem.Species
	want   float64
	tol    float64
}

// said is a message an awkward file must give: its severity, the line and
// column (0: none) and words it holds.
type said struct {
	sev   problem.Severity
	line  int
	col   int
	words string
}

// awkwardCase is one file of testdata/awkward and the outcome it must give.
type awkwardCase struct {
	file     string
	opt      Options
	samples  int
	values   []value
	dates    []string // each sample's date (UTC, "" when it has none)
	messages []said   // every problem and note, in file order
}

// Check values: 40.078 mg/L Ca is 1000 µmol/L and 100 mg/L alkalinity as
// CaCO3 is 1998.28 µeq/L; 1 mg/L NO3-N is 71.3929 µmol/L and 1 µg/L Sr is
// 0.0114129 µmol/L (docs/methods.md §13 item 1, CIAAW 2021 weights). 2.298977 mg/L
// Na is 100 µmol/L (M(Na) 22.98976928 g/mol, CIAAW 2021).
var awkwardCases = []awkwardCase{
	{file: "units-u-ascii.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 0}, {0, chem.Na, 250, 0}},
		messages: []said{{problem.Note, 1, 0, "units read: Ca and Na in µmol/L (from the header)"}}},
	{file: "units-micro-sign.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 0}, {0, chem.Na, 250, 0}},
		messages: []said{{problem.Note, 1, 0, "Ca and Na in µmol/L"}}},
	{file: "units-greek-mu.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 0}, {0, chem.Na, 250, 0}},
		messages: []said{{problem.Note, 1, 0, "Ca and Na in µmol/L"}}},
	{file: "units-mg-l.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}, {0, chem.Na, 100, 1e-6}},
		messages: []said{{problem.Note, 1, 0, "Ca and Na in mg/L (from the header)"}}},
	{file: "units-mg-L-1.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}, {0, chem.Na, 100, 1e-6}},
		messages: []said{{problem.Note, 1, 0, "Ca and Na in mg/L"}}},
	{file: "units-ppm.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}},
		messages: []said{{problem.Note, 1, 0, "ppm is read as mg/L and ppb as µg/L, which holds for fresh water"}}},
	{file: "units-ug-l.csv", samples: 1, values: []value{{0, chem.Sr, 0.0114129, 1e-5}},
		messages: []said{{problem.Note, 1, 0, "Sr in µg/L (from the header); Na in mg/L"}}},
	{file: "units-row.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}, {0, chem.Na, 250, 0}, {0, chem.Alk, 1998.28, 1e-5}},
		dates: []string{"2024-03-05"},
		messages: []said{{problem.Note, 2, 0, "Ca in mg/L (from the units row); Na in µmol/L (from the units row); Alk in mg/L as CaCO3"},
			{problem.Note, 2, 2, `dates read day-first, as the column's format "dd/mm/yyyy" says; set "date order" if they are not`}}},
	{file: "units-conflict.csv", samples: 1, values: []value{{0, chem.Ca, math.NaN(), 0}, {0, chem.Na, 100, 1e-6}},
		messages: []said{{problem.Error, 2, 3, `the header says "mg/L" but the units row says "umol/L"; values kept as text`},
			{problem.Note, 2, 0, "Na in mg/L (from the units row)"}}},
	{file: "no-unit.csv", samples: 1, values: []value{{0, chem.Ca, math.NaN(), 0}},
		messages: []said{{problem.Error, 1, 0, "no column was recognised as a species concentration"},
			{problem.Error, 1, 3, `give the unit in the header, as in "Ca (mg/L)", or set "default unit"`},
			{problem.Error, 1, 4, `as in "Na (mg/L)"`}}},
	{file: "no-unit.csv", opt: Options{Units: map[string]string{"": "mg/L"}}, samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}},
		messages: []said{{problem.Warning, 1, 3, `the file gives no unit for Ca and Na: read in mg/L, the "default unit" setting`}}},
	{file: "bom.csv", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}}, dates: []string{"2024-03-05"},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
	{file: "utf16.txt", samples: 1, values: []value{{0, chem.Ca, 1000, 1e-9}}, dates: []string{"2024-03-05"},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
	{file: "latin1.tsv", samples: 1, values: []value{{0, chem.Ca, 1000, 0}, {0, chem.Na, 250, 0}},
		messages: []said{{problem.Note, 1, 0, "Ca and Na in µmol/L"}}},
	{file: "carriage-returns.csv", samples: 2, values: []value{{1, chem.Ca, 500, 1e-9}}, dates: []string{"2024-03-05", "2024-03-06"},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
	{file: "decimal-comma.csv", samples: 2, values: []value{{0, chem.Ca, 1000, 1e-9}, {1, chem.Ca, 500, 1e-9}, {1, chem.Na, 50, 1e-6}},
		dates: []string{"2024-03-05", "2024-03-19"},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Note, 2, 0, "numbers read with a decimal comma"},
			{problem.Note, 3, 2, "dates read day-first, as this one shows (19 cannot be a month); 2 dates read so"}}},
	// K 0.39098 mg/L is 10 µmol/L (M(K) 39.0983 g/mol, CIAAW 2021); half the limit is 5.
	{file: "below-detection.csv", samples: 6,
		values: []value{{0, chem.K, 5, 1e-4}, {1, chem.K, 5, 1e-4}, {2, chem.K, math.NaN(), 0}, {5, chem.K, math.NaN(), 0}},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Warning, 2, 4, `6 values below detection (line 2 "<0.39098", line 3 "< 0.39098", line 4 "<DL", line 5 "<LOD", line 6 "bdl" and 1 more): half the limit stands in for each (setting "below detection limit"); the limits are kept; 4 give no limit and are left missing`}}},
	{file: "below-detection.csv", opt: Options{Policy: Zero}, samples: 6, values: []value{{0, chem.K, 0, 0}, {2, chem.K, 0, 0}},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Warning, 2, 4, "zero stands in for each"}}},
	{file: "not-determined.csv", samples: 2, values: []value{{0, chem.Cl, math.NaN(), 0}, {1, chem.Cl, 100, 1e-3}},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Warning, 2, 4, `1 cell read as missing, not as zero (line 2 "n.d."); "n.d." is read as not determined: if the laboratory means not detected, write its detection limit`}}},
	{file: "sentinels.csv", samples: 6, values: []value{{0, chem.Mg, math.NaN(), 0}, {3, chem.Mg, math.NaN(), 0}, {5, chem.Mg, 100, 1e-4}},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Warning, 2, 4, `5 cells read as missing, not as zero (line 2 "-999", line 3 "-9999", line 4 "NA", line 5 "n.a.", line 6 "--")`}}},
	{file: "duplicate-columns.csv", samples: 1, values: []value{{0, chem.Ca, math.NaN(), 0}, {0, chem.Na, 100, 1e-6}},
		messages: []said{{problem.Error, 1, 3, `Ca is in column 3 "Ca (mg/L)" and column 5 "Ca2+ (umol/L)"; none is read: remove all but one of the Ca columns, or name the one to read in "columns to use"`},
			{problem.Note, 1, 0, "units read: Na in mg/L"}}},
	{file: "duplicate-columns.csv", opt: Options{Use: []string{"Ca2+ (umol/L)"}}, samples: 1, values: []value{{0, chem.Ca, 990, 0}},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Note, 1, 3, `Ca is read from column 5 "Ca2+ (umol/L)", as chosen in "columns to use"; this column is kept as text`}}},
	{file: "mixed-units-column.csv", samples: 2, values: []value{{0, chem.Ca, 1000, 1e-9}, {1, chem.Ca, 500, 0}},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Note, 3, 3, "read in µmol/L, the unit the cell gives, although the column is in mg/L"}}},
	{file: "two-date-formats.csv", samples: 3, dates: []string{"2024-03-05", "2024-03-13", "2024-04-05"},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Note, 3, 2, "dates read day-first, as this one shows (13 cannot be a month)"}}},
	{file: "dates-ambiguous.csv", samples: 2, dates: []string{"", ""},
		messages: []said{{problem.Error, 2, 2, `all 2 dates, such as this one, read both day-first and month-first; set "date order" to day-first or month-first; the dates are kept as text until then`},
			{problem.Note, 1, 0, "units read"}}},
	{file: "dates-ambiguous.csv", opt: Options{DateOrder: DayFirst}, samples: 2, dates: []string{"2024-03-05", "2024-04-06"},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
	{file: "dates-month-first.csv", samples: 2, dates: []string{"2024-03-05", "2024-03-13"},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Note, 3, 2, "dates read month-first, as this one shows (13 cannot be a month); 2 dates read so"}}},
	{file: "dates-contradict.csv", samples: 2, dates: []string{"", ""},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Error, 3, 2, `line 2 "13/03/2024" reads only day-first but line 3 "03/14/2024" only month-first; set "date order" to day-first or month-first`}}},
	{file: "blank-and-comment-lines.csv", samples: 2, values: []value{{0, chem.Na, 100, 1e-6}, {1, chem.Na, 200, 1e-6}},
		messages: []said{{problem.Note, 4, 0, "units read"},
			{problem.Note, 7, 1, "the line starts with # and is read as a comment, not as a sample; remove the # if it is data"}}},
	{file: "trailing-separators.csv", samples: 2, values: []value{{1, chem.Na, 200, 1e-6}},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
	{file: "negative-and-text.csv", samples: 2, values: []value{{0, chem.Na, math.NaN(), 0}, {0, chem.Ca, 1000, 1e-9}, {1, chem.Ca, math.NaN(), 0}},
		messages: []said{{problem.Note, 1, 0, "units read"},
			{problem.Error, 2, 3, "negative value; a concentration cannot be negative; left missing"},
			{problem.Error, 3, 4, `not a number; left missing; write a number, a value below detection such as "<0.05", or leave the cell blank`}}},
	// 61.0168 mg/L HCO3 is 1000 µmol/L within 2e-5 (M(HCO3) 61.0168 from
	// CIAAW 2021 H 1.008, C 12.011, O 15.999; the importer's sum of the
	// abridged weights differs in the fifth digit).
	{file: "hco3.csv", samples: 1, values: []value{{0, chem.HCO3, 1000, 2e-5}, {0, chem.Alk, math.NaN(), 0}},
		messages: []said{{problem.Note, 1, 0, "Na and HCO3 in mg/L"}}},
	{file: "alkalinity-caco3.csv", samples: 1, values: []value{{0, chem.Alk, 1998.28, 1e-5}},
		messages: []said{{problem.Note, 1, 0, "Alk in mg/L as CaCO3 (from the header)"}}},
	{file: "nitrate-n.csv", samples: 1, values: []value{{0, chem.NO3, 71.3929, 1e-5}},
		messages: []said{{problem.Note, 1, 0, "NO3 in mg/L as N (from the header)"}}},
	{file: "quoted-fields.csv", samples: 3, values: []value{{1, chem.Na, 200, 1e-6}, {2, chem.Na, math.NaN(), 0}},
		messages: []said{{problem.Note, 1, 0, "units read"}, {problem.Error, 5, 4, `"bad": not a number`}}},
	{file: "timezone-and-time.csv", samples: 2, dates: []string{"2024-03-05T10:30", "2024-03-06T10:00"},
		messages: []said{{problem.Note, 1, 0, "units read"}}},
}

// TestAwkwardFiles reads each awkward file and checks the values read and
// every message: its severity, line, column and words.
func TestAwkwardFiles(t *testing.T) {
	for _, tc := range awkwardCases {
		t.Run(tc.file, func(t *testing.T) {
			b, err := os.ReadFile(filepath.Join("testdata", "awkward", tc.file))
			if err != nil {
				t.Fatal(err)
			}
			tb, err := Read(bytes.NewReader(b), tc.file, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			checkAwkward(t, tb, tc)
		})
	}
}

// checkAwkward compares a table with the outcome a case must give.
func checkAwkward(t *testing.T, tb *Table, tc awkwardCase) {
	t.Helper()
	if len(tb.Samples) != tc.samples {
		t.Fatalf("%d samples, want %d", len(tb.Samples), tc.samples)
	}
	for _, v := range tc.values {
		got := tb.Samples[v.sample].C[v.sp]
		switch {
		case math.IsNaN(v.want):
			if !math.IsNaN(got) {
				t.Errorf("sample %d %s = %v, want missing", v.sample+1, v.sp, got)
			}
		case math.IsNaN(got) || math.Abs(got-v.want) > v.tol*math.Abs(v.want):
			t.Errorf("sample %d %s = %.9g, want %.9g (relative tolerance %g)", v.sample+1, v.sp, got, v.want, v.tol)
		}
	}
	for i, d := range tc.dates {
		s := tb.Samples[i]
		got := ""
		if s.HasTime {
			got = s.Time.Format("2006-01-02")
			if !s.DateOnly {
				got = s.Time.Format("2006-01-02T15:04")
			}
		}
		if got != d {
			t.Errorf("sample %d date %q, want %q", i+1, got, d)
		}
	}
	all := append(append(ProblemList{}, tb.Problems...), tb.Notes...)
	if len(all) != len(tc.messages) {
		t.Errorf("%d messages, want %d:\n%s", len(all), len(tc.messages), listProblems(all))
	}
	for _, m := range tc.messages {
		found := false
		for _, p := range all {
			found = found || p.Severity == m.sev && p.Line == m.line && p.Col == m.col && strings.Contains(p.Error(), m.words) && p.File == tb.Name
		}
		if !found {
			t.Errorf("no %s at line %d column %d saying %q among\n%s", m.sev, m.line, m.col, m.words, listProblems(all))
		}
	}
}

func listProblems(l ProblemList) string {
	var b strings.Builder
	for _, p := range l {
		fmt.Fprintf(&b, "  %s %d:%d %s\n", p.Severity, p.Line, p.Col, p)
	}
	return b.String()
}

// mergedWorkbook writes an .xlsx (Office Open XML, ECMA-376 part 1) of two
// sheets: "Chemistry", whose header runs over rows 1 and 2 with merged
// cells ("Sample" and "Date" merged down, "Major ions (mg/L)" merged across
// the Na, Ca and Cl columns below it), and "Notes".
func mergedWorkbook(t testing.TB) []byte {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	put := func(name, body string) {
		w, err := zw.Create(name)
		if err == nil {
			_, err = w.Write([]byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" + body))
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	const main = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	const rel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
	sheet := func(rows [][]string, merges ...string) string {
		var sh strings.Builder
		sh.WriteString(`<worksheet ` + main + `><sheetData>`)
		for r, rec := range rows {
			fmt.Fprintf(&sh, `<row r="%d">`, r+1)
			for c, v := range rec {
				if v == "" {
					continue
				}
				ref := string(rune('A'+c)) + strconv.Itoa(r+1)
				if _, err := strconv.ParseFloat(v, 64); err == nil {
					fmt.Fprintf(&sh, `<c r="%s"><v>%s</v></c>`, ref, v)
					continue
				}
				var esc bytes.Buffer
				xml.EscapeText(&esc, []byte(v))
				fmt.Fprintf(&sh, `<c r="%s" t="inlineStr"><is><t>%s</t></is></c>`, ref, esc.String())
			}
			sh.WriteString(`</row>`)
		}
		sh.WriteString(`</sheetData>`)
		if len(merges) > 0 {
			fmt.Fprintf(&sh, `<mergeCells count="%d">`, len(merges))
			for _, m := range merges {
				fmt.Fprintf(&sh, `<mergeCell ref="%s"/>`, m)
			}
			sh.WriteString(`</mergeCells>`)
		}
		return sh.String() + `</worksheet>`
	}
	put("[Content_Types].xml", `<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">`+
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>`+
		`<Default Extension="xml" ContentType="application/xml"/></Types>`)
	put("_rels/.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	put("xl/workbook.xml", `<workbook `+main+` xmlns:r="`+rel+`"><sheets><sheet name="Chemistry" sheetId="1" r:id="rId1"/>`+
		`<sheet name="Notes" sheetId="2" r:id="rId2"/></sheets></workbook>`)
	put("xl/_rels/workbook.xml.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/worksheet" Target="worksheets/sheet1.xml"/>`+
		`<Relationship Id="rId2" Type="`+rel+`/worksheet" Target="worksheets/sheet2.xml"/></Relationships>`)
	put("xl/worksheets/sheet1.xml", sheet([][]string{
		{"Sample", "Date", "Major ions (mg/L)", "", "", "pH"},
		{"", "", "Na", "Ca", "Cl", ""},
		{"S1", "2024-03-05", "2.298977", "40.078", "3.545", "7.1"},
		{"S2", "2024-03-06", "4.597954", "<0.5", "7.09", "7.3"},
	}, "A1:A2", "B1:B2", "C1:E1", "F1:F2"))
	put("xl/worksheets/sheet2.xml", sheet([][]string{{"Note"}, {"invented for a test"}}))
	put("xl/styles.xml", `<styleSheet `+main+`><cellXfs count="1"><xf numFmtId="0"/></cellXfs></styleSheet>`)
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// TestAwkwardWorkbook reads a workbook whose header runs over two rows of
// merged cells and which has a second sheet.
func TestAwkwardWorkbook(t *testing.T) {
	b := mergedWorkbook(t)
	tb, err := ReadXLSX(b, "merged.xlsx", "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	// Cl 3.545 mg/L is 100 µmol/L (M(Cl) 35.45, CIAAW 2021 abridged).
	checkAwkward(t, tb, awkwardCase{file: "merged.xlsx", samples: 2,
		values: []value{{0, chem.Na, 100, 1e-6}, {0, chem.Ca, 1000, 1e-9}, {0, chem.Cl, 100, 1e-3}, {1, chem.Na, 200, 1e-6}},
		dates:  []string{"2024-03-05", "2024-03-06"},
		messages: []said{
			{problem.Note, 0, 0, `read sheet "Chemistry", the first of the workbook's 2; not read: "Notes"`},
			{problem.Note, 2, 0, `sheet "Chemistry": the header is written over rows 1 to 2 with merged cells; read as one row, the columns taking the unit of the merged heading above them: "Na (mg/L)", "Ca (mg/L)", "Cl (mg/L)"`},
			{problem.Note, 2, 0, "units read: Na, Ca and Cl in mg/L (from the header)"},
			{problem.Warning, 4, 4, `1 value below detection (line 4 "<0.5")`},
		}})
	if ph := tb.Samples[1].PH; ph != 7.3 {
		t.Errorf("pH of S2 %v, want 7.3 (merged down from row 1)", ph)
	}
	// The second sheet by name: no note about other sheets, no merges.
	tb, err = ReadXLSX(b, "merged.xlsx", "Notes", Options{})
	if err == nil && tb.Problems.Count(ErrNoColumn)+tb.Problems.Count(ErrNotTable) == 0 {
		t.Errorf("the notes sheet read as samples: %v", tb.Problems)
	}
	for _, p := range tb.Notes {
		if errors.Is(p, ErrOtherSheets) {
			t.Errorf("a named sheet gives a note about the others: %v", p)
		}
	}
}
