package co2

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode"
)

// The weathering reactions of the docs/methods.md §9.1. Charges are written
// after the formula as "+", "-", "+2" or "-2"; coefficients may be
// fractions.
var reactions = []struct {
	name     string
	equation string
}{
	{"carbonic acid", "CO2 + H2O -> H2CO3"},
	{"calcite", "CaCO3 + CO2 + H2O -> Ca+2 + 2 HCO3-"},
	{"dolomite", "CaMg(CO3)2 + 2 CO2 + 2 H2O -> Ca+2 + Mg+2 + 4 HCO3-"},
	{"albite to kaolinite", "2 NaAlSi3O8 + 2 CO2 + 11 H2O -> Al2Si2O5(OH)4 + 2 Na+ + 2 HCO3- + 4 H4SiO4"},
	{"K-feldspar to kaolinite", "2 KAlSi3O8 + 2 CO2 + 11 H2O -> Al2Si2O5(OH)4 + 2 K+ + 2 HCO3- + 4 H4SiO4"},
	{"anorthite to kaolinite", "CaAl2Si2O8 + 2 CO2 + 3 H2O -> Al2Si2O5(OH)4 + Ca+2 + 2 HCO3-"},
	{"forsterite", "Mg2SiO4 + 4 CO2 + 4 H2O -> 2 Mg+2 + 4 HCO3- + H4SiO4"},
	{"wollastonite", "CaSiO3 + 2 CO2 + 3 H2O -> Ca+2 + 2 HCO3- + H4SiO4"},
	{"pyrite oxidation", "FeS2 + 15/4 O2 + 7/2 H2O -> Fe(OH)3 + 2 SO4-2 + 4 H+"},
	{"pyrite with calcite", "4 FeS2 + 15 O2 + 14 H2O + 16 CaCO3 -> 4 Fe(OH)3 + 8 SO4-2 + 16 Ca+2 + 16 HCO3-"},
	{"calcite by sulfuric acid, buffered", "2 CaCO3 + H2SO4 -> 2 Ca+2 + 2 HCO3- + SO4-2"},
	{"calcite by excess sulfuric acid", "CaCO3 + H2SO4 -> Ca+2 + SO4-2 + CO2 + H2O"},
	{"albite by sulfuric acid", "2 NaAlSi3O8 + H2SO4 + 9 H2O -> Al2Si2O5(OH)4 + 2 Na+ + SO4-2 + 4 H4SiO4"},
	// The Ca silicates by sulfuric acid, written like albite's (§9.3:
	// silicate weathering by H2SO4 consumes no CO2); balanced by TestBalance.
	{"anorthite by sulfuric acid", "CaAl2Si2O8 + H2SO4 + H2O -> Al2Si2O5(OH)4 + Ca+2 + SO4-2"},
	{"wollastonite by sulfuric acid", "CaSiO3 + H2SO4 + H2O -> Ca+2 + SO4-2 + H4SiO4"},
	{"Urey reaction", "CaSiO3 + CO2 -> CaCO3 + SiO2"},
}

// term is one species of a reaction with its coefficient.
type term struct {
	coef    float64
	formula string
}

// side parses "2 NaAlSi3O8 + 15/4 O2" into terms.
func side(s string) ([]term, error) {
	var out []term
	for _, part := range strings.Split(s, " + ") {
		f := strings.Fields(part)
		t := term{coef: 1}
		switch len(f) {
		case 1:
			t.formula = f[0]
		case 2:
			c, err := fraction(f[0])
			if err != nil {
				return nil, err
			}
			t.coef, t.formula = c, f[1]
		default:
			return nil, fmt.Errorf("bad term %q", part)
		}
		out = append(out, t)
	}
	return out, nil
}

// fraction parses "3" or "15/4".
func fraction(s string) (float64, error) {
	num, den, ok := strings.Cut(s, "/")
	n, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, err
	}
	if !ok {
		return n, nil
	}
	d, err := strconv.ParseFloat(den, 64)
	if err != nil || d == 0 {
		return 0, fmt.Errorf("bad fraction %q", s)
	}
	return n / d, nil
}

// atoms counts the atoms and the charge of a formula such as
// "Al2Si2O5(OH)4", "SO4-2" or "Na+".
func atoms(f string) (map[string]float64, float64, error) {
	charge := 0.0
	if i := strings.LastIndexAny(f, "+-"); i > 0 {
		n := 1.0
		if rest := f[i+1:]; rest != "" {
			v, err := strconv.Atoi(rest)
			if err != nil {
				return nil, 0, fmt.Errorf("bad charge in %q", f)
			}
			n = float64(v)
		}
		if f[i] == '-' {
			n = -n
		}
		charge, f = n, f[:i]
	}
	counts, rest, err := group(f)
	if err != nil {
		return nil, 0, err
	}
	if rest != "" {
		return nil, 0, fmt.Errorf("unbalanced parenthesis in %q", f)
	}
	return counts, charge, nil
}

