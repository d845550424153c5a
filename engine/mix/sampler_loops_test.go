package mix

import (
	"math"
)

// The inverse model's kernels as plain loops, as they were before they were
// written out for WebAssembly (proposal_small.go, slab_small.go,
// eval_small.go, lanes.go, stream.go and the batches of sample.go and
// slab.go): sampler_kernels_test.go checks the two give the same bits.

// loopEll is proposal.ell.
func loopEll(p *proposal, eta, u []float64) float64 {
	d := p.d
	eta, u = eta[:d], u[:d]
	e := 0.0
	for i := range d {
		e += eta[i] * eta[i]
	}
	top, sum := math.Inf(-1), 0.0
	lc := make([]float64, len(p.comp))
	for ci := range p.comp {
		c := &p.comp[ci]
		mu := c.mu[:d]
		q := 0.0
		for i := range d {
			v := eta[i] - mu[i]
			row := c.l[i*d : i*d+i+1]
			for k, lk := range row[:i] {
				v -= lk * u[k]
			}
			u[i] = v / row[i]
			q += u[i] * u[i]
		}
		lc[ci] = p.lpi[ci] - 0.5*q - c.halfDet
		top = fmax(top, lc[ci])
	}
	for ci := range p.comp {
		sum += pexp(lc[ci] - top)
	}
	return 0.5*e + top + plog(sum)
}

// loopDraw is proposal.draw.
func loopDraw(p *proposal, u float64, z, eta []float64) {
	ci := len(p.comp) - 1
	for i, c := range p.cum {
		if u < c {
			ci = i
			break
		}
	}
	c := &p.comp[ci]
	d := p.d
	for i := range d {
		v := c.mu[i]
		for k := 0; k <= i; k++ {
			v += float64(c.l[i*d+k] * z[k])
		}
		eta[i] = v
	}
}

// loopMoments is moments.
func loopMoments(d int, ds *draws, w []float64, in []bool) (gaussian, float64, bool) {
	g := gaussian{mu: make([]float64, d), cov: make([]float64, d*d)}
	tw := 0.0
	for k := range ds.n {
		if !in[k] {
			continue
		}
		tw += w[k]
		e := ds.eta(k, d)
		for i := range d {
			g.mu[i] += w[k] * e[i]
		}
	}
	if !(tw > 0) {
		return g, 0, false
	}
	for i := range d {
		g.mu[i] /= tw
	}
	for k := range ds.n {
		if !in[k] {
			continue
		}
		e := ds.eta(k, d)
		for i := range d {
			di := e[i] - g.mu[i]
			for j := 0; j <= i; j++ {
				g.cov[i*d+j] += w[k] * di * (e[j] - g.mu[j])
			}
		}
	}
	for i := range g.cov {
		g.cov[i] /= tw
	}
	return g, tw, true
}

// loopMixture is sampleWork.mixture, into lq.
func loopMixture(w *sampleWork, lq []float64) {
	nTot := float64(w.n)
	c0 := float64(w.nStage[0])
	for s := 1; s < len(w.nStage); s++ {
		c0 += defensive * float64(w.nStage[s])
	}
	lc0 := plog(c0 / nTot)
	lc := make([]float64, len(w.props))
	for s := range w.props {
		lc[s] = plog((1 - defensive) * float64(w.nStage[s+1]) / nTot)
	}
	for k := 0; k < w.n; k++ {
		big := lc0
		for s := range w.props {
			big = fmax(big, lc[s]+w.ell[s][k])
		}
		sum := pexp(lc0 - big)
		for s := range w.props {
			sum += pexp(lc[s] + w.ell[s][k] - big)
		}
		lq[k] = big + plog(sum)
	}
}

// loopTempered is sampleWork.tempered.
func loopTempered(w *sampleWork, wt []float64, beta float64) float64 {
	top := math.Inf(-1)
	for k := 0; k < w.n; k++ {
		wt[k] = beta*w.at(k, oLogL) - w.lq[k]
		top = fmax(top, wt[k])
	}
	if math.IsInf(top, -1) || top != top {
		clear(wt[:w.n])
		return 0
	}
	sw, sw2 := 0.0, 0.0
	for k := 0; k < w.n; k++ {
		v := pexp(wt[k] - top)
		wt[k] = v
		sw += v
		sw2 += v * v
	}
	if sw2 == 0 {
		return 0
	}
	return sw * sw / sw2
}

