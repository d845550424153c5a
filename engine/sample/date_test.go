package sample

import (
	"testing"
	"time"
)

func TestParseDate(t *testing.T) {
	utc := func(y, m, d, hh, mm, ss int) time.Time {
		return time.Date(y, time.Month(m), d, hh, mm, ss, 0, time.UTC)
	}
	tests := []struct {
		in    string
		order DateOrder
		want  time.Time
		ok    bool
	}{
		{"2024-03-05", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"2024/03/05", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"2024-3-5", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"2024-03-05T10:30", DateAuto, utc(2024, 3, 5, 10, 30, 0), true},
		{"2024-03-05T10:30:15Z", DateAuto, utc(2024, 3, 5, 10, 30, 15), true},
		{"2024-03-05 10:30:15", DateAuto, utc(2024, 3, 5, 10, 30, 15), true},
		{"2024-03-05T10:30:00+01:00", DateAuto, utc(2024, 3, 5, 9, 30, 0), true},
		{"2024-03-05T10:30:00-0500", DateAuto, utc(2024, 3, 5, 15, 30, 0), true},
		{"20240305", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"05/03/2024", DayFirst, utc(2024, 3, 5, 0, 0, 0), true},
		{"05/03/2024", MonthFirst, utc(2024, 5, 3, 0, 0, 0), true},
		{"05/03/2024", DateAuto, time.Time{}, false}, // order unknown: never guessed
		{"5.3.2024", DayFirst, utc(2024, 3, 5, 0, 0, 0), true},
		{"05-03-2024 14:20", DayFirst, utc(2024, 3, 5, 14, 20, 0), true},
		{"25/12/2024", DayFirst, utc(2024, 12, 25, 0, 0, 0), true},
		{"25/12/2024", MonthFirst, time.Time{}, false},
		{"5-Mar-2024", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"5 March 2024", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"Mar 5, 2024", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		// Excel serial day 45356 is 2024-03-05 (1900 date system, epoch 1899-12-30; common practice).
		{"45356", DateAuto, utc(2024, 3, 5, 0, 0, 0), true},
		{"45356.4375", DateAuto, utc(2024, 3, 5, 10, 30, 0), true},
		{"2024-02-30", DateAuto, time.Time{}, false}, {"2023-02-29", DateAuto, time.Time{}, false},
		{"2024-13-01", DateAuto, time.Time{}, false}, {"05/03/24", DayFirst, time.Time{}, false},
		{"yesterday", DateAuto, time.Time{}, false}, {"2024", DateAuto, time.Time{}, false}, {"9999", DateAuto, time.Time{}, false}, {"2024-03-05T25:00", DateAuto, time.Time{}, false},
		{"13/13/2024", DayFirst, time.Time{}, false}, {"", DateAuto, time.Time{}, false},
	}
	for _, tc := range tests {
		t.Run(tc.in+"/"+tc.order.String(), func(t *testing.T) {
			d, ok := parseDate([]byte(tc.in))
			var got time.Time
			if ok {
				got, ok = d.resolve(tc.order)
			}
			if ok != tc.ok || ok && !got.Equal(tc.want) {
				t.Errorf("parseDate(%q) with %v = %v, %v; want %v, %v", tc.in, tc.order, got, ok, tc.want, tc.ok)
			}
		})
	}
}

func TestParseClock(t *testing.T) {
	tests := []struct {
		in   string
		want int
		ok   bool
	}{
		{"10:30", 37800, true}, {"9:05:30", 32730, true}, {"0.4375", 37800, true}, {"24:00", 86400, true},
		{"10h30", 0, false}, {"25:00", 0, false}, {"10:61", 0, false}, {"1.5", 0, false},
	}
	for _, tc := range tests {
		sec, _, ok := parseClock([]byte(tc.in))
		if ok != tc.ok || ok && sec != tc.want {
			t.Errorf("parseClock(%q) = %d, %v; want %d, %v", tc.in, sec, ok, tc.want, tc.ok)
		}
	}
}

func TestDateFormat(t *testing.T) {
	tests := []struct {
		in   string
		want DateOrder
		ok   bool
	}{
		{"dd/mm/yyyy", DayFirst, true}, {"DD.MM.YYYY", DayFirst, true}, {"(dd-mm-yyyy hh:mm)", DayFirst, true},
		{"mm/dd/yyyy", MonthFirst, true}, {"MM/DD/YYYY hh:mm", MonthFirst, true},
		{"yyyy-mm-dd", DateAuto, true}, {"ISO 8601", DateAuto, true}, {"mg/L", DateAuto, false},
	}
	for _, tc := range tests {
		got, ok := dateFormat(tc.in)
		if got != tc.want || ok != tc.ok {
			t.Errorf("dateFormat(%q) = %v, %v; want %v, %v", tc.in, got, ok, tc.want, tc.ok)
		}
	}
}