// group counts atoms up to an unmatched ")" and returns the rest.
func group(s string) (map[string]float64, string, error) {
	out := map[string]float64{}
	for s != "" {
		switch {
		case s[0] == ')':
			return out, s, nil
		case s[0] == '(':
			inner, rest, err := group(s[1:])
			if err != nil {
				return nil, "", err
			}
			if rest == "" || rest[0] != ')' {
				return nil, "", fmt.Errorf("missing ) in %q", s)
			}
			n, rest := number(rest[1:])
			for el, c := range inner {
				out[el] += c * n
			}
			s = rest
		case unicode.IsUpper(rune(s[0])):
			j := 1
			for j < len(s) && unicode.IsLower(rune(s[j])) {
				j++
			}
			el := s[:j]
			n, rest := number(s[j:])
			out[el] += n
			s = rest
		default:
			return nil, "", fmt.Errorf("unexpected %q", s)
		}
	}
	return out, "", nil
}

// number reads a leading count, 1 when there is none.
func number(s string) (float64, string) {
	j := 0
	for j < len(s) && s[j] >= '0' && s[j] <= '9' {
		j++
	}
	if j == 0 {
		return 1, s
	}
	n, _ := strconv.Atoi(s[:j])
	return float64(n), s[j:]
}

// balance returns the atom and charge totals of products minus reactants.
func balance(eq string) (map[string]float64, float64, error) {
	lhs, rhs, ok := strings.Cut(eq, " -> ")
	if !ok {
		return nil, 0, fmt.Errorf("no arrow in %q", eq)
	}
	diff := map[string]float64{}
	charge := 0.0
	for sign, s := range map[float64]string{-1: lhs, +1: rhs} {
		terms, err := side(s)
		if err != nil {
			return nil, 0, err
		}
		for _, t := range terms {
			a, z, err := atoms(t.formula)
			if err != nil {
				return nil, 0, err
			}
			for el, n := range a {
				diff[el] += sign * t.coef * n
			}
			charge += sign * t.coef * z
		}
	}
	return diff, charge, nil
}

func TestFormulaCounter(t *testing.T) {
	// Formulas of common minerals (common practice).
	tests := []struct {
		f      string
		want   map[string]float64
		charge float64
	}{
		{"Al2Si2O5(OH)4", map[string]float64{"Al": 2, "Si": 2, "O": 9, "H": 4}, 0},
		{"CaMg(CO3)2", map[string]float64{"Ca": 1, "Mg": 1, "C": 2, "O": 6}, 0},
		{"SO4-2", map[string]float64{"S": 1, "O": 4}, -2},
		{"Na+", map[string]float64{"Na": 1}, 1},
		{"HCO3-", map[string]float64{"H": 1, "C": 1, "O": 3}, -1},
		{"Ca+2", map[string]float64{"Ca": 1}, 2},
	}
	for _, tc := range tests {
		t.Run(tc.f, func(t *testing.T) {
			got, z, err := atoms(tc.f)
			if err != nil {
				t.Fatal(err)
			}
			if z != tc.charge || len(got) != len(tc.want) {
				t.Fatalf("got %v charge %g, want %v charge %g", got, z, tc.want, tc.charge)
			}
			for el, n := range tc.want {
				if got[el] != n {
					t.Errorf("%s: got %g, want %g", el, got[el], n)
				}
			}
		})
	}
	// An unbalanced equation must be caught.
	if d, z, _ := balance("NaAlSi3O8 + CO2 + H2O -> Na+ + HCO3-"); d["Si"] == 0 || z != 0 {
		t.Errorf("unbalanced albite: got diff %v, charge %g; want Si left over", d, z)
	}
}

func TestReactionsBalanced(t *testing.T) {
	// Every reaction of the docs/methods.md §9.1 conserves each element and
	// charge exactly (docs/methods.md says the counts were checked; this
	// checks them again).
	for _, r := range reactions {
		t.Run(r.name, func(t *testing.T) {
			diff, charge, err := balance(r.equation)
			if err != nil {
				t.Fatal(err)
			}
			for el, d := range diff {
				if math.Abs(d) > 1e-12 {
					t.Errorf("%s: products − reactants = %g", el, d)
				}
			}
			if math.Abs(charge) > 1e-12 {
				t.Errorf("charge: products − reactants = %g", charge)
			}
		})
	}
}
