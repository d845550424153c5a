package sample

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"
	"time"

	"lixiv/engine/chem"
)

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }

func TestReadDelimiters(t *testing.T) {
	// 40.078 mg/L Ca = 1000 µmol/L (docs/methods.md §2.3, IUPAC 2021 weights).
	tests := []struct {
		name       string
		text       string
		comma, dec rune
		opt        Options
	}{
		{"comma", "Site,Ca (mg/L),Na (mg/L)\nA,40.078,1\n", ',', '.', Options{}},
		{"semicolon", "Site;Ca (mg/L);Na (mg/L)\nA;40.078;1\n", ';', '.', Options{}},
		{"semicolon, decimal comma", "Site;Ca (mg/L);Na (mg/L)\nA;40,078;1\n", ';', ',', Options{}},
		{"tab (pasted cells)", "Site\tCa (mg/L)\tNa (mg/L)\t\nA\t40.078\t1\t\n", '\t', '.', Options{}},
		{"tab, decimal comma", "Site\tCa (mg/L)\tNa (mg/L)\nA\t40,078\t1\n", '\t', ',', Options{}},
		{"CRLF", "Site,Ca (mg/L),Na (mg/L)\r\nA,40.078,1\r\n", ',', '.', Options{}},
		{"CR only (old exports)", "Site,Ca (mg/L),Na (mg/L)\rA,40.078,1\r", ',', '.', Options{}},
		{"UTF-8 BOM", "\ufeffSite,Ca (mg/L),Na (mg/L)\nA,40.078,1\n", ',', '.', Options{}},
		{"quoted fields", "\"Site\",\"Ca (mg/L)\",\"Na (mg/L)\"\n\"A\",\"40.078\",\"1\"\n", ',', '.', Options{}},
		{"no final newline", "Site,Ca (mg/L),Na (mg/L)\nA,40.078,1", ',', '.', Options{}},
		{"blank lines", "\n\nSite,Ca (mg/L),Na (mg/L)\n\nA,40.078,1\n\n", ',', '.', Options{}},
		{"semicolon, decimal comma, trailing empty cells", "Site;Ca;Na;Remark\n;mg/L;mg/L;\nA;40,078;1,5;\nB;40,078;1,25;\nC;40,078;n.a.;dry\nD;40,078;2,5;\n", ';', ',', Options{}},
		// A quoted note holding line breaks and the other delimiters: the
		// delimiter is judged on records, not on the pieces of one.
		{"quoted line breaks and commas in a tab table", "Site\tCa (mg/L)\tNote\nA\t40.078\t\"wet,\nwindy,\ncold,\"\n", '\t', '.', Options{}},
		{"semicolon, decimal comma set", "Site;Ca (mg/L);Na (mg/L)\nA;40,078;1\n", ';', ',', Options{Decimal: ','}},
		{"tab with ragged trailing tabs", "Site\tCa (mg/L)\tNa (mg/L)\tNote\nA\t40.078\t1\t\nB\t40.078\t2\nC\t40.078\t3\tx\n", '\t', '.', Options{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tb := ParseText(tc.text, "t.csv", tc.opt)
			if err := tb.Problems.Err(); err != nil {
				t.Fatalf("problems: %v", err)
			}
			if tb.Comma != tc.comma || tb.Decimal != tc.dec {
				t.Errorf("delimiter %q, decimal %q; want %q, %q", tb.Comma, tb.Decimal, tc.comma, tc.dec)
			}
			if len(tb.Samples) < 1 {
				t.Fatalf("got no samples")
			}
			s := tb.Samples[0]
			if s.Site != "A" || !near(s.C[chem.Ca], 1000, 1e-12) {
				t.Errorf("got site %q Ca %v; want A, 1000 µmol/L", s.Site, s.C[chem.Ca])
			}
		})
	}
}

