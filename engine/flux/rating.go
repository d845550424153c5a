package flux

import "math"

// Bias is the retransformation bias correction of the rating curve. The
// zero value is Duan's smearing estimator.
type Bias int

// Bias corrections: exp of a fitted mean log concentration underestimates
// the mean concentration (Ferguson 1986, Water Resour. Res. 22, 74-76).
const (
	Duan     Bias = iota // (1/n) Σ exp(e_i), non-parametric smearing (Duan 1983, J. Am. Stat. Assoc. 78, 605-610)
	Ferguson             // exp(s²/2), for normal log residuals (Ferguson 1986)
	NoBias               // no correction; biased low by about exp(-s²/2)
)

var biasNames = [...]string{"Duan smearing", "Ferguson exp(s²/2)", "none"}

// String names the correction.
func (b Bias) String() string {
	if b < 0 || int(b) >= len(biasNames) {
		return "?"
	}
	return biasNames[b]
}

// RatingFit is a fitted concentration-discharge rating curve
//
//	ln C = ln A + B ln Q [+ Sin sin(2πt) + Cos cos(2πt)] + e
//
// with C in µmol/L, Q in m³/s and t the decimal year.
type RatingFit struct {
	A        float64 // µmol/L at Q = 1 m³/s (seasonal terms zero)
	B        float64 // exponent: near 0 chemostatic, near -1 dilution
	Sin, Cos float64 // seasonal coefficients; 0 without the seasonal option
	R2       float64 // coefficient of determination in log space; NaN when ln C does not vary
	S        float64 // residual standard deviation of ln C, sqrt(Σe²/(n−p))
	N        float64 // number of samples in the fit (bootstrap counts included)
	Bias     Bias    // correction applied
	Factor   float64 // the bias-correction factor applied to every day
	Fitted   int     // slope terms fitted (1, or 3 with seasons); fewer when a term did not vary among the samples
}

// DuanFactor returns Duan's smearing factor (1/n) Σ exp(e_i) for
// natural-log residuals e.
func DuanFactor(e []float64) float64 {
	s := 0.0
	for _, v := range e {
		s += pexp(v)
	}
	return s / float64(len(e))
}

// FergusonFactor returns exp(s²/2) for the residual standard deviation s in
// natural-log units. For s fitted in log10 units use s·ln 10.
func FergusonFactor(s float64) float64 { return pexp(s * s / 2) }

