package mix

import "math"

// The amounts n_j (µmol/L of Na from end-member j) have a spike-and-slab
// prior: each end-member is present or absent with probability ½, on its
// own (so every set of present end-members, the "face", has prior 2^-k);
// the shares of the rock-derived cation charge, e_j = c_j n_j with c_j =
// 1 + (K/Na)_j + 2 (Ca/Na)_j + 2 (Mg/Na)_j µeq per µmol of Na, are uniform
// on the simplex of the present ones (Dirichlet(1, ..., 1)); and the total
// charge E = sum e_j is log-uniform between slabLo and slabHi. A share of
// charge rather than of Na puts a carbonate that brings a fifth of the
// cations (and a hundredth of the Na) in the middle of the prior, not in
// its corner. Absent end-members contribute exactly 0, so a source can be
// absent from a draw and a share can be exactly 0 or 1.
//
// For the draw's end-member ratios, the faces are proposed in proportion to
// a Laplace estimate of their evidence, and the amounts on the chosen face
// from the Gaussian N(μ_F, H_F⁻¹) of the linear least-squares problem on it;
// the weight is the exact ratio of prior × likelihood to that proposal, so
// the sampler is exact importance sampling of (ratios, face, amounts) and
// the Laplace estimates only steer it. A proposed amount below zero, or a
// total outside the slab, has weight 0.
const (
	slabLo = 1   // µeq/L: smallest total rock-derived cation charge of the prior (assumption)
	slabHi = 1e5 // µeq/L: largest (assumption)
)

// logSlabNorm is ln ln(slabHi/slabLo), the log normaliser of the total's
// log-uniform density.
var logSlabNorm = plog(plog(slabHi / slabLo))

// logFact[m] is ln (m−1)! for m faces members (the Dirichlet(1) density on a
// simplex of m fractions is (m−1)!).
var logFact = [MaxEndMembers + 1]float64{0, 0, 0, plog(2), plog(6), plog(24), plog(120)}

// logSlab returns the log prior density of the charges e on a face of m
// members with total t (−Inf outside the slab).
func logSlab(m int, t float64) float64 {
	if !(t >= slabLo && t <= slabHi) {
		return math.Inf(-1)
	}
	return logFact[m] - float64(m)*plog(t) - logSlabNorm
}

const log2Pi = 1.8378770664093453

// faceFit is the least-squares problem of one face: the Cholesky factor of
// the (lightly regularised) normal matrix, the solution and the Laplace
// estimate of the face's evidence.
type faceFit struct {
	m    int
	idx  [MaxEndMembers]int
	l    [MaxEndMembers][MaxEndMembers]float64 // H_F + λI = L Lᵀ
	mu   vec6                                  // on the face's members, in order
	logZ float64
	hd   float64 // ln det L, the sum of ln L_ii in order
	p    float64 // exp(logZ − largest logZ): the face's unnormalised chance
}

// slabDraw samples the face and the amounts for the draw whose whitened
// design gives the normal equations H, b (data norm yy) and whose
// end-members carry c charge per Na, and returns the draw's log weight
// factor (prior × likelihood over proposal, the ratios' part aside) and the
// amounts in n.
func (r *Run) slabDraw(w *sampleWork, K int, H *mat6, b *vec6, yy float64, c *vec6, n *vec6) float64 {
	st := w.st
	// The regularisation λ I, a Gaussian of sd 10 T_ref on each amount,
	// keeps faces with more members than data solvable; it shapes the
	// proposal only (the weight is exact).
	tref := max(st.y[0], 1)
	lambda := 1 / (100 * tref * tref)
	logPrior := -float64(K) * math.Ln2
	fits := &w.fits // working space: each entry is written before it is read (m is reset below)
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
			lz += plog(fmax(normCDF(f.mu[i]/sd[i]), 1e-300))
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
		z[i] = normQuantile(uniform(w.rng))
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