func TestReadEncodings(t *testing.T) {
	utf16le := func(s string) []byte {
		b := []byte{0xff, 0xfe}
		for _, r := range s {
			b = append(b, byte(r), byte(r>>8))
		}
		return b
	}
	tests := []struct {
		name string
		in   []byte
	}{
		{"UTF-16LE with BOM (spreadsheet Unicode text)", utf16le("Site\tCa (µmol/L)\nA\t1000\n")},
		{"Latin-1 micro sign", []byte("Site,Ca (\xb5mol/L)\nA,1000\n")},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tb, err := Read(bytes.NewReader(tc.in), "t.txt", Options{})
			if err != nil || tb.Problems.Err() != nil {
				t.Fatalf("err %v, problems %v", err, tb.Problems.Err())
			}
			if len(tb.Samples) != 1 || tb.Samples[0].C[chem.Ca] != 1000 {
				t.Fatalf("got %d samples; want one with Ca 1000 µmol/L", len(tb.Samples))
			}
			if got := tb.Columns[1].Label; got != "µmol/L" {
				t.Errorf("unit label %q, want µmol/L", got)
			}
		})
	}
}

func TestReadQuotes(t *testing.T) {
	text := "Sample,Ca (mg/L),Note\nA1,1,\"a, b\"\nA2,2,\"two\nlines \"\"quoted\"\"\"\nA3,3,plain\n"
	tb := ParseText(text, "q.csv", Options{})
	if err := tb.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	want := []struct {
		id, note string
		line     int
	}{{"A1", "a, b", 2}, {"A2", "two\nlines \"quoted\"", 3}, {"A3", "plain", 5}}
	if len(tb.Samples) != len(want) {
		t.Fatalf("got %d samples, want %d", len(tb.Samples), len(want))
	}
	for i, w := range want {
		s := tb.Samples[i]
		if s.ID != w.id || s.Meta["Note"] != w.note || s.Line != w.line {
			t.Errorf("sample %d = %q %q line %d; want %q %q line %d", i, s.ID, s.Meta["Note"], s.Line, w.id, w.note, w.line)
		}
	}
}

func TestReadUnitsRow(t *testing.T) {
	// Units row under the names; 1 mg/L NO3-N = 71.3929 µmol/L, 100 mg/L as
	// CaCO3 = 1998.28 µeq/L (docs/methods.md §2.3).
	text := "Site,NO3,Alkalinity,Ca,Q\n,mg/L as N,mg/L CaCO3,meq/L,m3/s\nA,1,100,2,0.5\n"
	tb := ParseText(text, "u.csv", Options{})
	if err := tb.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	s := tb.Samples[0]
	for _, c := range []struct {
		sp   chem.Species
		want float64
	}{{chem.NO3, 71.3929}, {chem.Alk, 1998.28}, {chem.Ca, 1000}} {
		if !near(s.C[c.sp], c.want, 1e-5) {
			t.Errorf("%s = %v, want %v (1e-5 relative)", c.sp, s.C[c.sp], c.want)
		}
	}
	if s.Q != 0.5 || s.Line != 3 {
		t.Errorf("Q %v line %d, want 0.5 m3/s on line 3", s.Q, s.Line)
	}
}

func TestReadCensored(t *testing.T) {
	text := "Sample,Ca (µmol/L),K (µmol/L),Na (µmol/L)\nA,<0.4,< DL,5\nB,bdl,<LOD,6\n"
	tests := []struct {
		p        Policy
		ca, caDL float64
	}{
		{HalfLimit, 0.2, 0.4}, {Zero, 0, 0.4}, {AtLimit, 0.4, 0.4}, {LeaveOut, nan, 0.4},
	}
	for _, tc := range tests {
		t.Run(tc.p.String(), func(t *testing.T) {
			tb := ParseText(text, "c.csv", Options{Policy: tc.p})
			if err := tb.Problems.Err(); err != nil {
				t.Fatal(err)
			}
			a, b := tb.Samples[0], tb.Samples[1]
			if got := a.C[chem.Ca]; !(got == tc.ca || math.IsNaN(got) && math.IsNaN(tc.ca)) {
				t.Errorf("Ca = %v, want %v", got, tc.ca)
			}
			if lim, ok := a.Limit(chem.Ca); !ok || lim != tc.caDL {
				t.Errorf("Ca limit = %v, %v; want %v", lim, ok, tc.caDL)
			}
			if lim, ok := a.Limit(chem.K); !ok || !math.IsNaN(lim) {
				t.Errorf("K limit = %v, %v; want NaN (unknown), true", lim, ok)
			}
			if a.NCensored() != 2 || b.NCensored() != 2 || a.IsCensored(chem.Na) {
				t.Errorf("censored counts %d %d, want 2 2", a.NCensored(), b.NCensored())
			}
			if a.C[chem.Na] != 5 {
				t.Errorf("Na = %v, want 5", a.C[chem.Na])
			}
		})
	}
	// Substitute reruns a table under another policy; the limits stay.
	tb := ParseText(text, "c.csv", Options{})
	if n := tb.NCensored(); n != 4 {
		t.Errorf("NCensored = %d, want 4", n)
	}
	tb.Substitute(AtLimit)
	if got := tb.Samples[0].C[chem.Ca]; got != 0.4 {
		t.Errorf("after Substitute(AtLimit) Ca = %v, want 0.4", got)
	}
	tb.Substitute(Zero)
	if got := tb.Samples[0].C[chem.Ca]; got != 0 || tb.Policy != Zero {
		t.Errorf("after Substitute(Zero) Ca = %v, want 0", got)
	}
}

