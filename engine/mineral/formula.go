package mineral

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Formula is a chemical formula as element counts, each element once, in
// the order it first appears in the text. Counts may be fractional
// (Na0.62Ca0.38Al1.38Si2.62O8).
type Formula []Term

// Term is one element of a formula and how many atoms of it a formula unit
// holds.
type Term struct {
	Element string
	Count   float64
}

// Count returns how many atoms of element el the formula holds (0 when
// none).
func (f Formula) Count(el string) float64 {
	for _, t := range f {
		if t.Element == el {
			return t.Count
		}
	}
	return 0
}

// String writes the formula with each element once and counts of 1 left
// out: "CaMg(CO3)2" is written "CaMgC2O6". Counts are written to at most
// six decimals.
func (f Formula) String() string {
	var b strings.Builder
	for _, t := range f {
		b.WriteString(t.Element)
		if t.Count != 1 {
			b.WriteString(Number(t.Count))
		}
	}
	return b.String()
}

// Number writes a count or coefficient to at most six decimals, without
// trailing zeros: 2, 0.62, 3.75.
func Number(x float64) string {
	s := strconv.FormatFloat(x, 'f', 6, 64)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		s = "0"
	}
	return s
}

// Limits on what the parser takes.
const (
	MaxFormulaLength = 200   // characters
	maxDepth         = 10    // nested brackets
	maxCount         = 10000 // largest count of one element after multiplying out
	minCount         = 1e-6  // smallest, which Number still writes
)

// ParseError is a formula that cannot be read, with the position (1-based,
// in characters) of the trouble.
type ParseError struct {
	Text string // the formula as given
	Pos  int    // character position, from 1
	Msg  string
}

// Error implements error.
func (e *ParseError) Error() string {
	return fmt.Sprintf("formula %q, position %d: %s", e.Text, e.Pos, e.Msg)
}

// Parse reads a formula such as "NaAlSi3O8", "Na0.62Ca0.38Al1.38Si2.62O8",
// "CaMg(CO3)2", "Al2Si2O5(OH)4" or "CaSO4·2H2O". The syntax:
//
//   - an element is its symbol (an upper-case letter, then at most one
//     lower-case letter), followed by an optional count;
//   - a count is a decimal number above zero (2, 0.62, .5, 1.38);
//   - a group in round or square brackets, followed by an optional count,
//     multiplies every count inside it;
//   - a part after "·" or "*" (water of hydration) may start with a count
//     that multiplies the whole part: "·2H2O";
//   - spaces between elements, brackets and parts are ignored.
//
// Parse refuses anything else with a *ParseError naming the position:
// an unknown symbol, an unclosed or unopened bracket, an empty group, a
// count of zero or one that follows nothing, a count that comes to fewer
// than 0.000001 or more than 10000 atoms, a formula longer than
// MaxFormulaLength characters or nested deeper than ten brackets.
func Parse(text string) (Formula, error) {
	p := &parser{text: text, runes: []rune(text)}
	if len(p.runes) > MaxFormulaLength {
		return nil, p.fail(MaxFormulaLength+1, fmt.Sprintf("longer than %d characters", MaxFormulaLength))
	}
	if !utf8.ValidString(text) {
		return nil, p.fail(1, "not valid text (UTF-8)")
	}
	f := &counts{}
	first := true
	for {
		p.space()
		if p.i >= len(p.runes) {
			if first {
				return nil, p.fail(p.i+1, "empty formula")
			}
			return nil, p.fail(p.i+1, "nothing after the hydration dot")
		}
		mult := 1.0
		if !first && p.isNumberStart() {
			start := p.i
			m, err := p.number()
			if err != nil {
				return nil, err
			}
			if !(m > 0) {
				return nil, p.fail(start+1, "a count must be above zero")
			}
			mult = m
		}
		part, err := p.sequence(0)
		if err != nil {
			return nil, err
		}
		if len(part.order) == 0 {
			switch {
			case p.i < len(p.runes) && (p.runes[p.i] == ')' || p.runes[p.i] == ']'):
				return nil, p.fail(p.i+1, fmt.Sprintf("%q closes a bracket that was not opened", string(p.runes[p.i])))
			case p.i < len(p.runes):
				return nil, p.fail(p.i+1, fmt.Sprintf("%q with no element before it", string(p.runes[p.i])))
			}
			return nil, p.fail(p.i+1, "nothing after the hydration dot")
		}
		if err := f.addAll(part, mult, p); err != nil {
			return nil, err
		}
		first = false
		p.space()
		if p.i >= len(p.runes) {
			break
		}
		switch r := p.runes[p.i]; r {
		case '·', '*', '•', '⋅':
			p.i++
		case ')', ']':
			return nil, p.fail(p.i+1, fmt.Sprintf("%q closes a bracket that was not opened", string(r)))
		default:
			return nil, p.fail(p.i+1, fmt.Sprintf("%q cannot stand here", string(r)))
		}
	}
	return f.formula(), nil
}

type parser struct {
	text  string
	runes []rune
	i     int
}

