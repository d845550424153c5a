package discharge

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestReadForms(t *testing.T) {
	tests := []struct {
		name      string
		in        string
		opt       Options
		first     Day
		q         []float64 // m³/s, NaN for gaps
		delim     rune
		comma     bool
		noteMatch string
	}{
		{"csv iso m3/s", "Date,Q (m3/s)\n2021-10-01,1.5\n2021-10-02,2\n", Options{}, Date(2021, 10, 1), []float64{1.5, 2}, ',', false, "commas"},
		{"tsv pasted, no header", "2021-10-01\t1.5\n2021-10-02\t2\n", Options{Unit: M3PerS}, Date(2021, 10, 1), []float64{1.5, 2}, '\t', false, "tabs"},
		{"bom semicolon decimal comma day-first", "\ufeffDatum;Abfluss [m3/s]\n30.09.2021;1,25\n01.10.2021;1,5\n", Options{}, Date(2021, 9, 30), []float64{1.25, 1.5}, ';', true, "day-first"},
		{"month-first settled by column", "Date,Flow (cfs)\n09/30/2021,100\n10/01/2021,200\n", Options{}, Date(2021, 9, 30), []float64{100 * FT3, 200 * FT3}, ',', false, "month-first"},
		{"ambiguous with option", "Date,Q\n01/02/2021,1\n02/02/2021,2\n", Options{Unit: M3PerS, DateOrder: DayFirst}, Date(2021, 2, 1), []float64{1, 2}, ',', false, ""},
		{"L/s with units row", "Date,Discharge\n,L/s\n2021-01-01,500\n2021-01-02,1500\n", Options{}, Date(2021, 1, 1), []float64{0.5, 1.5}, ',', false, "L/s"},
		{"mm/day with area", "date,runoff (mm/day)\n2021-01-01,0.864\n", Options{AreaKm2: 100}, Date(2021, 1, 1), []float64{1}, ',', false, ""},
		{"m3/day", "date,Q_m3/day\n2021-01-01,172800\n", Options{}, Date(2021, 1, 1), []float64{2}, ',', false, ""},
		{"gap and missing codes", "Date,Q (m3/s)\n2021-01-01,1\n2021-01-02,NA\n2021-01-04,4\n2021-01-05,-999\n2021-01-06,6\n", Options{}, Date(2021, 1, 1), []float64{1, math.NaN(), math.NaN(), 4, math.NaN(), 6}, ',', false, "3 gap days in 2 gaps"},
		{"sub-daily averaged", "Date,Time,Q (m3/s)\n2021-01-01,00:00,1\n2021-01-01,12:00,3\n2021-01-02,00:00,4\n2021-01-02,12:00,6\n", Options{}, Date(2021, 1, 1), []float64{2, 5}, ',', false, "2 readings per day"},
		{"sub-daily iso timestamps", "Timestamp,Q (m3/s)\n2021-01-01T00:00,1\n2021-01-01T06:00,2\n2021-01-01T12:00,3\n2021-01-02T00:00:00Z,4\n", Options{}, Date(2021, 1, 1), []float64{2, 4}, ',', false, "1 to 3 readings per day (fewest on 2021-01-02)"},
		{"month names", "Date,Q (m3/s)\n30-Sep-2021,1\n1-Oct-2021,2\n", Options{}, Date(2021, 9, 30), []float64{1, 2}, ',', false, ""},
		{"semicolon, decimal comma, no header", "2021-01-01;1,5\n2021-01-02;2,25\n", Options{Unit: M3PerS}, Date(2021, 1, 1), []float64{1.5, 2.25}, ';', true, "semicolons"},
		{"semicolon, decimal comma set", "2021-01-01;1,5\n2021-01-02;2,25\n", Options{Unit: M3PerS, Decimal: DecimalComma}, Date(2021, 1, 1), []float64{1.5, 2.25}, ';', true, "semicolons"},
		{"spaces, decimal comma set", "2021-01-01 1,5\n2021-01-02 2,25\n", Options{Unit: M3PerS, Decimal: DecimalComma}, Date(2021, 1, 1), []float64{1.5, 2.25}, ' ', true, "spaces"},
		{"space separated", "2021-01-01 1\n2021-01-02 2\n", Options{Unit: M3PerS}, Date(2021, 1, 1), []float64{1, 2}, ' ', false, "spaces"},
		{"unit column", "Date,Q,Unit\n2021-01-01,1,m3/s\n2021-01-02,2,m3/s\n", Options{}, Date(2021, 1, 1), []float64{1, 2}, ',', false, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			imp := ReadString(tt.in, tt.opt)
			if err := imp.Problems.Err(); err != nil {
				t.Fatalf("problems: %v", err)
			}
			r := imp.Record
			if r.Len() != len(tt.q) || r.First() != tt.first {
				t.Fatalf("got %d days from %v, want %d from %v", r.Len(), r.Days, len(tt.q), tt.first)
			}
			for i, w := range tt.q {
				g := r.Q[i]
				if math.IsNaN(w) != math.IsNaN(g) || !math.IsNaN(w) && math.Abs(g-w) > 1e-12*w {
					t.Errorf("day %d: got %g m3/s, want %g", i, g, w)
				}
			}
			if imp.Delimiter != tt.delim || imp.DecimalComma != tt.comma {
				t.Errorf("got delimiter %q comma %v, want %q %v", imp.Delimiter, imp.DecimalComma, tt.delim, tt.comma)
			}
			if tt.noteMatch != "" && !strings.Contains(strings.Join(imp.Notes, "; "), tt.noteMatch) {
				t.Errorf("notes %q do not mention %q", imp.Notes, tt.noteMatch)
			}
		})
	}
}

