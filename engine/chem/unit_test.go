package chem

import (
	"errors"
	"math"
	"testing"
)

func TestToMicromolarWorked(t *testing.T) {
	// Worked values from docs/methods.md §2.3 and §13 item 1, computed
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
		{"K 1000 ppb", 1000, K, "ppb", 25.5766},
		{"SO4 20 mg/L", 20, SO4, "mg/L", 208.212},
		{"SO4 20 mg/L SO4", 20, SO4, "mg/L SO4", 208.212},
		{"alkalinity 100 mg/L as CaCO3", 100, Alk, "mg/L as CaCO3", 1998.28},
		{"alkalinity 100 mg/L CaCO3", 100, Alk, "mg/L CaCO3", 1998.28},
		{"alkalinity 100 ppm as CaCO3", 100, Alk, "ppm as CaCO3", 1998.28},
		// 1 meq/L HCO3 = 61.016 mg/L HCO3 (docs/methods.md §2.3).
		{"alkalinity 61.016 mg/L HCO3", 61.016, Alk, "mg/L HCO3", 1000},
		{"alkalinity 61.016 mg/L, no basis, is as HCO3", 61.016, Alk, "mg/L", 1000},
		{"HCO3 61.016 mg/L", 61.016, HCO3, "mg/L", 1000},
		{"SiO2 10 mg/L", 10, SiO2, "mg/L", 166.436},
		{"SiO2 10 mg/L SiO2", 10, SiO2, "mg/L SiO2", 166.436},
		// Si to SiO2 x 2.13933 (docs/methods.md §1.1): 10 mg/L Si = 21.3933 mg/L SiO2 = 356.060 µmol/L.
		{"silica 10 mg/L as Si", 10, SiO2, "mg/L as Si", 356.0605},
		{"silica 10 mg Si/L", 10, SiO2, "mg Si/L", 356.0605},
		{"nitrate 1 mg/L as N", 1, NO3, "mg/L as N", 71.3929},
		{"nitrate 1 mg/L NO3-N", 1, NO3, "mg/L NO3-N", 71.3929},
		{"nitrate 1 mg N/L", 1, NO3, "mg N/L", 71.3929},
		{"nitrate 1 mg/L-N", 1, NO3, "mg/L-N", 71.3929},
		// 1 mg/L NO3-N = 4.42664 mg/L NO3 (docs/methods.md §1.1): 4.42664 / 62.004 * 1000.
		{"nitrate 4.42664 mg/L as NO3", 4.42664, NO3, "mg/L", 71.3929},
		// SO4-S to SO4 x 2.99613 (docs/methods.md §1.1): 1 mg/L as S = 1000/32.06 µmol/L.
		{"sulfate 1 mg/L as S", 1, SO4, "mg/L as S", 31.19152},
		{"sulfate 1 mg/L SO4-S", 1, SO4, "mg/L SO4-S", 31.19152},
		{"sulfate 2.99613 mg/L", 2.99613, SO4, "mg/L", 31.19152},
		{"Sr 1 µg/L", 1, Sr, "µg/L", 0.0114129},
		{"Sr 1 ug/L", 1, Sr, "ug/L", 0.0114129},
		{"Sr 1 μg/L (Greek mu)", 1, Sr, "μg/L", 0.0114129},
		{"Sr 11.4129 nmol/L", 11.4129, Sr, "nmol/L", 0.0114129},
		{"Sr 1 ppb", 1, Sr, "ppb", 0.0114129},
		{"Ca 2000 µeq/L", 2000, Ca, "µeq/L", 1000},
		{"Ca 2000 ueq/L", 2000, Ca, "ueq/L", 1000},
		{"Ca 1 mmol/L", 1, Ca, "mmol/L", 1000},
		{"Ca 1 mM", 1, Ca, "mM", 1000},
		{"Ca 1000 uM", 1000, Ca, "uM", 1000},
		{"Ca 1000 µM", 1000, Ca, "µM", 1000},
		{"Ca 0.001 mol/L", 0.001, Ca, "mol/L", 1000},
		{"SO4 416.424 µeq/L", 416.424, SO4, "µeq/L", 208.212},
		{"Alk 2 meq/L", 2, Alk, "meq/L", 2000},
		{"Alk 2 meq/L as CaCO3 (the basis changes nothing)", 2, Alk, "meq/L as CaCO3", 2000},
		{"Alk 1 mmol/L as CaCO3 is 2 meq/L", 1, Alk, "mmol/L as CaCO3", 2000},
		{"Alk 0.002 eq/L", 0.002, Alk, "eq/L", 2000},
		{"NO3 5 µmol/L as N", 5, NO3, "µmol/L as N", 5},
		{"Na 5 umol_L", 5, Na, "umol_L", 5},
		{"Na 5 µmol L-1", 5, Na, "µmol L-1", 5},
		{"Na 5 µmol·L⁻¹", 5, Na, "µmol·L⁻¹", 5},
		{"Na 1 mg l-1", 1, Na, "mg l-1", 43.4976},
		{"Na 1 mg/litre", 1, Na, "mg/litre", 43.4976},
		{"Na 1 g/m3", 1, Na, "g/m3", 43.4976},
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

func TestFromMicromolarWorked(t *testing.T) {
	// docs/methods.md §2.3 (IUPAC 2021 weights): 2 mg/L Mg = 0.164575 meq/L;
	// 20 mg/L SO4 = 416.424 µeq/L; 1 meq/L HCO3 = 61.016 mg/L HCO3;
	// 40.078 mg/L Ca = 2000 µeq/L.
	tests := []struct {
		name       string
		v          float64 // µmol/L
		s          Species
		unit, back string
		want       float64
	}{
		{"Mg 2 mg/L in meq/L", 2, Mg, "mg/L", "meq/L", 0.164575},
		{"SO4 20 mg/L in µeq/L", 20, SO4, "mg/L", "µeq/L", 416.424},
		{"Ca 40.078 mg/L in µeq/L", 40.078, Ca, "mg/L", "µeq/L", 2000},
		{"HCO3 1 meq/L in mg/L", 1, HCO3, "meq/L", "mg/L", 61.016},
		{"Alk 1 meq/L in mg/L HCO3", 1, Alk, "meq/L", "mg/L as HCO3", 61.016},
		// mg/L as HCO3 = mg/L as CaCO3 x 1.21927 (docs/methods.md §1.1).
		{"Alk 100 mg/L CaCO3 in mg/L HCO3", 100, Alk, "mg/L as CaCO3", "mg/L as HCO3", 121.927},
		{"NO3-N 1 mg/L in mg/L NO3", 1, NO3, "mg/L as N", "mg/L", 4.42664},
		{"SO4-S 1 mg/L in mg/L SO4", 1, SO4, "mg/L as S", "mg/L", 2.99613},
		{"Si 1 mg/L in mg/L SiO2", 1, SiO2, "mg/L as Si", "mg/L", 2.13933},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			from, err := ParseUnit(tc.unit)
			if err != nil {
				t.Fatal(err)
			}
			to, err := ParseUnit(tc.back)
			if err != nil {
				t.Fatal(err)
			}
			um, err := ToMicromolar(tc.v, tc.s, from)
			if err != nil {
				t.Fatal(err)
			}
			got, err := FromMicromolar(um, tc.s, to)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tc.want)/tc.want > 1e-5 {
				t.Errorf("got %.7g %s, want %.7g (tolerance 1e-5 relative)", got, tc.back, tc.want)
			}
		})
	}
}