// loopPerfc is perfc with its exponential taken on its own, as before the
// exponentials were taken in batches (perfcArg's polynomial is perfc's).
func loopPerfc(x float64) float64 {
	t, a := perfcArg(x)
	v := t * pexp(a)
	if x < 0 {
		return 2 - v
	}
	return v
}

// loopNormQuantile is normQuantile, its central part as normQuantile
// computes it (quantiles writes that part out; its coefficients are
// normQuantile's, Acklam 2003).
func loopNormQuantile(p float64) float64 {
	if p < pLow || p > 1-pLow {
		return normQuantile(p) // the tails, which quantiles leaves to normQuantile
	}
	q := p - 0.5
	r := q * q
	return horner6(r, qa1, qa2, qa3, qa4, qa5, qa6) * q / horner6(r, qb1, qb2, qb3, qb4, qb5, 1)
}

// loopResidual is yy − 2 bᵀn + nᵀHn by the loops dot and quad were.
func loopResidual(k int, yy float64, b *vec6, H *mat6, n *vec6) float64 {
	d := 0.0
	for i := 0; i < k; i++ {
		d += float64(b[i] * n[i])
	}
	q := 0.0
	for i := 0; i < k; i++ {
		v := 0.0
		for j := 0; j < k; j++ {
			v += float64(H[i][j] * n[j])
		}
		q += float64(n[i] * v)
	}
	return yy - 2*d + q
}

// loopLinear is linearAt by the loops: the rows' whitened errors, then
// Affine.At of the atmospheric and evaporite amounts and the sulfate.
func loopLinear(st *setup, z []float64) (zl [nLanes]float64) {
	q := st.q
	for i := 0; i < st.r; i++ {
		s := 0.0
		mi := st.m[i*q : (i+1)*q]
		for c, zc := range z {
			s += float64(mi[c] * zc)
		}
		zl[laneEps+i] = s
	}
	for c := range NCations {
		zl[laneAtm+c], zl[laneEvap+c] = st.atm[c].At(z), st.evap[c].At(z)
	}
	zl[laneSO4] = st.so4.At(z)
	return zl
}