// TestReadBadInput checks that each kind of bad input gives a positioned
// problem with a clear message and that the rest of the table loads.
func TestReadBadInput(t *testing.T) {
	tests := []struct {
		name    string
		in      string
		opt     Options
		kind    error
		msg     string    // the problem's full text
		q       []float64 // what still loads, from the first day
		first   Day
		nProbls int
	}{
		{
			name: "unsorted dates", in: "Date,Q (m3/s)\n2021-01-02,2\n2021-01-01,1\n2021-01-03,3\n",
			kind: ErrUnsorted, msg: "flow.csv:3 (Date): dates not in order: row 3 comes before a row above it; the table was loaded in date order",
			q: []float64{1, 2, 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "duplicated day", in: "Date,Q (m3/s)\n2021-01-01,1\n2021-01-02,2\n2021-01-02,9\n2021-01-03,3\n",
			kind: ErrDuplicateDay, msg: "flow.csv:4 (Date): duplicated day: day 2021-01-02 is also in row 3; row 3 is kept and this row left out",
			q: []float64{1, 2, 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "negative discharge", in: "Date,Q (m3/s)\n2021-01-01,1\n2021-01-02,-2\n2021-01-03,3\n",
			kind: ErrNegative, msg: "flow.csv:3:2 (Q (m3/s)): negative discharge: 2021-01-02: -2 is below zero; the day is left out (a gap)",
			q: []float64{1, math.NaN(), 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "text in number column", in: "Date,Q (m3/s)\n2021-01-01,1\n2021-01-02,high\n2021-01-03,3\n",
			kind: ErrNotNumber, msg: "flow.csv:3:2 (Q (m3/s)): not a number: 2021-01-02: \"high\" is not a number; the day is left out (a gap)",
			q: []float64{1, math.NaN(), 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "mixed units in a unit column", in: "Date,Q,Unit\n2021-01-01,1,m3/s\n2021-01-02,1000,L/s\n2021-01-03,3,m3/s\n",
			kind: ErrMixedUnits, msg: "flow.csv:3:3 (Unit): mixed units: L/s here but m3/s above; the value was converted with its own unit L/s",
			q: []float64{1, 1, 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "header unit against options", in: "Date,Q (L/s)\n2021-01-01,1000\n", opt: Options{Unit: M3PerS},
			kind: ErrMixedUnits, msg: "flow.csv:1:2 (Q (L/s)): mixed units: the file says L/s but the options say m3/s; the file's unit is used",
			q: []float64{1}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "ambiguous dates", in: "Date,Q (m3/s)\n01/02/2021,1\n02/02/2021,2\n",
			kind: ErrAmbiguousDate, msg: "flow.csv:2:1 (Date): ambiguous date order: every date, such as this one, reads both day-first and month-first; set \"date order\" to day-first or month-first; 2 rows were not loaded",
			nProbls: 1,
		},
		{
			name: "bad date", in: "Date,Q (m3/s)\n2021-01-01,1\n2021-02-30,2\nyesterday,3\n2021-01-02,2\n",
			kind: ErrBadDate, msg: "flow.csv:3:1 (Date): not a date: \"2021-02-30\" is not a valid calendar date",
			q: []float64{1, 2}, first: Date(2021, 1, 1), nProbls: 2,
		},
		{
			name: "no unit", in: "Date,Q\n2021-01-01,1\n",
			kind: ErrNoUnit, msg: "flow.csv:1:2 (Q): no discharge unit: state it in the header, as \"Q (m3/s)\", or in the options; nothing was loaded",
			nProbls: 1,
		},
		{
			name: "mm/day without area", in: "Date,Runoff (mm/day)\n2021-01-01,1\n",
			kind: ErrNeedArea, msg: "flow.csv:2:2 (Runoff (mm/day)): runoff in mm/day needs the catchment area in km2: 2021-01-01: the value was left out",
			q: []float64{math.NaN()}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "no date column", in: "Station,Q (m3/s)\nA,1\n",
			kind: ErrNoDateColumn, msg: "flow.csv:1: no date column: the header names no date column (Date, Day, DateTime, Timestamp)",
			nProbls: 1,
		},
		{
			name: "short row", in: "Date,Q (m3/s)\n2021-01-01,1\n2021-01-02\n2021-01-03,3\n",
			kind: ErrShortRow, msg: "flow.csv:3: row too short: 1 cells, but discharge is in column 2; the day is a gap",
			q: []float64{1, math.NaN(), 3}, first: Date(2021, 1, 1), nProbls: 1,
		},
		{
			name: "not a table", in: "\n\n",
			kind: ErrNotTable, msg: "flow.csv: not a table: no rows", nProbls: 1,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			opt := tt.opt
			opt.File = "flow.csv"
			imp := ReadString(tt.in, opt)
			if len(imp.Problems) != tt.nProbls {
				t.Errorf("got %d problems %v, want %d", len(imp.Problems), imp.Problems, tt.nProbls)
			}
			var p *Problem
			for _, q := range imp.Problems {
				if errors.Is(q, tt.kind) {
					p = q
					break
				}
			}
			if p == nil {
				t.Fatalf("no problem of kind %v in %v", tt.kind, imp.Problems)
			}
			if got := p.Error(); got != tt.msg {
				t.Errorf("message\n got  %s\n want %s", got, tt.msg)
			}
			if imp.Problems.Err() == nil {
				t.Error("Problems.Err() is nil with problems present")
			}
			r := imp.Record
			if r.Len() != len(tt.q) {
				t.Fatalf("got %d days loaded, want %d", r.Len(), len(tt.q))
			}
			if len(tt.q) > 0 && r.First() != tt.first {
				t.Errorf("first day %s, want %s", r.First(), tt.first)
			}
			for i, w := range tt.q {
				g := r.Q[i]
				if math.IsNaN(w) != math.IsNaN(g) || !math.IsNaN(w) && math.Abs(g-w) > 1e-12 {
					t.Errorf("day %d: got %g, want %g", i, g, w)
				}
			}
		})
	}
}

func TestReadMixedOrderColumn(t *testing.T) {
	imp := ReadString("Date,Q (m3/s)\n13/01/2021,1\n01/13/2021,2\n2021-01-14,3\n", Options{File: "f"})
	if imp.Problems.Count(ErrAmbiguousDate) == 0 {
		t.Fatalf("got %v, want an ambiguous date problem", imp.Problems)
	}
	want := "f:3:1 (Date): ambiguous date order: line 2 \"13/01/2021\" reads only day-first but line 3 \"01/13/2021\" only month-first; set \"date order\" to day-first or month-first; the 2 dates written with the year last were not loaded"
	if got := imp.Problems[0].Error(); got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	// The ISO row still loads.
	if imp.Record.Len() != 1 || imp.Record.Q[0] != 3 {
		t.Errorf("got %v, want the ISO day alone", imp.Record.Q)
	}
}

func TestProblemsEmpty(t *testing.T) {
	var ps Problems
	if ps.Err() != nil {
		t.Errorf("empty list Err() = %v, want nil", ps.Err())
	}
	imp := ReadString("Date,Q (m3/s)\n2021-01-01,1\n2021-01-02,x\n2021-01-03,-1\n", Options{})
	if got, want := imp.Problems.Error(), "input:3:2 (Q (m3/s)): not a number: 2021-01-02: \"x\" is not a number; the day is left out (a gap) (and 1 more problems)"; got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
}

func TestReadSpanTooLong(t *testing.T) {
	imp := ReadString("Date,Q (m3/s)\n2021-01-01,1\n1021-01-02,2\n", Options{File: "f"})
	want := "f:2 (Date): not a date: the dates run from 1021-01-02 (row 3) to 2021-01-01, more than 200 years; check the years; nothing was loaded"
	if len(imp.Problems) != 2 || imp.Problems[0].Error() != want || imp.Record.Len() != 0 {
		t.Errorf("got %v, want ... %s", imp.Problems, want)
	}
}

func TestReadManyProblems(t *testing.T) {
	var b strings.Builder
	b.WriteString("Date,Q (m3/s)\n")
	for i := 0; i < 120; i++ {
		b.WriteString(Date(2021, 1, 1+i).String() + ",x\n")
	}
	imp := ReadString(b.String(), Options{File: "f"})
	if len(imp.Problems) != MaxProblems+1 {
		t.Fatalf("got %d problems, want %d", len(imp.Problems), MaxProblems+1)
	}
	if got, want := imp.Problems[MaxProblems].Error(), "f: not a number: 70 more rows like the above are not listed"; got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	if imp.Record.Len() != 120 {
		t.Errorf("got %d days, want 120 (gaps)", imp.Record.Len())
	}
}

func TestReadUTCOffset(t *testing.T) {
	imp := ReadString("Timestamp,Q (m3/s)\n2021-01-01T06:00:00+01:00,1\n2021-01-01T18:00-0500,3\n", Options{})
	if imp.Problems.Err() != nil || imp.Record.Len() != 1 || imp.Record.Q[0] != 2 {
		t.Errorf("got %v, %v", imp.Problems, imp.Record.Q)
	}
}