func TestReadMissingIsNaN(t *testing.T) {
	text := "Sample,Ca (mg/L)\nA,\nB,n.d.\nC,NA\nD,-\nE,--\nF,N/A\nG,-999\nH,-9999\nI,n.a.\n"
	tb := ParseText(text, "m.csv", Options{})
	if err := tb.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	if len(tb.Samples) != 9 {
		t.Fatalf("got %d samples, want 9", len(tb.Samples))
	}
	for _, s := range tb.Samples {
		if !math.IsNaN(s.C[chem.Ca]) || s.IsCensored(chem.Ca) {
			t.Errorf("sample %s: Ca = %v, want NaN (missing, never 0)", s.ID, s.C[chem.Ca])
		}
	}
}

// Each bad input gives a positioned problem with its message; the rest of
// the table loads.
func TestReadBadInput(t *testing.T) {
	tests := []struct {
		name    string
		text    string
		err     error
		msg     string
		samples int
	}{
		{"negative concentration", "Sample,Ca (mg/L),Na (mg/L)\nA,-1.5,2\nB,3,4\n", ErrNegative,
			`bad.csv:2:2 (Ca (mg/L)): "-1.5": negative value; a concentration cannot be negative; left missing`, 2},
		{"text in a numeric column", "Sample,Ca (mg/L),Na (mg/L)\nA,high,2\nB,3,4\n", ErrNotNumber,
			`bad.csv:2:2 (Ca (mg/L)): "high": not a number; left missing; write a number, a value below detection such as "<0.05", or leave the cell blank`, 2},
		{"duplicated species column", "Sample,Ca (mg/L),Calcium (µmol/L)\nA,1,25\n", ErrDuplicateColumn,
			`bad.csv:1:2 (Ca (mg/L)): duplicated column; Ca is in column 2 "Ca (mg/L)" and column 3 "Calcium (µmol/L)"; none is read: remove all but one of the Ca columns, or name the one to read in "columns to use"`, 1},
		{"conflicting units", "Sample,Ca (mg/L),Na\n,µmol/L,mg/L\nA,1,2\n", ErrUnitConflict,
			`bad.csv:2:2 (Ca (mg/L)): "µmol/L": conflicting units; the header says "mg/L" but the units row says "µmol/L"; values kept as text`, 1},
		{"unknown unit", "Sample,Ca (mg/L),Na\n,mg/L,furlongs\nA,1,2\n", ErrUnknownUnit,
			`bad.csv:2:3 (Na): "furlongs": unknown unit; "furlongs" is not a unit for concentration; values kept as text`, 1},
		{"no unit", "Sample,Ca,Na (mg/L)\nA,1,2\n", ErrNoUnit,
			`bad.csv:1:2 (Ca): no unit given; no unit for Ca in the header or a units row; values kept as text: give the unit in the header, as in "Ca (mg/L)", or set "default unit"`, 1},
		{"unit that does not apply", "Sample,Ca (mg/L as N),Na (mg/L)\nA,1,2\n", ErrUnitMismatch,
			`bad.csv:1:2 (Ca (mg/L as N)): unit does not apply; Ca cannot be in mg/L as N; values kept as text`, 1},
		{"pH out of range", "Sample,pH,Na (mg/L)\nA,17,2\n", ErrOutOfRange,
			`bad.csv:2:2 (pH): "17": value out of range; pH must lie between 0 and 14; left missing`, 1},
		{"negative discharge", "Sample,Q (m3/s),Na (mg/L)\nA,-2,2\n", ErrNegative,
			`bad.csv:2:2 (Q (m3/s)): "-2": negative value; discharge cannot be negative; left missing`, 1},
		{"bad date", "Sample,Date,Na (mg/L)\nA,31/02/2024,2\nB,2024-01-02,3\n", ErrBadDate,
			`bad.csv:2:2 (Date): "31/02/2024": not a date; not a valid date read day first; kept as text`, 2},
		{"extra fields", "Sample,Na (mg/L)\nA,2,oops\n", ErrFieldCount,
			`bad.csv:2:3: "oops": wrong number of fields; the row has more fields than the header (2); kept as text under "column 3"`, 1},
		{"unterminated quote", "Sample,Na (mg/L),Note\nA,2,\"open\nB,3,x\n", ErrQuote,
			`bad.csv:2: unterminated quote; a quoted field is not closed before the end of the file`, 1},
		{"binary file", "\x00\x01\x02garbage", ErrNotTable,
			`bad.csv: not a sample table; the file holds binary data, not text`, 0},
		{"workbook", "PK\x03\x04xl/workbook.xml", ErrNotTable,
			`bad.csv: not a sample table; this is a zip archive (an .xlsx workbook?); open it as a workbook, save the sheet as CSV or paste its cells`, 0},
		{"empty file", " \n\n", ErrNotTable, `bad.csv: not a sample table; the file is empty`, 0},
		{"prose", "Dear colleague, please find the results attached.\nBest wishes\n", ErrNotTable,
			`bad.csv:1: not a sample table; no column names a species, date, site or sample; every column is kept as text; headers not recognised: "Dear colleague", "please find the results attached." (rename a column to a name the importer reads)`, 1},
		{"no species recognised", "Sample,When,Sodum,Potasium\nA1,2024-01-01,4.1,0.4\n", ErrNoColumn,
			`bad.csv:1: column not found; no column was recognised as a species concentration (such as "Na (mg/L)", "Ca2+ [µmol/L]", "Alkalinity as CaCO3 (mg/L)"); headers not recognised: "When", "Sodum", "Potasium" (rename a column to a name the importer reads)`, 1},
		{"header only", "Sample,Na (mg/L)\n", ErrNotTable, `bad.csv:1: not a sample table; the header has no data rows below it`, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tb := ParseText(tc.text, "bad.csv", Options{})
			err := tb.Problems.Err()
			if !errors.Is(err, tc.err) {
				t.Fatalf("problems %v; want one that is %v", err, tc.err)
			}
			var found bool
			for _, p := range tb.Problems {
				if errors.Is(p, tc.err) {
					found = true
					if p.Error() != tc.msg {
						t.Errorf("message\n got %s\nwant %s", p.Error(), tc.msg)
					}
					break
				}
			}
			if !found {
				t.Errorf("no problem unwraps to %v", tc.err)
			}
			if len(tb.Samples) != tc.samples {
				t.Errorf("got %d samples, want %d (the rest of the table loads)", len(tb.Samples), tc.samples)
			}
		})
	}
}

