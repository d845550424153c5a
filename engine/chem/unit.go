package chem

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// Dimension is what a concentration unit measures.
type Dimension int

// Unit dimensions.
const (
	Mass       Dimension = iota // mass per volume (g/L base)
	Amount                      // amount of substance per volume (mol/L base)
	Equivalent                  // charge equivalents per volume (eq/L base)
)

// Unit is a concentration unit as parsed from a header or a units row.
// ppm and ppb are taken as mg/L and µg/L, which holds for dilute fresh water
// (density within 0.5 % of 1 kg/L from 0 to 30 °C; common practice).
type Unit struct {
	Dim   Dimension
	Scale float64 // factor to the base unit of Dim (g/L, mol/L or eq/L)
	// Basis names what a mass is reported as: "" (the species itself), "N",
	// "S", "Si", "P" (the element), "CaCO3" (alkalinity as CaCO3), "HCO3" or
	// "H4SiO4".
	Basis string
	Text  string // canonical spelling, such as "mg/L" or "µeq/L"
}

// String returns the canonical spelling, with " as X" for a basis.
func (u Unit) String() string {
	if u.Basis != "" {
		return u.Text + " as " + u.Basis
	}
	return u.Text
}

// Common units.
var (
	MgPerL      = Unit{Mass, 1e-3, "", "mg/L"}
	UgPerL      = Unit{Mass, 1e-6, "", "µg/L"}
	MolPerL     = Unit{Amount, 1, "", "mol/L"}
	MmolPerL    = Unit{Amount, 1e-3, "", "mmol/L"}
	UmolPerL    = Unit{Amount, 1e-6, "", "µmol/L"}
	NmolPerL    = Unit{Amount, 1e-9, "", "nmol/L"}
	EqPerL      = Unit{Equivalent, 1, "", "eq/L"}
	MeqPerL     = Unit{Equivalent, 1e-3, "", "meq/L"}
	UeqPerL     = Unit{Equivalent, 1e-6, "", "µeq/L"}
	MgPerLCaCO3 = Unit{Mass, 1e-3, "CaCO3", "mg/L"}
)

// ErrUnknownUnit is returned by ParseUnit for a unit it does not recognise.
var ErrUnknownUnit = errors.New("unknown unit")

// ErrUnitMismatch is returned when a unit cannot apply to a species, such as
// "as N" for calcium or an equivalent unit for neutral silica.
var ErrUnitMismatch = errors.New("unit does not apply to species")

var unitWords = map[string]Unit{
	"mg/l": MgPerL, "mgl": MgPerL, "mgl-1": MgPerL, "mg/dm3": MgPerL, "ppm": MgPerL, "g/m3": MgPerL,
	"µg/l": UgPerL, "ug/l": UgPerL, "µgl": UgPerL, "ugl": UgPerL, "ppb": UgPerL, "mg/m3": UgPerL, "ugl-1": UgPerL,
	"ng/l": {Mass, 1e-9, "", "ng/L"}, "g/l": {Mass, 1, "", "g/L"},
	"mol/l": MolPerL, "moll": MolPerL, "m": MolPerL,
	"mmol/l": MmolPerL, "mmoll": MmolPerL, "mm": MmolPerL,
	"µmol/l": UmolPerL, "umol/l": UmolPerL, "µmoll": UmolPerL, "umoll": UmolPerL, "µm": UmolPerL, "um": UmolPerL,
	"nmol/l": NmolPerL, "nmoll": NmolPerL, "nm": NmolPerL,
	"eq/l": EqPerL, "eql": EqPerL,
	"meq/l": MeqPerL, "meql": MeqPerL,
	"µeq/l": UeqPerL, "ueq/l": UeqPerL, "µeql": UeqPerL, "ueql": UeqPerL,
}

