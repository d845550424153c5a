package sample

import (
	"bufio"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"lixiv/engine/chem"
)

// WriteCSV writes the normalised table as comma-separated text: sample,
// site, date (ISO 8601, UTC), discharge in m³/s, pH, temperature in °C,
// conductivity in µS/cm, 87Sr/86Sr, then one column per species in µmol/L
// (alkalinity in µeq/L), then the metadata columns. Censored values are
// written as "<limit" (or "<DL" when the limit is unknown), missing values
// as empty cells. Numbers are written in full precision, so reading the
// output back gives the same table.
func (t *Table) WriteCSV(w io.Writer) error {
	bw := bufio.NewWriter(w)
	has := func(get func(*Sample) float64) bool {
		for _, s := range t.Samples {
			if !math.IsNaN(get(s)) {
				return true
			}
		}
		return false
	}
	type col struct {
		head string
		cell func(b []byte, s *Sample) []byte
		unit string // the unit the head names, for a units row
	}
	num := func(get func(*Sample) float64) func([]byte, *Sample) []byte {
		return func(b []byte, s *Sample) []byte {
			if v := get(s); !math.IsNaN(v) {
				b = strconv.AppendFloat(b, v, 'g', -1, 64)
			}
			return b
		}
	}
	cols := []col{
		{head: "Sample", cell: func(b []byte, s *Sample) []byte { return appendField(b, s.ID) }},
		{head: "Site", cell: func(b []byte, s *Sample) []byte { return appendField(b, s.Site) }},
		{head: "Date", cell: func(b []byte, s *Sample) []byte {
			switch {
			case !s.HasTime:
			case s.DateOnly:
				b = s.Time.UTC().AppendFormat(b, "2006-01-02")
			default:
				b = s.Time.UTC().AppendFormat(b, "2006-01-02T15:04:05.999999999Z")
			}
			return b
		}},
	}
	for _, q := range []struct {
		head, unit string
		get        func(*Sample) float64
	}{
		{"Q (m3/s)", "m3/s", func(s *Sample) float64 { return s.Q }},
		{"pH", "", func(s *Sample) float64 { return s.PH }},
		{"Temperature (°C)", "°C", func(s *Sample) float64 { return s.Temp }},
		{"EC (µS/cm)", "µS/cm", func(s *Sample) float64 { return s.Cond }},
		{"87Sr/86Sr", "", func(s *Sample) float64 { return s.Sr87Sr86 }},
	} {
		if has(q.get) {
			cols = append(cols, col{q.head, num(q.get), q.unit})
		}
	}
	var want [chem.NSpecies]bool
	for _, sp := range t.Species() {
		want[sp] = true
	}
	for _, s := range t.Samples {
		for sp := range want {
			if s.C.Has(chem.Species(sp)) || s.IsCensored(chem.Species(sp)) {
				want[sp] = true
			}
		}
	}
	for i, ok := range want {
		if !ok {
			continue
		}
		sp := chem.Species(i)
		unit := "µmol/L"
		if sp == chem.Alk {
			unit = "µeq/L"
		}
		cols = append(cols, col{head: sp.Symbol() + " (" + unit + ")", unit: unit, cell: func(b []byte, s *Sample) []byte {
			if lim, ok := s.Censored[sp]; ok {
				if math.IsNaN(lim) {
					return append(b, "<DL"...)
				}
				return strconv.AppendFloat(append(b, '<'), lim, 'g', -1, 64)
			}
			if v := s.C[sp]; !math.IsNaN(v) {
				b = strconv.AppendFloat(b, v, 'g', -1, 64)
			}
			return b
		}})
	}
	fixed := map[string]bool{}
	for _, c := range cols {
		fixed[strings.ToLower(c.head)] = true
	}
	for _, k := range t.metaKeys() {
		head := k
		if fixed[strings.ToLower(k)] {
			head = k + " (text)" // an unread date kept as text, say
		}
		cols = append(cols, col{head: head, cell: func(b []byte, s *Sample) []byte { return appendField(b, s.Meta[k]) }})
	}
	var line []byte
	for i, c := range cols {
		if i > 0 {
			line = append(line, ',')
		}
		line = appendField(line, c.head)
	}
	line = append(line, '\n')
	if _, err := bw.Write(line); err != nil {
		return err
	}
	if len(t.Samples) > 0 {
		// A first sample that would be read back as a units row (units in
		// its text columns, no number under a numeric column) gets a units
		// row of the header's own units before it.
		heads, first, units := make([]string, len(cols)), make([]string, len(cols)), make([]string, len(cols))
		for i, c := range cols {
			heads[i], first[i], units[i] = c.head, string(c.cell(nil, t.Samples[0])), c.unit
		}
		if IsUnitsRow(heads, first) {
			line = line[:0]
			for i, u := range units {
				if i > 0 {
					line = append(line, ',')
				}
				line = appendField(line, u)
			}
			line = append(line, '\n')
			if _, err := bw.Write(line); err != nil {
				return err
			}
		}
	}
	for _, s := range t.Samples {
		line = line[:0]
		for i, c := range cols {
			if i > 0 {
				line = append(line, ',')
			}
			line = c.cell(line, s)
		}
		line = append(line, '\n')
		if _, err := bw.Write(line); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// metaKeys lists the metadata keys in column order, then any others (extra
// fields) in the order first met.
func (t *Table) metaKeys() []string {
	var keys []string
	seen := map[string]bool{}
	for _, s := range t.Samples {
		for k := range s.Meta {
			seen[k] = true
		}
	}
	for _, c := range t.Columns {
		k := c.Header
		if k == "" {
			k = "column " + strconv.Itoa(c.Index+1)
		}
		if seen[k] {
			keys = append(keys, k)
			delete(seen, k)
		}
	}
	rest := make([]string, 0, len(seen))
	for k := range seen {
		rest = append(rest, k)
	}
	sort.Strings(rest)
	return append(keys, rest...)
}

// appendField appends s, quoted if it holds a comma, quote, line break or
// leading or trailing space.
func appendField(b []byte, s string) []byte {
	if s == "" || !strings.ContainsAny(s, ",\"\r\n") && s[0] != ' ' && s[len(s)-1] != ' ' {
		return append(b, s...)
	}
	b = append(b, '"')
	b = append(b, strings.ReplaceAll(s, `"`, `""`)...)
	return append(b, '"')
}