func TestReadKeepsText(t *testing.T) {
	// A column kept as text because of a problem keeps its cells in Meta.
	tb := ParseText("Sample,Ca,Lab\nA,12.5,north\n", "k.csv", Options{})
	s := tb.Samples[0]
	if s.Meta["Ca"] != "12.5" || s.Meta["Lab"] != "north" || !math.IsNaN(s.C[chem.Ca]) {
		t.Errorf("Meta = %v, Ca = %v; want the text kept and Ca missing", s.Meta, s.C[chem.Ca])
	}
	if tb.Columns[1].Kind != Meta || tb.Columns[1].Note == "" {
		t.Errorf("column Ca read as %v with note %q; want metadata with a note", tb.Columns[1].Kind, tb.Columns[1].Note)
	}
}

func TestReadOptions(t *testing.T) {
	text := "Sample,Ca,Q,Lab code\nA,1,20,X\n"
	tb := ParseText(text, "o.csv", Options{Units: map[string]string{"": "mmol/L", "Q": "L/s"}, Map: map[string]string{"Lab code": "site"}})
	if err := tb.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	s := tb.Samples[0]
	if s.C[chem.Ca] != 1000 || s.Q != 0.02 || s.Site != "X" {
		t.Errorf("Ca %v Q %v site %q; want 1000 µmol/L, 0.02 m3/s, X", s.C[chem.Ca], s.Q, s.Site)
	}
	// Map to "" keeps a recognised column as text.
	tb = ParseText(text, "o.csv", Options{Units: map[string]string{"": "mmol/L", "Q": "L/s"}, Map: map[string]string{"Ca": ""}})
	if tb.Samples[0].Meta["Ca"] != "1" || tb.Samples[0].C.Has(chem.Ca) {
		t.Errorf("Ca mapped to metadata: Meta %v", tb.Samples[0].Meta)
	}
	// Forced delimiter and decimal mark.
	tb = ParseText("Sample;Ca (mg/L)\nA;40,078\n", "o.csv", Options{Comma: ';', Decimal: ','})
	if got := tb.Samples[0].C[chem.Ca]; !near(got, 1000, 1e-12) {
		t.Errorf("Ca = %v, want 1000", got)
	}
}

