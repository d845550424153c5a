package mix

import (
	"lixiv/engine/chem"
	"lixiv/engine/internal/enum"
)

// Source is a reservoir that supplies dissolved cations to a river.
type Source int

// The sources, in report order.
const (
	Atmosphere Source = iota // rain and dry deposition (sea salt, dust)
	Evaporite                // halite, gypsum and anhydrite
	Silicate                 // silicate minerals
	Carbonate                // calcite and dolomite
	NSources                 // number of sources; not a source
)

var sourceNames = [NSources]string{"atmosphere", "evaporite", "silicate", "carbonate"}

// String returns the lower-case English name of the source.
func (s Source) String() string { return enum.Name(s, sourceNames[:], "unknown") }

// Cations are the apportioned cations, in the order Split indexes them.
var Cations = [NCations]chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg}

// NCations is the number of apportioned cations.
const NCations = 4

// CationIndex returns the position of s in Cations, or -1.
func CationIndex(s chem.Species) int {
	for i, c := range Cations {
		if c == s {
			return i
		}
	}
	return -1
}

// Split holds, for one water sample, the concentration (µmol/L) of each
// apportioned cation contributed by each source: Split[src][i] is the
// amount of Cations[i] from src.
type Split [NSources][NCations]float64

// Of returns the µmol/L of species sp from source src (NaN if sp is not an
// apportioned cation).
func (s *Split) Of(src Source, sp chem.Species) float64 {
	i := CationIndex(sp)
	if i < 0 {
		return nan()
	}
	return s[src][i]
}

// Total returns the sum over sources of cation sp (µmol/L).
func (s *Split) Total(sp chem.Species) float64 {
	i := CationIndex(sp)
	if i < 0 {
		return nan()
	}
	t := 0.0
	for src := Source(0); src < NSources; src++ {
		t += s[src][i]
	}
	return t
}
