package mineral

import (
	"math"
	"strings"
	"testing"
)

// TestCatalogueBalancesCharge: every built-in formula balances charge with
// the oxidation states of its atoms (docs/methods.md §16 asks that each
// built-in formula pass an atom and charge balance test), holds only
// elements the balance follows, and is written as its formula reads.
func TestCatalogueBalancesCharge(t *testing.T) {
	seen := map[string]bool{}
	for _, m := range Catalogue {
		if q := m.Charge(); math.Abs(q) > 1e-9 {
			t.Errorf("%s %s: charge %g, want 0", m.Key, m.Text, q)
		}
		if err := m.check(); err != nil {
			t.Errorf("%s: %v", m.Key, err)
		}
		if m.Source == "" || m.Name == "" || len(m.Formula) == 0 {
			t.Errorf("%s: no source, name or formula", m.Key)
		}
		if seen[strings.ToLower(m.Key)] {
			t.Errorf("%s listed twice", m.Key)
		}
		seen[strings.ToLower(m.Key)] = true
		if got, _, err := Lookup(m.Key); err != nil || got.Key != m.Key {
			t.Errorf("Lookup(%q) = %v, %v", m.Key, got.Key, err)
		}
	}
	for an := 0.0; an <= 100; an += 12.5 {
		m, err := Plagioclase(an)
		if err != nil || math.Abs(m.Charge()) > 1e-9 {
			t.Errorf("plagioclase An%g: charge %g, %v", an, m.Charge(), err)
		}
	}
}

// atoms sums the atoms and charge of a reaction, reading each species'
// formula with Parse: every element and the charge must come to zero.
func atoms(t *testing.T, r Reaction) (map[string]float64, float64) {
	t.Helper()
	sum := map[string]float64{}
	q := 0.0
	for _, term := range r {
		f, err := Parse(term.Species)
		if err != nil {
			t.Fatalf("species %s: %v", term.Species, err)
		}
		for _, a := range f {
			sum[a.Element] += term.Coef * a.Count
		}
		q += term.Coef * term.Charge
	}
	return sum, q
}

// TestReactionsBalance: the carbonic-acid reaction of every built-in
// mineral, and of plagioclase of several compositions, balances every
// element and the charge.
func TestReactionsBalance(t *testing.T) {
	ms := append([]Mineral(nil), Catalogue...)
	for _, an := range []float64{0, 17, 38, 62.5, 100} {
		p, _ := Plagioclase(an)
		ms = append(ms, p)
	}
	for _, m := range ms {
		r := m.Reaction()
		sum, q := atoms(t, r)
		for el, n := range sum {
			if math.Abs(n) > 1e-9 {
				t.Errorf("%s: %s does not balance (%g): %s", m.Key, el, n, r)
			}
		}
		if math.Abs(q) > 1e-9 {
			t.Errorf("%s: charge %g: %s", m.Key, q, r)
		}
	}
}

// TestCO2PerMole checks the CO2 consumed per mole against the balanced
// reactions of the docs/methods.md §9.1: albite and K-feldspar 1 (2 per 2
// mol), anorthite 2, forsterite 4, wollastonite 2, calcite 1, dolomite 2;
// gypsum and halite 0; pyrite −4, whose acid is buffered by 4 calcite
// (which consume 4) so that pyrite with calcite consumes none (§9.1, §9.3).
func TestCO2PerMole(t *testing.T) {
	for _, c := range []struct {
		key  string
		want float64
	}{{"albite", 1}, {"K-feldspar", 1}, {"anorthite", 2}, {"forsterite", 4}, {"wollastonite", 2}, {"calcite", 1},
		{"dolomite", 2}, {"gypsum", 0}, {"halite", 0}, {"pyrite", -4}, {"kaolinite", 0}, {"gibbsite", 0},
		{"biotite", 7}, {"annite", 1}, {"diopside", 4}, {"plagioclase An30", 1.3}} {
		m, _, err := Lookup(c.key)
		if err != nil {
			t.Fatal(err)
		}
		if got := m.CO2PerMole(); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("%s: %g CO2 per mole, want %g", c.key, got, c.want)
		}
	}
}

