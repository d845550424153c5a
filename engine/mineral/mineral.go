package mineral

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Mineral is a phase of the mass balance: a formula with a name and where
// the formula comes from.
type Mineral struct {
	Key     string  // how settings name it: "albite", "plagioclase An38"
	Name    string  // what the page shows: "albite (Na-plagioclase)"
	Text    string  // the formula as written: "CaMg(CO3)2"
	Formula Formula // element counts
	// Secondary says that the mineral usually forms in soils and
	// weathering profiles (kaolinite, gibbsite, smectite) rather than
	// dissolving; a balance lets it take either sign.
	Secondary bool
	Source    string // where the formula comes from
	// States overrides the usual oxidation state of an element in this
	// mineral (S −1 in pyrite); nil for none.
	States map[string]float64
	Typed  bool // typed by the user, not from the table
}

// Formula sources. The ideal end-member formulas are the common textbook
// forms (Deer, Howie & Zussman 1992, An Introduction to the Rock-Forming
// Minerals, 2nd ed., Longman; from memory), as the docs/methods.md §16 lists
// them.
const (
	srcDHZ       = "ideal end-member; Deer, Howie & Zussman 1992 (from memory); docs/methods.md §16"
	srcSmectite  = "Ca-montmorillonite of Helgeson 1969 (Am. J. Sci. 267, from memory) with Ca 0.165 so that charge balances exactly (docs/methods.md §16 gives Ca0.17, that value rounded)"
	srcPhlogo    = "Mg end-member of biotite (phlogopite); Fe-bearing biotite releases its Fe to Fe(III) oxide; Deer, Howie & Zussman 1992 (from memory); docs/methods.md §16"
	srcPlag      = "plagioclase of n % anorthite: Na(1−x)Ca(x)Al(1+x)Si(3−x)O8, x = n/100; docs/methods.md §16"
	srcEvaporite = "ideal formula; common practice"
)

// Catalogue is the table of built-in minerals, primary phases first
// (roughly in the order Goldich (1938) gives for their weathering, most
// weatherable first), then carbonates, salts and sulfide, then the
// secondary phases. Plagioclase of any composition is named
// "plagioclase AnNN" (see Lookup); An30 is listed as an example.
var Catalogue = []Mineral{
	{Key: "forsterite", Name: "forsterite (olivine, Mg end-member)", Text: "Mg2SiO4", Source: srcDHZ},
	{Key: "anorthite", Name: "anorthite (Ca-plagioclase)", Text: "CaAl2Si2O8", Source: srcDHZ},
	{Key: "diopside", Name: "diopside (pyroxene)", Text: "CaMgSi2O6", Source: srcDHZ},
	{Key: "enstatite", Name: "enstatite (pyroxene, Mg end-member)", Text: "MgSiO3", Source: srcDHZ},
	{Key: "wollastonite", Name: "wollastonite", Text: "CaSiO3", Source: srcDHZ},
	{Key: "plagioclase An30", Name: "plagioclase An30 (andesine–oligoclase)", Text: "Na0.7Ca0.3Al1.3Si2.7O8", Source: strings.Replace(srcPlag, "n %", "30 %", 1)},
	{Key: "chlorite", Name: "chlorite (clinochlore)", Text: "Mg5Al2Si3O10(OH)8", Source: srcDHZ},
	{Key: "biotite", Name: "biotite (as phlogopite, Mg end-member)", Text: "KMg3AlSi3O10(OH)2", Source: srcPhlogo},
	{Key: "annite", Name: "annite (biotite, Fe end-member)", Text: "KFe3AlSi3O10(OH)2", Source: srcDHZ},
	{Key: "albite", Name: "albite (Na-plagioclase)", Text: "NaAlSi3O8", Source: srcDHZ},
	{Key: "K-feldspar", Name: "K-feldspar (orthoclase, microcline)", Text: "KAlSi3O8", Source: srcDHZ},
	{Key: "muscovite", Name: "muscovite", Text: "KAl3Si3O10(OH)2", Source: srcDHZ},
	{Key: "calcite", Name: "calcite", Text: "CaCO3", Source: srcDHZ},
	{Key: "dolomite", Name: "dolomite", Text: "CaMg(CO3)2", Source: srcDHZ},
	{Key: "magnesite", Name: "magnesite", Text: "MgCO3", Source: srcDHZ},
	{Key: "gypsum", Name: "gypsum", Text: "CaSO4·2H2O", Source: srcEvaporite},
	{Key: "anhydrite", Name: "anhydrite", Text: "CaSO4", Source: srcEvaporite},
	{Key: "halite", Name: "halite", Text: "NaCl", Source: srcEvaporite},
	{Key: "pyrite", Name: "pyrite (oxidised to sulfate and Fe(III) oxide)", Text: "FeS2", Source: srcDHZ, States: map[string]float64{"S": -1}},
	{Key: "kaolinite", Name: "kaolinite", Text: "Al2Si2O5(OH)4", Source: srcDHZ, Secondary: true},
	{Key: "gibbsite", Name: "gibbsite", Text: "Al(OH)3", Source: srcDHZ, Secondary: true},
	{Key: "smectite", Name: "Ca-smectite (montmorillonite)", Text: "Ca0.165Al2.33Si3.67O10(OH)2", Source: srcSmectite, Secondary: true},
}

