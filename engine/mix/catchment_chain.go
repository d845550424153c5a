package mix

import (
	"math"
	"math/rand/v2"
)

// chain is one Markov chain of the catchment-wide model over the shared
// latents (standard normal under the priors, as in the per-sample model)
// and the log scatters.
type chain struct {
	rng      *rand.Rand
	x, prop  []float64 // current state and proposal
	z        []float64
	lp       float64 // log posterior at x
	t        int     // steps taken, warm-up included
	goal     int     // kept steps to reach before the next check
	accepted int     // accepted proposals after warm-up
	window   int     // accepted proposals in the current adaptation window
	logScale float64 // log of the proposal's scale
	chol     []float64
	warm     []float64 // warm-up states, for the proposal's covariance
	hist     []float64 // kept states, [step][parameter]
	th       [NTracers][MaxEndMembers]float64
	tau      [MaxEndMembers]float64
}

// adaptEvery is the length of a warm-up adaptation window, in steps: the
// proposal's scale is tuned after every window (towards 23 % acceptance, the
// optimum of random-walk Metropolis in many dimensions: Roberts, Gelman &
// Gilks 1997, Ann. Appl. Probab. 7, from memory).
const (
	adaptEvery = 50
	acceptGoal = 0.234
)

// newChain starts chain k from a draw of the priors (dispersed: the
// posterior is narrower), with the scatters at their prior's scale.
func (c *CatchmentRun) newChain(k int) *chain {
	r := c.base
	ch := &chain{rng: rand.New(rand.NewPCG(r.opt.Seed^chainStream, uint64(k))), goal: c.co.Batch}
	ch.x, ch.prop, ch.z = make([]float64, c.np), make([]float64, c.np), make([]float64, c.np)
	for t := range NTracers {
		for j := range r.n {
			ch.th[t][j] = r.smp[t][j].v
		}
	}
	ch.chol = make([]float64, c.np*c.np)
	for i := range c.np {
		ch.chol[i*c.np+i] = 0.1
	}
	ch.logScale = 0
	ls := plog(c.co.Scatter)
	for try := 0; try < 100; try++ {
		for i := range c.nd {
			ch.x[i] = normQuantile(uniform(ch.rng))
		}
		for e := range c.ems {
			ch.x[c.nd+e] = ls + 0.5*normQuantile(uniform(ch.rng))
		}
		if ch.lp = c.logPost(ch, ch.x); !math.IsInf(ch.lp, -1) {
			break
		}
	}
	return ch
}

// step takes one Metropolis step of chain ch, adapting its proposal during
// warm-up and keeping the state after it.
func (c *CatchmentRun) step(ch *chain) {
	np := c.np
	s := pexp(ch.logScale)
	for i := range np {
		ch.z[i] = normQuantile(uniform(ch.rng))
	}
	for i := range np {
		v := 0.0
		for k := 0; k <= i; k++ {
			v += float64(ch.chol[i*np+k] * ch.z[k])
		}
		ch.prop[i] = ch.x[i] + float64(s*v)
	}
	lp := c.logPost(ch, ch.prop)
	ok := plog(uniform(ch.rng)) < lp-ch.lp
	if ok {
		ch.x, ch.prop = ch.prop, ch.x
		ch.lp = lp
	}
	ch.t++
	if ch.t <= c.co.Warmup {
		if ok {
			ch.window++
		}
		ch.warm = append(ch.warm, ch.x...)
		c.adapt(ch)
		if ch.t == c.co.Warmup {
			ch.warm = nil
		}
		return
	}
	if ok {
		ch.accepted++
	}
	ch.hist = append(ch.hist, ch.x...)
}

// adapt tunes the scale of ch's proposal at the end of each warm-up
// window, towards the goal acceptance.
func (c *CatchmentRun) adapt(ch *chain) {
	if ch.t%adaptEvery != 0 {
		return
	}
	rate := float64(ch.window) / adaptEvery
	ch.window = 0
	ch.logScale += 1.5 * (rate - acceptGoal)
	ch.logScale = max(-12, min(3, ch.logScale))
}

