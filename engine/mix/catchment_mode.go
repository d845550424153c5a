package mix

import (
	"math"
	"sort"
)

// The mode search of the catchment-wide chains: each chain, from its own
// draw of the priors, climbs to a mode of the posterior of the shared
// latents and scatter parameters by quasi-Newton steps (BFGS with a backtracking
// line search; Nocedal & Wright 2006, Numerical Optimization, ch. 6 and 3,
// from memory) on gradients by finite differences. The modes the chains
// reach, told apart and each given the covariance of its curvature, make
// the proposal of the chains (catchment_proposal.go).

// search is the state of one chain's mode search.
type search struct {
	x, g  []float64 // current point and gradient of f = −log posterior
	f     float64
	binv  []float64 // the inverse Hessian's estimate
	iter  int
	calm  int // iterations in a row after which little is left to gain
	done  bool
	evals int // log posterior evaluations so far
}

// Limits of the mode search (engineering choices, no source): the most
// quasi-Newton iterations, the gain in log posterior a Newton step would
// make below which an iteration counts as calm (two calm iterations in a
// row end the search),
// the finite-difference step, and the longest step in each parameter.
const (
	searchIters = 80
	searchCalm  = 0.5
	searchH     = 1e-5
	searchStep  = 1.0
)

// negLogPost returns −log posterior at x, +Inf where it is not defined.
func (c *CatchmentRun) negLogPost(ch *chain, x []float64) float64 {
	f := -c.logPost(ch, x)
	if f != f {
		return math.Inf(1)
	}
	return f
}

// gradient sets g to the forward-difference gradient of f = −log posterior
// at x (backward where the forward point is outside the support) and
// returns the evaluations made.
func (c *CatchmentRun) gradient(ch *chain, x []float64, f float64, g []float64) int {
	y := ch.prop
	copy(y, x)
	for i := range x {
		y[i] = x[i] + searchH
		f1 := c.negLogPost(ch, y)
		switch {
		case !math.IsInf(f1, 1):
			g[i] = (f1 - f) / searchH
		default:
			y[i] = x[i] - searchH
			if f0 := c.negLogPost(ch, y); !math.IsInf(f0, 1) {
				g[i] = (f - f0) / searchH
			} else {
				g[i] = 0
			}
		}
		y[i] = x[i]
	}
	return len(x)
}

// startSearch begins ch's mode search at its starting state.
func (c *CatchmentRun) startSearch(ch *chain) {
	np := c.np
	s := &search{x: append([]float64(nil), ch.x...), g: make([]float64, np), binv: make([]float64, np*np)}
	s.f = -ch.lp
	for i := range np {
		s.binv[i*np+i] = 1
	}
	if math.IsInf(s.f, 1) {
		s.done = true
	}
	ch.search = s
}

