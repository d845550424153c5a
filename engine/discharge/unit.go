package discharge

import (
	"errors"
	"strings"
)

// Unit is a unit discharge is reported in.
type Unit int

// The discharge units Lixiv reads. The zero value is NoUnit.
const (
	NoUnit   Unit = iota // not stated
	M3PerS               // cubic metres per second (the internal unit)
	LPerS                // litres per second
	M3PerDay             // cubic metres per day
	FT3PerS              // cubic feet per second (cfs)
	MMPerDay             // runoff depth over the catchment, mm per day (needs the area)
)

// FT3 is one cubic foot in cubic metres, exact (1 ft = 0.3048 m by
// definition; common practice).
const FT3 = 0.028316846592

var unitNames = [...]string{"", "m3/s", "L/s", "m3/day", "ft3/s", "mm/day"}

// String returns the unit as Lixiv writes it, such as "m3/s".
func (u Unit) String() string {
	if u < 0 || int(u) >= len(unitNames) {
		return "?"
	}
	if u == NoUnit {
		return "(no unit)"
	}
	return unitNames[u]
}

// ErrNeedArea is returned when runoff in mm/day is converted without a
// positive catchment area.
var ErrNeedArea = errors.New("runoff in mm/day needs the catchment area in km2")

// ToM3s converts a discharge v in unit u to m³/s. areaKm2 is used only for
// MMPerDay, where it must be positive.
func ToM3s(v float64, u Unit, areaKm2 float64) (float64, error) {
	switch u {
	case M3PerS:
		return v, nil
	case LPerS:
		return v / 1000, nil
	case M3PerDay:
		return v / 86400, nil
	case FT3PerS:
		return v * FT3, nil
	case MMPerDay:
		if !(areaKm2 > 0) {
			return 0, ErrNeedArea
		}
		// v mm/day × A km² = v·1e-3 m × A·1e6 m² per 86400 s.
		return v * areaKm2 / 86.4, nil
	}
	return 0, ErrUnknownUnit
}

// ErrUnknownUnit is returned for a unit string Lixiv does not know.
var ErrUnknownUnit = errors.New("unknown discharge unit")

var unitWords = map[string]Unit{
	"m3/s": M3PerS, "m³/s": M3PerS, "m3s-1": M3PerS, "m3/sec": M3PerS, "cms": M3PerS, "cumecs": M3PerS, "m3s": M3PerS,
	"l/s": LPerS, "ls-1": LPerS, "l/sec": LPerS, "ls": LPerS,
	"m3/day": M3PerDay, "m3/d": M3PerDay, "m³/d": M3PerDay, "m³/day": M3PerDay, "m3d-1": M3PerDay,
	"ft3/s": FT3PerS, "ft³/s": FT3PerS, "cfs": FT3PerS, "ft3s-1": FT3PerS, "cusec": FT3PerS, "cusecs": FT3PerS,
	"mm/day": MMPerDay, "mm/d": MMPerDay, "mmd-1": MMPerDay, "mmday-1": MMPerDay,
}

// ParseUnit reads a discharge unit as written in a header or unit column:
// "m3/s", "m³/s", "cms", "L/s", "l s-1", "m3/day", "ft3/s", "cfs", "mm/day",
// "mm d-1". Case, spaces and a surrounding pair of brackets are ignored.
func ParseUnit(text string) (Unit, error) {
	t := strings.ToLower(strings.TrimSpace(text))
	t = strings.Trim(t, "()[]{}")
	t = strings.ReplaceAll(t, " ", "")
	t = strings.ReplaceAll(t, "^", "")
	t = strings.ReplaceAll(t, "⁻¹", "-1")
	t = strings.ReplaceAll(t, "per", "/")
	if u, ok := unitWords[t]; ok {
		return u, nil
	}
	return NoUnit, ErrUnknownUnit
}