// refitAt reports whether the chains' proposals are refitted at step t:
// at 200, 400, 800, … steps and at three quarters of the warm-up, never
// after.
func (c *CatchmentRun) refitAt(t int) bool {
	last := 3 * c.co.Warmup / 4
	if t == last {
		return true
	}
	for p := 200; p < last; p *= 2 {
		if t == p {
			return true
		}
	}
	return false
}

// stopAt returns the step at which ch waits for the other chains: the next
// refit, or the end of its current goal.
func (c *CatchmentRun) stopAt(ch *chain) int {
	for t := max(ch.t, c.refitted+1); t < c.co.Warmup; t++ {
		if c.refitAt(t) {
			return t
		}
	}
	return c.co.Warmup + ch.goal
}

// refit sets every chain's proposal covariance to that of the second half
// of the warm-up so far, pooled over the chains (which, started apart, see
// more of the posterior than any one of them), scaled by 2.38²/dimensions
// (Gelman, Roberts & Gilks 1996, from memory).
func (c *CatchmentRun) refit() {
	np := c.np
	to := c.chains[0].t
	c.refitted = to
	from := to / 2
	n := 0.0
	mean := make([]float64, np)
	for _, ch := range c.chains {
		for k := from; k < to; k++ {
			for i := range np {
				mean[i] += ch.warm[k*np+i]
			}
			n++
		}
	}
	for i := range mean {
		mean[i] /= n
	}
	cov := make([]float64, np*np)
	for _, ch := range c.chains {
		for k := from; k < to; k++ {
			x := ch.warm[k*np : (k+1)*np]
			for i := range np {
				for j := 0; j <= i; j++ {
					cov[i*np+j] += float64((x[i] - mean[i]) * (x[j] - mean[j]))
				}
			}
		}
	}
	f := 2.38 * 2.38 / float64(np) / (n - 1)
	for i := range np {
		for j := 0; j <= i; j++ {
			cov[i*np+j] *= f
		}
		cov[i*np+i] += 1e-8
	}
	l, ok := cholesky(np, cov)
	if !ok {
		return
	}
	for _, ch := range c.chains {
		ch.chol = append([]float64(nil), l...)
		ch.logScale = 0
	}
}

// cholesky returns the lower factor of the n×n matrix a (lower triangle
// read), and false when it is not positive definite.
func cholesky(n int, a []float64) ([]float64, bool) {
	l := make([]float64, n*n)
	for j := range n {
		d := a[j*n+j]
		for p := 0; p < j; p++ {
			d -= float64(l[j*n+p] * l[j*n+p])
		}
		if !(d > 0) {
			return nil, false
		}
		d = sqrt(d)
		l[j*n+j] = d
		for i := j + 1; i < n; i++ {
			s := a[i*n+j]
			for p := 0; p < j; p++ {
				s -= float64(l[i*n+p] * l[j*n+p])
			}
			l[i*n+j] = s / d
		}
	}
	return l, true
}

// logPost returns the log posterior density of the shared latents and log
// scatters x (up to a constant): the priors and every used sample's
// likelihood.
func (c *CatchmentRun) logPost(ch *chain, x []float64) float64 {
	r := c.base
	lp := 0.0
	for i, d := range r.dims {
		lp -= 0.5 * x[i] * x[i]
		ch.th[d.t][d.em] = pexp(r.smp[d.t][d.em].fromLatent(x[i]))
	}
	s2 := 2 * c.co.Scatter * c.co.Scatter
	for e, j := range c.ems {
		u := x[c.nd+e]
		if u < -30 || u > 3 {
			return math.Inf(-1)
		}
		tau := pexp(u)
		ch.tau[j] = tau
		lp += u - tau*tau/s2
	}
	for _, s := range c.used {
		l := c.sampleLogL(&r.res.Samples[s].setup, &ch.th, &ch.tau)
		if l != l || math.IsInf(l, -1) {
			return math.Inf(-1)
		}
		lp += l
	}
	return lp
}