// ParseUnit parses a unit as written in a header or units row: "mg/L",
// "mg l-1", "ppm", "µmol/L", "umol_L", "uM", "meq/L", "mg/L as CaCO3",
// "mg/L CaCO3", "mg/L NO3-N", "mg N/L", "mg/L as S", "mg/L SiO2". Both µ
// (micro sign or Greek mu) and u are accepted; case is ignored, so "mM" is
// mmol/L and "M" mol/L. A basis word that names the species itself ("mg/L
// SiO2") gives that species' symbol as Basis.
func ParseUnit(text string) (Unit, error) {
	t := strings.TrimSpace(text)
	t = strings.Trim(t, "()[]{} ")
	if t == "" {
		return Unit{}, fmt.Errorf("%w: empty", ErrUnknownUnit)
	}
	low := strings.ToLower(t)
	low = strings.ReplaceAll(low, "μ", "µ") // Greek mu to micro sign
	basis := ""
	setBasis := func(b string) bool {
		if basis != "" && basis != b {
			return false
		}
		basis = b
		return true
	}
	// Basis words: "as CaCO3", "CaCO3", "as N", "NO3-N", "mg N/L".
	fields := strings.Fields(strings.NewReplacer("_", " ", ",", " ").Replace(low))
	var keep []string
	for i := 0; i < len(fields); i++ {
		f := fields[i]
		ok := true
		switch {
		case f == "as" && i+1 < len(fields) && canonBasis(fields[i+1]) != "":
			ok = setBasis(canonBasis(fields[i+1]))
			i++
		case i > 0 && canonBasis(f) != "":
			ok = setBasis(canonBasis(f))
		case i > 0 && strings.Contains(f, "/") && canonBasis(f[:strings.IndexByte(f, '/')]) != "":
			// "mg N/L": the basis sits before the slash.
			j := strings.IndexByte(f, '/')
			ok = setBasis(canonBasis(f[:j]))
			keep = append(keep, f[j:])
		case len(f) > 2 && (strings.HasSuffix(f, "-n") || strings.HasSuffix(f, "-s") || strings.HasSuffix(f, "-p")):
			ok = setBasis(canonBasis(f[len(f)-1:]))
			if _, isSpecies := lookupSpecies(f[:len(f)-2]); !isSpecies {
				keep = append(keep, f[:len(f)-2]) // "mg/l-n"
			}
		default:
			keep = append(keep, f)
		}
		if !ok {
			return Unit{}, fmt.Errorf("%w: %q names two bases", ErrUnknownUnit, text)
		}
	}
	core := strings.Join(keep, "")
	core = strings.ReplaceAll(core, "litre", "l")
	core = strings.ReplaceAll(core, "liter", "l")
	core = strings.ReplaceAll(core, "⁻¹", "-1")
	core = strings.ReplaceAll(core, "·", "")
	core = strings.ReplaceAll(core, ".", "")
	u, ok := unitWords[core]
	if !ok {
		// "mgl-1" style and "mg/l" with stray characters.
		u, ok = unitWords[strings.ReplaceAll(core, "-1", "")]
	}
	if !ok {
		return Unit{}, fmt.Errorf("%w: %q", ErrUnknownUnit, text)
	}
	u.Basis = basis
	return u, nil
}

func canonBasis(w string) string {
	switch w {
	case "caco3":
		return "CaCO3"
	case "n":
		return "N"
	case "s":
		return "S"
	case "si":
		return "Si"
	case "p":
		return "P"
	case "hco3":
		return "HCO3"
	case "h4sio4":
		return "H4SiO4"
	case "sio2":
		return "SiO2"
	case "so4":
		return "SO4"
	case "no3":
		return "NO3"
	case "po4":
		return "PO4"
	case "nh4":
		return "NH4"
	case "co3":
		return "CO3"
	}
	return ""
}