// iterate takes one quasi-Newton iteration of ch's mode search and returns
// the log posterior evaluations it made.
func (c *CatchmentRun) iterate(ch *chain) int {
	s := ch.search
	np := c.np
	ev := 0
	if s.iter == 0 {
		ev += c.gradient(ch, s.x, s.f, s.g)
	}
	p := make([]float64, np)
	gp := 0.0
	for i := range np {
		v := 0.0
		for j := range np {
			v -= float64(s.binv[i*np+j] * s.g[j])
		}
		p[i] = v
		gp += float64(v * s.g[i])
	}
	if !(gp < 0) {
		for i := range np {
			for j := range np {
				s.binv[i*np+j] = 0
			}
			s.binv[i*np+i] = 1
			p[i] = -s.g[i]
		}
		gp = 0
		for i := range np {
			gp -= s.g[i] * s.g[i]
		}
	}
	big := 0.0
	for _, v := range p {
		big = max(big, math.Abs(v))
	}
	if big > searchStep {
		for i := range p {
			p[i] *= searchStep / big
		}
		gp *= searchStep / big
	}
	xn := make([]float64, np)
	fn := math.Inf(1)
	ok := false
	for a, try := 1.0, 0; try < 20 && !(gp == 0); a, try = a*0.25, try+1 {
		for i := range np {
			xn[i] = s.x[i] + a*p[i]
		}
		fn = c.negLogPost(ch, xn)
		ev++
		if fn <= s.f+1e-4*a*gp {
			ok = true
			break
		}
	}
	s.iter++
	if !ok {
		s.done = true
		s.evals += ev
		return ev
	}
	gn := make([]float64, np)
	ev += c.gradient(ch, xn, fn, gn)
	sv, yv := make([]float64, np), make([]float64, np)
	sy, yy := 0.0, 0.0
	for i := range np {
		sv[i], yv[i] = xn[i]-s.x[i], gn[i]-s.g[i]
		sy += sv[i] * yv[i]
		yy += yv[i] * yv[i]
	}
	if sy > 1e-12 {
		if s.iter == 1 {
			for i := range np {
				s.binv[i*np+i] = sy / yy
			}
		}
		hy := make([]float64, np)
		yhy := 0.0
		for i := range np {
			v := 0.0
			for j := range np {
				v += float64(s.binv[i*np+j] * yv[j])
			}
			hy[i] = v
			yhy += v * yv[i]
		}
		a := (sy + yhy) / (sy * sy)
		for i := range np {
			for j := range np {
				s.binv[i*np+j] += float64(a*sv[i]*sv[j]) - float64(hy[i]*sv[j]+sv[i]*hy[j])/sy
			}
		}
	}
	s.x, s.g, s.f = xn, gn, fn
	// The gain a Newton step would make, ½ gᵀ B⁻¹ g, by the updated
	// estimate.
	dec := 0.0
	for i := range np {
		v := 0.0
		for j := range np {
			v += float64(s.binv[i*np+j] * s.g[j])
		}
		dec += 0.5 * v * s.g[i]
	}
	if dec < searchCalm {
		s.calm++
	} else {
		s.calm = 0
	}
	if s.calm >= 2 || s.iter >= searchIters {
		s.done = true
	}
	s.evals += ev
	return ev
}

// curvature returns the covariance (lower triangle) of the Gaussian of
// −log posterior's curvature at x, where it is f, by finite differences of
// steps scaled by the search's estimate of the inverse Hessian, made
// positive definite by a ridge when it is not; and the evaluations made.
func (c *CatchmentRun) curvature(ch *chain, s *search) ([]float64, int) {
	np := c.np
	x, f := s.x, s.f
	h := make([]float64, np)
	for i := range np {
		h[i] = min(0.5, max(1e-3, 0.5*sqrt(math.Abs(s.binv[i*np+i]))))
		if i >= c.nd {
			h[i] = 0.5 // a scatter's parameter: often at its edge, 0, where the prior alone shapes it
		}
	}
	y := make([]float64, np)
	at := func(di, dj int, si, sj float64) float64 {
		copy(y, x)
		y[di] += si * h[di]
		if dj >= 0 {
			y[dj] += sj * h[dj]
		}
		v := c.negLogPost(ch, y)
		if math.IsInf(v, 1) {
			return f + 1e6 // outside the support: steep
		}
		return v
	}
	H := make([]float64, np*np)
	plus := make([]float64, np)
	ev := 0
	for i := range np {
		plus[i] = at(i, -1, 1, 0)
		ev += 2
		if x[i]-h[i] > 0 || i < c.nd {
			minus := at(i, -1, -1, 0)
			H[i*np+i] = (plus[i] - 2*f + minus) / (h[i] * h[i])
		} else {
			// At the edge of a positive parameter: one-sided.
			H[i*np+i] = (at(i, -1, 2, 0) - 2*plus[i] + f) / (h[i] * h[i])
		}
		if !(H[i*np+i] > 0) {
			H[i*np+i] = 1 / (h[i] * h[i])
		}
	}
	for i := range np {
		for j := 0; j < i; j++ {
			H[i*np+j] = (at(i, j, 1, 1) - plus[i] - plus[j] + f) / (h[i] * h[j])
			ev++
		}
	}
	for _, ridge := range []float64{0, 1e-3, 1e-2, 0.1, 1, 10} {
		a := append([]float64(nil), H...)
		for i := range np {
			a[i*np+i] *= 1 + ridge
		}
		l, ok := cholesky(np, a)
		if !ok {
			continue
		}
		return invertChol(np, l), ev
	}
	cov := make([]float64, np*np)
	for i := range np {
		cov[i*np+i] = h[i] * h[i]
	}
	return cov, ev
}

