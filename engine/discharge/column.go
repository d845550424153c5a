package discharge

import "strings"

// columns says where the importer found each column (-1 when absent).
type columns struct {
	date, time, q, unitCol int
	unit                   Unit // unit from the discharge header, if any
	headerless             bool
}

func (c columns) name(header []string, i int) string {
	if c.headerless {
		return ""
	}
	return strings.TrimSpace(cell(header, i))
}

var dateNames = map[string]bool{"date": true, "day": true, "datetime": true, "timestamp": true, "sampledate": true,
	"dateandtime": true, "datum": true, "fecha": true, "time stamp": true}
var timeNames = map[string]bool{"time": true, "hour": true, "clock": true, "timeofday": true}
var qNames = map[string]bool{"q": true, "discharge": true, "flow": true, "runoff": true, "streamflow": true,
	"qmean": true, "meanq": true, "dailymeanq": true, "meandischarge": true, "dailymeandischarge": true,
	"meanflow": true, "dailyflow": true, "value": true, "abfluss": true, "debit": true, "caudal": true}
var unitColNames = map[string]bool{"unit": true, "units": true, "qunit": true}

// splitHeader parses "Q (m3/s)", "Flow [L/s]", "Q_m3/s" into a normalised
// name and a unit.
func splitHeader(h string) (name string, u Unit) {
	t := strings.TrimSpace(h)
	if i := strings.IndexAny(t, "(["); i >= 0 {
		inner := strings.Trim(t[i:], "()[] ")
		if uu, err := ParseUnit(inner); err == nil {
			u = uu
		}
		t = t[:i]
	}
	t = strings.ToLower(strings.TrimSpace(t))
	if uu, err := ParseUnit(t); err == nil {
		return "q", uu // the header is a unit: "cfs", "L/s"
	}
	if i := strings.IndexAny(t, "_ "); i > 0 && u == NoUnit {
		if uu, err := ParseUnit(t[i+1:]); err == nil {
			u, t = uu, t[:i]
		}
	}
	t = strings.NewReplacer(" ", "", "_", "", "-", "", ".", "").Replace(t)
	return t, u
}

// findColumns maps a header row, or recognises a table without one (first
// cell a date).
func findColumns(first []string) columns {
	c := columns{date: -1, time: -1, q: -1, unitCol: -1}
	if _, ok := parseStamp(cell(first, 0)); ok {
		c.headerless = true
		c.date = 0
		c.q = 1
		if len(first) >= 3 {
			if _, ok := parseClock(first[1]); ok {
				c.time, c.q = 1, 2
			}
		}
		return c
	}
	for i, h := range first {
		name, u := splitHeader(h)
		switch {
		case c.date < 0 && dateNames[name]:
			c.date = i
		case c.time < 0 && timeNames[name]:
			c.time = i
		case c.q < 0 && (qNames[name] || strings.HasPrefix(name, "discharge") || strings.HasPrefix(name, "flow") || strings.HasPrefix(name, "runoff")):
			c.q, c.unit = i, u
		case c.unitCol < 0 && unitColNames[name]:
			c.unitCol = i
		}
	}
	return c
}