func TestReadDates(t *testing.T) {
	utc := func(y, m, d, hh, mm int) time.Time { return time.Date(y, time.Month(m), d, hh, mm, 0, 0, time.UTC) }
	ambiguous := "Sample,Date,Na (mg/L)\nA,03/04/2024,1\nB,05/06/2024,2\n"
	t.Run("ambiguous is reported, not guessed", func(t *testing.T) {
		tb := ParseText(ambiguous, "d.csv", Options{})
		if n := tb.Problems.Count(ErrAmbiguousDate); n != 1 {
			t.Fatalf("%d ambiguous-date problems, want 1: %v", n, tb.Problems)
		}
		want := `d.csv:2:2 (Date): "03/04/2024": ambiguous date order; all 2 dates, such as this one, read both day-first and month-first; set "date order" to day-first or month-first; the dates are kept as text until then`
		if got := tb.Problems[0].Error(); got != want {
			t.Errorf("message\n got %s\nwant %s", got, want)
		}
		for _, s := range tb.Samples {
			if s.HasTime || s.Meta["Date"] == "" {
				t.Errorf("sample %s: HasTime %v, text %q; want no time and the text kept", s.ID, s.HasTime, s.Meta["Date"])
			}
		}
	})
	for _, tc := range []struct {
		order DateOrder
		want  time.Time
	}{{DayFirst, utc(2024, 4, 3, 0, 0)}, {MonthFirst, utc(2024, 3, 4, 0, 0)}} {
		t.Run("caller chooses "+tc.order.String(), func(t *testing.T) {
			tb := ParseText(ambiguous, "d.csv", Options{DateOrder: tc.order})
			if err := tb.Problems.Err(); err != nil {
				t.Fatal(err)
			}
			if s := tb.Samples[0]; !s.HasTime || !s.DateOnly || !s.Time.Equal(tc.want) {
				t.Errorf("time %v (has %v), want %v", s.Time, s.HasTime, tc.want)
			}
		})
	}
	t.Run("the column proves day first", func(t *testing.T) {
		tb := ParseText("Sample,Date,Time,Na (mg/L)\nA,03/04/2024,09:30,1\nB,25/04/2024,,2\n", "d.csv", Options{})
		if err := tb.Problems.Err(); err != nil {
			t.Fatal(err)
		}
		if s := tb.Samples[0]; !s.Time.Equal(utc(2024, 4, 3, 9, 30)) || s.DateOnly {
			t.Errorf("time %v, want 2024-04-03 09:30 with a time of day", s.Time)
		}
		if s := tb.Samples[1]; !s.Time.Equal(utc(2024, 4, 25, 0, 0)) || !s.DateOnly {
			t.Errorf("time %v, want 2024-04-25, date only", s.Time)
		}
	})
	t.Run("the column proves month first", func(t *testing.T) {
		tb := ParseText("Sample,Date,Na (mg/L)\nA,03/04/2024,1\nB,04/25/2024,2\n", "d.csv", Options{})
		if s := tb.Samples[0]; tb.Problems.Err() != nil || !s.Time.Equal(utc(2024, 3, 4, 0, 0)) {
			t.Errorf("time %v, problems %v; want 2024-03-04", s.Time, tb.Problems.Err())
		}
	})
	t.Run("mixed orders", func(t *testing.T) {
		tb := ParseText("Sample,Date,Na (mg/L)\nA,13/04/2024,1\nB,04/25/2024,2\n", "d.csv", Options{})
		if tb.Problems.Count(ErrAmbiguousDate) != 1 || tb.Samples[0].HasTime {
			t.Errorf("problems %v; want one ambiguous-date problem and no times", tb.Problems)
		}
	})
	t.Run("ISO needs no order", func(t *testing.T) {
		tb := ParseText("Sample,Date,Na (mg/L)\nA,2024-04-03T10:00Z,1\n", "d.csv", Options{})
		if s := tb.Samples[0]; tb.Problems.Err() != nil || !s.Time.Equal(utc(2024, 4, 3, 10, 0)) {
			t.Errorf("time %v, problems %v", s.Time, tb.Problems.Err())
		}
	})
}

