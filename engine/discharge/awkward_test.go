package discharge

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/problem"
)

// said is a message an awkward discharge file must give.
type said struct {
	sev   problem.Severity
	line  int // 0: the file as a whole
	col   int
	words string
}

// TestAwkwardFiles reads each file of testdata/awkward and checks the days
// read and every problem and notice: severity, line, column and words.
func TestAwkwardFiles(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		file     string
		opt      Options
		first    Day
		q        []float64 // m³/s, NaN for a gap
		messages []said
	}{
		{"bad-days.csv", Options{}, Date(2021, 10, 1), []float64{1.5, nan, nan, nan, 2.5}, []said{
			{problem.Error, 3, 2, "negative discharge: 2021-10-02: -0.4 is below zero; the day is left out (a gap)"},
			{problem.Warning, 4, 2, `2021-10-03: the discharge holds "-999", a no-data code read as missing; the day is left out (a gap)`},
			{problem.Warning, 5, 2, "2021-10-04: the discharge is empty; the day is left out (a gap)"},
			{problem.Warning, 0, 2, "3 days left out (1 below zero, 1 with a no-data code, 1 empty), each named at its line"},
		}},
		{"day-first.csv", Options{}, Date(2021, 10, 12), []float64{1, 2, 3}, []said{
			{problem.Note, 3, 1, "dates read day-first, as this one shows (its first number cannot be a month)"},
		}},
		{"ambiguous.csv", Options{}, 0, nil, []said{
			{problem.Error, 2, 1, `every date, such as this one, reads both day-first and month-first; set "date order" to day-first or month-first; 2 rows were not loaded`},
		}},
		{"ambiguous.csv", Options{DateOrder: MonthFirst}, Date(2021, 1, 10), []float64{1, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, 2}, nil},
		{"decimal-comma.csv", Options{}, Date(2021, 10, 1), []float64{1.25, 1.5, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, 0.75}, []said{
			{problem.Note, 4, 1, "dates read day-first"},
		}},
		{"bom-units-row.csv", Options{}, Date(2021, 10, 1), []float64{1.5, 2.5}, nil},
		// 1 ft³/s = 0.028316846592 m³/s exactly (docs/methods.md §1.1).
		{"cfs.csv", Options{}, Date(2021, 10, 1), []float64{2.8316846592, 5.6633693184}, nil},
		{"sub-daily.csv", Options{}, Date(2021, 10, 1), []float64{2, 4}, []said{
			{problem.Warning, 5, 3, `2021-10-02: the discharge holds "n.a.", a no-data code read as missing; the reading is left out`},
			{problem.Warning, 0, 3, "1 reading left out (1 with a no-data code)"},
		}},
		{"unsorted.csv", Options{}, Date(2021, 10, 1), []float64{1, 2, 3}, []said{
			{problem.Warning, 3, 0, "row 3 comes before a row above it; the table was loaded in date order"},
		}},
	}
	for _, tt := range tests {
		t.Run(tt.file+" "+tt.opt.DateOrder.String(), func(t *testing.T) {
			b, err := os.ReadFile(filepath.Join("testdata", "awkward", tt.file))
			if err != nil {
				t.Fatal(err)
			}
			tt.opt.File = tt.file
			im := ReadString(string(b), tt.opt)
			r := im.Record
			if r.Len() != len(tt.q) || len(tt.q) > 0 && r.First() != tt.first {
				t.Fatalf("%d days %v, want %d from %s", r.Len(), r.Days, len(tt.q), tt.first)
			}
			for i, want := range tt.q {
				if got := r.Q[i]; !(math.IsNaN(want) && math.IsNaN(got)) && math.Abs(got-want) > 1e-12*want {
					t.Errorf("%s: %v m³/s, want %v", r.Days[i], got, want)
				}
			}
			all := append(append(Problems{}, im.Problems...), im.Notices...)
			var list strings.Builder
			for _, p := range all {
				fmt.Fprintf(&list, "  %s %d:%d %s\n", p.Severity, p.Row, p.Col, p)
			}
			if len(all) != len(tt.messages) {
				t.Errorf("%d messages, want %d:\n%s", len(all), len(tt.messages), list.String())
			}
			for _, m := range tt.messages {
				found := false
				for _, p := range all {
					found = found || p.Severity == m.sev && p.Row == m.line && p.Col == m.col && strings.Contains(p.Error(), m.words) && p.File == tt.file
				}
				if !found {
					t.Errorf("no %s at line %d column %d saying %q among\n%s", m.sev, m.line, m.col, m.words, list.String())
				}
			}
		})
	}
}
