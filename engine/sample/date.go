package sample

import (
	"bytes"
	"math"
	"strings"
	"time"

	"lixiv/engine/internal/dateorder"
)

// dateVal is a date cell as read, before the column's day/month order is
// known. For three-number dates (dmy) a and b are the first two numbers.
type dateVal struct {
	y, a, b  int
	dmy      bool  // a and b still need the column's order
	named    bool  // month given by name: a is the day, b the month
	clock    bool  // a time of day was given
	sec      int   // seconds since midnight
	nsec     int   // fraction of the second
	zone     int   // offset east of UTC in seconds
	serial   bool  // Excel serial day: days since 1899-12-30 in sec/nsec
	serialNs int64 // nanoseconds since 1899-12-30 for serial days
}

var monthNames = map[string]int{
	"jan": 1, "feb": 2, "mar": 3, "apr": 4, "may": 5, "jun": 6, "jul": 7, "aug": 8, "sep": 9, "sept": 9,
	"oct": 10, "nov": 11, "dec": 12, "january": 1, "february": 2, "march": 3, "april": 4, "june": 6,
	"july": 7, "august": 8, "september": 9, "october": 10, "november": 11, "december": 12,
}

// digits reads an unsigned integer at b[i:], returning it, the new index and
// the number of digits read.
func digits(b []byte, i int) (v, j, n int) {
	for j = i; j < len(b) && b[j] >= '0' && b[j] <= '9' && n < 9; j++ {
		v = v*10 + int(b[j]-'0')
		n++
	}
	return v, j, n
}

// parseDate reads ISO 8601 dates (2024-03-05, 2024-03-05T10:30:00Z,
// 2024/03/05 10:30), three-number dates (05/03/2024, 5.3.2024, 05-03-2024),
// dates with a month name (5-Mar-2024, 5 March 2024, Mar 5 2024), compact
// 20240305, and Excel serial days (45356, 45356.4375).
func parseDate(b []byte) (dateVal, bool) {
	b = trimSpace(b)
	var d dateVal
	if len(b) == 0 {
		return d, false
	}
	if b[0] >= '0' && b[0] <= '9' {
		n1, i, w1 := digits(b, 0)
		if i == len(b) || b[i] == '.' && w1 >= 5 && allSerial(b[i+1:]) {
			switch {
			case w1 == 8 && i == len(b): // 20240305
				d.y, d.a, d.b = n1/10000, n1/100%100, n1%100
				return d, validYMD(d.y, d.a, d.b)
			case w1 >= 5 && w1 <= 7:
				// Excel serial days from 10000 (1927-05-18): shorter numbers
				// are more likely years or codes than dates.
				v, ok := parseNumber(b, '.')
				if !ok || v < 10000 || v > 2958465 {
					return d, false
				}
				d.serial = true
				d.serialNs = int64(math.Round(v*86400e3)) * 1e6 // to the millisecond
				d.clock = v != math.Trunc(v)
				return d, true
			}
			return d, false
		}
		sep := b[i]
		switch {
		case w1 == 4 && (sep == '-' || sep == '/' || sep == '.'):
			m, j, wm := digits(b, i+1)
			if wm < 1 || wm > 2 || j >= len(b) || b[j] != sep {
				return d, false
			}
			dd, k, wd := digits(b, j+1)
			if wd < 1 || wd > 2 {
				return d, false
			}
			d.y, d.a, d.b = n1, m, dd
			if !validYMD(d.y, d.a, d.b) {
				return d, false
			}
			return d, parseClockZone(b[k:], &d)
		case w1 <= 2 && (sep == '/' || sep == '.' || sep == '-'):
			if i+1 < len(b) && isLetter(b[i+1]) { // 5-Mar-2024
				j := i + 1
				for j < len(b) && isLetter(b[j]) {
					j++
				}
				mo, ok := monthNames[strings.ToLower(string(b[i+1:j]))]
				if !ok || j >= len(b) || b[j] != sep {
					return d, false
				}
				y, k, wy := digits(b, j+1)
				if wy != 4 {
					return d, false
				}
				d.y, d.a, d.b, d.named = y, n1, mo, true
				return d, validYMD(y, mo, n1) && parseClockZone(b[k:], &d)
			}
			n2, j, w2 := digits(b, i+1)
			if w2 < 1 || w2 > 2 || j >= len(b) || b[j] != sep {
				return d, false
			}
			y, k, wy := digits(b, j+1)
			if wy != 4 {
				return d, false
			}
			d.y, d.a, d.b, d.dmy = y, n1, n2, true
			if n1 < 1 || n2 < 1 || n1 > 31 || n2 > 31 || (n1 > 12 && n2 > 12) {
				return d, false
			}
			return d, parseClockZone(b[k:], &d)
		case w1 <= 2 && sep == ' ': // 5 March 2024
			mo, j, ok := monthAt(b, i+1)
			if !ok {
				return d, false
			}
			return namedDate(b, j+1, n1, mo, d)
		}
		return d, false
	}
	if isLetter(b[0]) { // Mar 5 2024, March 5, 2024
		mo, j, ok := monthAt(b, 0)
		if !ok {
			return d, false
		}
		day, k, wd := digits(b, j+1)
		if wd < 1 || wd > 2 {
			return d, false
		}
		if k < len(b) && b[k] == ',' {
			k++
		}
		if k >= len(b) || b[k] != ' ' {
			return d, false
		}
		return namedDate(b, k+1, day, mo, d)
	}
	return d, false
}

