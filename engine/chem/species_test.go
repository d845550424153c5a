package chem

import "testing"

func TestParseSpecies(t *testing.T) {
	// Header spellings from docs/methods.md §1.1 (common practice).
	tests := []struct {
		in    string
		want  Species
		basis string
		ok    bool
	}{
		{"Na", Na, "", true}, {"Na+", Na, "", true}, {"Na⁺", Na, "", true}, {"Sodium", Na, "", true},
		{"Sodium, dissolved", Na, "", true}, {"Na_diss", Na, "", true}, {"natrium", Na, "", true},
		{"K", K, "", true}, {"K+", K, "", true}, {"Potassium", K, "", true}, {"Kalium", K, "", true},
		{"Ca", Ca, "", true}, {"Ca2+", Ca, "", true}, {"Ca++", Ca, "", true}, {"Ca²⁺", Ca, "", true},
		{"Ca 2+", Ca, "", true}, {"Calcium", Ca, "", true}, {"Total Ca", Ca, "", true},
		{"Mg", Mg, "", true}, {"Mg2+", Mg, "", true}, {"Mg++", Mg, "", true}, {"Magnesium", Mg, "", true},
		{"Cl", Cl, "", true}, {"Cl-", Cl, "", true}, {"Cl⁻", Cl, "", true}, {"Chloride", Cl, "", true},
		{"SO4", SO4, "", true}, {"SO42-", SO4, "", true}, {"SO4--", SO4, "", true}, {"SO4^2-", SO4, "", true},
		{"SO4 2-", SO4, "", true}, {"SO₄²⁻", SO4, "", true}, {"Sulfate", SO4, "", true}, {"Sulphate", SO4, "", true},
		{"SO4-S", SO4, "S", true}, {"Sulphate as S", SO4, "S", true}, {"Sulfate as SO4", SO4, "", true},
		{"NO3", NO3, "", true}, {"NO3-", NO3, "", true}, {"Nitrate", NO3, "", true}, {"NOx", NO3, "", true},
		{"NO3-N", NO3, "N", true}, {"Nitrate as N", NO3, "N", true}, {"NO3_N", NO3, "N", true},
		{"NO3+NO2-N", NO3, "N", true}, {"NH4-N", NH4, "N", true}, {"PO4-P", PO4, "P", true},
		{"HCO3", HCO3, "", true}, {"HCO3-", HCO3, "", true}, {"Bicarbonate", HCO3, "", true},
		{"CO3 2-", CO3, "", true}, {"Carbonate", CO3, "", true},
		{"Alk", Alk, "", true}, {"Alk.", Alk, "", true}, {"Alkalinity", Alk, "", true}, {"TA", Alk, "", true},
		{"Total alkalinity", Alk, "", true}, {"ANC", Alk, "", true}, {"Gran alkalinity", Alk, "", true},
		{"Alkalinity as CaCO3", Alk, "CaCO3", true}, {"Alkalinity_as_CaCO3", Alk, "CaCO3", true},
		{"Alk CaCO3", Alk, "CaCO3", true}, {"Alkalinity as HCO3", Alk, "HCO3", true},
		{"SiO2", SiO2, "", true}, {"Si", SiO2, "Si", true}, {"Silica", SiO2, "", true}, {"H4SiO4", SiO2, "H4SiO4", true},
		{"DSi", SiO2, "", true}, {"Dissolved silica", SiO2, "", true},
		{"Sr", Sr, "", true}, {"Strontium", Sr, "", true}, {"Sr88", Sr, "", true},
		{"F-", F, "", true}, {"Br", Br, "", true}, {"NH4+", NH4, "", true},
		// Not species, or a basis that does not apply.
		{"pH", 0, "", false}, {"87Sr/86Sr", 0, "", false}, {"Date", 0, "", false}, {"Site", 0, "", false},
		{"Ca as N", 0, "", false}, {"Total N", 0, "", false}, {"DOC", 0, "", false}, {"", 0, "", false},
		{"Dissolved", 0, "", false}, {"Cl as CaCO3", 0, "", false}, {"Na as", 0, "", false},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, basis, ok := ParseSpecies(tc.in)
			if ok != tc.ok || (ok && (got != tc.want || basis != tc.basis)) {
				t.Errorf("ParseSpecies(%q) = %v, %q, %v; want %v, %q, %v", tc.in, got, basis, ok, tc.want, tc.basis, tc.ok)
			}
		})
	}
}

func TestNormalise(t *testing.T) {
	tests := []struct{ in, want string }{
		{"SO₄²⁻", "so4"}, {"Ca 2+", "ca2"}, {"Na_diss", "nadiss"}, {"HCO3-", "hco3"},
	}
	for _, tc := range tests {
		if got := Normalise(tc.in); got != tc.want {
			t.Errorf("Normalise(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}