// massBasis returns the grams per mole (or per equivalent for CaCO3) that a
// mass concentration of s reported on the given basis refers to.
func massBasis(s Species, basis string) (float64, error) {
	switch basis {
	case "":
		if s == Alk {
			return molarMass[HCO3], nil // mass alkalinity with no basis: as HCO3
		}
		return molarMass[s], nil
	case "CaCO3":
		if s != Alk && s != HCO3 && s != CO3 {
			return 0, fmt.Errorf("%w: %s as CaCO3", ErrUnitMismatch, s)
		}
		// Per equivalent; converted to µmol of the species by the caller.
		return EqMassCaCO3, nil
	case "HCO3":
		if s != Alk && s != HCO3 {
			return 0, fmt.Errorf("%w: %s as HCO3", ErrUnitMismatch, s)
		}
		return molarMass[HCO3], nil
	case s.Symbol():
		return molarMass[s], nil
	case "H4SiO4":
		if s != SiO2 {
			return 0, fmt.Errorf("%w: %s as H4SiO4", ErrUnitMismatch, s)
		}
		return formula{{"H", 4}, {"Si", 1}, {"O", 4}}.mass(), nil
	default:
		m, ok := s.ElementMass(basis)
		if !ok {
			return 0, fmt.Errorf("%w: %s as %s", ErrUnitMismatch, s, basis)
		}
		return m, nil
	}
}

// ToMicromolar converts a value of species s in unit u to µmol/L (µeq/L for
// Alk). NaN stays NaN.
func ToMicromolar(v float64, s Species, u Unit) (float64, error) {
	f, err := Factor(s, u)
	if err != nil {
		return math.NaN(), err
	}
	return v * f, nil
}

// FromMicromolar converts a value of species s in µmol/L (µeq/L for Alk) to
// unit u.
func FromMicromolar(v float64, s Species, u Unit) (float64, error) {
	f, err := Factor(s, u)
	if err != nil {
		return math.NaN(), err
	}
	return v / f, nil
}

// Factor returns the number that multiplies a value of s in unit u to give
// µmol/L (µeq/L for Alk). A basis on an amount unit counts moles of the
// basis ("mmol/L as CaCO3" of alkalinity is 2 meq/L; "µmol/L as N" of
// nitrate is µmol/L of NO3); a basis on an equivalent unit changes nothing.
func Factor(s Species, u Unit) (float64, error) {
	if s < 0 || s >= NSpecies {
		return 0, fmt.Errorf("%w: species %d", ErrUnitMismatch, int(s))
	}
	if !(u.Scale > 0) || math.IsInf(u.Scale, 0) {
		return 0, fmt.Errorf("%w: %q has no scale", ErrUnknownUnit, u.Text)
	}
	z := math.Abs(float64(s.Charge()))
	if u.Basis != "" {
		if _, err := massBasis(s, u.Basis); err != nil {
			return 0, err
		}
	}
	switch u.Dim {
	case Amount:
		return u.Scale * 1e6 * amountBasis(s, u.Basis), nil
	case Equivalent:
		if z == 0 {
			return 0, fmt.Errorf("%w: %s is neutral, so %s has no meaning", ErrUnitMismatch, s, u.Text)
		}
		if s == Alk {
			return u.Scale * 1e6, nil
		}
		return u.Scale * 1e6 / z, nil
	case Mass:
		m, err := massBasis(s, u.Basis)
		if err != nil {
			return 0, err
		}
		f := u.Scale * 1e6 / m
		if u.Basis == "CaCO3" && s == CO3 {
			f /= 2 // µeq to µmol of a divalent ion
		}
		return f, nil
	}
	return 0, fmt.Errorf("%w: dimension %d", ErrUnknownUnit, u.Dim)
}

// amountBasis returns the moles of s (equivalents for Alk) per mole of the
// basis: 2 for alkalinity or HCO3 as CaCO3, 1/n for an element that occurs n
// times in s, 1 otherwise.
func amountBasis(s Species, basis string) float64 {
	switch basis {
	case "", "HCO3", "H4SiO4", "SiO2":
		return 1
	case "CaCO3":
		if s == CO3 {
			return 1
		}
		return 2
	}
	for _, t := range speciesTable[s].form {
		if t.el == basis {
			return 1 / t.n
		}
	}
	return 1
}