// monthAt reads the month name that starts at b[i] and is followed by a
// space; j is the space's index.
func monthAt(b []byte, i int) (mo, j int, ok bool) {
	j = i
	for j < len(b) && isLetter(b[j]) {
		j++
	}
	mo, ok = monthNames[strings.ToLower(string(b[i:j]))]
	return mo, j, ok && j < len(b) && b[j] == ' '
}

// namedDate ends a date written with a month name: the year, four digits
// from b[at], then an optional time of day.
func namedDate(b []byte, at, day, mo int, d dateVal) (dateVal, bool) {
	y, k, wy := digits(b, at)
	if wy != 4 {
		return d, false
	}
	d.y, d.a, d.b, d.named = y, day, mo, true
	return d, validYMD(y, mo, day) && parseClockZone(b[k:], &d)
}

func allSerial(b []byte) bool {
	for _, c := range b {
		if c < '0' || c > '9' {
			return false
		}
	}
	return len(b) > 0
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

func validYMD(y, m, d int) bool {
	if y < 1000 || y > 9999 || m < 1 || m > 12 || d < 1 {
		return false
	}
	return d <= daysIn(y, m)
}

func daysIn(y, m int) int {
	return time.Date(y, time.Month(m)+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

// parseClockZone reads what follows a date: nothing, or "T"/" " and a time
// of day with an optional zone.
func parseClockZone(b []byte, d *dateVal) bool {
	if len(b) == 0 {
		return true
	}
	if b[0] != 'T' && b[0] != ' ' {
		return false
	}
	b = trimSpace(b[1:])
	if len(b) == 0 {
		return true
	}
	sec, nsec, rest, ok := clockPrefix(b)
	if !ok {
		return false
	}
	d.clock, d.sec, d.nsec = true, sec, nsec
	rest = trimSpace(rest)
	if len(rest) == 0 {
		return true
	}
	if rest[0] == 'Z' && len(rest) == 1 || bytes.EqualFold(rest, []byte("UTC")) {
		return true
	}
	if rest[0] != '+' && rest[0] != '-' {
		return false
	}
	h, j, wh := digits(rest, 1)
	if wh == 4 && j == len(rest) {
		d.zone = (h/100*3600 + h%100*60)
	} else {
		if wh != 2 || j >= len(rest) || rest[j] != ':' {
			return false
		}
		m, k, wm := digits(rest, j+1)
		if wm != 2 || k != len(rest) {
			return false
		}
		d.zone = h*3600 + m*60
	}
	if d.zone > 14*3600 {
		return false
	}
	if rest[0] == '-' {
		d.zone = -d.zone
	}
	return true
}

// clockPrefix reads hh:mm[:ss[.fff]] at the start of b.
func clockPrefix(b []byte) (sec, nsec int, rest []byte, ok bool) {
	h, i, wh := digits(b, 0)
	if wh < 1 || wh > 2 || i >= len(b) || b[i] != ':' {
		return 0, 0, b, false
	}
	m, j, wm := digits(b, i+1)
	if wm != 2 || h > 24 || m > 59 {
		return 0, 0, b, false
	}
	s := 0
	if j < len(b) && b[j] == ':' {
		var ws int
		s, j, ws = digits(b, j+1)
		if ws != 2 || s > 60 {
			return 0, 0, b, false
		}
		if j < len(b) && (b[j] == '.' || b[j] == ',') {
			f, k, wf := digits(b, j+1)
			if wf == 0 {
				return 0, 0, b, false
			}
			for w := wf; w < 9; w++ {
				f *= 10
			}
			nsec, j = f, k
		}
	}
	if h == 24 && (m != 0 || s != 0 || nsec != 0) {
		return 0, 0, b, false
	}
	return h*3600 + m*60 + s, nsec, b[j:], true
}

// parseClock reads a time-of-day cell: "10:30", "10:30:15", or a fraction of
// a day as Excel stores it (0.4375).
func parseClock(b []byte) (sec, nsec int, ok bool) {
	b = trimSpace(b)
	if s, ns, rest, ok := clockPrefix(b); ok && len(trimSpace(rest)) == 0 {
		return s, ns, true
	}
	if v, ok := parseNumber(b, '.'); ok && v >= 0 && v < 1 {
		ns := int64(v*86400e9 + 0.5)
		return int(ns / 1e9), int(ns % 1e9), true
	}
	return 0, 0, false
}

// excelEpoch is day 0 of Excel's 1900 date system as used for serial days
// after February 1900 (common practice).
var excelEpoch = time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)

// resolve turns a date into a time, given the column's order for dmy dates.
func (d dateVal) resolve(order DateOrder) (t time.Time, ok bool) {
	if d.serial {
		return excelEpoch.Add(time.Duration(d.serialNs)), true
	}
	y, m, day := d.y, d.a, d.b
	switch {
	case d.named:
		m, day = d.b, d.a
	case d.dmy:
		if day, m, ok = dateorder.DayMonth(d.a, d.b, order == DayFirst, order == MonthFirst); !ok {
			return time.Time{}, false
		}
	}
	if !validYMD(y, m, day) {
		return time.Time{}, false
	}
	t = time.Date(y, time.Month(m), day, 0, 0, d.sec, d.nsec, time.UTC)
	return t.Add(-time.Duration(d.zone) * time.Second), true
}

// dateFormat reads a units-row cell that spells the date format, such as
// "dd/mm/yyyy" or "MM/DD/YYYY hh:mm".
func dateFormat(s string) (DateOrder, bool) {
	k := strings.ToLower(strings.TrimSpace(s))
	k = strings.Trim(k, "()[]")
	if i := strings.IndexAny(k, " t"); i > 0 {
		k = k[:i]
	}
	switch strings.NewReplacer(".", "/", "-", "/").Replace(k) {
	case "dd/mm/yyyy", "d/m/yyyy", "dd/mm/yy", "d/m/y", "dd/mm/jjjj", "tt/mm/jjjj":
		return DayFirst, true
	case "mm/dd/yyyy", "m/d/yyyy", "mm/dd/yy", "m/d/y":
		return MonthFirst, true
	case "yyyy/mm/dd", "iso", "iso8601", "iso 8601", "hh:mm", "hh:mm:ss", "yyyymmdd":
		return DateAuto, true
	}
	return DateAuto, false
}

func timeOfDay(sec, nsec int) time.Duration {
	return time.Duration(sec)*time.Second + time.Duration(nsec)
}
