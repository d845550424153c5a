package mix

import "math"

// This file holds the few elementary functions the inverse model needs,
// written out in plain Go so that a seed gives bit-identical draws on every
// target. The math package uses assembly for Exp and Log on amd64 and pure Go
// on wasm; the two may differ in the last bit. The algorithms are the
// classic fdlibm ones (Sun Microsystems 1993, e_exp.c and e_log.c), whose
// coefficients are also those of Go's pure-Go fallbacks. Each product that
// feeds a sum is wrapped in float64() so that no compiler fuses it into an
// FMA (the Go specification: an explicit conversion rounds).

const (
	ln2Hi = 6.93147180369123816490e-01
	ln2Lo = 1.90821492927058770002e-10
	log2e = 1.44269504088896338700e+00
)

// pexp returns e**x. Results below the smallest normal float64 are flushed
// to zero and results above the largest are +Inf.
func pexp(x float64) float64 {
	const (
		p1 = 1.66666666666666657415e-01
		p2 = -2.77777777770155933842e-03
		p3 = 6.61375632143793436117e-05
		p4 = -1.65339022054652515390e-06
		p5 = 4.13813679705723846039e-08
	)
	switch {
	case x != x:
		return x
	case x > 7.09782712893383973096e+02:
		return math.Inf(1)
	case x < -7.08e+02: // result would be subnormal: flush to zero
		return 0
	case -1.0/(1<<28) < x && x < 1.0/(1<<28):
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
	q := float64(t*p5) + p4
	q = float64(t*q) + p3
	q = float64(t*q) + p2
	q = float64(t*q) + p1
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

// plog returns the natural logarithm of x (NaN for x < 0, -Inf for 0).
func plog(x float64) float64 {
	const (
		l1 = 6.666666666666735130e-01
		l2 = 3.999999999940941908e-01
		l3 = 2.857142874366239149e-01
		l4 = 2.222219843214978396e-01
		l5 = 1.818357216161805012e-01
		l6 = 1.531383769920937332e-01
		l7 = 1.479819860511658591e-01
	)
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
	t1 := float64(s4*l7) + l5
	t1 = float64(s4*t1) + l3
	t1 = float64(s4*t1) + l1
	t1 = s2 * t1
	t2 := float64(s4*l6) + l4
	t2 = float64(s4*t2) + l2
	t2 = s4 * t2
	r := t1 + t2
	hfsq := 0.5 * f * f
	return float64(k*ln2Hi) - ((hfsq - (float64(s*(hfsq+r)) + float64(k*ln2Lo))) - f)
}

// normQuantile returns the standard normal quantile of p in (0, 1), by
// Acklam's rational approximation (relative error below 1.15e-9; P. J.
// Acklam 2003, "An algorithm for computing the inverse normal cumulative
// distribution function", from memory for the coefficients' provenance,
// checked against gonum's quantile in the tests). It uses only plog and
// math.Sqrt, which is exactly rounded on every target.
func normQuantile(p float64) float64 {
	const (
		a1   = -3.969683028665376e+01
		a2   = 2.209460984245205e+02
		a3   = -2.759285104469687e+02
		a4   = 1.383577518672690e+02
		a5   = -3.066479806614716e+01
		a6   = 2.506628277459239e+00
		b1   = -5.447609879822406e+01
		b2   = 1.615858368580409e+02
		b3   = -1.556989798598866e+02
		b4   = 6.680131188771972e+01
		b5   = -1.328068155288572e+01
		c1   = -7.784894002430293e-03
		c2   = -3.223964580411365e-01
		c3   = -2.400758277161838e+00
		c4   = -2.549732539343734e+00
		c5   = 4.374664141464968e+00
		c6   = 2.938163982698783e+00
		d1   = 7.784695709041462e-03
		d2   = 3.224671290700398e-01
		d3   = 2.445134137142996e+00
		d4   = 3.754408661907416e+00
		pLow = 0.02425
	)
	switch {
	case p < pLow:
		q := math.Sqrt(-2 * plog(p))
		return horner(q, c1, c2, c3, c4, c5, c6) / horner(q, d1, d2, d3, d4, 1)
	case p > 1-pLow:
		q := math.Sqrt(-2 * plog(1-p))
		return -horner(q, c1, c2, c3, c4, c5, c6) / horner(q, d1, d2, d3, d4, 1)
	}
	q := p - 0.5
	r := q * q
	return horner(r, a1, a2, a3, a4, a5, a6) * q / horner(r, b1, b2, b3, b4, b5, 1)
}

// horner evaluates c[0] x^(n-1) + ... + c[n-1], rounding every product.
func horner(x float64, c ...float64) float64 {
	v := c[0]
	for _, ci := range c[1:] {
		v = float64(v*x) + ci
	}
	return v
}

// sqrt is math.Sqrt, which is exactly rounded (IEEE 754) on every target.
func sqrt(x float64) float64 { return math.Sqrt(x) }

// perfc returns the complementary error function with a fractional error
// below 1.2e-7 everywhere: the Chebyshev fit "erfcc" of Press, Teukolsky,
// Vetterling & Flannery (1992), Numerical Recipes in C, 2nd ed., §6.2
// (coefficients from memory, checked against math.Erfc in the tests). It
// uses only pexp, so it gives the same bits on every target.
func perfc(x float64) float64 {
	z := abs(x)
	t := 1 / (1 + 0.5*z)
	p := horner(t, 0.17087277, -0.82215223, 1.48851587, -1.13520398, 0.27886807,
		-0.18628806, 0.09678418, 0.37409196, 1.00002368, -1.26551223)
	v := t * pexp(float64(-z*z)+p)
	if x < 0 {
		return 2 - v
	}
	return v
}

// normCDF returns the standard normal distribution function (error as
// perfc's).
func normCDF(x float64) float64 { return 0.5 * perfc(-x*0.7071067811865476) }

// chi2Survival returns P(X > x) for X chi-square with nu >= 1 degrees of
// freedom, from the closed forms for whole degrees of freedom (Abramowitz &
// Stegun 1964, 26.4.4 and 26.4.5, from memory; checked against gonum in the
// tests): for even nu, e^(-x/2) sum_{i < nu/2} (x/2)^i / i!; for odd nu,
// 2 Q(√x) + 2 φ(√x) sum_{k=1}^{(nu-1)/2} x^(k-1/2) / (1·3···(2k-1)), with
// Q and φ the normal tail and density.
func chi2Survival(nu int, x float64) float64 {
	if !(x > 0) {
		return 1
	}
	if nu%2 == 0 {
		term, sum := 1.0, 1.0
		for i := 1; i < nu/2; i++ {
			term = float64(term*x) / float64(2*i)
			sum += term
		}
		return min(1, float64(pexp(-0.5*x)*sum))
	}
	s := sqrt(x)
	q := 2 * (1 - normCDF(s))
	if s > 5 {
		q = perfc(s * 0.7071067811865476) // 2 Q(s) without the cancellation
	}
	term, sum := s, 0.0
	for k := 1; k <= (nu-1)/2; k++ {
		if k > 1 {
			term = float64(term*x) / float64(2*k-1)
		}
		sum += term
	}
	phi := 0.3989422804014327 * pexp(-0.5*x)
	return min(1, q+float64(2*phi*sum))
}
