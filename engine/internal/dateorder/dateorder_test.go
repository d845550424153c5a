package dateorder

import "testing"

func TestVerdict(t *testing.T) {
	// A month is 1 to 12, so a number above 12 can only be a day (common
	// practice).
	tests := []struct {
		name     string
		dates    [][2]int
		want     Verdict
		day, mon int // lines of the witnesses
	}{
		{"none", nil, None, 0, 0},
		{"either", [][2]int{{3, 4}, {5, 6}}, Either, 0, 0},
		{"day first", [][2]int{{3, 4}, {25, 6}, {30, 1}}, DayFirst, 3, 0},
		{"month first", [][2]int{{3, 4}, {6, 25}}, MonthFirst, 0, 3},
		{"conflict", [][2]int{{13, 1}, {1, 13}}, Conflict, 2, 3},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var e Evidence
			for i, d := range tt.dates {
				e.Add(Witness{Line: i + 2, Raw: "x", A: d[0], B: d[1]})
			}
			if got := e.Verdict(); got != tt.want {
				t.Errorf("verdict %d, want %d", got, tt.want)
			}
			if e.DayFirst.Line != tt.day || e.MonthFirst.Line != tt.mon {
				t.Errorf("witnesses at lines %d and %d, want %d and %d", e.DayFirst.Line, e.MonthFirst.Line, tt.day, tt.mon)
			}
			if e.N != len(tt.dates) || (e.N > 0 && e.First.Line != 2) {
				t.Errorf("N %d, first line %d", e.N, e.First.Line)
			}
		})
	}
}

func TestDayMonth(t *testing.T) {
	// 03/04/2021: 3 April day-first, 4 March month-first (common practice).
	if d, m, ok := DayMonth(3, 4, true, false); !ok || d != 3 || m != 4 {
		t.Errorf("day-first: %d %d %v", d, m, ok)
	}
	if d, m, ok := DayMonth(3, 4, false, true); !ok || d != 4 || m != 3 {
		t.Errorf("month-first: %d %d %v", d, m, ok)
	}
	if _, _, ok := DayMonth(3, 4, false, false); ok {
		t.Error("no order chosen, yet read")
	}
}
