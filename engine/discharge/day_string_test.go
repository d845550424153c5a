package discharge

import (
	"fmt"
	"testing"
)

// String writes every day as "%04d-%02d-%02d" does, across the years a
// record can hold and beyond.
func TestDayStringAsPrintf(t *testing.T) {
	for _, d := range []Day{Date(-1, 12, 31), Date(0, 1, 1), Date(9, 2, 3), Date(1999, 12, 31), Date(2000, 2, 29), Date(2021, 10, 1), Date(9999, 12, 31), Date(10000, 1, 1)} {
		y, m, dd := d.Civil()
		if got, want := d.String(), fmt.Sprintf("%04d-%02d-%02d", y, m, dd); got != want {
			t.Errorf("day %d: %q, want %q", int(d), got, want)
		}
	}
	for d := Date(1890, 1, 1); d < Date(2110, 1, 1); d++ {
		y, m, dd := d.Civil()
		if got, want := d.String(), fmt.Sprintf("%04d-%02d-%02d", y, m, dd); got != want {
			t.Fatalf("day %d: %q, want %q", int(d), got, want)
		}
	}
}
