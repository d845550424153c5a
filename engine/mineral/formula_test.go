package mineral

import (
	"errors"
	"math"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
)

func TestParse(t *testing.T) {
	for _, c := range []struct {
		text string
		want string // element counts, as Formula.String writes them
	}{
		{"NaAlSi3O8", "NaAlSi3O8"},
		{"Na0.62Ca0.38Al1.38Si2.62O8", "Na0.62Ca0.38Al1.38Si2.62O8"},
		{"CaMg(CO3)2", "CaMgC2O6"},
		{"Al2Si2O5(OH)4", "Al2Si2O9H4"},
		{"KMg3AlSi3O10(OH)2", "KMg3AlSi3O12H2"},
		{"CaSO4·2H2O", "CaSO6H4"},
		{"CaSO4*2H2O", "CaSO6H4"},
		{"CaSO4 · 2 H2O", "CaSO6H4"},
		{"Ca0.165Al2.33Si3.67O10(OH)2", "Ca0.165Al2.33Si3.67O12H2"},
		{"Mg5Al2Si3O10(OH)8", "Mg5Al2Si3O18H8"},
		{"K[Mg3]AlSi3O10(OH)2", "KMg3AlSi3O12H2"},
		{"Na.5 K.5AlSi3O8", "Na0.5K0.5AlSi3O8"},
		{"Ca((CO3)2)1.5", "CaC3O9"},
		{"Co3O4", "Co3O4"}, // cobalt: symbols are case-sensitive
		{"CO2", "CO2"},
	} {
		f, err := Parse(c.text)
		if err != nil {
			t.Errorf("%q: %v", c.text, err)
			continue
		}
		if got := f.String(); got != c.want {
			t.Errorf("%q: read as %s, want %s", c.text, got, c.want)
		}
	}
}

// TestParseRefuses: every refusal names the position (in characters, from
// 1) of the trouble.
func TestParseRefuses(t *testing.T) {
	for _, c := range []struct {
		text string
		pos  int
		msg  string
	}{
		{"", 1, "empty"},
		{"   ", 4, "empty"},
		{"NaAlSi3O8x", 10, "capital"},
		{"NaAlXx3O8", 5, `"Xx" is not an element`},
		{"Q2", 1, `"Q" is not an element`},
		{"CaMg(CO3", 5, "never closed"},
		{"CaMg(CO3]2", 9, "does not close"},
		{"CaCO3)", 6, "not opened"},
		{"Ca()", 3, "empty bracket"},
		{"2H2O", 1, "must follow"},
		{"O0", 2, "above zero"},
		{"CaSO4·", 7, "nothing after"},
		{"·2H2O", 1, "no element before"},
		{"CaSO4·0H2O", 7, "above zero"},
		{"Na+", 3, `"+" is not part`},
		{"Na 2", 4, "must follow"}, // no space before a count
		{"Na99999", 3, "count of atoms"},
		{"H5000H5001", 6, "more than"},
		{"B.0000001", 1, "fewer than 0.000001"},
		{strings.Repeat("(", 12) + "H" + strings.Repeat(")", 12), 12, "nested deeper"},
		{strings.Repeat("H", 201), 201, "longer than"},
		{"Ca\xffO", 1, "UTF-8"},
	} {
		_, err := Parse(c.text)
		var pe *ParseError
		if !errors.As(err, &pe) {
			t.Errorf("%q: err %v, want a ParseError", c.text, err)
			continue
		}
		if pe.Pos != c.pos || !strings.Contains(pe.Msg, c.msg) || !strings.Contains(err.Error(), "position") {
			t.Errorf("%q: %v; want position %d and %q", c.text, err, c.pos, c.msg)
		}
	}
}

func TestNumber(t *testing.T) {
	for _, c := range []struct {
		x    float64
		want string
	}{{2, "2"}, {0.62, "0.62"}, {5.5, "5.5"}, {1.0 / 3, "0.333333"}, {-4, "-4"}, {-1e-9, "0"}, {3.75, "3.75"}} {
		if got := Number(c.x); got != c.want {
			t.Errorf("Number(%g) = %q, want %q", c.x, got, c.want)
		}
	}
}

// FuzzParse: the parser never panics, refuses with a position inside the
// text (or just after it), and whatever it reads it reads again the same
// from its own written form.
func FuzzParse(f *testing.F) {
	for _, s := range []string{"NaAlSi3O8", "Na0.62Ca0.38Al1.38Si2.62O8", "CaMg(CO3)2", "Al2Si2O5(OH)4", "CaSO4·2H2O",
		"K[Mg3]AlSi3O10(OH)2", "((((H))))", "Ca(", ")", "·", "O.5", "H1e3", "Na 0. 5", "CaSO4.2H2O", "Ca0.165Al2.33Si3.67O10(OH)2"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		defer watchdog.Start(s)()
		g, err := Parse(s)
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("%q: %v is not a ParseError", s, err)
			}
			if n := len([]rune(s)); pe.Pos < 1 || pe.Pos > n+1 && pe.Pos != MaxFormulaLength+1 {
				t.Fatalf("%q: position %d outside the text (%d characters)", s, pe.Pos, n)
			}
			return
		}
		if len(g) == 0 {
			t.Fatalf("%q: read as an empty formula without an error", s)
		}
		for _, term := range g {
			if !(term.Count > 0) || term.Count > maxCount || math.IsInf(term.Count, 0) || !IsElement(term.Element) {
				t.Fatalf("%q: term %+v", s, term)
			}
		}
		// Counts written to six decimals read back within that rounding:
		// half a millionth, and the float's own rounding beyond it (0.0200005
		// is stored a hair above itself and written 0.020001).
		h, err := Parse(g.String())
		if err != nil {
			t.Fatalf("%q: written as %q, which does not read: %v", s, g.String(), err)
		}
		if len(h) != len(g) {
			t.Fatalf("%q: %v reads back as %v", s, g, h)
		}
		for i := range g {
			if h[i].Element != g[i].Element || math.Abs(h[i].Count-g[i].Count) > 5e-7+1e-15*math.Max(1, g[i].Count) {
				t.Fatalf("%q: %v reads back as %v", s, g, h)
			}
		}
	})
}
