package chem

import (
	"math"
	"testing"
)

func TestToMicromolarWorked(t *testing.T) {
	// Worked values from ../shared/science.md §2.3 and §13 item 1, computed
	// from the IUPAC/CIAAW 2021 standard atomic weights (Prohaska et al. 2022).
	tests := []struct {
		name string
		v    float64
		s    Species
		unit string
		want float64
	}{
		{"Ca 40.078 mg/L is 1 mmol/L", 40.078, Ca, "mg/L", 1000},
		{"Ca 40.0 mg/L", 40.0, Ca, "mg/L", 998.054},
		{"Na 10 mg/L", 10, Na, "mg/L", 434.976},
		{"Cl 5 mg/L", 5, Cl, "mg/L", 141.044},
		{"K 1 ppm", 1, K, "ppm", 25.5766},
		{"SO4 20 mg/L", 20, SO4, "mg/L", 208.212},
		{"alkalinity 100 mg/L as CaCO3", 100, Alk, "mg/L as CaCO3", 1998.28},
		{"alkalinity 100 mg/L CaCO3", 100, Alk, "mg/L CaCO3", 1998.28},
		{"SiO2 10 mg/L", 10, SiO2, "mg/L", 166.436},
		{"nitrate 1 mg/L as N", 1, NO3, "mg/L as N", 71.3929},
		{"nitrate 1 mg/L NO3-N", 1, NO3, "mg/L NO3-N", 71.3929},
		{"Sr 1 µg/L", 1, Sr, "µg/L", 0.0114129},
		{"Sr 1 ug/L", 1, Sr, "ug/L", 0.0114129},
		{"Ca 2000 µeq/L", 2000, Ca, "µeq/L", 1000},
		{"Alk 2 meq/L", 2, Alk, "meq/L", 2000},
		{"Na 5 umol_L", 5, Na, "umol_L", 5},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			u, err := ParseUnit(tc.unit)
			if err != nil {
				t.Fatalf("ParseUnit(%q): %v", tc.unit, err)
			}
			got, err := ToMicromolar(tc.v, tc.s, u)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tc.want)/tc.want > 1e-5 {
				t.Errorf("got %.7g µmol/L, want %.7g (tolerance 1e-5 relative)", got, tc.want)
			}
		})
	}
}
