package flux

import (
	"testing"

	"lixiv/engine/discharge"
)

// yearFractions gives the bits of discharge.Day.YearFraction, for days in
// order, out of order and across leap years.
func TestYearFractionsAsDay(t *testing.T) {
	var f yearFractions
	days := []discharge.Day{discharge.Date(2021, 6, 1), discharge.Date(1900, 1, 1), discharge.Date(2000, 12, 31), discharge.Date(2000, 1, 1), discharge.Date(2021, 6, 2)}
	for d := discharge.Date(1995, 1, 1); d < discharge.Date(2006, 1, 1); d++ {
		days = append(days, d)
	}
	for _, d := range days {
		if got, want := f.of(d), d.YearFraction(); got != want {
			t.Fatalf("%v: %v, want %v", d, got, want)
		}
	}
}
