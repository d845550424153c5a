package chem

import (
	"math"
	"testing"
)

func TestAtomicWeight(t *testing.T) {
	// Prohaska et al. (2022), "Standard atomic weights of the elements 2021",
	// Pure Appl. Chem. 94, 573-600, Table 1; conventional values for elements
	// with an interval (docs/methods.md §2.1).
	tests := []struct {
		el   string
		want float64
	}{
		{"H", 1.008}, {"C", 12.011}, {"N", 14.007}, {"O", 15.999},
		{"F", 18.998403162}, {"Na", 22.98976928}, {"Mg", 24.305}, {"Si", 28.085},
		{"P", 30.973761998}, {"S", 32.06}, {"Cl", 35.45}, {"K", 39.0983},
		{"Ca", 40.078}, {"Br", 79.904}, {"Sr", 87.62},
	}
	for _, tc := range tests {
		t.Run(tc.el, func(t *testing.T) {
			got, ok := AtomicWeight(tc.el)
			if !ok || got != tc.want {
				t.Errorf("AtomicWeight(%q) = %v, %v; want %v, true (exact)", tc.el, got, ok, tc.want)
			}
		})
	}
	if _, ok := AtomicWeight("Xx"); ok {
		t.Error("AtomicWeight(Xx) reported known")
	}
}

func TestMolarMass(t *testing.T) {
	// docs/methods.md §2.2: molar masses computed from the IUPAC/CIAAW 2021 weights
	// (Prohaska et al. 2022), given there to three decimals; tolerance 5e-4 g/mol.
	tests := []struct {
		s      Species
		want   float64
		charge int
	}{
		{Na, 22.98976928, +1}, {K, 39.0983, +1}, {Ca, 40.078, +2}, {Mg, 24.305, +2},
		{Sr, 87.62, +2}, {NH4, 18.039, +1}, {H, 1.008, +1},
		{Cl, 35.45, -1}, {SO4, 96.056, -2}, {NO3, 62.004, -1}, {F, 18.998, -1}, {Br, 79.904, -1},
		{HCO3, 61.016, -1}, {CO3, 60.008, -2}, {Alk, 61.016, -1}, {SiO2, 60.083, 0}, {PO4, 94.970, -3},
	}
	for _, tc := range tests {
		t.Run(tc.s.String(), func(t *testing.T) {
			if got := tc.s.MolarMass(); math.Abs(got-tc.want) > 5e-4 {
				t.Errorf("MolarMass = %.5f, want %.3f (±5e-4)", got, tc.want)
			}
			if got := tc.s.Charge(); got != tc.charge {
				t.Errorf("Charge = %d, want %d", got, tc.charge)
			}
		})
	}
	// Neutral compounds, docs/methods.md §2.2.
	for _, tc := range []struct {
		name      string
		got, want float64
	}{
		{"CaCO3", MassCaCO3, 100.086}, {"CaCO3 equivalent", EqMassCaCO3, 50.043},
		{"CO2", MassCO2, 44.009}, {"C", MassC, 12.011},
	} {
		if math.Abs(tc.got-tc.want) > 5e-4 {
			t.Errorf("%s: got %.5f, want %.3f (±5e-4)", tc.name, tc.got, tc.want)
		}
	}
}

func TestElementMass(t *testing.T) {
	// Element content for "as N", "as S", "as Si", "as P" (IUPAC 2021 weights).
	tests := []struct {
		s    Species
		el   string
		want float64
		ok   bool
	}{
		{NO3, "N", 14.007, true}, {NH4, "N", 14.007, true}, {SO4, "S", 32.06, true},
		{SiO2, "Si", 28.085, true}, {PO4, "P", 30.973761998, true}, {HCO3, "O", 47.997, true},
		{Ca, "N", 0, false},
	}
	for _, tc := range tests {
		got, ok := tc.s.ElementMass(tc.el)
		if ok != tc.ok || math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("%s.ElementMass(%s) = %v, %v; want %v, %v", tc.s, tc.el, got, ok, tc.want, tc.ok)
		}
	}
}

func TestSpeciesNames(t *testing.T) {
	for _, s := range All() {
		if s.Symbol() == "?" || s.Name() == "unknown" {
			t.Errorf("species %d has no symbol or name", int(s))
		}
		got, _, ok := ParseSpecies(s.Symbol())
		if !ok || got != s {
			t.Errorf("ParseSpecies(%q) = %v, %v; want %v", s.Symbol(), got, ok, s)
		}
	}
	if NSpecies.Symbol() != "?" || Species(-1).Name() != "unknown" {
		t.Error("out-of-range species should print as unknown")
	}
}
