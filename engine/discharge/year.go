package discharge

import (
	"fmt"
	"math"
)

// Year is a reporting year of a record: a calendar year (FirstMonth 1) or a
// water year starting on the first day of FirstMonth. A water year is
// labelled by the calendar year in which it ends, so with FirstMonth 10 the
// year 2021 runs from 2020-10-01 to 2021-09-30 (common practice).
type Year struct {
	Label      int // calendar year in which the year ends
	FirstMonth int // 1-12
	Start, End Day // first and last day, inclusive, of the full year
	Days       int // days of the full year (365 or 366)
	InRecord   int // days of the year the record spans
	WithData   int // days of the year with a discharge value (measured or filled)
}

// Complete reports whether every day of the year has a discharge value.
func (y Year) Complete() bool { return y.WithData == y.Days }

// String names the year: "2021" for a calendar year, "2020-10/2021-09" for a
// water year.
func (y Year) String() string {
	if y.FirstMonth == 1 {
		return fmt.Sprintf("%d", y.Label)
	}
	sy, sm, _ := y.Start.Civil()
	ey, em, _ := y.End.Civil()
	return fmt.Sprintf("%d-%02d/%d-%02d", sy, sm, ey, em)
}

// YearOf returns the label of the year that contains d when years start on
// the first day of firstMonth (1-12; 0 means 1).
func YearOf(d Day, firstMonth int) int {
	firstMonth = normMonth(firstMonth)
	y, m, _ := d.Civil()
	if firstMonth == 1 || m < firstMonth {
		return y
	}
	return y + 1
}

// YearBounds returns the first and last day of the year labelled label.
func YearBounds(label, firstMonth int) (start, end Day) {
	firstMonth = normMonth(firstMonth)
	if firstMonth == 1 {
		return Date(label, 1, 1), Date(label+1, 1, 1) - 1
	}
	return Date(label-1, firstMonth, 1), Date(label, firstMonth, 1) - 1
}

func normMonth(m int) int {
	if m < 1 || m > 12 {
		return 1
	}
	return m
}

// Years returns every year the record touches, in order, with how many of
// its days the record holds. firstMonth is the month years start on (1-12;
// 0 means January, calendar years).
func (r *Record) Years(firstMonth int) []Year {
	firstMonth = normMonth(firstMonth)
	if len(r.Days) == 0 {
		return nil
	}
	var out []Year
	for label := YearOf(r.First(), firstMonth); ; label++ {
		s, e := YearBounds(label, firstMonth)
		if s > r.Last() {
			break
		}
		y := Year{Label: label, FirstMonth: firstMonth, Start: s, End: e, Days: int(e-s) + 1}
		for d := max(s, r.First()); d <= min(e, r.Last()); d++ {
			y.InRecord++
			if !math.IsNaN(r.Q[r.Index(d)]) {
				y.WithData++
			}
		}
		out = append(out, y)
	}
	return out
}

// Sum returns the sum of daily discharge (m³/s × days) from day a to day b
// inclusive, clipped to the record, and the number of days with a value.
// Gaps are skipped.
func (r *Record) Sum(a, b Day) (sum float64, n int) {
	for d := max(a, r.First()); d <= min(b, r.Last()); d++ {
		q := r.Q[r.Index(d)]
		if !math.IsNaN(q) {
			sum += q
			n++
		}
	}
	return sum, n
}

// Runoff returns the runoff depth in mm over the catchment of area areaKm2
// from day a to day b inclusive: Σ Q_d × 86.4 / A. Gap days are skipped, so
// compare n, the number of days counted, with the span. For a complete year
// it is the annual runoff in mm/yr.
func (r *Record) Runoff(a, b Day, areaKm2 float64) (mm float64, n int) {
	s, n := r.Sum(a, b)
	return RunoffMM(s, areaKm2), n
}

// RunoffMM converts a sum of daily mean discharges (m³/s × days) to a runoff
// depth in mm over areaKm2: 1 m³/s for one day over 1 km² is 86.4 mm.
func RunoffMM(sumQDays, areaKm2 float64) float64 {
	return sumQDays * 86.4 / areaKm2
}
