package plot

import "time"

// Day returns the time axis value of a date: days since 1970-01-01.
func Day(t time.Time) float64 {
	return float64(t.Unix()) / 86400
}

func dayTime(d float64) time.Time { return time.Unix(int64(d*86400), 0).UTC() }

// timeTicks marks months (short ranges) or years.
func timeTicks(lo, hi float64) []Tick {
	a, b := dayTime(lo), dayTime(hi)
	var t []Tick
	span := hi - lo
	if span <= 400 {
		m := time.Date(a.Year(), a.Month(), 1, 0, 0, 0, 0, time.UTC)
		for ; !m.After(b); m = m.AddDate(0, 1, 0) {
			if m.Before(a) {
				continue
			}
			step := 1
			if span > 200 {
				step = 2
			}
			if (int(m.Month())-1)%step != 0 {
				continue
			}
			t = append(t, Tick{Value: Day(m), Label: m.Format("Jan 2006")})
		}
		return t
	}
	step := 1
	if span > 366*8 {
		step = 2
	}
	for y := a.Year(); y <= b.Year()+1; y++ {
		d := time.Date(y, 1, 1, 0, 0, 0, 0, time.UTC)
		if d.Before(a) || d.After(b) {
			continue
		}
		if y%step == 0 {
			t = append(t, Tick{Value: Day(d), Label: d.Format("2006")})
		}
		if span <= 366*4 {
			mid := time.Date(y, 7, 1, 0, 0, 0, 0, time.UTC)
			if !mid.Before(a) && !mid.After(b) {
				t = append(t, Tick{Value: Day(mid), Minor: true})
			}
		}
	}
	return t
}
