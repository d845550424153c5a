package chem

import (
	"strings"
	"unicode"
)

// Species is a dissolved constituent of a water sample. Its concentration is
// held in µmol/L, except Alk (alkalinity), which is an equivalent quantity
// held in µeq/L.
type Species int

// The species Lixiv knows. The order is fixed: it indexes Composition.
const (
	Na Species = iota
	K
	Ca
	Mg
	NH4
	Sr
	H
	Cl
	SO4
	NO3
	F
	Br
	HCO3
	CO3
	Alk
	SiO2
	PO4
	NSpecies // number of species; not a species
)

type speciesInfo struct {
	symbol string  // canonical symbol, as shown
	name   string  // English name
	charge int     // ionic charge; Alk counts as -1 per equivalent
	form   formula // chemical formula
}

var speciesTable = [NSpecies]speciesInfo{
	Na:   {"Na", "sodium", +1, formula{{"Na", 1}}},
	K:    {"K", "potassium", +1, formula{{"K", 1}}},
	Ca:   {"Ca", "calcium", +2, formula{{"Ca", 1}}},
	Mg:   {"Mg", "magnesium", +2, formula{{"Mg", 1}}},
	NH4:  {"NH4", "ammonium", +1, formula{{"N", 1}, {"H", 4}}},
	Sr:   {"Sr", "strontium", +2, formula{{"Sr", 1}}},
	H:    {"H", "hydrogen ion", +1, formula{{"H", 1}}},
	Cl:   {"Cl", "chloride", -1, formula{{"Cl", 1}}},
	SO4:  {"SO4", "sulfate", -2, formula{{"S", 1}, {"O", 4}}},
	NO3:  {"NO3", "nitrate", -1, formula{{"N", 1}, {"O", 3}}},
	F:    {"F", "fluoride", -1, formula{{"F", 1}}},
	Br:   {"Br", "bromide", -1, formula{{"Br", 1}}},
	HCO3: {"HCO3", "bicarbonate", -1, formula{{"H", 1}, {"C", 1}, {"O", 3}}},
	CO3:  {"CO3", "carbonate", -2, formula{{"C", 1}, {"O", 3}}},
	Alk:  {"Alk", "alkalinity", -1, formula{{"H", 1}, {"C", 1}, {"O", 3}}},
	SiO2: {"SiO2", "silica", 0, formula{{"Si", 1}, {"O", 2}}},
	PO4:  {"PO4", "phosphate", -3, formula{{"P", 1}, {"O", 4}}},
}

var molarMass [NSpecies]float64

func init() {
	for s := Species(0); s < NSpecies; s++ {
		molarMass[s] = speciesTable[s].form.mass()
	}
}

// Symbol returns the canonical symbol, such as "SO4".
func (s Species) Symbol() string {
	if s < 0 || s >= NSpecies {
		return "?"
	}
	return speciesTable[s].symbol
}

// String returns the canonical symbol.
func (s Species) String() string { return s.Symbol() }

// Name returns the English name, such as "sulfate".
func (s Species) Name() string {
	if s < 0 || s >= NSpecies {
		return "unknown"
	}
	return speciesTable[s].name
}

// Charge returns the ionic charge. Alkalinity counts as -1 per equivalent;
// silica is neutral.
func (s Species) Charge() int { return speciesTable[s].charge }

// MolarMass returns the molar mass in g/mol computed from the IUPAC 2021
// standard atomic weights. For Alk it is the mass of HCO3-, the basis of
// alkalinity reported "as HCO3".
func (s Species) MolarMass() float64 { return molarMass[s] }

// ElementMass returns the mass of the named element in one mole of the
// species (g/mol), used for values reported "as N", "as S", "as Si" or "as P".
// It returns false when the species holds no such element.
func (s Species) ElementMass(el string) (float64, bool) {
	for _, t := range speciesTable[s].form {
		if t.el == el {
			return t.n * atomicWeight[el], true
		}
	}
	return 0, false
}

// IsCation reports whether the species carries a positive charge.
func (s Species) IsCation() bool { return s.Charge() > 0 }

// IsAnion reports whether the species carries a negative charge.
func (s Species) IsAnion() bool { return s.Charge() < 0 }

// All returns every species in index order.
func All() []Species {
	out := make([]Species, NSpecies)
	for i := range out {
		out[i] = Species(i)
	}
	return out
}