func TestReadPreambleAndExtras(t *testing.T) {
	text := "Corrie Vale burn survey\nfictional data\nSample,Site,Na (mg/L),Ca (mg/L),DOC (mg/L)\nA,CV,1,2,3.5\n"
	tb := ParseText(text, "p.csv", Options{})
	if len(tb.Preamble) != 2 || tb.Preamble[0] != "Corrie Vale burn survey" {
		t.Errorf("preamble %q, want the two title lines", tb.Preamble)
	}
	if got := tb.Samples[0].Meta["DOC (mg/L)"]; got != "3.5" {
		t.Errorf("DOC kept as %q, want 3.5", got)
	}
	if got := len(tb.Species()); got != 2 {
		t.Errorf("Species() has %d entries, want 2", got)
	}
}

func TestProblemList(t *testing.T) {
	var l ProblemList
	if l.Err() != nil {
		t.Fatal("empty list must give a nil error")
	}
	l = append(l, &Problem{File: "f.csv", Line: 3, Col: 2, Header: "Ca", Value: "x", Err: ErrNotNumber},
		&Problem{File: "f.csv", Line: 4, Col: 2, Header: "Ca", Value: "-1", Err: ErrNegative})
	err := l.Err()
	if !errors.Is(err, ErrNegative) || !errors.Is(err, ErrNotNumber) || errors.Is(err, ErrBadDate) {
		t.Error("errors.Is must find the sentinels in the list, and only those")
	}
	want := `f.csv:3:2 (Ca): "x": not a number (and 1 more problems)`
	if err.Error() != want {
		t.Errorf("got %q, want %q", err.Error(), want)
	}
	var p *Problem
	if !errors.As(err, &p) || p.Line != 3 {
		t.Error("errors.As must reach the first problem")
	}
}

func TestMaxProblems(t *testing.T) {
	var b strings.Builder
	b.WriteString("Sample,Na (mg/L)\n")
	for i := 0; i < 50; i++ {
		b.WriteString("A,x\n")
	}
	tb := ParseText(b.String(), "m.csv", Options{MaxProblems: 10})
	if len(tb.Problems) != 11 || !errors.Is(tb.Problems[10], ErrTooMany) || len(tb.Samples) != 50 {
		t.Fatalf("got %d problems, %d samples; want 10 + one ErrTooMany, 50 samples", len(tb.Problems), len(tb.Samples))
	}
	if want := "m.csv: too many problems; 40 more problems not listed"; tb.Problems[10].Error() != want {
		t.Errorf("got %q, want %q", tb.Problems[10].Error(), want)
	}
}

func TestReadOpenQuoteLongFile(t *testing.T) {
	// A quote left open swallows the rest of the file into one field, which
	// is reported; reading stays linear in the file size.
	var b strings.Builder
	b.WriteString("Sample,Na (mg/L),Note\nA,1,\"open\n")
	for i := 0; i < 100000; i++ {
		b.WriteString("B,2,x\n")
	}
	tb := ParseText(b.String(), "q.csv", Options{})
	if len(tb.Samples) != 1 || tb.Problems.Count(ErrQuote) != 1 {
		t.Errorf("got %d samples and problems %v; want 1 sample and one ErrQuote", len(tb.Samples), tb.Problems)
	}
	if got := len(tb.Samples[0].Meta["Note"]); got != len("open")+100000*len("\nB,2,x") {
		t.Errorf("note holds %d bytes, want the whole rest of the file", got)
	}
}

