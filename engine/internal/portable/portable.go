// Package portable holds the elementary functions of the engine's random
// paths, written out in plain Go so that a seed gives bit-identical results
// on every target. The math package uses assembly for Exp and Log on amd64
// and pure Go on wasm; the two may differ in the last bit, and
// math/rand/v2's NormFloat64 calls them. The algorithms are the classic
// fdlibm ones (Sun Microsystems 1993, e_exp.c and e_log.c, with the
// coefficients of Go's pure-Go fallbacks; common practice). Each product
// that feeds a sum is wrapped in float64() so that no compiler fuses it into
// a fused multiply-add (the Go specification: an explicit conversion
// rounds), which arm64 and other targets would otherwise do.
package portable

import (
	"math"
	"math/rand/v2"
)

const (
	ln2Hi = 6.93147180369123816490e-01
	ln2Lo = 1.90821492927058770002e-10
	log2e = 1.44269504088896338700e+00
)

// Exp's and Log's coefficients (fdlibm's e_exp.c and e_log.c, as in Go's
// pure-Go math.Exp and math.Log; common practice), and Exp's branch edges:
// above expOverflow (ln of the largest float64, fdlibm's o_threshold) the
// result is +Inf; below expFlush it would be subnormal and is flushed to
// zero (an engineering choice, no source); within ±expTiny (2⁻²⁸, fdlibm's)
// it is 1 + x. ExpAll and LogAll share them.
const (
	expP1       = 1.66666666666666657415e-01
	expP2       = -2.77777777770155933842e-03
	expP3       = 6.61375632143793436117e-05
	expP4       = -1.65339022054652515390e-06
	expP5       = 4.13813679705723846039e-08
	expOverflow = 7.09782712893383973096e+02
	expFlush    = -7.08e+02
	expTiny     = 1.0 / (1 << 28)

	logL1 = 6.666666666666735130e-01
	logL2 = 3.999999999940941908e-01
	logL3 = 2.857142874366239149e-01
	logL4 = 2.222219843214978396e-01
	logL5 = 1.818357216161805012e-01
	logL6 = 1.531383769920937332e-01
	logL7 = 1.479819860511658591e-01
)

// Exp returns e**x. Results below the smallest normal float64 are flushed
// to zero and results above the largest are +Inf.
func Exp(x float64) float64 {
	switch {
	case x != x:
		return x
	case x > expOverflow:
		return math.Inf(1)
	case x < expFlush: // result would be subnormal: flush to zero
		return 0
	case -expTiny < x && x < expTiny:
		return 1 + x
	}
	var k int
	if x < 0 {
		k = int(float64(log2e*x) - 0.5)
	} else {
		k = int(float64(log2e*x) + 0.5)
	}
	hi := x - float64(float64(k)*ln2Hi)
	lo := float64(k) * ln2Lo
	r := hi - lo
	t := r * r
	q := float64(t*expP5) + expP4
	q = float64(t*q) + expP3
	q = float64(t*q) + expP2
	q = float64(t*q) + expP1
	c := r - float64(t*q)
	y := 1 - ((lo - float64(r*c)/(2-c)) - hi)
	// y is in [0.7, 1.5]; scale by 2**k through the exponent bits, in two
	// steps when k is at the ends of the range.
	if k > 1000 {
		y *= 0x1p1000
		k -= 1000
	} else if k < -1000 {
		y *= 0x1p-1000
		k += 1000
	}
	return y * math.Float64frombits(uint64(k+1023)<<52)
}

// Log returns the natural logarithm of x (NaN for x < 0, -Inf for 0).
func Log(x float64) float64 {
	switch {
	case x != x || math.IsInf(x, 1):
		return x
	case x < 0:
		return math.NaN()
	case x == 0:
		return math.Inf(-1)
	}
	// Split x = f1 * 2**ki with f1 in [sqrt(2)/2, sqrt(2)).
	ki := 0
	if x < 0x1p-1022 { // subnormal: scale into the normal range
		x *= 0x1p52
		ki = -52
	}
	b := math.Float64bits(x)
	ki += int((b>>52)&0x7ff) - 1022
	f1 := math.Float64frombits(b&^(0x7ff<<52) | 1022<<52) // in [0.5, 1)
	if f1 < math.Sqrt2/2 {
		f1 *= 2
		ki--
	}
	f := f1 - 1
	k := float64(ki)
	s := f / (2 + f)
	s2 := s * s
	s4 := s2 * s2
	t1 := float64(s4*logL7) + logL5
	t1 = float64(s4*t1) + logL3
	t1 = float64(s4*t1) + logL1
	t1 = s2 * t1
	t2 := float64(s4*logL6) + logL4
	t2 = float64(s4*t2) + logL2
	t2 = s4 * t2
	r := t1 + t2
	hfsq := 0.5 * f * f
	return float64(k*ln2Hi) - ((hfsq - (float64(s*(hfsq+r)) + float64(k*ln2Lo))) - f)
}

// Normal returns a standard normal draw by Marsaglia's polar method, using
// only uniform draws, Log and math.Sqrt (exactly rounded in IEEE
// arithmetic).
func Normal(rng *rand.Rand) float64 {
	for {
		u := 2*rng.Float64() - 1
		v := 2*rng.Float64() - 1
		s := float64(u*u) + float64(v*v)
		if s > 0 && s < 1 {
			return u * math.Sqrt(-2*Log(s)/s)
		}
	}
}

// Max is Go's built-in max of two float64 (NaN if either is NaN, +0 over
// −0), written out so that the compiler inlines it: compiled to
// WebAssembly the built-in is a call into the runtime, which the hot loops
// of the inverse model and the quantiles felt.
func Max(x, y float64) float64 {
	if y != y || y > x {
		return y
	}
	if x != x || x > y || x != 0 {
		return x
	}
	return math.Float64frombits(math.Float64bits(x) & math.Float64bits(y)) // ±0: −0 only if both are
}

// Min is Go's built-in min of two float64 (NaN if either is NaN, −0 under
// +0), written out so that the compiler inlines it (see Max).
func Min(x, y float64) float64 {
	if y != y || y < x {
		return y
	}
	if x != x || x < y || x != 0 {
		return x
	}
	return math.Float64frombits(math.Float64bits(x) | math.Float64bits(y)) // ±0: −0 if either is
}