// rating fits the curve to the samples with positive concentration and
// discharge (weighted by w) and fills e.cd with the corrected daily
// concentrations. It returns false when the fit is singular or has no
// degrees of freedom.
func (e *engine) rating(w, c []float64, cref float64, fit *RatingFit, out []float64) bool {
	m := 1
	if e.opt.Seasonal {
		m = 3
	}
	p := m + 1
	// Reference: the first positive concentration; y = ln c − ln cpos.
	cpos := math.NaN()
	if cref > 0 {
		cpos = cref
	} else {
		for i := range c {
			if w[i] > 0 && c[i] > 0 && e.smp[i].q > 0 {
				cpos = c[i]
				break
			}
		}
	}
	if math.IsNaN(cpos) {
		return false
	}
	lref := plog(cpos)
	ok := func(i int) bool { return w[i] > 0 && c[i] > 0 && e.smp[i].q > 0 }
	if len(e.ly) < len(c) {
		e.ly = make([]float64, len(c))
	}
	ly := e.ly
	for i := range c {
		if ok(i) {
			ly[i] = plog(c[i]) - lref
		}
	}
	x := func(i, j int) float64 {
		switch j {
		case 0:
			return e.lnQ[i]
		case 1:
			return e.sS[i]
		}
		return e.cS[i]
	}
	var sw, ybar float64
	var xbar, x0 [3]float64
	var varies [3]bool
	distinct := 0
	for i := range e.smp {
		if !ok(i) {
			continue
		}
		for j := 0; j < m; j++ {
			if distinct == 0 {
				x0[j] = x(i, j)
			} else if x(i, j) != x0[j] {
				varies[j] = true
			}
		}
		distinct++
		sw += w[i]
		ybar += w[i] * ly[i]
		for j := 0; j < m; j++ {
			xbar[j] += w[i] * x(i, j)
		}
	}
	if distinct < p || sw <= float64(p) {
		return false
	}
	ybar /= sw
	for j := 0; j < m; j++ {
		xbar[j] /= sw
	}
	var a [3][3]float64
	var b [3]float64
	var syy float64
	for i := range e.smp {
		if !ok(i) {
			continue
		}
		dy := ly[i] - ybar
		syy += w[i] * dy * dy
		for j := 0; j < m; j++ {
			dj := x(i, j) - xbar[j]
			b[j] += w[i] * dj * dy
			for l := 0; l <= j; l++ {
				a[j][l] += w[i] * dj * (x(i, l) - xbar[l])
			}
		}
	}
	// A term that does not vary among the samples (all at one discharge,
	// say) cannot be fitted: it is left out with coefficient 0.
	var keep []int
	for j := 0; j < m; j++ {
		if varies[j] {
			keep = append(keep, j)
		}
	}
	var ak [3][3]float64
	var bk [3]float64
	for r, j := range keep {
		bk[r] = b[j]
		for q, l := range keep {
			if l <= j {
				ak[r][q] = a[j][l]
			} else {
				ak[r][q] = a[l][j]
			}
		}
	}
	sol, solved := cholSolve(ak, bk, len(keep))
	if !solved {
		return false
	}
	var beta [3]float64
	for r, j := range keep {
		beta[j] = sol[r]
	}
	p = len(keep) + 1
	if sw <= float64(p) {
		return false
	}
	b0 := ybar
	for j := 0; j < m; j++ {
		b0 -= beta[j] * xbar[j]
	}
	var ssr, smear float64
	for i := range e.smp {
		if !ok(i) {
			continue
		}
		r := ly[i] - b0
		for j := 0; j < m; j++ {
			r -= beta[j] * x(i, j)
		}
		ssr += w[i] * r * r
		smear += w[i] * pexp(r)
	}
	s := math.Sqrt(ssr / (sw - float64(p)))
	var bcf float64
	switch e.opt.Bias {
	case Duan:
		bcf = smear / sw
	case Ferguson:
		bcf = FergusonFactor(s)
	default:
		bcf = 1
	}
	if e.replicate && useMoments && m == 1 && fit == nil {
		if e.mom == nil {
			e.mom = e.prepareMoments(beta[0])
		}
		if e.mom != nil && e.mom.sumRating(e, cpos, b0, beta[0], bcf, cref, out) {
			e.summed = true
			return true
		}
	}
	for _, k := range e.flow {
		pred := b0 + beta[0]*e.lnq[k]
		if m == 3 {
			pred += beta[1]*e.sn[k] + beta[2]*e.cs[k]
		}
		e.cd[k] = cpos * pexp(pred) * bcf
	}
	if fit != nil {
		*fit = RatingFit{A: cpos * pexp(b0), B: beta[0], S: s, N: sw, Bias: e.opt.Bias, Factor: bcf, R2: math.NaN(), Fitted: len(keep)}
		if m == 3 {
			fit.Sin, fit.Cos = beta[1], beta[2]
		}
		if syy > 0 {
			fit.R2 = 1 - ssr/syy
		}
	}
	return true
}

// cholSolve solves the m×m symmetric positive-definite system a x = b, of
// which only the lower triangle of a is used. It reports false for a
// singular or ill-conditioned matrix.
func cholSolve(a [3][3]float64, b [3]float64, m int) ([3]float64, bool) {
	var l [3][3]float64
	for j := 0; j < m; j++ {
		d := a[j][j]
		for k := 0; k < j; k++ {
			d -= l[j][k] * l[j][k]
		}
		if !(d > 1e-12*a[j][j]) || !(a[j][j] > 0) {
			return b, false
		}
		l[j][j] = math.Sqrt(d)
		for i := j + 1; i < m; i++ {
			s := a[i][j]
			for k := 0; k < j; k++ {
				s -= l[i][k] * l[j][k]
			}
			l[i][j] = s / l[j][j]
		}
	}
	var y, x [3]float64
	for i := 0; i < m; i++ {
		s := b[i]
		for k := 0; k < i; k++ {
			s -= l[i][k] * y[k]
		}
		y[i] = s / l[i][i]
	}
	for i := m - 1; i >= 0; i-- {
		s := y[i]
		for k := i + 1; k < m; k++ {
			s -= l[k][i] * x[k]
		}
		x[i] = s / l[i][i]
	}
	return x, true
}
