package discharge

import "testing"

func TestDate(t *testing.T) {
	tests := []struct {
		y, m, d int
		want    Day
	}{
		{1970, 1, 1, 0},     // the epoch (common practice)
		{2000, 3, 1, 11017}, // days from 1970-01-01, checked with python3 datetime
		{1969, 12, 31, -1},
		{2024, 2, 29, 19782}, // python3: (date(2024,2,29)-date(1970,1,1)).days
		{1900, 1, 1, -25567}, // python3: (date(1900,1,1)-date(1970,1,1)).days
	}
	for _, tt := range tests {
		got := Date(tt.y, tt.m, tt.d)
		if got != tt.want {
			t.Errorf("Date(%d,%d,%d) = %d, want %d", tt.y, tt.m, tt.d, got, tt.want)
		}
		y, m, d := got.Civil()
		if y != tt.y || m != tt.m || d != tt.d {
			t.Errorf("Civil(%d) = %d-%d-%d, want %d-%d-%d", got, y, m, d, tt.y, tt.m, tt.d)
		}
	}
	// Round trip over four centuries, leap rules included.
	for d := Date(1800, 1, 1); d < Date(2200, 1, 1); d++ {
		y, m, dd := d.Civil()
		if Date(y, m, dd) != d {
			t.Fatalf("round trip failed at %d (%d-%d-%d)", d, y, m, dd)
		}
	}
	if got := Date(2021, 13, 1); got != Date(2022, 1, 1) {
		t.Errorf("month 13 normalises to %s, want 2022-01-01", got)
	}
	if got := Date(2021, 0, 1); got != Date(2020, 12, 1) {
		t.Errorf("month 0 normalises to %s, want 2020-12-01", got)
	}
}