// sampleLogL returns the log marginal likelihood of one sample given the
// shared ratios th and scatters tau (up to a constant). The amounts have a
// half-normal prior on the cation charge each end-member brings, c_j n_j
// with c_j = 1 + K/Na + 2 Ca/Na + 2 Mg/Na, of scale the sample's own
// cation charge T (an assumption, docs/methods.md §7.12): proper, so that
// end-members that come to look alike cannot make the volume of their
// amounts infinite, and in units of charge, so that an end-member poor in
// Na (carbonate) cannot trade its ratios against its amount. With D =
// diag(c_j/T)², the integral over n >= 0 of the Gaussian likelihood times
// that prior is taken in closed form but for the orthant, whose chance is
// the product of the marginal chances (gaussOrthant): without it, the
// marginal would favour end-members that sit inside the cloud of samples.
// The scatter is added to each tracer row's variance at the exact
// non-negative fit without it.
func (c *CatchmentRun) sampleLogL(st *setup, th *[NTracers][MaxEndMembers]float64, tau *[MaxEndMembers]float64) float64 {
	R, K := st.r, st.k
	var A [maxRows][MaxEndMembers]float64
	design(st, th, &A)
	var dg vec6
	tot := 0.0
	for c, f := range [NCations]float64{1, 1, 2, 2} {
		if v := st.x[c].Value; v > 0 {
			tot += f * v
		}
	}
	tot = max(tot, 1)
	ld := 0.0
	for jj, j := range st.act {
		cj := (1 + th[KNa][j] + 2*th[CaNa][j] + 2*th[MgNa][j]) / tot
		dg[jj] = cj * cj
		ld += plog(cj)
	}
	var H mat6
	var b, n vec6
	normal(R, K, &st.linv, &A, &st.yt, &H, &b)
	for jj := 0; jj < K; jj++ {
		H[jj][jj] += dg[jj]
	}
	nnls(K, &H, &b, &n)
	// The covariance with the scatter, and its factor.
	var C, L [maxRows][maxRows]float64
	C = st.cov
	for row := 1; row < R; row++ {
		v := 0.0
		for jj, j := range st.act {
			a := float64(tau[j]*A[row][jj]) * n[jj]
			v += a * a
		}
		C[row][row] += v
	}
	logDet := 0.0
	for j := 0; j < R; j++ {
		d := C[j][j]
		for p := 0; p < j; p++ {
			d -= L[j][p] * L[j][p]
		}
		d = math.Max(d, 1e-18*(1+C[j][j])+1e-30)
		L[j][j] = sqrt(d)
		logDet += plog(L[j][j])
		for i := j + 1; i < R; i++ {
			s := C[i][j]
			for p := 0; p < j; p++ {
				s -= L[i][p] * L[j][p]
			}
			L[i][j] = s / L[j][j]
		}
	}
	// Whitened data and design: L ỹ = y, L Ã = A.
	var yt [maxRows]float64
	var At [maxRows][MaxEndMembers]float64
	yy := 0.0
	for i := 0; i < R; i++ {
		s := st.y[i]
		for p := 0; p < i; p++ {
			s -= L[i][p] * yt[p]
		}
		yt[i] = s / L[i][i]
		yy += yt[i] * yt[i]
		for jj := 0; jj < K; jj++ {
			s := A[i][jj]
			for p := 0; p < i; p++ {
				s -= L[i][p] * At[p][jj]
			}
			At[i][jj] = s / L[i][i]
		}
	}
	gram(R, K, &At, &yt, &H, &b)
	for jj := 0; jj < K; jj++ {
		H[jj][jj] += dg[jj]
	}
	return gaussOrthant(K, &H, &b, yy) - logDet + ld
}

