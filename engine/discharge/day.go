package discharge

import "fmt"

// Day is a calendar day counted from 1970-01-01 (day 0) in the proleptic
// Gregorian calendar. Discharge records and sample dates use it.
type Day int

// Date returns the Day of the given year, month (1-12) and day of month.
// Out-of-range months and days are normalised as by time.Date.
func Date(year, month, day int) Day {
	// Normalise the month first.
	year += (month - 1) / 12
	month = (month-1)%12 + 1
	if month <= 0 {
		month += 12
		year--
	}
	// Days from civil, after H. Hinnant's algorithm (common practice).
	y := year
	if month <= 2 {
		y--
	}
	era := floorDiv(y, 400)
	yoe := y - era*400
	mp := (month + 9) % 12
	doy := (153*mp+2)/5 + day - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return Day(era*146097 + doe - 719468)
}

// Civil returns the year, month (1-12) and day of month of d.
func (d Day) Civil() (year, month, day int) {
	z := int(d) + 719468
	era := floorDiv(z, 146097)
	doe := z - era*146097
	yoe := (doe - doe/1460 + doe/36524 - doe/146096) / 365
	y := yoe + era*400
	doy := doe - (365*yoe + yoe/4 - yoe/100)
	mp := (5*doy + 2) / 153
	day = doy - (153*mp+2)/5 + 1
	month = mp + 3
	if month > 12 {
		month -= 12
	}
	if month <= 2 {
		y++
	}
	return y, month, day
}

// String formats d as an ISO 8601 date, such as "2021-10-01".
func (d Day) String() string {
	y, m, dd := d.Civil()
	if y < 0 || y > 9999 {
		return fmt.Sprintf("%04d-%02d-%02d", y, m, dd)
	}
	// A record of many years formats tens of thousands of days: without
	// fmt, as "%04d-%02d-%02d" would.
	b := [10]byte{byte('0' + y/1000), byte('0' + y/100%10), byte('0' + y/10%10), byte('0' + y%10), '-',
		byte('0' + m/10), byte('0' + m%10), '-', byte('0' + dd/10), byte('0' + dd%10)}
	return string(b[:])
}

// YearFraction returns the decimal year of the middle of d (for example
// 2021.5 near the start of July), as used by seasonal terms.
func (d Day) YearFraction() float64 {
	y, _, _ := d.Civil()
	start := Date(y, 1, 1)
	n := Date(y+1, 1, 1) - start
	return float64(y) + (float64(d-start)+0.5)/float64(n)
}

func floorDiv(a, b int) int {
	q := a / b
	if (a%b != 0) && ((a < 0) != (b < 0)) {
		q--
	}
	return q
}