func TestParseUnit(t *testing.T) {
	tests := []struct {
		in    string
		dim   Dimension
		scale float64
		basis string
		err   error
	}{
		{"mg/L", Mass, 1e-3, "", nil}, {"mg/l", Mass, 1e-3, "", nil}, {"MG/L", Mass, 1e-3, "", nil},
		{"(mg/L)", Mass, 1e-3, "", nil}, {"[mg/L]", Mass, 1e-3, "", nil}, {" mg/L ", Mass, 1e-3, "", nil},
		{"mg l-1", Mass, 1e-3, "", nil}, {"mg L⁻¹", Mass, 1e-3, "", nil}, {"mg_L", Mass, 1e-3, "", nil},
		{"ppm", Mass, 1e-3, "", nil}, {"ppb", Mass, 1e-6, "", nil},
		{"µg/L", Mass, 1e-6, "", nil}, {"ug/L", Mass, 1e-6, "", nil}, {"μg/L", Mass, 1e-6, "", nil},
		{"ug_L", Mass, 1e-6, "", nil}, {"ng/L", Mass, 1e-9, "", nil},
		{"mol/L", Amount, 1, "", nil}, {"M", Amount, 1, "", nil}, {"mmol/L", Amount, 1e-3, "", nil},
		{"mM", Amount, 1e-3, "", nil}, {"µmol/L", Amount, 1e-6, "", nil}, {"umol/L", Amount, 1e-6, "", nil},
		{"umol_L", Amount, 1e-6, "", nil}, {"µM", Amount, 1e-6, "", nil}, {"uM", Amount, 1e-6, "", nil},
		{"µmol l-1", Amount, 1e-6, "", nil}, {"nmol/L", Amount, 1e-9, "", nil}, {"nM", Amount, 1e-9, "", nil},
		{"eq/L", Equivalent, 1, "", nil}, {"meq/L", Equivalent, 1e-3, "", nil}, {"meq l-1", Equivalent, 1e-3, "", nil},
		{"µeq/L", Equivalent, 1e-6, "", nil}, {"ueq/L", Equivalent, 1e-6, "", nil}, {"μeq/L", Equivalent, 1e-6, "", nil},
		{"mg/L as CaCO3", Mass, 1e-3, "CaCO3", nil}, {"mg/L CaCO3", Mass, 1e-3, "CaCO3", nil},
		{"mg CaCO3/L", Mass, 1e-3, "CaCO3", nil}, {"mg/L as HCO3", Mass, 1e-3, "HCO3", nil},
		{"mg/L HCO3", Mass, 1e-3, "HCO3", nil}, {"mg/L NO3-N", Mass, 1e-3, "N", nil},
		{"mg/L as N", Mass, 1e-3, "N", nil}, {"mg N/L", Mass, 1e-3, "N", nil}, {"mg/L-N", Mass, 1e-3, "N", nil},
		{"mg/L as S", Mass, 1e-3, "S", nil}, {"mg/L SO4-S", Mass, 1e-3, "S", nil}, {"mg/L Si", Mass, 1e-3, "Si", nil},
		{"mg/L SiO2", Mass, 1e-3, "SiO2", nil}, {"µg/L as P", Mass, 1e-6, "P", nil},
		{"mmol/L as CaCO3", Amount, 1e-3, "CaCO3", nil},
		{"", 0, 0, "", ErrUnknownUnit}, {"()", 0, 0, "", ErrUnknownUnit}, {"furlongs", 0, 0, "", ErrUnknownUnit},
		{"°C", 0, 0, "", ErrUnknownUnit}, {"µS/cm", 0, 0, "", ErrUnknownUnit}, {"N", 0, 0, "", ErrUnknownUnit},
		{"mg/L as N as S", 0, 0, "", ErrUnknownUnit}, {"%", 0, 0, "", ErrUnknownUnit}, {"as", 0, 0, "", ErrUnknownUnit},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			u, err := ParseUnit(tc.in)
			if tc.err != nil {
				if !errors.Is(err, tc.err) {
					t.Fatalf("ParseUnit(%q) = %v, %v; want error %v", tc.in, u, err, tc.err)
				}
				return
			}
			if err != nil {
				t.Fatalf("ParseUnit(%q): %v", tc.in, err)
			}
			if u.Dim != tc.dim || u.Scale != tc.scale || u.Basis != tc.basis {
				t.Errorf("ParseUnit(%q) = {%v %g %q}, want {%v %g %q}", tc.in, u.Dim, u.Scale, u.Basis, tc.dim, tc.scale, tc.basis)
			}
		})
	}
}

