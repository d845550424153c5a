package mix

import (
	"math"
	"math/rand/v2"
)

// The independence proposal of the catchment-wide chains: a mixture of
// multivariate Student t distributions, one per mode of the posterior of the
// shared latents and scatter parameters, fitted before the chains are kept and
// fixed after (so that the chains are valid Metropolis–Hastings chains).

// tDegrees is the degrees of freedom of the proposal's components: heavy
// tails, so that the proposal covers the posterior's where the Gaussian of
// a mode would not (an engineering choice, no source).
const tDegrees = 5

// widen is the factor by which the proposal's scale exceeds the spread
// of the draws it is fitted to: an independence proposal narrower than its
// target in some direction sticks there (an engineering choice, no source).
const widen = 1.3

// tComp is one multivariate t of the proposal: centre mu, scale matrix
// S = M Mᵀ (M lower-triangular), weight w.
type tComp struct {
	mu, m  []float64
	logW   float64 // log of the weight
	logDet float64 // log det M
}

// chainProposal is a mixture of t components over np parameters, folded
// at zero in the last ones (the scatters' parameters, which are positive):
// a draw's negative values there are made positive, and the density sums
// over the signs.
type chainProposal struct {
	np    int
	fold  int // parameters from fold on are positive: each draw is folded there
	comps []tComp
}

// draw sets y to a draw of the proposal, from the generator rng.
func (q *chainProposal) draw(rng *rand.Rand, y, z []float64) {
	u := uniform(rng)
	k := len(q.comps) - 1
	acc := 0.0
	for i := range q.comps {
		acc += pexp(q.comps[i].logW)
		if u < acc {
			k = i
			break
		}
	}
	g := 0.0
	for range tDegrees {
		v := normQuantile(uniform(rng))
		g += v * v
	}
	s := sqrt(float64(tDegrees) / g)
	if uniform(rng) < defensiveShare {
		s *= defensiveScale
	}
	for i := range q.np {
		z[i] = normQuantile(uniform(rng))
	}
	c := &q.comps[k]
	for i := range q.np {
		v := 0.0
		for p := 0; p <= i; p++ {
			v += float64(c.m[i*q.np+p] * z[p])
		}
		y[i] = c.mu[i] + float64(s*v)
	}
	for i := q.fold; i < q.np; i++ {
		y[i] = math.Abs(y[i])
	}
}

// logDensity returns the log density of the proposal at y, up to a
// constant shared by every y.
func (q *chainProposal) logDensity(y []float64) float64 {
	// The folded density: the sum over the sign patterns of the folded
	// parameters.
	var buf [64]float64
	var lbuf [2 * maxModes * 64]float64 // sign patterns × components × 2
	ls := lbuf[:0]
	g := buf[:q.np]
	best := math.Inf(-1)
	wide := float64(q.np) * plog(defensiveScale)
	for pat := range 1 << (q.np - q.fold) {
		copy(g, y)
		for i := q.fold; i < q.np; i++ {
			if pat>>(i-q.fold)&1 == 1 {
				g[i] = -g[i]
			}
		}
		for k := range q.comps {
			c := &q.comps[k]
			d := c.dist2(g)
			a := c.logW + plog(1-defensiveShare) + c.logT(d)
			b := c.logW + plog(defensiveShare) - wide + c.logT(d/(defensiveScale*defensiveScale))
			ls = append(ls, a, b)
			best = max(best, a, b)
		}
	}
	s := 0.0
	for _, v := range ls {
		s += pexp(v - best)
	}
	return best + plog(s)
}

// defensiveShare and defensiveScale make the proposal defensive (Hesterberg
// 1995, Technometrics 37, from memory): a share of its draws come from each
// component widened by the scale, so that its density over the target's
// stays bounded where the fitted components fall short, and no chain
// sticks there (an engineering choice, no source).
const (
	defensiveShare = 0.1
	defensiveScale = 2.5
)

// logT returns the log density of component c at a point of squared
// scaled distance d (dist2), up to the constant shared by every
// component.
func (c *tComp) logT(d float64) float64 {
	return -c.logDet - 0.5*float64(tDegrees+len(c.mu))*plog(1+d/float64(tDegrees))
}

// dist2 returns the squared distance of y from c's centre in units of its
// scale matrix, |M⁻¹ (y − μ)|².
func (c *tComp) dist2(y []float64) float64 {
	np := len(c.mu)
	q := 0.0
	var w [64]float64
	for i := range np {
		s := y[i] - c.mu[i]
		// The terms in their order, four to a turn of the loop.
		row := c.m[i*np : i*np+i+1]
		p := 0
		for ; p+4 <= i; p += 4 {
			r, v := row[p:p+4], w[p:p+4]
			s = s - float64(r[0]*v[0]) - float64(r[1]*v[1]) - float64(r[2]*v[2]) - float64(r[3]*v[3])
		}
		for ; p < i; p++ {
			s -= float64(row[p] * w[p])
		}
		w[i] = s / row[i]
		q += w[i] * w[i]
	}
	return q
}