func init() {
	for i := range Catalogue {
		f, err := Parse(Catalogue[i].Text)
		if err != nil {
			panic("mineral: built-in " + Catalogue[i].Key + ": " + err.Error())
		}
		Catalogue[i].Formula = f
	}
}

// Plagioclase returns plagioclase of an % anorthite (0–100): Na(1−x)
// Ca(x) Al(1+x) Si(3−x) O8 with x = an/100 (docs/methods.md §16).
func Plagioclase(an float64) (Mineral, error) {
	if !(an >= 0 && an <= 100) {
		return Mineral{}, fmt.Errorf("plagioclase An%s: the anorthite content must be 0 to 100 %%", Number(an))
	}
	x := an / 100
	f := Formula{{"Na", 1 - x}, {"Ca", x}, {"Al", 1 + x}, {"Si", 3 - x}, {"O", 8}}
	if x == 0 || x == 1 { // albite and anorthite hold no Ca or Na
		f = f.without(map[bool]string{true: "Na", false: "Ca"}[x == 1])
	}
	key := "plagioclase An" + Number(an)
	return Mineral{Key: key, Name: key, Text: f.String(), Formula: f, Source: strings.Replace(srcPlag, "n %", Number(an)+" %", 1)}, nil
}

func (f Formula) without(el string) Formula {
	var out Formula
	for _, t := range f {
		if t.Element != el {
			out = append(out, t)
		}
	}
	return out
}

// plagioclaseAn returns NN of "plagioclase AnNN" (letter case ignored,
// spaces optional, NN a number with an optional decimal part), or false.
func plagioclaseAn(e string) (string, bool) {
	rest, ok := foldPrefix(e, "plagioclase")
	if !ok {
		return "", false
	}
	if rest, ok = foldPrefix(strings.TrimLeft(rest, asciiSpace), "an"); !ok {
		return "", false
	}
	num := strings.TrimLeft(rest, asciiSpace)
	whole, frac, dot := strings.Cut(num, ".")
	if !allDigits(whole) || dot && !allDigits(frac) {
		return "", false
	}
	return num, true
}

// asciiSpace is what a regular expression's \s matches.
const asciiSpace = "\t\n\f\r "

// foldPrefix removes prefix p from s, matching letters under Unicode's
// simple case folding (as strings.EqualFold does), rune by rune.
func foldPrefix(s, p string) (string, bool) {
	for _, pr := range p {
		r, n := utf8.DecodeRuneInString(s)
		if n == 0 || !strings.EqualFold(string(r), string(pr)) {
			return "", false
		}
		s = s[n:]
	}
	return s, true
}

// allDigits reports whether s is one or more ASCII digits.
func allDigits(s string) bool {
	return s != "" && strings.Trim(s, "0123456789") == ""
}