func TestFactorMismatch(t *testing.T) {
	tests := []struct {
		name string
		s    Species
		unit string
	}{
		{"calcium as N", Ca, "mg/L as N"},
		{"chloride as CaCO3", Cl, "mg/L as CaCO3"},
		{"silica in meq/L", SiO2, "meq/L"},
		{"sodium as SiO2", Na, "mg/L SiO2"},
		{"sodium as H4SiO4", Na, "mg/L as H4SiO4"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			u, err := ParseUnit(tc.unit)
			if err != nil {
				t.Fatal(err)
			}
			f, err := Factor(tc.s, u)
			if !errors.Is(err, ErrUnitMismatch) {
				t.Errorf("Factor = %v, %v; want ErrUnitMismatch", f, err)
			}
			if v, err := ToMicromolar(1, tc.s, u); err == nil || !math.IsNaN(v) {
				t.Errorf("ToMicromolar = %v, %v; want NaN and an error", v, err)
			}
		})
	}
	// A zero Unit has no scale: refuse it rather than return a silent zero.
	if f, err := Factor(Ca, Unit{}); !errors.Is(err, ErrUnknownUnit) {
		t.Errorf("Factor(zero Unit) = %v, %v; want ErrUnknownUnit", f, err)
	}
	if f, err := Factor(NSpecies, MgPerL); err == nil {
		t.Errorf("Factor(NSpecies) = %v, nil; want an error", f)
	}
}

func TestUnitString(t *testing.T) {
	u, _ := ParseUnit("mg/L as CaCO3")
	if got := u.String(); got != "mg/L as CaCO3" {
		t.Errorf("String = %q, want %q", got, "mg/L as CaCO3")
	}
	if got := UeqPerL.String(); got != "µeq/L" {
		t.Errorf("String = %q, want µeq/L", got)
	}
}

func TestComposition(t *testing.T) {
	c := NewComposition()
	if c.Has(Ca) {
		t.Fatal("new composition has Ca")
	}
	c[Ca], c[Alk], c[SO4] = 100, 250, 50
	if got := c.Eq(Ca); got != 200 {
		t.Errorf("Eq(Ca) = %v, want 200", got)
	}
	if got := c.Eq(Alk); got != 250 {
		t.Errorf("Eq(Alk) = %v, want 250 (already µeq/L)", got)
	}
	if got := c.Eq(SO4); got != 100 {
		t.Errorf("Eq(SO4) = %v, want 100", got)
	}
	d := c.Scale(0.5)
	if d[Ca] != 50 || !math.IsNaN(d[Na]) || c[Ca] != 100 {
		t.Errorf("Scale(0.5) = %v (Ca), %v (Na), original Ca %v; want 50, NaN, 100", d[Ca], d[Na], c[Ca])
	}
}