// newTComp returns the component of centre mu and scale matrix cov
// (lower triangle read), and false when cov is not positive definite.
func newTComp(np int, mu, cov []float64) (tComp, bool) {
	m, ok := cholesky(np, cov)
	if !ok {
		return tComp{}, false
	}
	c := tComp{mu: append([]float64(nil), mu...), m: m}
	for i := range np {
		c.logDet += plog(m[i*np+i])
	}
	return c, true
}

// normalise sets the weights' logs so that the weights sum to 1.
func (q *chainProposal) normalise(w []float64) {
	t := 0.0
	for _, v := range w {
		t += v
	}
	for k := range q.comps {
		q.comps[k].logW = plog(w[k] / t)
	}
}

// refit moves each component to the weighted mean and covariance of the
// draws ys (importance weights lw in logs, the target's density over the
// proposal's), the draws shared among the components by their
// responsibilities, and reweighs the components by their shares of the
// weight. When a few draws would carry the weight, the weights of the
// moments are tempered (raised to the power temper finds), so that the
// components move part of the way towards the target rather than collapse
// on those draws; the shares take the weights as they are. A component whose draws are too few to estimate a covariance
// (an effective number below four per parameter) keeps its place and
// shape. The weighted covariance is taken as the scale matrix, so that the
// t's own covariance is ν/(ν−2) times wider: the proposal is wider than the
// target, as an independence proposal should be.
func (q *chainProposal) refit(ys [][]float64, lw []float64) {
	np := q.np
	if len(ys) == 0 {
		return
	}
	top := math.Inf(-1)
	for _, v := range lw {
		top = max(top, v)
	}
	beta := temper(lw, top, float64(4*np))
	nk := len(q.comps)
	resp := make([]float64, nk)
	wsum := make([]float64, nk)
	mass := make([]float64, nk) // untempered: the components' shares of the target
	w2 := make([]float64, nk)
	mean := make([][]float64, nk)
	cov := make([][]float64, nk)
	for k := range nk {
		mean[k], cov[k] = make([]float64, np), make([]float64, np*np)
	}
	wt := make([][]float64, len(ys))
	for n, y := range ys {
		w := pexp(beta * (lw[n] - top))
		w1 := pexp(lw[n] - top)
		wt[n] = make([]float64, nk)
		best := math.Inf(-1)
		for k := range q.comps {
			resp[k] = q.comps[k].logW + q.comps[k].logT(q.comps[k].dist2(y))
			best = max(best, resp[k])
		}
		s := 0.0
		for k := range resp {
			resp[k] = pexp(resp[k] - best)
			s += resp[k]
		}
		for k := range nk {
			v := w * resp[k] / s
			mass[k] += w1 * resp[k] / s
			wt[n][k] = v
			wsum[k] += v
			w2[k] += v * v
			for i := range np {
				mean[k][i] += v * y[i]
			}
		}
	}
	for k := range nk {
		if !(wsum[k] > 0) {
			continue
		}
		for i := range np {
			mean[k][i] /= wsum[k]
		}
		for n, y := range ys {
			v := wt[n][k] / wsum[k]
			for i := range np {
				for j := 0; j <= i; j++ {
					cov[k][i*np+j] += float64(v * (y[i] - mean[k][i]) * (y[j] - mean[k][j]))
				}
			}
		}
	}
	for k := range nk {
		ess := wsum[k] * wsum[k] / w2[k]
		if !(ess >= float64(4*np)) {
			continue
		}
		for i := range cov[k] {
			cov[k][i] *= widen * widen
		}
		if c, ok := newTComp(np, mean[k], cov[k]); ok {
			c.logW = q.comps[k].logW
			q.comps[k] = c
		}
	}
	share := make([]float64, nk)
	total := 0.0
	for k := range nk {
		total += mass[k]
	}
	for k := range nk {
		// No component falls below a twentieth of its fair share: a mode
		// the warm-up's draws missed stays reachable.
		share[k] = max(mass[k]/total, 0.05/float64(nk))
	}
	q.normalise(share)
}

// heaviest returns the index of the component of largest weight.
func (q *chainProposal) heaviest() int {
	k := 0
	for i := range q.comps {
		if q.comps[i].logW > q.comps[k].logW {
			k = i
		}
	}
	return k
}

// temper returns the largest power β in (0, 1] of the importance weights
// exp(lw − top) whose effective number, (Σw)²/Σw², is at least want (or as
// many as there are weights), by bisection.
func temper(lw []float64, top, want float64) float64 {
	want = min(want, float64(len(lw)))
	ess := func(beta float64) float64 {
		s, s2 := 0.0, 0.0
		for _, v := range lw {
			w := pexp(beta * (v - top))
			s += w
			s2 += w * w
		}
		return s * s / s2
	}
	if ess(1) >= want {
		return 1
	}
	lo, hi := 0.0, 1.0
	for range 30 {
		mid := 0.5 * (lo + hi)
		if ess(mid) >= want {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo
}
