package mix

import (
	"math"

	"lixiv/engine/internal/portable"
)

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

// faceMembers[mask] lists the end-members of the face mask in order (the
// first faceCount[mask] entries).
var faceMembers, faceCount = faceTables()

func faceTables() (members [1 << MaxEndMembers][MaxEndMembers]int, size [1 << MaxEndMembers]int) {
	for mask := range members {
		for j := range MaxEndMembers {
			if mask&(1<<j) != 0 {
				members[mask][size[mask]] = j
				size[mask]++
			}
		}
	}
	return members, size
}

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

	ok           bool    // the face's problem was solved
	t, chi2, jac float64 // its Laplace estimate's sums (solve)
	off          int     // where its members' terms begin in slabScratch
}

// slabScratch holds slabDraw's batches of logs and exponentials: per member
// of each face solved, its factor's diagonal and the parts of its normal
// distribution function (perfcArg); per face solved, its total.
type slabScratch struct {
	diag, x, t, e [MaxEndMembers << (MaxEndMembers - 1)]float64
	te            [1 << MaxEndMembers]float64
	logs          [2*MaxEndMembers<<(MaxEndMembers-1) + 1<<MaxEndMembers]float64
	p             [1 << MaxEndMembers]float64
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
	tref := st.y[0] // max(st.y[0], 1), without the runtime call WebAssembly makes of max
	if tref < 1 {
		tref = 1
	}
	lambda := 1 / (100 * tref * tref)
	logPrior := -float64(K) * math.Ln2
	fits := &w.fits // working space: each entry is written before it is read (m is reset below)
	nf := 1 << K
	sc := &w.slab
	var logc [MaxEndMembers]float64
	copy(logc[:K], c[:K])
	portable.LogAll(logc[:K])
	top := logPrior - 0.5*yy // the empty face: n = 0
	fits[0].logZ = top
	// Each face's least-squares problem, and the arguments of the logs
	// and exponentials of its Laplace estimate: gathered over all faces
	// and taken in two calls (portable.ExpAll, LogAll), which WebAssembly
	// makes far faster than one call each. The estimate is then summed in
	// the order of the face-by-face loop it replaces (slab_small_test.go).
	nm, nok := 0, 0 // members of the faces solved, and those faces
	for mask := 1; mask < nf; mask++ {
		f := &fits[mask]
		f.logZ = math.Inf(-1)
		f.idx, f.m = faceMembers[mask], faceCount[mask]
		m := f.m
		switch m {
		case 1:
			f.t, f.chi2, f.jac, f.ok = f.solve1(H, b, c, &logc, yy, lambda)
		case 2:
			f.t, f.chi2, f.jac, f.ok = f.solve2(H, b, c, &logc, yy, lambda)
		case 3:
			f.t, f.chi2, f.jac, f.ok = f.solve3(H, b, c, &logc, yy, lambda)
		case 4:
			f.t, f.chi2, f.jac, f.ok = f.solve4(H, b, c, &logc, yy, lambda)
		case 5:
			f.t, f.chi2, f.jac, f.ok = f.solve5(H, b, c, &logc, yy, lambda)
		default:
			f.t, f.chi2, f.jac, f.ok = f.solve6(H, b, c, &logc, yy, lambda)
		}
		if !f.ok {
			continue
		}
		f.off = nm
		vt := 0.0
		for i := 0; i < m; i++ {
			g := nm + i
			v := invDiag(m, &f.l, i)
			sd := sqrt(v)
			vt += c[f.idx[i]] * c[f.idx[i]] * v
			sc.diag[g] = f.l[i][i]
			// normCDF(μ_i/sd_i) = perfc(x)/2: its exponential's argument.
			x := -(f.mu[i] / sd) * invSqrt2
			sc.x[g] = x
			sc.t[g], sc.e[g] = perfcArg(x)
		}
		nm += m
		// The prior at a total that is no smaller than its own spread
		// (the log-uniform density is steep near zero; a point value
		// there would overstate the face).
		sc.te[nok] = atLeast(sqrt(f.t*f.t+vt), slabLo)
		nok++
	}
	portable.ExpAll(sc.e[:nm])
	// The logs: the factors' diagonals, the normal distribution functions
	// (at least 1e-300) and the totals, one after the other.
	lg := sc.logs[:2*nm+nok]
	copy(lg, sc.diag[:nm])
	for g := range nm {
		lg[nm+g] = atLeast(0.5*perfcFrom(sc.x[g], sc.t[g], sc.e[g]), 1e-300)
	}
	copy(lg[2*nm:], sc.te[:nok])
	portable.LogAll(lg)
	fi := 0
	for mask := 1; mask < nf; mask++ {
		f := &fits[mask]
		if !f.ok {
			continue
		}
		m := f.m
		halfDet := 0.0
		for _, v := range lg[f.off : f.off+m] {
			halfDet += v
		}
		f.hd = halfDet
		te := sc.te[fi]
		slab := math.Inf(-1) // logSlab(m, te), its log taken above
		if te >= slabLo && te <= slabHi {
			slab = logFact[m] - float64(m)*lg[2*nm+fi] - logSlabNorm
		}
		fi++
		lz := logPrior + slab + f.jac - 0.5*pos(f.chi2) + 0.5*float64(m)*log2Pi - halfDet
		for _, v := range lg[nm+f.off : nm+f.off+m] {
			lz += v
		}
		if lz != lz {
			continue
		}
		f.logZ = lz
		top = fmax(top, lz)
	}
	// Choose a face in proportion to the estimates.
	ps := sc.p[:nf]
	for mask := range ps {
		ps[mask] = fits[mask].logZ - top
	}
	portable.ExpAll(ps)
	sum := 0.0
	for mask, p := range ps {
		fits[mask].p = p
		sum += p
	}
	u := pcgUniform(w.src) * sum
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
	normals(z[:m], w.src)
	for i := 0; i < m; i++ {
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
	chi2 := pos(residual(K, yy, b, H, n))
	logProp := -0.5*zz - 0.5*float64(m)*log2Pi + f.hd
	return logPrior + lp - 0.5*chi2 - logProp - logQ
}