// gaussOrthant returns the log of the integral over n >= 0 of
// exp(−½ (yy − 2 bᵀn + nᵀHn)) (up to the constant (2π)^(k/2)): the Gaussian
// integral at the unconstrained optimum μ = H⁻¹b, −½ (yy − bᵀμ) − ½ log det H,
// times the chance that a draw of N(μ, H⁻¹) is non-negative, taken as the
// product of the marginal chances Φ(μ_j/σ_j) (as the face estimates of the
// per-sample model, slab.go). −Inf when H is singular.
func gaussOrthant(K int, H *mat6, b *vec6, yy float64) float64 {
	var L [MaxEndMembers][MaxEndMembers]float64
	hd := 0.0
	for j := 0; j < K; j++ {
		d := H[j][j]
		for p := 0; p < j; p++ {
			d -= L[j][p] * L[j][p]
		}
		if !(d > 1e-13*H[j][j]) {
			return math.Inf(-1)
		}
		d = sqrt(d)
		L[j][j] = d
		hd += plog(d)
		for i := j + 1; i < K; i++ {
			s := H[i][j]
			for p := 0; p < j; p++ {
				s -= L[i][p] * L[j][p]
			}
			L[i][j] = s / d
		}
	}
	var y, mu vec6
	for i := 0; i < K; i++ {
		s := b[i]
		for p := 0; p < i; p++ {
			s -= L[i][p] * y[p]
		}
		y[i] = s / L[i][i]
	}
	fit := 0.0
	for i := K - 1; i >= 0; i-- {
		s := y[i]
		for p := i + 1; p < K; p++ {
			s -= L[p][i] * mu[p]
		}
		mu[i] = s / L[i][i]
		fit += y[i] * y[i] // bᵀH⁻¹b = |L⁻¹b|²
	}
	l := -0.5*max(0, yy-fit) - hd
	for i := 0; i < K; i++ {
		l += plog(max(normCDF(mu[i]/sqrt(invDiag(K, &L, i))), 1e-300))
	}
	return l
}

// normal forms the normal equations H = ÃᵀÃ, b = Ãᵀỹ of the design A
// whitened by the lower-triangular w (Ã = w A), with ỹ given whitened.
func normal(R, K int, w *[maxRows][maxRows]float64, A *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
	var At [maxRows][MaxEndMembers]float64
	whiten(R, K, w, A, &At)
	gram(R, K, &At, yt, H, b)
}

// whiten sets At = w A for the lower-triangular w.
func whiten(R, K int, w *[maxRows][maxRows]float64, A, At *[maxRows][MaxEndMembers]float64) {
	for i := 0; i < R; i++ {
		wi := &w[i]
		for jj := 0; jj < K; jj++ {
			s := 0.0
			for p := 0; p <= i; p++ {
				s += float64(wi[p] * A[p][jj])
			}
			At[i][jj] = s
		}
	}
}

// gram forms H = ÃᵀÃ and b = Ãᵀỹ.
func gram(R, K int, At *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
	for i := 0; i < K; i++ {
		for j := 0; j <= i; j++ {
			s := 0.0
			for p := 0; p < R; p++ {
				s += float64(At[p][i] * At[p][j])
			}
			H[i][j], H[j][i] = s, s
		}
		s := 0.0
		for p := 0; p < R; p++ {
			s += float64(At[p][i] * yt[p])
		}
		b[i] = s
	}
}

// invDiag returns (H⁻¹)_ii for H = L Lᵀ of order m: the squared norm of
// column i of L⁻¹.
func invDiag(m int, l *[MaxEndMembers][MaxEndMembers]float64, i int) float64 {
	var col [MaxEndMembers]float64
	v := 0.0
	for a := i; a < m; a++ {
		s := 0.0
		if a == i {
			s = 1
		}
		for p := i; p < a; p++ {
			s -= l[a][p] * col[p]
		}
		col[a] = s / l[a][a]
		v += col[a] * col[a]
	}
	return v
}
