package mix

import (
	"math"
	"math/rand/v2"
)

// chain is one Markov chain of the catchment-wide model over the shared
// latents (standard normal under the priors, as in the per-sample model)
// and the scatters' parameters v (scatterOf).
type chain struct {
	rng      *rand.Rand
	src      *rand.PCG // rng's source, whose state travels with the chain (catchment_farm.go)
	x, prop  []float64 // current state and proposal
	z        []float64
	lp, lq   float64   // log posterior and log proposal density at x
	t        int       // steps taken, warm-up included
	goal     int       // kept steps to reach before the next check
	accepted int       // accepted proposals after warm-up
	search   *search   // the mode search, before the proposal is made
	indTried int       // independence proposals made in the warm-up
	indTaken int       // and accepted
	warmY    []float64 // the warm-up's independence proposals, [draw][parameter]
	warmW    []float64 // and their log importance weights
	bm       []float64 // a block's conditional centre
	hist     []float64 // kept states, [step][parameter]
	acc      []float64 // accepted after each kept step (a count), to cut a chain back to a check
	th       [NTracers][MaxEndMembers]float64
	tau      [MaxEndMembers]float64
}

// newChain draws chain k's start from the priors (dispersed: the posterior
// is narrower), the scatters' parameters too, and readies its mode
// search.
func (c *CatchmentRun) newChain(k int) *chain {
	r := c.base
	src := rand.NewPCG(r.opt.Seed^chainStream, uint64(k))
	ch := &chain{rng: rand.New(src), src: src, goal: c.co.Batch}
	ch.x, ch.prop, ch.z = make([]float64, c.np), make([]float64, c.np), make([]float64, c.np)
	ch.bm = make([]float64, c.np)
	for t := range NTracers {
		for j := range r.n {
			ch.th[t][j] = r.smp[t][j].v
		}
	}
	for try := 0; try < 100; try++ {
		for i := range c.nd {
			ch.x[i] = normQuantile(uniform(ch.rng))
		}
		for e := range c.ems {
			ch.x[c.nd+e] = math.Abs(normQuantile(uniform(ch.rng)))
		}
		if ch.lp = c.logPost(ch, ch.x); !math.IsInf(ch.lp, -1) {
			break
		}
	}
	c.startSearch(ch)
	return ch
}

// The shares of the kinds of step during the warm-up: independence steps
// from the whole proposal (whose draws refit it), block steps, and random
// walks; after the warm-up the first two are set from the independence
// steps' acceptance (setShares).
const (
	warmFull  = 0.5
	warmBlock = 0.4
)

// step takes one Metropolis–Hastings step of chain ch, of one of three
// kinds: an independence step from the fitted proposal (share c.full), a
// block step for one end-member's parameters (share c.block), or a random
// walk of covariance 2.38²/d times the heaviest component's scale (Gelman,
// Roberts & Gilks 1996, from memory). During the warm-up the independence
// proposals are kept, with their importance weights, for the refits; after
// it the state is kept.
func (c *CatchmentRun) step(ch *chain) {
	np := c.np
	q := c.prop
	warm := ch.t < c.co.Warmup
	var lp, lq float64
	ok := false
	switch u := uniform(ch.rng); {
	case u < c.full:
		q.draw(ch.rng, ch.prop, ch.z)
		lp = c.logPost(ch, ch.prop)
		lq = q.logDensity(ch.prop)
		ok = plog(uniform(ch.rng)) < (lp-lq)-(ch.lp-ch.lq)
		if warm {
			ch.indTried++
			if ok {
				ch.indTaken++
			}
			if !math.IsInf(lp, -1) {
				ch.warmY = append(ch.warmY, ch.prop...)
				ch.warmW = append(ch.warmW, lp-lq)
			}
		}
	case u < c.full+c.block && len(c.blocks) > 0:
		b := &c.blocks[min(int(uniform(ch.rng)*float64(len(c.blocks))), len(c.blocks)-1)]
		m := ch.bm[:len(b.idx)]
		b.mean(ch.x, m)
		copy(ch.prop, ch.x)
		b.propose(ch.rng, ch.prop, m, ch.z)
		lp = c.logPost(ch, ch.prop)
		ok = plog(uniform(ch.rng)) < (lp+b.logQ(ch.x, m))-(ch.lp+b.logQ(ch.prop, m))
	default:
		m := q.comps[c.heavy].m
		s := 2.38 / sqrt(float64(np))
		for i := range np {
			ch.z[i] = normQuantile(uniform(ch.rng))
		}
		for i := range np {
			v := 0.0
			for k := 0; k <= i; k++ {
				v += float64(m[i*np+k] * ch.z[k])
			}
			ch.prop[i] = ch.x[i] + float64(s*v)
		}
		lp = c.logPost(ch, ch.prop)
		ok = plog(uniform(ch.rng)) < lp-ch.lp
	}
	if ok && lq == 0 {
		lq = q.logDensity(ch.prop)
	}
	if ok {
		ch.x, ch.prop = ch.prop, ch.x
		ch.lp, ch.lq = lp, lq
	}
	ch.t++
	if warm {
		return
	}
	if ok {
		ch.accepted++
	}
	ch.hist = append(ch.hist, ch.x...)
	ch.acc = append(ch.acc, float64(ch.accepted))
}