func TestRequire(t *testing.T) {
	tests := []struct {
		name, text string
		kinds      []Kind
		want       []string
	}{
		{"all there", "Sample,Date,Na (mg/L)\nA,2024-01-02,1\n", []Kind{Concentration, Date}, nil},
		{"no date", "# lab sheet\nSample,When,Na (mg/L),Remark\nA,2024-01-02,1,ok\n", []Kind{Concentration, Date},
			[]string{`r.csv:2: column not found; no column was recognised as the sampling date (such as "Date", "Sampling date" or "Datetime"); headers not recognised: "When", "Remark" (rename a column to a name the importer reads)`}},
		{"no site, nothing unrecognised", "Sample,Date,Na (mg/L)\nA,2024-01-02,1\n", []Kind{Site},
			[]string{`r.csv:1: column not found; no column was recognised as the site (such as "Site" or "Station")`}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got []string
			for _, p := range ParseText(tc.text, "r.csv", Options{}).Require(tc.kinds...) {
				if !errors.Is(p, ErrNoColumn) {
					t.Errorf("%v does not unwrap to ErrNoColumn", p)
				}
				got = append(got, p.Error())
			}
			if strings.Join(got, "\n") != strings.Join(tc.want, "\n") {
				t.Errorf("got\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(tc.want, "\n"))
			}
		})
	}
}

// SamplesText compares two reads of one table: the same samples on other
// lines give the same text, a changed value does not.
func TestSamplesText(t *testing.T) {
	a := ParseText("Site,Ca (mg/L)\nA,40.078\n", "a.csv", Options{})
	b := ParseText("# comment\nSite,Ca (mg/L)\n\nA,40.078\n", "b.csv", Options{})
	c := ParseText("Site,Ca (mg/L)\nA,40.079\n", "c.csv", Options{})
	if a.Samples[0].Line == b.Samples[0].Line {
		t.Fatalf("the reads should differ in lines")
	}
	if a.SamplesText() != b.SamplesText() {
		t.Errorf("same samples on other lines:\n%s\n%s", a.SamplesText(), b.SamplesText())
	}
	if a.SamplesText() == c.SamplesText() {
		t.Errorf("a changed value gives the same text:\n%s", c.SamplesText())
	}
}

// TestReadShortHeader: where no line fills half the fields the file's
// lines usually have (here the wide lines are rows commented out), the
// first line that is not a comment is still the header, and the lines after
// it are its rows, the comments among them noted.
func TestReadShortHeader(t *testing.T) {
	tests := []struct {
		name, text string
		preamble   int
		samples    []string
	}{
		{"wide rows commented out", "Sample,Na (mg/L)\n#A,1,,,x\n#B,2,,,y\nC,3\n", 0, []string{"C"}},
		{"a note above", "# exported\nSample,Na (mg/L)\n#A,1,,,x\n#B,2,,,y\n\nC,3\n", 1, []string{"C"}},
		{"tabs", "Sample\tNa (mg/L)\n#A\t1\t\t\tx\n#B\t2\t\t\ty\nC\t3\nD\t4\n", 0, []string{"C", "D"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tb := ParseText(tc.text, "short.csv", Options{})
			if len(tb.Preamble) != tc.preamble {
				t.Errorf("preamble %q, want %d lines", tb.Preamble, tc.preamble)
			}
			var names []string
			for _, s := range tb.Samples {
				names = append(names, s.ID)
			}
			if strings.Join(names, ",") != strings.Join(tc.samples, ",") {
				t.Errorf("samples %q, want %q (problems: %v)", names, tc.samples, tb.Problems.Err())
			}
			if tb.Header != 1+tc.preamble {
				t.Errorf("header on line %d, want %d", tb.Header, 1+tc.preamble)
			}
			if tb.Notes.Count(ErrComment) != 2 {
				t.Errorf("%d comment lines noted, want 2", tb.Notes.Count(ErrComment))
			}
		})
	}
}
