package sample

import (
	"math"
	"strconv"
	"testing"
)

func TestParseNumber(t *testing.T) {
	tests := []struct {
		in   string
		dec  byte
		want float64
		ok   bool
	}{
		{"0", '.', 0, true}, {"12", '.', 12, true}, {"-3.5", '.', -3.5, true}, {"+2.25", '.', 2.25, true},
		{".5", '.', 0.5, true}, {"5.", '.', 5, true}, {"0,25", ',', 0.25, true}, {"0.25", ',', 0.25, true},
		{"1e-3", '.', 1e-3, true}, {"2,5E2", ',', 250, true}, {"0.1", '.', 0.1, true},
		{"123456789012345678901234", '.', 1.2345678901234568e23, true},
		{"0.000000000000000000000000123", '.', 1.23e-25, true},
		{"", '.', 0, false}, {"-", '.', 0, false}, {".", '.', 0, false}, {"1,5", '.', 0, false},
		{"1.2.3", '.', 0, false}, {"12abc", '.', 0, false}, {"1e999", '.', 0, false}, {"0x10", '.', 0, false},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, ok := parseNumber([]byte(tc.in), tc.dec)
			if ok != tc.ok || ok && got != tc.want {
				t.Errorf("parseNumber(%q, %q) = %v, %v; want %v, %v (exact)", tc.in, tc.dec, got, ok, tc.want, tc.ok)
			}
		})
	}
}

// The fast path must agree exactly with strconv (the slow, literal reference).
func TestParseNumberMatchesStrconv(t *testing.T) {
	for i := 0; i < 20000; i++ {
		x := float64(i*7919%100003) / math.Pow(10, float64(i%9))
		s := strconv.FormatFloat(x, 'f', -1, 64)
		want, _ := strconv.ParseFloat(s, 64)
		got, ok := parseNumber([]byte(s), '.')
		if !ok || got != want {
			t.Fatalf("parseNumber(%q) = %v, %v; want %v", s, got, ok, want)
		}
	}
}

func TestClassifyCell(t *testing.T) {
	// Spellings from docs/methods.md §1.1 (common practice in laboratory exports).
	tests := []struct {
		in    string
		dec   byte
		class cellClass
		v     float64 // number or limit; NaN for none
	}{
		{"1.25", '.', cellNumber, 1.25}, {" 3 ", '.', cellNumber, 3}, {"0,5", ',', cellNumber, 0.5},
		{"\u00a07.5\u00a0", '.', cellNumber, 7.5},
		{"", '.', cellMissing, nan}, {"  ", '.', cellMissing, nan}, {"NA", '.', cellMissing, nan},
		{"n.a.", '.', cellMissing, nan}, {"N/A", '.', cellMissing, nan}, {"#N/A", '.', cellMissing, nan},
		{"n.d.", '.', cellMissing, nan}, {"ND", '.', cellMissing, nan}, {"nd", '.', cellMissing, nan},
		{"-", '.', cellMissing, nan}, {"--", '.', cellMissing, nan}, {"-999", '.', cellMissing, nan},
		{"-9999", '.', cellMissing, nan}, {"-999.0", '.', cellMissing, nan}, {"NaN", '.', cellMissing, nan},
		{"<0.01", '.', cellCensored, 0.01}, {"< 0.01", '.', cellCensored, 0.01}, {"<0,02", ',', cellCensored, 0.02},
		{"<=0.5", '.', cellCensored, 0.5}, {"≤0.5", '.', cellCensored, 0.5},
		{"<DL", '.', cellCensored, nan}, {"< DL", '.', cellCensored, nan}, {"<LOD", '.', cellCensored, nan},
		{"<LOQ", '.', cellCensored, nan}, {"<d.l.", '.', cellCensored, nan}, {"bdl", '.', cellCensored, nan},
		{"BDL", '.', cellCensored, nan}, {"b.d.l.", '.', cellCensored, nan},
		{"abc", '.', cellText, nan}, {"<abc", '.', cellText, nan}, {"<-1", '.', cellText, nan},
		{">100", '.', cellText, nan}, {"1,5", '.', cellText, nan}, {"12 mg", '.', cellText, nan},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			v, c := classifyCell([]byte(tc.in), tc.dec)
			if c != tc.class || !(v == tc.v || math.IsNaN(v) && math.IsNaN(tc.v)) {
				t.Errorf("classifyCell(%q) = %v, %d; want %v, %d", tc.in, v, c, tc.v, tc.class)
			}
		})
	}
}

func TestPolicy(t *testing.T) {
	// Substitution for a value below a 0.4 µmol/L limit (common practice;
	// Helsel 2005 for the caveat).
	tests := []struct {
		p    Policy
		lim  float64
		want float64
	}{
		{HalfLimit, 0.4, 0.2}, {Zero, 0.4, 0}, {AtLimit, 0.4, 0.4}, {LeaveOut, 0.4, nan},
		{HalfLimit, nan, nan}, {Zero, nan, 0}, {AtLimit, nan, nan},
	}
	for _, tc := range tests {
		got := tc.p.Value(tc.lim)
		if !(got == tc.want || math.IsNaN(got) && math.IsNaN(tc.want)) {
			t.Errorf("%v.Value(%v) = %v, want %v", tc.p, tc.lim, got, tc.want)
		}
	}
	var zero Options
	if zero.Policy != HalfLimit {
		t.Error("the zero Options must substitute half the limit")
	}
}
