package mix

import (
	"math"

	"lixiv/engine/internal/portable"
)

// This file holds the few elementary functions the inverse model needs
// beyond portable.Exp and portable.Log, written out in plain Go so that a
// seed gives bit-identical draws on every target. Each product that feeds a
// sum is wrapped in float64() so that no compiler fuses it into an FMA (the
// Go specification: an explicit conversion rounds).

// pexp is portable.Exp.
func pexp(x float64) float64 { return portable.Exp(x) }

// plog is portable.Log.
func plog(x float64) float64 { return portable.Log(x) }

// fmax is the built-in max of two float64, inlined (portable.Max).
func fmax(x, y float64) float64 { return portable.Max(x, y) }

// pos is fmax(0, x), and fmax(x, 0), in one comparison: NaN stays NaN and
// −0 gives +0.
func pos(x float64) float64 {
	if x <= 0 {
		return 0
	}
	return x
}

// atLeast is fmax(x, c) for a c above zero, in one comparison (NaN stays
// NaN).
func atLeast(x, c float64) float64 {
	if x < c {
		return c
	}
	return x
}

// The central part of normQuantile (Acklam 2003, as below): for p in
// [pLow, 1 − pLow], q = p − 0.5, r = q², the quantile is
// qa(r)·q / qb(r), with the coefficients of qa and qb.
const (
	pLow = 0.02425
	qa1  = -3.969683028665376e+01
	qa2  = 2.209460984245205e+02
	qa3  = -2.759285104469687e+02
	qa4  = 1.383577518672690e+02
	qa5  = -3.066479806614716e+01
	qa6  = 2.506628277459239e+00
	qb1  = -5.447609879822406e+01
	qb2  = 1.615858368580409e+02
	qb3  = -1.556989798598866e+02
	qb4  = 6.680131188771972e+01
	qb5  = -1.328068155288572e+01
)

// The tails of normQuantile (Acklam 2003, as below): for p < pLow, q =
// √(−2 ln p), the quantile is qc(q) / qd(q) (and its negative in the upper
// tail), with the coefficients of qc and qd.
const (
	qc1 = -7.784894002430293e-03
	qc2 = -3.223964580411365e-01
	qc3 = -2.400758277161838e+00
	qc4 = -2.549732539343734e+00
	qc5 = 4.374664141464968e+00
	qc6 = 2.938163982698783e+00
	qd1 = 7.784695709041462e-03
	qd2 = 3.224671290700398e-01
	qd3 = 2.445134137142996e+00
	qd4 = 3.754408661907416e+00
)

// invSqrt2 is 1/√2 rounded to float64 (math.Sqrt2 / 2 exactly), and
// invSqrt2Pi 1/√(2π), the standard normal density at 0.
const (
	invSqrt2   = 0.7071067811865476
	invSqrt2Pi = 0.3989422804014327
)

// normQuantile returns the standard normal quantile of p in (0, 1), by
// Acklam's rational approximation (relative error below 1.15e-9; P. J.
// Acklam 2003, "An algorithm for computing the inverse normal cumulative
// distribution function", from memory for the coefficients' provenance,
// checked against gonum's quantile in the tests). It uses only plog and
// math.Sqrt, which is exactly rounded on every target.
func normQuantile(p float64) float64 {
	switch {
	case p < pLow:
		q := math.Sqrt(-2 * plog(p))
		return horner6(q, qc1, qc2, qc3, qc4, qc5, qc6) / horner5(q, qd1, qd2, qd3, qd4, 1)
	case p > 1-pLow:
		q := math.Sqrt(-2 * plog(1-p))
		return -horner6(q, qc1, qc2, qc3, qc4, qc5, qc6) / horner5(q, qd1, qd2, qd3, qd4, 1)
	}
	q := p - 0.5
	r := q * q
	return horner6(r, qa1, qa2, qa3, qa4, qa5, qa6) * q / horner6(r, qb1, qb2, qb3, qb4, qb5, 1)
}

// horner5 evaluates c0 x⁴ + c1 x³ + ... + c4 by Horner's rule, rounding
// every product (written out rather than over a slice, so that it inlines
// with its coefficients in registers).
func horner5(x, c0, c1, c2, c3, c4 float64) float64 {
	v := float64(c0*x) + c1
	v = float64(v*x) + c2
	v = float64(v*x) + c3
	return float64(v*x) + c4
}

// horner6 is horner5 with one more coefficient: c0 x⁵ + ... + c5.
func horner6(x, c0, c1, c2, c3, c4, c5 float64) float64 {
	return float64(horner5(x, c0, c1, c2, c3, c4)*x) + c5
}

// sqrt is math.Sqrt, which is exactly rounded (IEEE 754) on every target.
func sqrt(x float64) float64 { return math.Sqrt(x) }

// perfc returns the complementary error function with a fractional error
// below 1.2e-7 everywhere: the Chebyshev fit "erfcc" of Press, Teukolsky,
// Vetterling & Flannery (1992), Numerical Recipes in C, 2nd ed., §6.2
// (coefficients from memory, checked against math.Erfc in the tests). It
// uses only pexp, so it gives the same bits on every target.
func perfc(x float64) float64 {
	t, a := perfcArg(x)
	return perfcFrom(x, t, pexp(a))
}

// perfcArg returns perfc's t and the argument of its exponential.
func perfcArg(x float64) (t, a float64) {
	z := abs(x)
	t = 1 / (1 + 0.5*z)
	p := horner5(t, 0.17087277, -0.82215223, 1.48851587, -1.13520398, 0.27886807)
	p = horner5(t, p, -0.18628806, 0.09678418, 0.37409196, 1.00002368)
	p = float64(p*t) + -1.26551223
	return t, float64(-z*z) + p
}

// perfcFrom returns perfc(x) from perfcArg's t and the exponential e of its
// argument.
func perfcFrom(x, t, e float64) float64 {
	v := t * e
	if x < 0 {
		return 2 - v
	}
	return v
}

// normCDF returns the standard normal distribution function (error as
// perfc's).
func normCDF(x float64) float64 { return 0.5 * perfc(-x*invSqrt2) }

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
		return portable.Min(1, float64(pexp(-0.5*x)*sum))
	}
	s := sqrt(x)
	q := 2 * (1 - normCDF(s))
	if s > 5 {
		q = perfc(s * invSqrt2) // 2 Q(s) without the cancellation
	}
	term, sum := s, 0.0
	for k := 1; k <= (nu-1)/2; k++ {
		if k > 1 {
			term = float64(term*x) / float64(2*k-1)
		}
		sum += term
	}
	phi := invSqrt2Pi * pexp(-0.5*x)
	return portable.Min(1, q+float64(2*phi*sum))
}
