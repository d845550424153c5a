package sample

import (
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/internal/enum"
)

// Kind is what a column of the file was read as.
type Kind int

// Column kinds.
const (
	Meta          Kind = iota // not recognised, or not usable: kept as text in Sample.Meta
	ID                        // sample identifier
	Site                      // site or station
	Date                      // date, possibly with a time of day
	Clock                     // time of day, joined to the date column
	Discharge                 // discharge at sampling
	Concentration             // a species concentration
	SrRatio                   // 87Sr/86Sr
	PH                        // pH
	Temperature               // water temperature
	Conductivity              // electrical conductivity
)

var kindNames = [...]string{"metadata", "id", "site", "date", "time", "discharge", "concentration", "87Sr/86Sr", "pH", "temperature", "conductivity"}

// String names the kind.
func (k Kind) String() string { return enum.Name(k, kindNames[:], "unknown") }

// Column records how one column of the file was read.
type Column struct {
	Index    int          // 0-based position in the file
	Header   string       // header text as written
	UnitText string       // the cell of the units row under it, if any
	Kind     Kind         // what it was read as
	Species  chem.Species // for Concentration
	Unit     chem.Unit    // for Concentration: the unit the values were in
	// Scale converts the column's values to the internal unit (µmol/L,
	// µeq/L, m³/s, °C or µS/cm); Offset is added after scaling (°F).
	Scale  float64
	Offset float64
	// Label is the unit the values were read in, as shown to the user
	// ("mg/L as CaCO3", "L/s", "mS/m"); empty for columns without a unit.
	Label string
	// UnitFrom says where the unit came from: "header", "units row" or
	// "setting" (Options.Units); empty for columns without a unit.
	UnitFrom string
	// Note says why a recognised column was kept as metadata, or how it was
	// read when that needs saying ("field pH preferred").
	Note string
}

// Mapping returns a short description such as "Ca, mg/L -> µmol/L".
func (c Column) Mapping() string {
	switch c.Kind {
	case Concentration:
		to := "µmol/L"
		if c.Species == chem.Alk {
			to = "µeq/L"
		}
		return c.Species.Symbol() + ", " + c.Label + " -> " + to
	case Discharge:
		return "discharge, " + c.Label + " -> m³/s"
	case Conductivity:
		return "conductivity, " + c.Label + " -> µS/cm"
	case Temperature:
		return "temperature, " + c.Label + " -> °C"
	}
	return c.Kind.String()
}

// requirements describes, for the kinds Require checks, what the column
// holds and headers that are recognised as it.
var requirements = map[Kind]string{
	Concentration: "a species concentration (such as \"Na (mg/L)\", \"Ca2+ [µmol/L]\", \"Alkalinity as CaCO3 (mg/L)\")",
	Date:          "the sampling date (such as \"Date\", \"Sampling date\" or \"Datetime\")",
	ID:            "the sample name (such as \"Sample\" or \"Sample ID\")",
	Site:          "the site (such as \"Site\" or \"Station\")",
	Discharge:     "discharge (such as \"Q (L/s)\" or \"Discharge (m3/s)\")",
}

// Unrecognised returns the headers of the columns kept as metadata because
// the importer found no meaning for them, in file order. Columns set aside
// for a stated reason (a second pH column, a unit that does not apply) are
// not among them: their Column.Note says why.
func (t *Table) Unrecognised() []string {
	var out []string
	for _, c := range t.Columns {
		if c.Kind == Meta && c.Note == "" && c.Header != "" {
			out = append(out, c.Header)
		}
	}
	return out
}

// Require returns a problem (ErrNoColumn) for each of kinds that no column
// of the table was read as, naming the headers that were not recognised so
// that the user can rename one; it returns nil when every kind is there.
func (t *Table) Require(kinds ...Kind) ProblemList {
	var out ProblemList
	for _, k := range kinds {
		found := false
		for _, c := range t.Columns {
			found = found || c.Kind == k
		}
		if found {
			continue
		}
		what := requirements[k]
		if what == "" {
			what = k.String()
		}
		out = append(out, &Problem{File: t.Name, Line: t.Header, Err: ErrNoColumn,
			Detail: "no column was recognised as " + what + unrecognisedNote(t.Unrecognised())})
	}
	return out
}

// unrecognisedNote lists unrecognised headers for a message.
func unrecognisedNote(heads []string) string {
	if len(heads) == 0 {
		return ""
	}
	const most = 8
	var b strings.Builder
	b.WriteString("; headers not recognised: ")
	for i, h := range heads {
		if i == most {
			fmt.Fprintf(&b, " and %d more", len(heads)-most)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(strconv.Quote(h))
	}
	b.WriteString(" (rename a column to a name the importer reads)")
	return b.String()
}
