package mix

import (
	"fmt"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/internal/enum"
)

// Tracer is a quantity the inverse model matches: a molar ratio to Na, or
// the 87Sr/86Sr isotope ratio. An end-member carries one prior per tracer.
type Tracer int

// The tracers, in the order EndMember.Ratio indexes them.
const (
	CaNa     Tracer = iota // Ca/Na, mol/mol
	MgNa                   // Mg/Na, mol/mol
	KNa                    // K/Na, mol/mol
	HCO3Na                 // HCO3/Na, mol/mol (alkalinity in µeq/L when HCO3 is not given)
	ClNa                   // Cl/Na, mol/mol
	SrNa                   // Sr/Na, mol/mol
	Sr87Sr86               // 87Sr/86Sr, mixed in proportion to Sr
	NTracers               // number of tracers; not a tracer
)

var tracerNames = [NTracers]string{"Ca/Na", "Mg/Na", "K/Na", "HCO3/Na", "Cl/Na", "Sr/Na", "87Sr/86Sr"}

// tracerSpecies is the numerator species of each ratio tracer (Sr for the
// isotope ratio, whose mixing weight is Sr).
var tracerSpecies = [NTracers]chem.Species{chem.Ca, chem.Mg, chem.K, chem.HCO3, chem.Cl, chem.Sr, chem.Sr}

// String returns the tracer's name, such as "Ca/Na".
func (t Tracer) String() string { return enum.Name(t, tracerNames[:], "unknown tracer") }

// Species returns the numerator species of a ratio tracer (Sr for 87Sr/86Sr).
func (t Tracer) Species() chem.Species { return tracerSpecies[t] }

// ParseTracer reads a tracer name such as "Ca/Na", "mg/na" or "87Sr/86Sr".
func ParseTracer(s string) (Tracer, error) {
	k := strings.ToLower(strings.ReplaceAll(strings.TrimSpace(s), " ", ""))
	for t, n := range tracerNames {
		if k == strings.ToLower(n) {
			return Tracer(t), nil
		}
	}
	switch k {
	case "alk/na":
		return HCO3Na, nil
	case "sr87/sr86", "87sr86sr", "srisotopes":
		return Sr87Sr86, nil
	}
	return 0, fmt.Errorf("mix: unknown tracer %q (want one of %s)", s, strings.Join(tracerNames[:], ", "))
}

// cationTracer maps the apportioned cations (Cations order) to the tracer
// holding their ratio to Na; Na itself has none (-1).
var cationTracer = [NCations]Tracer{-1, KNa, CaNa, MgNa}
