package discharge

import (
	"strconv"
	"strings"

	"lixiv/engine/internal/dateorder"
	"lixiv/engine/internal/enum"
)

// DateOrder settles dates written with the year last, such as 03/04/2021.
// The zero value, AutoOrder, settles it from the column itself (a first
// field above 12 means day-first, a second field above 12 month-first) and
// reports an ambiguity when the column cannot tell.
type DateOrder int

// Date orders.
const (
	AutoOrder  DateOrder = iota // decide from the column, report if it cannot
	DayFirst                    // 03/04/2021 is 3 April 2021
	MonthFirst                  // 03/04/2021 is 4 March 2021
)

var orderNames = [...]string{"auto", "day-first", "month-first"}

// String names the order.
func (o DateOrder) String() string { return enum.Name(o, orderNames[:], "?") }

// stamp is a parsed date cell before the order of a year-last date is known.
type stamp struct {
	y, a, b int  // year and the two other fields as written
	form    byte // 'i' ISO (y, month a, day b), 'l' year last (a, b ambiguous), 'd' day-first fixed, 'm' month-first fixed
	sec     int  // seconds of the day, or -1 when no time was given
}

var monthWords = map[string]int{
	"jan": 1, "feb": 2, "mar": 3, "apr": 4, "may": 5, "jun": 6,
	"jul": 7, "aug": 8, "sep": 9, "sept": 9, "oct": 10, "nov": 11, "dec": 12,
	"january": 1, "february": 2, "march": 3, "april": 4, "june": 6, "july": 7,
	"august": 8, "september": 9, "october": 10, "november": 11, "december": 12,
}

// parseStamp reads "2021-03-04", "2021/03/04", "20210304", "04.03.2021",
// "04/03/2021", "4-Mar-2021", "Mar 4, 2021", each optionally followed by a
// time "12:30" or "12:30:15" after a space or a "T". ok is false when the
// text is not such a date.
func parseStamp(text string) (st stamp, ok bool) {
	t := strings.TrimSpace(text)
	st.sec = -1
	if t == "" {
		return st, false
	}
	datePart, timePart := t, ""
	if i := strings.IndexAny(t, "T "); i > 0 {
		// "Mar 4, 2021" has spaces inside the date; try a time at the end.
		if j := strings.LastIndexAny(t, "T "); j > 0 && strings.Contains(t[j+1:], ":") {
			datePart, timePart = strings.TrimSpace(t[:j]), t[j+1:]
		} else if t[i] == 'T' {
			return st, false
		}
	}
	if timePart != "" {
		sec, ok := parseClock(timePart)
		if !ok {
			return st, false
		}
		st.sec = sec
	}
	f := splitDate(datePart)
	switch {
	case len(f) == 1 && len(f[0]) == 8 && allDigits(f[0]):
		st.form = 'i'
		st.y, _ = strconv.Atoi(f[0][:4])
		st.a, _ = strconv.Atoi(f[0][4:6])
		st.b, _ = strconv.Atoi(f[0][6:])
	case len(f) != 3:
		return st, false
	case len(f[0]) == 4 && allDigits(f[0]) && allDigits(f[1]) && allDigits(f[2]):
		st.form = 'i'
		st.y, _ = strconv.Atoi(f[0])
		st.a, _ = strconv.Atoi(f[1])
		st.b, _ = strconv.Atoi(f[2])
	case len(f[2]) == 4 && allDigits(f[2]):
		st.y, _ = strconv.Atoi(f[2])
		switch {
		case allDigits(f[0]) && allDigits(f[1]) && len(f[0]) <= 2 && len(f[1]) <= 2:
			st.form = 'l'
			st.a, _ = strconv.Atoi(f[0])
			st.b, _ = strconv.Atoi(f[1])
		case allDigits(f[0]) && monthWords[strings.ToLower(f[1])] > 0:
			st.form = 'd'
			st.a, _ = strconv.Atoi(f[0])
			st.b = monthWords[strings.ToLower(f[1])]
		case monthWords[strings.ToLower(f[0])] > 0 && allDigits(f[1]):
			st.form = 'm'
			st.a = monthWords[strings.ToLower(f[0])]
			st.b, _ = strconv.Atoi(f[1])
		default:
			return st, false
		}
	default:
		return st, false
	}
	return st, st.y >= 1000
}

func splitDate(s string) []string {
	return strings.FieldsFunc(s, func(r rune) bool {
		return r == '-' || r == '/' || r == '.' || r == ' ' || r == ','
	})
}

func allDigits(s string) bool {
	if s == "" {
		return false
	}
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return true
}

func parseClock(s string) (int, bool) {
	s = strings.TrimSuffix(strings.TrimSuffix(strings.TrimSpace(s), "Z"), "z")
	// A UTC offset (+01:00, -0500) is dropped: the day is the local day as
	// written, the basis of published daily means.
	if i := strings.LastIndexAny(s, "+-"); i >= 4 {
		s = s[:i]
	}
	f := strings.Split(s, ":")
	if len(f) < 2 || len(f) > 3 {
		return 0, false
	}
	lim := []int{24, 60, 61}
	sec := 0
	for i, p := range f {
		if i == 2 {
			if k := strings.IndexByte(p, '.'); k >= 0 {
				p = p[:k]
			}
		}
		if !allDigits(p) || len(p) > 2 {
			return 0, false
		}
		v, _ := strconv.Atoi(p)
		if v >= lim[i] {
			return 0, false
		}
		sec = sec*60 + v
		if i == 1 && len(f) == 2 {
			sec *= 60
		}
	}
	return sec, true
}

// day resolves the stamp under order o (used only for year-last dates). ok
// is false for an impossible date such as month 13 or 31 April.
func (st stamp) day(o DateOrder) (Day, bool) {
	var m, d int
	switch st.form {
	case 'i':
		m, d = st.a, st.b
	case 'd':
		d, m = st.a, st.b
	case 'm':
		m, d = st.a, st.b
	case 'l':
		var ok bool
		if d, m, ok = dateorder.DayMonth(st.a, st.b, o == DayFirst, o == MonthFirst); !ok {
			return 0, false
		}
	}
	if m < 1 || m > 12 || d < 1 || d > 31 {
		return 0, false
	}
	dd := Date(st.y, m, d)
	if _, mm, _ := dd.Civil(); mm != m {
		return 0, false // 31 April rolled over
	}
	return dd, true
}
