package plot

import (
	"math"
	"strconv"
	"strings"
)

// Numbers are written as a paper's tables write them. A value reads
// plainly with four significant digits ("0.3685", "1436"), its digits
// grouped in threes from 10,000 ("112,400"); a value of a million or more,
// or below a thousandth, reads in scientific notation with three
// significant digits ("1.43 × 10⁶"). A column of a table, or the labels of
// an axis, share one notation, so that "1.44 × 10⁶" never stands above
// "380000". NaN (no value) reads "–". Exports keep full precision: these
// functions are for the screen and the drawings only.

const (
	sciHigh  = 1e6  // values this large or larger are written in scientific notation
	sciLow   = 1e-3 // so are non-zero values smaller than this
	plainSig = 4    // significant digits of a plain value
	sciSig   = 3    // significant digits of a value in scientific notation
)

// Number formats one value: plain with up to four significant digits, or
// in scientific notation when very large or small.
func Number(v float64) string {
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return noValue(v)
	case v == 0:
		return "0"
	}
	if av := math.Abs(v); av >= sciHigh || av < sciLow {
		return sci(v, sciSig, false)
	}
	return plain(v, plainSig)
}

// Column formats the values of one table column alike. The notation is
// chosen for the whole column: scientific when its largest value calls for
// it; whole numbers when every value is whole; else fixed decimals, enough
// for four significant digits in the largest value and two in the
// smallest, when that asks no more than five of the largest; else each
// value plainly with four significant digits.
func Column(vs []float64) []string {
	lo, hi, whole := span(vs)
	exp, ok := 0, false // the column's values are multiples of 10^exp
	if hi > 0 {
		eHi, eLo := int(math.Floor(math.Log10(hi))), int(math.Floor(math.Log10(lo)))
		exp = min(eHi-plainSig+1, eLo-1)
		ok = exp >= eHi-plainSig
	}
	out := make([]string, len(vs))
	for i, v := range vs {
		switch {
		case math.IsNaN(v) || math.IsInf(v, 0):
			out[i] = noValue(v)
		case hi == 0:
			out[i] = "0"
		case hi >= sciHigh || hi < sciLow:
			if v == 0 {
				out[i] = "0"
			} else {
				out[i] = sci(v, sciSig, false)
			}
		case whole:
			out[i] = group(strconv.FormatFloat(v, 'f', 0, 64))
		case ok:
			out[i] = fixed(v, exp)
		default:
			out[i] = plain(v, plainSig)
		}
	}
	return out
}

// TickLabels formats the labels of an axis's ticks alike: scientific for
// all when the largest calls for it ("10⁶", "2 × 10⁶"), else plain, each
// with the fewest digits that tell it apart.
func TickLabels(vs []float64) []string {
	_, hi, _ := span(vs)
	out := make([]string, len(vs))
	for i, v := range vs {
		switch {
		case math.IsNaN(v) || math.IsInf(v, 0):
			out[i] = noValue(v)
		case v == 0 || math.Abs(v) < hi*1e-9: // a tick at zero, up to rounding
			out[i] = "0"
		case hi >= sciHigh || hi < sciLow:
			out[i] = sci(v, 6, true)
		default:
			out[i] = group(strconv.FormatFloat(round(v, 6), 'f', -1, 64))
		}
	}
	return out
}

// span returns the smallest and largest non-zero magnitude of the finite
// values (0, 0 when there is none) and whether every finite value is whole.
func span(vs []float64) (lo, hi float64, whole bool) {
	whole = true
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		if v != math.Trunc(v) {
			whole = false
		}
		if a := math.Abs(v); a > 0 {
			if hi == 0 || a < lo {
				lo = a
			}
			hi = math.Max(hi, a)
		}
	}
	return lo, hi, whole
}

func noValue(v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "-∞"
	}
	return "–"
}

// round rounds v to n significant digits.
func round(v float64, n int) float64 {
	if v == 0 {
		return 0
	}
	r, err := strconv.ParseFloat(strconv.FormatFloat(v, 'e', n-1, 64), 64)
	if err != nil {
		return v
	}
	return r
}

// plain writes v rounded to n significant digits, without trailing zeros.
func plain(v float64, n int) string {
	return group(strconv.FormatFloat(round(v, n), 'f', -1, 64))
}

// fixed writes v rounded to a multiple of 10^exp: with -exp decimals when
// exp < 0, else as a whole number.
func fixed(v float64, exp int) string {
	var s string
	if exp < 0 {
		s = strconv.FormatFloat(v, 'f', -exp, 64)
	} else {
		step := math.Pow(10, float64(exp))
		s = strconv.FormatFloat(math.Round(v/step)*step, 'f', 0, 64)
	}
	return group(s)
}

// sci writes v as "m × 10ⁿ" with n significant digits in m; short drops
// m's trailing zeros, and m itself when it is 1 ("10⁶").
func sci(v float64, n int, short bool) string {
	s := strconv.FormatFloat(v, 'e', n-1, 64) // "-1.43e+06"
	i := strings.IndexByte(s, 'e')
	m, e := s[:i], s[i+1:]
	exp, _ := strconv.Atoi(e)
	if short {
		if strings.Contains(m, ".") {
			m = strings.TrimRight(strings.TrimRight(m, "0"), ".")
		}
		switch m {
		case "1":
			return power(exp)
		case "-1":
			return "-" + power(exp)
		}
	}
	return m + " × " + power(exp)
}

var superscript = [...]string{"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"}

// power writes 10 to the power exp with a superscript exponent.
func power(exp int) string {
	var b strings.Builder
	b.WriteString("10")
	if exp < 0 {
		b.WriteString("⁻")
		exp = -exp
	}
	for _, c := range strconv.Itoa(exp) {
		b.WriteString(superscript[c-'0'])
	}
	return b.String()
}

// group puts a comma between each three digits of the whole part of a
// formatted number of 10,000 or more (five digits or more).
func group(s string) string {
	neg := strings.HasPrefix(s, "-")
	if neg {
		s = s[1:]
	}
	whole, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		whole, frac = s[:i], s[i:]
	}
	if len(whole) >= 5 {
		var b strings.Builder
		for i, c := range whole {
			if i > 0 && (len(whole)-i)%3 == 0 {
				b.WriteByte(',')
			}
			b.WriteRune(c)
		}
		whole = b.String()
	}
	if neg {
		return "-" + whole + frac
	}
	return whole + frac
}