// invertChol returns (L Lᵀ)⁻¹ (lower triangle filled) for the lower
// Cholesky factor l.
func invertChol(n int, l []float64) []float64 {
	// li = L⁻¹, column by column.
	li := make([]float64, n*n)
	for j := range n {
		for i := j; i < n; i++ {
			s := 0.0
			if i == j {
				s = 1
			}
			for p := j; p < i; p++ {
				s -= float64(l[i*n+p] * li[p*n+j])
			}
			li[i*n+j] = s / l[i*n+i]
		}
	}
	out := make([]float64, n*n)
	for i := range n {
		for j := 0; j <= i; j++ {
			s := 0.0
			for p := i; p < n; p++ {
				s += float64(li[p*n+i] * li[p*n+j])
			}
			out[i*n+j], out[j*n+i] = s, s
		}
	}
	return out
}

// modeSame is the squared scaled distance below which two chains' modes
// count as one: a loose search can stop a standard deviation or so from
// the mode in every parameter, distinct modes lie many apart (an
// engineering choice, no source).
func modeSame(np int) float64 { return float64(3*np + 10) }

// valleyDepth is how far −log posterior must rise, on the straight line
// between two points the searches reached, above the higher of the two for
// them to count as distinct modes (an engineering choice, no source).
const valleyDepth = 2.0

// valley reports whether −log posterior rises by valleyDepth or more above
// the higher of its values fa at a and fb at b somewhere on the segment
// between them (probed at a quarter, half and three quarters of the way),
// and the evaluations made. Searches that stopped at different places of
// one long ridge find no valley between them, and count as one mode.
func (c *CatchmentRun) valley(ch *chain, a, b []float64, fa, fb float64) (int, bool) {
	y := make([]float64, len(a))
	top := max(fa, fb) + valleyDepth
	for q, t := range [3]float64{0.25, 0.5, 0.75} {
		for i := range y {
			y[i] = a[i] + t*(b[i]-a[i])
		}
		if c.negLogPost(ch, y) > top {
			return q + 1, true
		}
	}
	return 3, false
}

// maxModes is the most components the proposal takes.
const maxModes = 8

// buildProposal makes the chains' proposal from the modes their searches
// reached: the modes, best first, are told apart by their scaled distance
// and by a valley between them (valley); each distinct one gets a t component of its curvature's
// covariance, weighted by its Laplace mass (modes of less than e⁻¹² of
// the best left out, none below a twentieth of its fair share). Each chain
// then starts from its own draw of the proposal (dispersed: the t's tails
// are wide). It returns the evaluations made.
func (c *CatchmentRun) buildProposal() int {
	np := c.np
	order := make([]int, len(c.chains))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return c.chains[order[a]].search.f < c.chains[order[b]].search.f })
	q := &chainProposal{np: np, fold: c.nd}
	var mass, tops []float64
	ev := 0
	ch0 := c.chains[0]
	for _, k := range order {
		s := c.chains[k].search
		if math.IsInf(s.f, 1) || len(q.comps) == maxModes {
			continue
		}
		same := false
		for i := range q.comps {
			if q.comps[i].dist2(s.x) < modeSame(np) {
				same = true
				break
			}
			e, valley := c.valley(ch0, q.comps[i].mu, s.x, tops[i], s.f)
			ev += e
			if !valley {
				same = true
				break
			}
		}
		if same {
			continue
		}
		cov, e := c.curvature(ch0, s)
		ev += e
		comp, ok := newTComp(np, s.x, cov)
		if !ok {
			continue
		}
		m := -s.f + comp.logDet
		if len(mass) > 0 && m < mass[0]-12 {
			continue
		}
		q.comps = append(q.comps, comp)
		mass = append(mass, m)
		tops = append(tops, s.f)
	}
	if len(q.comps) == 0 {
		// No search found a point of the support: the prior.
		cov := make([]float64, np*np)
		mu := make([]float64, np)
		for i := range np {
			cov[i*np+i] = 1
		}
		comp, _ := newTComp(np, mu, cov)
		q.comps, mass = []tComp{comp}, []float64{0}
	}
	w := make([]float64, len(mass))
	for i := range mass {
		w[i] = max(pexp(mass[i]-mass[0]), 0.05/float64(len(mass)))
	}
	q.normalise(w)
	c.prop = q
	for _, ch := range c.chains {
		for try := 0; try < 100; try++ {
			q.draw(ch.rng, ch.x, ch.z)
			if ch.lp = c.logPost(ch, ch.x); !math.IsInf(ch.lp, -1) {
				break
			}
		}
		ev++
		ch.lq = q.logDensity(ch.x)
		ch.search = nil
	}
	return ev
}
