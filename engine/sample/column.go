package sample

import (
	"lixiv/engine/chem"
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
func (k Kind) String() string {
	if k < 0 || int(k) >= len(kindNames) {
		return "unknown"
	}
	return kindNames[k]
}

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
