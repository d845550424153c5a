package sample

import (
	"fmt"
	"strings"
	"time"

	"lixiv/engine/chem"
)

// Sample is one water sample: where and when it was taken, the discharge at
// that moment, and its chemistry. Concentrations are in µmol/L (µeq/L for
// alkalinity); a quantity that was not measured is NaN, never 0.
type Sample struct {
	ID   string // sample identifier as written in the file
	Site string // site or station name

	// Time is the sampling date and time, read as written (no time zone
	// conversion unless the cell gives an offset) and stored in UTC. HasTime
	// (below) is false when the row gave no date or one that could not be
	// read; DateOnly is true when it gave a date without a time of day.
	Time time.Time

	Q float64 // discharge at sampling, m³/s; NaN if none

	// C holds the concentrations. A value reported below detection holds the
	// substitute chosen by Options.Policy (NaN for LeaveOut or an unknown
	// limit); its limit is kept in Censored.
	C chem.Composition

	// Censored maps each species reported below detection to its detection
	// limit in µmol/L (µeq/L for Alk). The limit is NaN when the cell gave
	// none ("<DL", "bdl"). Nil when no value was censored.
	Censored map[chem.Species]float64

	Sr87Sr86 float64 // 87Sr/86Sr ratio; NaN if none
	PH       float64 // pH (field pH preferred when both are given); NaN if none
	Temp     float64 // water temperature, °C; NaN if none
	Cond     float64 // electrical conductivity, µS/cm; NaN if none

	// Meta holds the cells of columns that were not recognised, and of
	// recognised columns whose values could not be used, keyed by the
	// header text. Nil when there are none.
	Meta map[string]string

	Line     int  // line in the source file where the row starts (1-based)
	HasTime  bool // Time is set
	DateOnly bool // Time has no time of day
}

// NewSample returns a sample with every quantity missing.
func NewSample() *Sample {
	s := &Sample{}
	s.reset()
	return s
}

func (s *Sample) reset() {
	*s = Sample{C: chem.NewComposition(), Q: nan, Sr87Sr86: nan, PH: nan, Temp: nan, Cond: nan}
}

// IsCensored reports whether species sp was reported below detection.
func (s *Sample) IsCensored(sp chem.Species) bool {
	_, ok := s.Censored[sp]
	return ok
}

// Limit returns the detection limit of species sp in µmol/L and whether sp
// was reported below detection.
func (s *Sample) Limit(sp chem.Species) (float64, bool) {
	l, ok := s.Censored[sp]
	return l, ok
}

// NCensored returns the number of species reported below detection.
func (s *Sample) NCensored() int { return len(s.Censored) }

// Table is an imported sample table: the samples in file order, what each
// column of the file was read as, and every problem met on the way.
type Table struct {
	Name     string    // file name, for messages
	Samples  []*Sample // one per data row, in file order
	Columns  []Column  // one per column of the file, in file order
	Problems ProblemList
	// Notes says what the importer read in place of what the file wrote
	// (values below detection, no-data codes, a unit from the settings)
	// and what it inferred (date order, decimal mark, units), each with
	// file, line, column and an example value, in file order.
	Notes    ProblemList
	Preamble []string // lines above the header row, kept as written
	Header   int      // line of the header row in the file (0 when none was found)
	Policy   Policy   // substitution applied to censored values in C
	Comma    rune     // field delimiter read (detected or given)
	Decimal  rune     // decimal mark read (detected or given)
}

// SamplesText writes every sample read, one per line with all its fields
// but the line it came from, so that two reads of one table in different
// text forms (a file and the same table saved again) can be compared.
func (t *Table) SamplesText() string {
	var b strings.Builder
	for _, s := range t.Samples {
		c := *s
		c.Line = 0
		fmt.Fprintf(&b, "%+v\n", c)
	}
	return b.String()
}

// Species returns the species that have a column in the table, in
// chem.Species order.
func (t *Table) Species() []chem.Species {
	var have [chem.NSpecies]bool
	for _, c := range t.Columns {
		if c.Kind == Concentration {
			have[c.Species] = true
		}
	}
	var out []chem.Species
	for s, ok := range have {
		if ok {
			out = append(out, chem.Species(s))
		}
	}
	return out
}

// NCensored returns the number of values below detection in the table.
func (t *Table) NCensored() int {
	n := 0
	for _, s := range t.Samples {
		n += len(s.Censored)
	}
	return n
}

// Substitute sets the value of every censored concentration in the table to
// the substitute given by policy p, so that results can be recomputed at 0,
// half the limit and the limit (a sensitivity run). The limits are kept.
func (t *Table) Substitute(p Policy) {
	t.Policy = p
	for _, s := range t.Samples {
		for sp, lim := range s.Censored {
			s.C[sp] = p.Value(lim)
		}
	}
}