// hydrateDot reports whether text holds "." followed by digits and "H2O",
// a decimal point where water of hydration was meant.
func hydrateDot(text string) bool {
	for i := strings.IndexByte(text, '.'); i >= 0; {
		j := i + 1
		for j < len(text) && text[j] >= '0' && text[j] <= '9' {
			j++
		}
		if j > i+1 && strings.HasPrefix(text[j:], "H2O") {
			return true
		}
		k := strings.IndexByte(text[i+1:], '.')
		if k < 0 {
			break
		}
		i += 1 + k
	}
	return false
}

// Lookup finds a mineral by what a user typed: the key or name of a
// mineral of the Catalogue (letter case and spaces ignored), "plagioclase
// AnNN" for plagioclase of NN % anorthite, a formula ("NaAlSi3O8"), or a
// name and a formula, "label = formula". A typed formula is checked as a
// built-in one is (elements followed, charge balance); the returned
// warnings say what is doubtful about it.
func Lookup(entry string) (m Mineral, warnings []string, err error) {
	e := strings.TrimSpace(entry)
	if e == "" {
		return Mineral{}, nil, fmt.Errorf("an empty mineral name")
	}
	norm := func(s string) string { return strings.ToLower(strings.Join(strings.Fields(s), " ")) }
	for _, c := range Catalogue {
		if norm(c.Key) == norm(e) || norm(c.Name) == norm(e) {
			return c, nil, nil
		}
	}
	if g, ok := plagioclaseAn(e); ok {
		an, _ := strconv.ParseFloat(g, 64)
		m, err := Plagioclase(an)
		return m, nil, err
	}
	label, text := e, e
	if l, t, ok := strings.Cut(e, "="); ok {
		label, text = strings.TrimSpace(l), strings.TrimSpace(t)
		if label == "" {
			return Mineral{}, nil, fmt.Errorf("%q: a name before \"=\" is empty", entry)
		}
	}
	f, perr := Parse(text)
	if perr != nil {
		if label == text {
			return Mineral{}, nil, fmt.Errorf("%q is not a mineral of the table (%s) nor a formula: %v", e, keys(), perr)
		}
		return Mineral{}, nil, perr
	}
	m = Mineral{Key: label, Name: label, Text: text, Formula: f, Source: "typed formula", Typed: true}
	if err := m.check(); err != nil {
		return Mineral{}, nil, err
	}
	if q := m.Charge(); math.Abs(q) > 1e-6 {
		w := fmt.Sprintf("%s: the formula %s does not balance charge with the usual oxidation states (Fe and Mn 2+, S 6+, C 4+): off by %s; check it",
			label, text, Number(q))
		if hydrateDot(text) {
			w += ` (a "." before water of hydration reads as a decimal point: write "·" or "*")`
		}
		warnings = append(warnings, w)
	}
	return m, warnings, nil
}

// keys lists the catalogue's keys for messages.
func keys() string {
	k := make([]string, len(Catalogue))
	for i, c := range Catalogue {
		k[i] = c.Key
	}
	return strings.Join(k[:len(k)-1], ", ") + " or " + k[len(k)-1] + `, or "plagioclase AnNN"`
}

// check refuses a formula holding an element the mass balance does not
// follow.
func (m Mineral) check() error {
	for _, t := range m.Formula {
		if _, ok := oxidation[t.Element]; !ok {
			return fmt.Errorf("%s: the mass balance does not follow %s; a mineral may hold %s", m.Key, t.Element, Followed)
		}
	}
	return nil
}

// state returns the oxidation state of element el in m.
func (m Mineral) state(el string) float64 {
	if s, ok := m.States[el]; ok {
		return s
	}
	return oxidation[el]
}

// Charge returns the sum of the oxidation states of the formula's atoms:
// 0 for a formula that balances charge.
func (m Mineral) Charge() float64 {
	q := 0.0
	for _, t := range m.Formula {
		q += t.Count * m.state(t.Element)
	}
	return q
}
