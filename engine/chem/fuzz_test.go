package chem

import (
	"math"
	"testing"

	"lixiv/engine/internal/watchdog"
)

func FuzzParseUnit(f *testing.F) {
	for _, s := range []string{"mg/L", "µmol/L", "mg/L as CaCO3", "mg N/L", "meq l-1", "uM", "mg/L-N", "ppb", "(mg/L SiO2)"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		defer watchdog.Start(s)()
		u, err := ParseUnit(s)
		if err != nil {
			return
		}
		if !(u.Scale > 0) {
			t.Fatalf("ParseUnit(%q) gave scale %v", s, u.Scale)
		}
		for _, sp := range All() {
			fac, err := Factor(sp, u)
			if err == nil && (!(fac > 0) || math.IsInf(fac, 0)) {
				t.Fatalf("Factor(%v, %q) = %v", sp, s, fac)
			}
		}
	})
}

func FuzzParseSpecies(f *testing.F) {
	for _, s := range []string{"Ca2+", "SO₄²⁻", "NO3-N", "Nitrate as N", "Alkalinity as CaCO3", "Si", "Sodium, dissolved"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		defer watchdog.Start(s)()
		sp, basis, ok := ParseSpecies(s)
		if !ok {
			return
		}
		if sp < 0 || sp >= NSpecies {
			t.Fatalf("ParseSpecies(%q) = species %d", s, int(sp))
		}
		// Any basis returned must convert a mass unit.
		u := MgPerL
		u.Basis = basis
		if _, err := Factor(sp, u); err != nil {
			t.Fatalf("ParseSpecies(%q) basis %q does not convert: %v", s, basis, err)
		}
	})
}
