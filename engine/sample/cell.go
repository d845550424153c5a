package sample

import (
	"bytes"
	"math"
	"strconv"
)

// cellClass is what a numeric cell holds.
type cellClass int

const (
	cellNumber   cellClass = iota // a number
	cellMissing                   // empty or a missing-value word or code
	cellCensored                  // below detection; the number is the limit (NaN if unknown)
	cellText                      // not a number
)

var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseNumber reads a decimal number with the given decimal mark. It is exact
// (the Clinger fast path: an integer mantissa below 2^53 scaled by a power of
// ten up to 1e22 is correctly rounded) and falls back to strconv otherwise.
// Both '.' and dec are accepted as the decimal mark.
func parseNumber(b []byte, dec byte) (float64, bool) {
	if len(b) == 0 {
		return 0, false
	}
	i := 0
	neg := false
	if b[0] == '-' || b[0] == '+' {
		neg = b[0] == '-'
		i++
	}
	var mant uint64
	nd, exp := 0, 0
	dot, digit := false, false
	for ; i < len(b); i++ {
		c := b[i]
		switch {
		case c >= '0' && c <= '9':
			digit = true
			if nd < 19 {
				mant = mant*10 + uint64(c-'0')
				if mant != 0 {
					nd++
				}
				if dot {
					exp--
				}
			} else if !dot {
				exp++
			}
			continue
		case (c == dec || c == '.') && !dot:
			dot = true
			continue
		}
		break
	}
	if !digit {
		return 0, false
	}
	if i < len(b) {
		if b[i] != 'e' && b[i] != 'E' {
			return 0, false
		}
		return slowNumber(b, dec)
	}
	if mant < 1<<53 && exp >= -22 && exp <= 22 {
		f := float64(mant)
		if exp < 0 {
			f /= pow10[-exp]
		} else {
			f *= pow10[exp]
		}
		if neg {
			f = -f
		}
		return f, true
	}
	return slowNumber(b, dec)
}

func slowNumber(b []byte, dec byte) (float64, bool) {
	s := string(b)
	if dec != '.' {
		s = string(bytes.ReplaceAll(b, []byte{dec}, []byte{'.'}))
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
		return 0, false
	}
	return f, true
}

// missingWords are cells read as "not measured" (docs/methods.md §1.1).
var missingWords = map[string]bool{
	"na": true, "n/a": true, "n.a.": true, "n.a": true, "#n/a": true, "nd": true, "n.d.": true, "n.d": true,
	"-": true, "--": true, "---": true, "–": true, "—": true, "nan": true, "null": true, "none": true,
	"missing": true, "ns": true, "n.s.": true, "not measured": true, "not analysed": true, "not analyzed": true,
	".": true, "?": true,
}

// missingCodes are numbers used as "no value" in exports (docs/methods.md §1.1).
func isMissingCode(v float64) bool { return v == -999 || v == -9999 || v == -99999 }

// limitWords are what follows "<" when the limit is not a number, and the
// words that mean "below detection" by themselves.
var limitWords = map[string]bool{
	"dl": true, "d.l.": true, "lod": true, "loq": true, "mdl": true, "rl": true, "ql": true, "ld": true,
	"l.o.d.": true, "detection limit": true, "det. limit": true, "detection": true, "lq": true,
}
var belowWords = map[string]bool{
	"bdl": true, "b.d.l.": true, "bd": true, "<bdl": true, "udl": true, "below dl": true,
	"below detection": true, "below detection limit": true, "<d.l.": true, "nq": true,
}

// trimSpace trims ASCII spaces, tabs and non-breaking spaces.
func trimSpace(b []byte) []byte {
	for len(b) > 0 && (b[0] == ' ' || b[0] == '\t') {
		b = b[1:]
	}
	for len(b) > 0 && (b[len(b)-1] == ' ' || b[len(b)-1] == '\t') {
		b = b[:len(b)-1]
	}
	for bytes.HasPrefix(b, nbsp) {
		b = trimSpace(b[len(nbsp):])
	}
	for bytes.HasSuffix(b, nbsp) {
		b = trimSpace(b[:len(b)-len(nbsp)])
	}
	return b
}

var nbsp = []byte("\u00a0")

// classifyCell reads a numeric cell.
func classifyCell(b []byte, dec byte) (float64, cellClass) {
	b = trimSpace(b)
	if len(b) == 0 {
		return nan, cellMissing
	}
	c := b[0]
	if c >= '0' && c <= '9' || c == '-' || c == '+' || c == '.' || c == dec {
		if v, ok := parseNumber(b, dec); ok {
			if isMissingCode(v) {
				return nan, cellMissing
			}
			return v, cellNumber
		}
	}
	low := string(bytes.ToLower(b))
	if missingWords[low] {
		return nan, cellMissing
	}
	if belowWords[low] {
		return nan, cellCensored
	}
	if c == '<' || bytes.HasPrefix(b, []byte("≤")) {
		rest := b[1:]
		if c != '<' {
			rest = b[len("≤"):]
		}
		rest = bytes.TrimPrefix(trimSpace(rest), []byte("="))
		rest = trimSpace(rest)
		if v, ok := parseNumber(rest, dec); ok && v >= 0 {
			return v, cellCensored
		}
		if limitWords[string(bytes.ToLower(rest))] {
			return nan, cellCensored
		}
	}
	return nan, cellText
}