// refits is the number of refits of the proposal during the warm-up, evenly
// spaced, the last at its end.
const refits = 8

// stopAt returns the step at which ch waits for the other chains: the next
// refit of the proposal, or the end of its current goal.
func (c *CatchmentRun) stopAt(ch *chain) int {
	for q := 1; q <= refits; q++ {
		if s := q * c.co.Warmup / refits; s > c.refitted {
			return s
		}
	}
	return c.co.Warmup + ch.goal
}

// refit moves the proposal to the importance-weighted moments of every
// independence proposal of the warm-up so far, pooled over the chains in
// their order (each weighted by the target's density over the proposal it
// came from), and re-evaluates the chains' proposal densities. At the end
// of the warm-up it also sets the shares of the kinds of step (setShares).
// Nothing changes after the warm-up, so the kept steps form valid chains.
func (c *CatchmentRun) refit(end bool) {
	np := c.np
	var ys [][]float64
	var lw []float64
	tried, taken := 0, 0
	for _, ch := range c.chains {
		for k := range ch.warmW {
			ys = append(ys, ch.warmY[k*np:(k+1)*np])
		}
		lw = append(lw, ch.warmW...)
		tried += ch.indTried
		taken += ch.indTaken
	}
	c.prop.refit(ys, lw)
	c.heavy = c.prop.heaviest()
	c.makeBlocks()
	for _, ch := range c.chains {
		ch.lq = c.prop.logDensity(ch.x)
	}
	if !end {
		return
	}
	c.setShares(float64(taken) / float64(max(tried, 1)))
	for _, ch := range c.chains {
		ch.warmY, ch.warmW = nil, nil
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
	for e, j := range c.ems {
		v := x[c.nd+e]
		if !(v > 0) || v > 50 {
			return math.Inf(-1)
		}
		ch.tau[j] = c.scatterOf(v)
		lp -= 0.5 * v * v // τ = s v half-normal: v half standard normal
	}
	var A [maxRows][MaxEndMembers]float64 // the design, shared by the samples of one layout in a row
	for i, s := range c.used {
		st := &r.res.Samples[s].setup
		if !c.sameA[i] {
			A = [maxRows][MaxEndMembers]float64{}
			design(st, &ch.th, &A)
		}
		l := c.sampleLogL(st, &A, &ch.th, &ch.tau, c.diagCov[i])
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
// taken from the amounts' joint Gaussian (gaussOrthant, logOrthant):
// without it, the marginal would favour end-members that sit inside the
// cloud of samples, and with the product of the marginal chances in its
// place it favoured, by tens of log units over a catchment, end-members
// for which the amounts' optimum lies beyond a face (docs/methods.md
// §7.12). The scatter is added to each tracer row's variance at the exact
// non-negative fit without it (to first order). A is st's design at th
// (design, zero past its rows and end-members), and diag says whether st's
// covariance is diagonal (diagonal).
func (c *CatchmentRun) sampleLogL(st *setup, A *[maxRows][MaxEndMembers]float64, th *[NTracers][MaxEndMembers]float64, tau *[MaxEndMembers]float64, diag bool) float64 {
	R, K := st.r, st.k
	tot := 0.0
	if v := st.x[0].Value; v > 0 {
		tot += 1 * v
	}
	if v := st.x[1].Value; v > 0 {
		tot += 1 * v
	}
	if v := st.x[2].Value; v > 0 {
		tot += 2 * v
	}
	if v := st.x[3].Value; v > 0 {
		tot += 2 * v
	}
	if tot < 1 { // max(tot, 1): tot is not NaN
		tot = 1
	}
	// Logs are taken of products (one log where there were many: the
	// chains spend much of their time here).
	var dg, ta vec6 // ta: each column's scatter, zero past K
	pc := 1.0
	for jj, j := range st.act {
		cj := (1 + th[KNa][j] + 2*th[CaNa][j] + 2*th[MgNa][j]) / tot
		dg[jj] = cj * cj
		pc *= cj
		ta[jj] = tau[j]
	}
	var H mat6
	var b, n vec6
	var At [maxRows][MaxEndMembers]float64
	// Raw waters' rows have errors of their own (a diagonal covariance):
	// whitening is then a division by each row's σ, and gives the same bits
	// as the general triangular solve, whose terms beside the diagonal are
	// zeros. Past the R rows, A and linv are zeros, and so is At.
	if diag {
		w := &st.linv
		w0, w1, w2, w3, w4, w5 := w[0][0], w[1][1], w[2][2], w[3][3], w[4][4], w[5][5]
		for jj := 0; jj < K; jj++ {
			At[0][jj] = float64(w0 * A[0][jj])
			At[1][jj] = float64(w1 * A[1][jj])
			At[2][jj] = float64(w2 * A[2][jj])
			At[3][jj] = float64(w3 * A[3][jj])
			At[4][jj] = float64(w4 * A[4][jj])
			At[5][jj] = float64(w5 * A[5][jj])
		}
		for i := 6; i < R; i++ {
			for jj := 0; jj < K; jj++ {
				At[i][jj] = float64(w[i][i] * A[i][jj])
			}
		}
		gram(R, K, &At, &st.yt, &H, &b)
	} else {
		normal(R, K, &st.linv, A, &st.yt, &H, &b)
	}
	addDiag(&H, &dg)
	nnls(K, &H, &b, &n)
	// The covariance with the scatter: each tracer row's variance widened by
	// what the scatter of the end-members' ratios brings at the amounts n
	// (past K, ta, A and n are zeros: the padded terms are 0·0).
	var wide [maxRows]float64
	wide[0] = st.cov[0][0] + 0.0
	for row := 1; row < R; row++ {
		a := &A[row]
		a0 := float64(ta[0]*a[0]) * n[0]
		a1 := float64(ta[1]*a[1]) * n[1]
		a2 := float64(ta[2]*a[2]) * n[2]
		a3 := float64(ta[3]*a[3]) * n[3]
		a4 := float64(ta[4]*a[4]) * n[4]
		a5 := float64(ta[5]*a[5]) * n[5]
		wide[row] = st.cov[row][row] + (0.0 + a0*a0 + a1*a1 + a2*a2 + a3*a3 + a4*a4 + a5*a5)
	}
	var yt [maxRows]float64
	yy := 0.0
	pl := 1.0
	if diag {
		for i := 0; i < R; i++ {
			x := wide[i]
			if c := 1e-18*(1+x) + 1e-30; x < c { // math.Max(x, c): c is not ±0, and NaN only with x
				x = c
			}
			l := sqrt(x)
			pl *= l
			yt[i] = st.y[i] / l
			yy += yt[i] * yt[i]
			a, at := &A[i], &At[i]
			at[0], at[1], at[2], at[3], at[4], at[5] = a[0]/l, a[1]/l, a[2]/l, a[3]/l, a[4]/l, a[5]/l
		}
	} else {
		pl, yy = whitenWide(R, K, st, &wide, A, &At, &yt)
	}
	gram(R, K, &At, &yt, &H, &b)
	addDiag(&H, &dg)
	return gaussOrthant(K, &H, &b, yy) + plog(pc/pl)
}

// addDiag adds d to the diagonal of H (past K both are zeros).
func addDiag(H *mat6, d *vec6) {
	H[0][0] += d[0]
	H[1][1] += d[1]
	H[2][2] += d[2]
	H[3][3] += d[3]
	H[4][4] += d[4]
	H[5][5] += d[5]
}

// whitenWide factors the setup's covariance with its diagonal set to wide,
// C = L Lᵀ, and sets the whitened data and design L ỹ = y, L Ã = A (yt and
// At zero on entry); it returns det L and |ỹ|².
func whitenWide(R, K int, st *setup, wide *[maxRows]float64, A, At *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64) (pl, yy float64) {
	var L [maxRows][maxRows]float64
	pl = 1.0
	for i := 0; i < R; i++ {
		// Row i of L, each entry as the column-by-column factor has it;
		// its diagonal is set last, so that l[p] is zero for p >= i in the
		// sums below, whose padded terms are then 0·0 (yt and At are
		// zero from row i on).
		c, l := &st.cov[i], &L[i]
		if i > 0 {
			l[0] = c[0] / L[0][0]
		}
		if i > 1 {
			l[1] = (c[1] - l[0]*L[1][0]) / L[1][1]
		}
		if i > 2 {
			l[2] = (c[2] - l[0]*L[2][0] - l[1]*L[2][1]) / L[2][2]
		}
		if i > 3 {
			l[3] = (c[3] - l[0]*L[3][0] - l[1]*L[3][1] - l[2]*L[3][2]) / L[3][3]
		}
		if i > 4 {
			l[4] = (c[4] - l[0]*L[4][0] - l[1]*L[4][1] - l[2]*L[4][2] - l[3]*L[4][3]) / L[4][4]
		}
		if i > 5 {
			l[5] = (c[5] - l[0]*L[5][0] - l[1]*L[5][1] - l[2]*L[5][2] - l[3]*L[5][3] - l[4]*L[5][4]) / L[5][5]
		}
		if i > 6 {
			l[6] = (c[6] - l[0]*L[6][0] - l[1]*L[6][1] - l[2]*L[6][2] - l[3]*L[6][3] - l[4]*L[6][4] - l[5]*L[6][5]) / L[6][6]
		}
		d := wide[i] - l[0]*l[0] - l[1]*l[1] - l[2]*l[2] - l[3]*l[3] - l[4]*l[4] - l[5]*l[5] - l[6]*l[6]
		if m := 1e-18*(1+wide[i]) + 1e-30; d < m { // math.Max(d, m): m is not ±0, and NaN only with d
			d = m
		}
		li := sqrt(d)
		pl *= li
		// Row i of the whitened data and design.
		yt[i] = (st.y[i] - l[0]*yt[0] - l[1]*yt[1] - l[2]*yt[2] - l[3]*yt[3] - l[4]*yt[4] - l[5]*yt[5] - l[6]*yt[6]) / li
		yy += yt[i] * yt[i]
		for jj := 0; jj < K; jj++ {
			At[i][jj] = (A[i][jj] - l[0]*At[0][jj] - l[1]*At[1][jj] - l[2]*At[2][jj] - l[3]*At[3][jj] - l[4]*At[4][jj] - l[5]*At[5][jj] - l[6]*At[6][jj]) / li
		}
		l[i] = li
	}
	return pl, yy
}

// gaussOrthant returns the log of the integral over n >= 0 of
// exp(−½ (yy − 2 bᵀn + nᵀHn)) (up to the constant (2π)^(k/2)): the Gaussian
// integral at the unconstrained optimum μ = H⁻¹b, −½ (yy − bᵀμ) − ½ log det H,
// times the chance that a draw of N(μ, H⁻¹) is non-negative (logOrthant).
// −Inf when H is singular.
func gaussOrthant(K int, H *mat6, b *vec6, yy float64) float64 {
	var L mat6
	var tol vec6
	for j := 0; j < K; j++ {
		tol[j] = 1e-13 * H[j][j]
	}
	var y, mu vec6
	if !cholSolve(K, H, &tol, true, &L, b, &y, &mu) {
		return math.Inf(-1)
	}
	hd := 1.0
	for j := 0; j < K; j++ {
		hd *= L[j][j]
	}
	// bᵀH⁻¹b = |L⁻¹b|², summed from the last row up (y is zero past K).
	fit := 0.0 + y[5]*y[5] + y[4]*y[4] + y[3]*y[3] + y[2]*y[2] + y[1]*y[1] + y[0]*y[0]
	d := yy - fit
	if d <= 0 { // max(0, d): +0 for ±0, NaN kept
		d = 0
	}
	return -0.5*d - plog(hd) + logOrthant(K, &L, &mu)
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

// setShares sets the shares of independence and block steps after the
// warm-up from the independence steps' acceptance there: most steps while
// the whole proposal fits, block steps as it fits worse (an engineering
// choice, no source); a tenth or less are random walks.
func (c *CatchmentRun) setShares(rate float64) {
	switch {
	case rate >= 0.2:
		c.full, c.block = 0.8, 0.15
	case rate >= 0.05:
		c.full, c.block = 0.4, 0.5
	default:
		c.full, c.block = 0.1, 0.8
	}
}

// scatterOf returns the scatter τ = s v of the chains' parameter v > 0, s
// the scale of τ's half-normal prior, so that v is half standard normal
// under the prior (as the shared latents are standard normal). The chains
// move v rather than ln τ: where the samples cannot tell a small scatter
// from none, the posterior of ln τ has a long tail towards −∞ (its prior
// density there falls only as τ), which no proposal centred on the bulk
// covers; v's posterior is then the half-normal prior, which the folded
// proposal fits (chainProposal).
func (c *CatchmentRun) scatterOf(v float64) float64 { return c.co.Scatter * v }
