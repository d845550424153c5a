package flux

import (
	"math"

	"lixiv/engine/internal/enum"
)

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
func (b Bias) String() string { return enum.Name(b, biasNames[:], "?") }

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
	cpos := e.ratingRef(w, c, cref)
	if math.IsNaN(cpos) {
		return false
	}
	ly := e.logConc(w, c, plog(cpos))
	var t ratingSums
	if !t.sum(e, w, c, ly, m) {
		return false
	}
	beta, nkeep, solved := t.solve(m)
	if !solved || t.sw <= float64(nkeep+1) {
		return false
	}
	b0 := t.ybar
	for j := 0; j < m; j++ {
		b0 -= beta[j] * t.xbar[j]
	}
	ssr, smear := e.residuals(w, c, ly, m, b0, beta)
	s := math.Sqrt(ssr / (t.sw - float64(nkeep+1)))
	var bcf float64
	switch e.opt.Bias {
	case Duan:
		bcf = smear / t.sw
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
		*fit = RatingFit{A: cpos * pexp(b0), B: beta[0], S: s, N: t.sw, Bias: e.opt.Bias, Factor: bcf, R2: math.NaN(), Fitted: nkeep}
		if m == 3 {
			fit.Sin, fit.Cos = beta[1], beta[2]
		}
		if t.syy > 0 {
			fit.R2 = 1 - ssr/t.syy
		}
	}
	return true
}

// ratingUsable reports whether sample i enters the fit: weighted, with
// positive concentration and discharge.
func (e *engine) ratingUsable(w, c []float64, i int) bool {
	return w[i] > 0 && c[i] > 0 && e.smp[i].q > 0
}

// ratingX is the j-th regressor of sample i: ln Q, then the season's sine
// and cosine.
func (e *engine) ratingX(i, j int) float64 {
	switch j {
	case 0:
		return e.lnQ[i]
	case 1:
		return e.sS[i]
	}
	return e.cS[i]
}

// ratingRef returns the reference concentration of the fit, y = ln c − ln
// cref: cref when given, else the first usable concentration (NaN when
// none).
func (e *engine) ratingRef(w, c []float64, cref float64) float64 {
	if cref > 0 {
		return cref
	}
	for i := range c {
		if e.ratingUsable(w, c, i) {
			return c[i]
		}
	}
	return math.NaN()
}

// logConc returns ln c − lref for each usable sample, in e's buffer.
func (e *engine) logConc(w, c []float64, lref float64) []float64 {
	if len(e.ly) < len(c) {
		e.ly = make([]float64, len(c))
	}
	ly := e.ly
	for i := range c {
		if e.ratingUsable(w, c, i) {
			ly[i] = plog(c[i]) - lref
		}
	}
	return ly
}

// ratingSums are the weighted sums of the rating curve's normal
// equations, about the weighted means.
type ratingSums struct {
	sw, ybar, syy float64
	xbar          [3]float64
	varies        [3]bool // the term varies among the samples
	a             [3][3]float64
	b             [3]float64
}

// sum forms the weighted means and the normal equations of m terms over
// the usable samples; false when there are fewer samples, or less weight,
// than coefficients.
func (t *ratingSums) sum(e *engine, w, c, ly []float64, m int) bool {
	var x0 [3]float64
	distinct := 0
	for i := range e.smp {
		if !e.ratingUsable(w, c, i) {
			continue
		}
		for j := 0; j < m; j++ {
			if distinct == 0 {
				x0[j] = e.ratingX(i, j)
			} else if e.ratingX(i, j) != x0[j] {
				t.varies[j] = true
			}
		}
		distinct++
		t.sw += w[i]
		t.ybar += w[i] * ly[i]
		for j := 0; j < m; j++ {
			t.xbar[j] += w[i] * e.ratingX(i, j)
		}
	}
	if p := m + 1; distinct < p || t.sw <= float64(p) {
		return false
	}
	t.ybar /= t.sw
	for j := 0; j < m; j++ {
		t.xbar[j] /= t.sw
	}
	for i := range e.smp {
		if !e.ratingUsable(w, c, i) {
			continue
		}
		dy := ly[i] - t.ybar
		t.syy += w[i] * dy * dy
		for j := 0; j < m; j++ {
			dj := e.ratingX(i, j) - t.xbar[j]
			t.b[j] += w[i] * dj * dy
			for l := 0; l <= j; l++ {
				t.a[j][l] += w[i] * dj * (e.ratingX(i, l) - t.xbar[l])
			}
		}
	}
	return true
}

// solve returns the slopes of the m terms and how many were fitted: a term
// that does not vary among the samples (all at one discharge, say) cannot
// be fitted and is left out with coefficient 0. false when the system is
// singular.
func (t *ratingSums) solve(m int) (beta [3]float64, nkeep int, ok bool) {
	var keep []int
	for j := 0; j < m; j++ {
		if t.varies[j] {
			keep = append(keep, j)
		}
	}
	var ak [3][3]float64
	var bk [3]float64
	for r, j := range keep {
		bk[r] = t.b[j]
		for q, l := range keep {
			if l <= j {
				ak[r][q] = t.a[j][l]
			} else {
				ak[r][q] = t.a[l][j]
			}
		}
	}
	sol, solved := cholSolve(ak, bk, len(keep))
	if !solved {
		return beta, 0, false
	}
	for r, j := range keep {
		beta[j] = sol[r]
	}
	return beta, len(keep), true
}

// residuals returns the weighted sum of squared residuals of the fit and
// the weighted sum of their exponentials (Duan's smearing).
func (e *engine) residuals(w, c, ly []float64, m int, b0 float64, beta [3]float64) (ssr, smear float64) {
	for i := range e.smp {
		if !e.ratingUsable(w, c, i) {
			continue
		}
		r := ly[i] - b0
		for j := 0; j < m; j++ {
			r -= beta[j] * e.ratingX(i, j)
		}
		ssr += w[i] * r * r
		smear += w[i] * pexp(r)
	}
	return ssr, smear
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