// loopSlabDraw is Run.slabDraw as it was: face by face, one call for each
// log and exponential, the uniforms from w.rng.
func (r *Run) loopSlabDraw(w *sampleWork, K int, H *mat6, b *vec6, yy float64, c *vec6, n *vec6) float64 {
	st := w.st
	// The regularisation λ I, a Gaussian of sd 10 T_ref on each amount,
	// keeps faces with more members than data solvable; it shapes the
	// proposal only (the weight is exact).
	tref := max(st.y[0], 1)
	lambda := 1 / (100 * tref * tref)
	logPrior := -float64(K) * math.Ln2
	fits := &w.fits
	nf := 1 << K
	var logc [MaxEndMembers]float64
	for j := 0; j < K; j++ {
		logc[j] = plog(c[j])
	}
	top := logPrior - 0.5*yy // the empty face: n = 0
	fits[0].logZ = top
	for mask := 1; mask < nf; mask++ {
		f := &fits[mask]
		f.logZ = math.Inf(-1)
		f.m = 0
		for j := 0; j < K; j++ {
			if mask&(1<<j) != 0 {
				f.idx[f.m] = j
				f.m++
			}
		}
		m := f.m
		ok := true
		halfDet := 0.0
		for c := 0; c < m && ok; c++ {
			d := H[f.idx[c]][f.idx[c]] + lambda
			for p := 0; p < c; p++ {
				d -= f.l[c][p] * f.l[c][p]
			}
			if !(d > 0) {
				ok = false
				break
			}
			d = sqrt(d)
			f.l[c][c] = d
			halfDet += plog(d)
			for i := c + 1; i < m; i++ {
				s := H[f.idx[i]][f.idx[c]]
				for p := 0; p < c; p++ {
					s -= f.l[i][p] * f.l[c][p]
				}
				f.l[i][c] = s / d
			}
		}
		if !ok {
			continue
		}
		f.hd = halfDet
		// μ = (H_F + λI)⁻¹ b_F, and the diagonal of the inverse.
		var y [MaxEndMembers]float64
		for i := 0; i < m; i++ {
			s := b[f.idx[i]]
			for p := 0; p < i; p++ {
				s -= f.l[i][p] * y[p]
			}
			y[i] = s / f.l[i][i]
		}
		for i := m - 1; i >= 0; i-- {
			s := y[i]
			for p := i + 1; p < m; p++ {
				s -= f.l[p][i] * f.mu[p]
			}
			f.mu[i] = s / f.l[i][i]
		}
		// Laplace estimate: prior at the (non-negative part of the)
		// solution, likelihood at it, the Gaussian volume, and the
		// chance that a proposal is non-negative (each amount on its
		// own, from the marginal sd).
		t, chi2, jac, vt := 0.0, yy, 0.0, 0.0
		for i := 0; i < m; i++ {
			ci := c[f.idx[i]]
			t += ci * fmax(f.mu[i], 0)
			jac += logc[f.idx[i]]
			chi2 -= 2 * b[f.idx[i]] * f.mu[i]
			for p := 0; p < m; p++ {
				chi2 += f.mu[i] * H[f.idx[i]][f.idx[p]] * f.mu[p]
			}
		}
		var sd [MaxEndMembers]float64
		for i := 0; i < m; i++ {
			v := invDiag(m, &f.l, i)
			sd[i] = sqrt(v)
			vt += c[f.idx[i]] * c[f.idx[i]] * v
		}
		// The prior at a total that is no smaller than its own spread
		// (the log-uniform density is steep near zero; a point value
		// there would overstate the face).
		te := sqrt(t*t + vt)
		lz := logPrior + logSlab(m, fmax(te, slabLo)) + jac - 0.5*fmax(chi2, 0) + 0.5*float64(m)*log2Pi - halfDet
		for i := 0; i < m; i++ {
			lz += plog(fmax(0.5*loopPerfc(-(f.mu[i]/sd[i])*invSqrt2), 1e-300))
		}
		if lz != lz {
			continue
		}
		f.logZ = lz
		top = fmax(top, lz)
	}
	// Choose a face in proportion to the estimates.
	sum := 0.0
	for mask := 0; mask < nf; mask++ {
		fits[mask].p = pexp(fits[mask].logZ - top)
		sum += fits[mask].p
	}
	u := uniform(w.rng) * sum
	pick, acc := -1, 0.0
	for mask := 0; mask < nf; mask++ {
		p := fits[mask].p
		if p == 0 {
			continue
		}
		acc += p
		pick = mask // the last face with a chance, should rounding leave u above the sum
		if u < acc {
			break
		}
	}
	logQ := fits[pick].logZ - top - plog(sum) // log of the face's proposal probability
	*n = vec6{}
	if pick == 0 {
		return logPrior - 0.5*yy - logQ
	}
	f := &fits[pick]
	m := f.m
	// n_F = μ + L⁻ᵀ z.
	var z, x [MaxEndMembers]float64
	zz := 0.0
	for i := 0; i < m; i++ {
		z[i] = loopNormQuantile(uniform(w.rng))
		zz += z[i] * z[i]
	}
	for i := m - 1; i >= 0; i-- {
		s := z[i]
		for p := i + 1; p < m; p++ {
			s -= f.l[p][i] * x[p]
		}
		x[i] = s / f.l[i][i]
	}
	t, jac := 0.0, 0.0
	for i := 0; i < m; i++ {
		v := f.mu[i] + x[i]
		if v < 0 {
			*n = vec6{}
			return math.Inf(-1)
		}
		n[f.idx[i]] = v
		t += c[f.idx[i]] * v
		jac += logc[f.idx[i]]
	}
	lp := logSlab(m, t) + jac
	if math.IsInf(lp, -1) {
		return math.Inf(-1)
	}
	chi2 := fmax(0, yy-2*dot(K, b, n)+quad(K, H, n))
	logProp := -0.5*zz - 0.5*float64(m)*log2Pi + f.hd
	return logPrior + lp - 0.5*chi2 - logProp - logQ
}

// loopCorr is the correlation of the a-th and b-th amounts as it was, one
// pair at a time.
func loopCorr(w *sampleWork, keep []int, kw []float64, a, b int) float64 {
	var sw, ma, mb float64
	for x, i := range keep {
		f := w.amounts(i)
		sw += kw[x]
		ma += kw[x] * f[a]
		mb += kw[x] * f[b]
	}
	ma, mb = ma/sw, mb/sw
	var saa, sbb, sab float64
	for x, i := range keep {
		f := w.amounts(i)
		da, db := f[a]-ma, f[b]-mb
		saa += kw[x] * da * da
		sbb += kw[x] * db * db
		sab += kw[x] * da * db
	}
	if !(saa > 0 && sbb > 0) {
		return math.NaN()
	}
	return sab / math.Sqrt(saa*sbb)
}