// TestReactionsAsPublished: the reactions of the docs/methods.md §9.1, per
// mole of mineral. Albite: 2 NaAlSi3O8 + 2 CO2 + 11 H2O → Al2Si2O5(OH)4 +
// 2 Na⁺ + 2 HCO3⁻ + 4 H4SiO4; anorthite: CaAl2Si2O8 + 2 CO2 + 3 H2O →
// Al2Si2O5(OH)4 + Ca²⁺ + 2 HCO3⁻; forsterite: Mg2SiO4 + 4 CO2 + 4 H2O →
// 2 Mg²⁺ + 4 HCO3⁻ + H4SiO4; calcite: CaCO3 + CO2 + H2O → Ca²⁺ + 2 HCO3⁻;
// pyrite with FeOOH in place of the Fe(OH)3 of docs/methods.md §9.1 (one H2O less).
func TestReactionsAsPublished(t *testing.T) {
	for _, c := range []struct{ key, want string }{
		{"albite", "NaAlSi3O8 + CO2 + 5.5 H2O → Na⁺ + HCO3⁻ + 2 H4SiO4 + 0.5 Al2Si2O5(OH)4"},
		{"anorthite", "CaAl2Si2O8 + 2 CO2 + 3 H2O → Ca²⁺ + 2 HCO3⁻ + Al2Si2O5(OH)4"},
		{"forsterite", "Mg2SiO4 + 4 CO2 + 4 H2O → 2 Mg²⁺ + 4 HCO3⁻ + H4SiO4"},
		{"wollastonite", "CaSiO3 + 2 CO2 + 3 H2O → Ca²⁺ + 2 HCO3⁻ + H4SiO4"},
		{"calcite", "CaCO3 + CO2 + H2O → Ca²⁺ + 2 HCO3⁻"},
		{"dolomite", "CaMg(CO3)2 + 2 CO2 + 2 H2O → Ca²⁺ + Mg²⁺ + 4 HCO3⁻"},
		{"K-feldspar", "KAlSi3O8 + CO2 + 5.5 H2O → K⁺ + HCO3⁻ + 2 H4SiO4 + 0.5 Al2Si2O5(OH)4"},
		{"pyrite", "FeS2 + 3.75 O2 + 4 HCO3⁻ → 4 CO2 + 1.5 H2O + 2 SO4²⁻ + FeOOH"},
		{"gypsum", "CaSO4·2H2O → 2 H2O + Ca²⁺ + SO4²⁻"},
		{"kaolinite", "Al2Si2O5(OH)4 + 5 H2O → 2 H4SiO4 + 2 Al(OH)3"},
		{"gibbsite", ""},
	} {
		m, _, _ := Lookup(c.key)
		if got := m.Reaction().String(); got != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.key, got, c.want)
		}
	}
}

func TestLookup(t *testing.T) {
	for _, c := range []struct {
		entry, key, formula string
		typed               bool
		warn                string
	}{
		{"Albite", "albite", "NaAlSi3O8", false, ""},
		{"  k-FELDSPAR ", "K-feldspar", "KAlSi3O8", false, ""},
		{"biotite (as phlogopite, Mg end-member)", "biotite", "KMg3AlSi3O12H2", false, ""},
		{"plagioclase An38", "plagioclase An38", "Na0.62Ca0.38Al1.38Si2.62O8", false, ""},
		{"Plagioclase an 38.2", "plagioclase An38.2", "Na0.618Ca0.382Al1.382Si2.618O8", false, ""},
		{"plagioclase An0", "plagioclase An0", "NaAlSi3O8", false, ""},
		{"plagioclase An100", "plagioclase An100", "CaAl2Si2O8", false, ""},
		{"Na0.7Ca0.3Al1.3Si2.7O8", "Na0.7Ca0.3Al1.3Si2.7O8", "Na0.7Ca0.3Al1.3Si2.7O8", true, ""},
		{"local amphibole = Ca2Mg5Si8O22(OH)2", "local amphibole", "Ca2Mg5Si8O24H2", true, ""},
		{"odd = CaMg2SiO4", "odd", "CaMg2SiO4", true, "off by 2"},
		{"CaSO4.2H2O", "CaSO4.2H2O", "CaSO5.2H2", true, `write "·"`},
	} {
		m, warns, err := Lookup(c.entry)
		if err != nil {
			t.Errorf("%q: %v", c.entry, err)
			continue
		}
		if m.Key != c.key || m.Formula.String() != c.formula || m.Typed != c.typed {
			t.Errorf("%q: %s %s typed %v; want %s %s %v", c.entry, m.Key, m.Formula, m.Typed, c.key, c.formula, c.typed)
		}
		if w := strings.Join(warns, "; "); c.warn == "" && w != "" || !strings.Contains(w, c.warn) {
			t.Errorf("%q: warnings %q, want %q", c.entry, w, c.warn)
		}
	}
	for _, c := range []struct{ entry, msg string }{
		{"", "empty"},
		{"quartzz", "not a mineral of the table"},
		{"quartzz", "position 1"},
		{"apatite = Ca5(PO4)3F", "does not follow P"},
		{"plagioclase An120", "0 to 100"},
		{" = NaCl", "name before"},
		{"x = Na(", "position 3"},
	} {
		if _, _, err := Lookup(c.entry); err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%q: err %v, want %q", c.entry, err, c.msg)
		}
	}
}