// aliases maps a normalised name (lower case, no spaces, charges stripped)
// to a species. The "as" basis of names such as NO3-N is handled by
// ParseSpecies.
var aliases = map[string]Species{
	"na": Na, "sodium": Na, "natrium": Na,
	"k": K, "potassium": K, "kalium": K,
	"ca": Ca, "calcium": Ca,
	"mg": Mg, "magnesium": Mg,
	"nh4": NH4, "ammonium": NH4,
	"sr": Sr, "strontium": Sr, "sr88": Sr, "88sr": Sr,
	"h": H, "hydrogen": H, "hydrogenion": H,
	"cl": Cl, "chloride": Cl, "chlorid": Cl,
	"so4": SO4, "sulfate": SO4, "sulphate": SO4,
	"no3": NO3, "nitrate": NO3, "nox": NO3, "no3no2": NO3, "no2no3": NO3, "nitratenitrite": NO3,
	"f": F, "fluoride": F,
	"br": Br, "bromide": Br,
	"hco3": HCO3, "bicarbonate": HCO3, "hydrogencarbonate": HCO3,
	"co3": CO3, "carbonate": CO3,
	"alk": Alk, "alkalinity": Alk, "ta": Alk, "totalalkalinity": Alk, "anc": Alk,
	"granalkalinity": Alk, "alk.": Alk, "carbonatealkalinity": Alk,
	"sio2": SiO2, "silica": SiO2, "h4sio4": SiO2, "si": SiO2, "dsi": SiO2,
	"dissolvedsilica": SiO2, "silicon": SiO2,
	"po4": PO4, "phosphate": PO4,
}

// Normalise turns a header name into the key used for alias look-up: lower
// case, without spaces, underscores, charge signs and superscripts.
func Normalise(name string) string {
	var b strings.Builder
	for _, r := range name {
		switch {
		case r == '⁺' || r == '⁻' || r == '+' || r == '^':
			continue
		case r >= '⁰' && r <= '⁹', r == '¹', r == '²', r == '³':
			continue
		case r >= '₀' && r <= '₉':
			b.WriteRune('0' + (r - '₀'))
		case unicode.IsSpace(r) || r == '_' || r == ',' || r == '-':
			continue
		default:
			b.WriteRune(unicode.ToLower(r))
		}
	}
	return b.String()
}

// ParseSpecies recognises a species name as laboratories write it: "Na",
// "Na+", "Ca2+", "Ca++", "SO4 2-", "SO₄²⁻", "Sulphate", "Alkalinity",
// "H4SiO4", "Sodium, dissolved", "Na_diss". It also returns the mass basis
// implied by the name ("N" for "NO3-N" or "Nitrate as N", "S" for "SO4-S",
// "Si" for "Si", "CaCO3" for "Alkalinity as CaCO3", "H4SiO4" for "H4SiO4",
// "" otherwise). ok is false for an unknown name, and for a basis that does
// not apply to the species ("Ca as N").
func ParseSpecies(name string) (s Species, basis string, ok bool) {
	low := strings.ToLower(strings.TrimSpace(name))
	toks := strings.FieldsFunc(low, func(r rune) bool {
		return unicode.IsSpace(r) || r == '_' || r == ',' || r == '-' || r == '/' || r == '(' || r == ')'
	})
	// Drop words that qualify rather than name: "dissolved", "filtered".
	keep := toks[:0:0]
	for _, t := range toks {
		switch t {
		case "dissolved", "diss", "diss.", "filtered", "filt", "total", "tot", "conc", "conc.", "concentration":
			continue
		}
		keep = append(keep, t)
	}
	toks = keep
	// "as X" anywhere, or a trailing element letter ("NO3-N", "SO4 S").
	self := false
	for i := 0; i+1 < len(toks); i++ {
		if toks[i] != "as" {
			continue
		}
		b := canonBasis(toks[i+1])
		if b == "" {
			return 0, "", false
		}
		basis = b
		toks = append(toks[:i:i], toks[i+2:]...)
		break
	}
	if basis == "" && len(toks) >= 2 {
		switch last := toks[len(toks)-1]; last {
		case "n", "s", "p", "si", "caco3":
			basis = canonBasis(last)
			toks = toks[:len(toks)-1]
		}
	}
	if len(toks) == 0 {
		return 0, "", false
	}
	key := strings.Join(toks, "")
	sp, ok := lookupSpecies(key)
	if !ok {
		return 0, "", false
	}
	switch {
	case basis == "":
		switch Normalise(key) {
		case "si", "silicon":
			return SiO2, "Si", true
		case "h4sio4":
			return SiO2, "H4SiO4", true
		}
		return sp, "", true
	case basis == sp.Symbol():
		self = true
	}
	if self {
		return sp, "", true
	}
	if _, err := massBasis(sp, basis); err != nil {
		return 0, "", false
	}
	return sp, basis, true
}

func lookupSpecies(raw string) (Species, bool) {
	n := Normalise(raw)
	if s, ok := aliases[n]; ok {
		return s, true
	}
	// Trailing charge digits written without superscripts: "ca2" from
	// "Ca2+", "so42" from "SO42-", "co32".
	for _, strip := range []string{"2", "3", "1"} {
		if strings.HasSuffix(n, strip) {
			if s, ok := aliases[strings.TrimSuffix(n, strip)]; ok && abs(s.Charge()) == int(strip[0]-'0') {
				return s, true
			}
		}
	}
	return 0, false
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}