func (p *parser) fail(pos int, msg string) *ParseError {
	return &ParseError{Text: p.text, Pos: pos, Msg: msg}
}

func (p *parser) space() {
	for p.i < len(p.runes) && unicode.IsSpace(p.runes[p.i]) {
		p.i++
	}
}

func (p *parser) isNumberStart() bool {
	if p.i >= len(p.runes) {
		return false
	}
	r := p.runes[p.i]
	return r >= '0' && r <= '9' || r == '.' && p.i+1 < len(p.runes) && p.runes[p.i+1] >= '0' && p.runes[p.i+1] <= '9'
}

// number reads digits with at most one decimal point.
func (p *parser) number() (float64, error) {
	start := p.i
	dot := false
	for p.i < len(p.runes) {
		r := p.runes[p.i]
		if r == '.' && !dot && p.i+1 < len(p.runes) && p.runes[p.i+1] >= '0' && p.runes[p.i+1] <= '9' {
			dot = true
		} else if r < '0' || r > '9' {
			break
		}
		p.i++
	}
	s := string(p.runes[start:p.i])
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || x > maxCount {
		return 0, p.fail(start+1, fmt.Sprintf("%q is not a count of atoms (at most %d)", s, maxCount))
	}
	return x, nil
}

// optCount reads the count after an element or group: 1 when there is none.
func (p *parser) optCount() (float64, error) {
	if !p.isNumberStart() {
		return 1, nil
	}
	start := p.i
	x, err := p.number()
	if err != nil {
		return 0, err
	}
	if x == 0 {
		return 0, p.fail(start+1, "a count must be above zero")
	}
	return x, nil
}

// sequence reads elements and groups until the end, a closing bracket or a
// hydration dot.
func (p *parser) sequence(depth int) (*counts, error) {
	if depth > maxDepth {
		return nil, p.fail(p.i+1, fmt.Sprintf("brackets nested deeper than %d", maxDepth))
	}
	c := &counts{}
	for {
		p.space()
		if p.i >= len(p.runes) {
			break
		}
		r := p.runes[p.i]
		switch {
		case r == '(' || r == '[':
			open := p.i
			p.i++
			inner, err := p.sequence(depth + 1)
			if err != nil {
				return nil, err
			}
			p.space()
			want := map[rune]rune{'(': ')', '[': ']'}[r]
			if p.i >= len(p.runes) {
				return nil, p.fail(open+1, fmt.Sprintf("%q is never closed", string(r)))
			}
			if p.runes[p.i] != want {
				return nil, p.fail(p.i+1, fmt.Sprintf("%q does not close the %q at position %d", string(p.runes[p.i]), string(r), open+1))
			}
			if len(inner.order) == 0 {
				return nil, p.fail(open+1, "an empty bracket")
			}
			p.i++
			n, err := p.optCount()
			if err != nil {
				return nil, err
			}
			if err := c.addAll(inner, n, p); err != nil {
				return nil, err
			}
		case r >= 'A' && r <= 'Z':
			at := p.i
			sym := string(r)
			p.i++
			if p.i < len(p.runes) && p.runes[p.i] >= 'a' && p.runes[p.i] <= 'z' {
				sym += string(p.runes[p.i])
				p.i++
			}
			if !IsElement(sym) {
				return nil, p.fail(at+1, fmt.Sprintf("%q is not an element symbol", sym))
			}
			n, err := p.optCount()
			if err != nil {
				return nil, err
			}
			if err := c.add(sym, n, p, at); err != nil {
				return nil, err
			}
		case r == ')' || r == ']' || r == '·' || r == '*' || r == '•' || r == '⋅':
			return c, nil
		case r >= '0' && r <= '9' || r == '.':
			return nil, p.fail(p.i+1, "a count must follow an element or a bracket")
		case r >= 'a' && r <= 'z':
			return nil, p.fail(p.i+1, fmt.Sprintf("%q: an element symbol starts with a capital letter", string(r)))
		default:
			return nil, p.fail(p.i+1, fmt.Sprintf("%q is not part of a formula", string(r)))
		}
	}
	return c, nil
}

// counts accumulates element counts in order of first appearance.
type counts struct {
	order []string
	n     map[string]float64
}

func (c *counts) add(el string, n float64, p *parser, at int) error {
	if c.n == nil {
		c.n = map[string]float64{}
	}
	if _, ok := c.n[el]; !ok {
		c.order = append(c.order, el)
	}
	if n < minCount {
		return p.fail(at+1, fmt.Sprintf("fewer than %s atoms of %s", Number(minCount), el))
	}
	c.n[el] += n
	if c.n[el] > maxCount {
		return p.fail(at+1, fmt.Sprintf("more than %d atoms of %s", maxCount, el))
	}
	return nil
}

func (c *counts) addAll(o *counts, mult float64, p *parser) error {
	for _, el := range o.order {
		if err := c.add(el, o.n[el]*mult, p, p.i-1); err != nil {
			return err
		}
	}
	return nil
}

func (c *counts) formula() Formula {
	f := make(Formula, len(c.order))
	for i, el := range c.order {
		f[i] = Term{el, c.n[el]}
	}
	return f
}
