package mix

import "math"

// The plain loop versions of the small dense kernels, as they were before
// they were unrolled for WebAssembly (kernels_test.go checks that the
// kernels give the same bits).

func refSampleLogL(st *setup, th *[NTracers][MaxEndMembers]float64, tau *[MaxEndMembers]float64) float64 {
	R, K := st.r, st.k
	var A [maxRows][MaxEndMembers]float64
	refDesign(st, th, &A)
	var dg vec6
	tot := 0.0
	for c, f := range [NCations]float64{1, 1, 2, 2} {
		if v := st.x[c].Value; v > 0 {
			tot += f * v
		}
	}
	tot = max(tot, 1)
	// Logs are taken of products (one log where there were many: the
	// chains spend much of their time here).
	pc := 1.0
	for jj, j := range st.act {
		cj := (1 + th[KNa][j] + 2*th[CaNa][j] + 2*th[MgNa][j]) / tot
		dg[jj] = cj * cj
		pc *= cj
	}
	var H mat6
	var b, n vec6
	var At [maxRows][MaxEndMembers]float64
	// Raw waters' rows have errors of their own (a diagonal covariance):
	// whitening is then a division by each row's σ, and gives the same bits
	// as the general triangular solve, whose terms beside the diagonal are
	// zeros.
	diag := refDiagonal(R, &st.cov)
	if diag {
		for i := 0; i < R; i++ {
			w := st.linv[i][i]
			for jj := 0; jj < K; jj++ {
				At[i][jj] = float64(w * A[i][jj])
			}
		}
		refGram(R, K, &At, &st.yt, &H, &b)
	} else {
		refNormal(R, K, &st.linv, &A, &st.yt, &H, &b)
	}
	for jj := 0; jj < K; jj++ {
		H[jj][jj] += dg[jj]
	}
	refNnls(K, &H, &b, &n)
	// The covariance with the scatter: each tracer row's variance widened by
	// what the scatter of the end-members' ratios brings at the amounts n.
	var wide [maxRows]float64
	for row := 0; row < R; row++ {
		v := 0.0
		if row > 0 {
			for jj, j := range st.act {
				a := float64(tau[j]*A[row][jj]) * n[jj]
				v += a * a
			}
		}
		wide[row] = st.cov[row][row] + v
	}
	var yt [maxRows]float64
	yy := 0.0
	pl := 1.0
	if diag {
		for i := 0; i < R; i++ {
			l := sqrt(math.Max(wide[i], 1e-18*(1+wide[i])+1e-30))
			pl *= l
			yt[i] = st.y[i] / l
			yy += yt[i] * yt[i]
			for jj := 0; jj < K; jj++ {
				At[i][jj] = A[i][jj] / l
			}
		}
	} else {
		pl, yy = refWhitenWide(R, K, st, &wide, &A, &At, &yt)
	}
	refGram(R, K, &At, &yt, &H, &b)
	for jj := 0; jj < K; jj++ {
		H[jj][jj] += dg[jj]
	}
	return refGaussOrthant(K, &H, &b, yy) + plog(pc/pl)
}

func refDiagonal(r int, c *[maxRows][maxRows]float64) bool {
	for i := 1; i < r; i++ {
		for j := 0; j < i; j++ {
			if c[i][j] != 0 {
				return false
			}
		}
	}
	return true
}

func refWhitenWide(R, K int, st *setup, wide *[maxRows]float64, A, At *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64) (pl, yy float64) {
	var C, L [maxRows][maxRows]float64
	C = st.cov
	for i := 0; i < R; i++ {
		C[i][i] = wide[i]
	}
	pl = 1.0
	for j := 0; j < R; j++ {
		d := C[j][j]
		for p := 0; p < j; p++ {
			d -= L[j][p] * L[j][p]
		}
		d = math.Max(d, 1e-18*(1+C[j][j])+1e-30)
		L[j][j] = sqrt(d)
		pl *= L[j][j]
		for i := j + 1; i < R; i++ {
			s := C[i][j]
			for p := 0; p < j; p++ {
				s -= L[i][p] * L[j][p]
			}
			L[i][j] = s / L[j][j]
		}
	}
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
	return pl, yy
}

func refGaussOrthant(K int, H *mat6, b *vec6, yy float64) float64 {
	var L [MaxEndMembers][MaxEndMembers]float64
	hd := 1.0
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
		hd *= d
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
	return -0.5*max(0, yy-fit) - plog(hd) + refLogOrthant(K, &L, &mu)
}

func refNormal(R, K int, w *[maxRows][maxRows]float64, A *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
	var At [maxRows][MaxEndMembers]float64
	refWhiten(R, K, w, A, &At)
	refGram(R, K, &At, yt, H, b)
}

func refWhiten(R, K int, w *[maxRows][maxRows]float64, A, At *[maxRows][MaxEndMembers]float64) {
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

func refGram(R, K int, At *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
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

func refLogOrthant(K int, L *[MaxEndMembers][MaxEndMembers]float64, mu *vec6) float64 {
	// Σ = H⁻¹ = L⁻ᵀ L⁻¹: W = L⁻¹ by forward substitution, Σ = Wᵀ W.
	var W, S [MaxEndMembers][MaxEndMembers]float64
	for c := 0; c < K; c++ {
		for a := c; a < K; a++ {
			s := 0.0
			if a == c {
				s = 1
			}
			for p := c; p < a; p++ {
				s -= float64(L[a][p] * W[p][c])
			}
			W[a][c] = s / L[a][a]
		}
	}
	for i := 0; i < K; i++ {
		for j := 0; j <= i; j++ {
			s := 0.0
			for a := i; a < K; a++ { // W is lower: W[a][i] = 0 for a < i
				s += float64(W[a][i] * W[a][j])
			}
			S[i][j], S[j][i] = s, s
		}
	}
	m := *mu
	var done [MaxEndMembers]bool
	lp, pr := 0.0, 1.0
	for range K {
		// The most constraining component left.
		k, zk := -1, 0.0
		for i := 0; i < K; i++ {
			if done[i] {
				continue
			}
			z := m[i] / sqrt(S[i][i])
			if k < 0 || z < zk {
				k, zk = i, z
			}
		}
		if zk > farInside {
			break // every component left is non-negative but for a chance below 1e-11
		}
		done[k] = true
		var lam float64
		if zk > -8 {
			// One log of the product at the end, where there were several.
			p := normCDF(zk)
			lam = invSqrt2Pi * pexp(-0.5*float64(zk*zk)) / p
			pr *= p
		} else {
			var lc float64
			lc, lam = logPhiMills(zk)
			lp += lc
		}
		// The truncated component: mean shifted by σ λ, variance scaled by
		// v = 1 − z λ − λ².
		sk := sqrt(S[k][k])
		v := max(1-float64(zk*lam)-float64(lam*lam), 0)
		shift := float64(sk * lam)
		for i := 0; i < K; i++ {
			if done[i] {
				continue
			}
			g := S[i][k] / S[k][k]
			m[i] += float64(g * shift)
		}
		for i := 0; i < K; i++ {
			if done[i] {
				continue
			}
			for j := 0; j <= i; j++ {
				if done[j] {
					continue
				}
				d := float64(S[i][k]*S[j][k]) / S[k][k] * (1 - v)
				S[i][j] -= d
				if j != i {
					S[j][i] = S[i][j]
				}
			}
			S[i][i] = max(S[i][i], 1e-300)
		}
	}
	return lp + plog(pr)
}

func refNnls(k int, H *mat6, b *vec6, n *vec6) {
	full := uint8(1<<k - 1)
	if refFace(k, full, H, b, n) && feasible(k, n) {
		return // interior: no KKT check needed
	}
	var pos uint8
	for j := 0; j < k; j++ {
		if n[j] > 0 {
			pos |= 1 << j
		}
	}
	if pos != full && pos != 0 && refFace(k, pos, H, b, n) && feasible(k, n) && kkt(k, pos, H, b, n) {
		return
	}
	var best vec6
	bestF := 0.0 // the empty face: n = 0, objective 0
	for _, mask := range faceOrder[k][1:] {
		if mask == pos {
			continue
		}
		if !refFace(k, mask, H, b, n) || !feasible(k, n) {
			continue
		}
		if kkt(k, mask, H, b, n) {
			return
		}
		if f := objective(k, H, b, n); f < bestF {
			best, bestF = *n, f
		}
	}
	*n = best // rounding left no face meeting the conditions: the best feasible one
}

func refFace(k int, mask uint8, H *mat6, b *vec6, n *vec6) bool {
	var idx [MaxEndMembers]int
	m := 0
	for j := 0; j < k; j++ {
		if mask&(1<<j) != 0 {
			idx[m] = j
			m++
		}
	}
	*n = vec6{}
	if m == 0 {
		return true
	}
	var L [MaxEndMembers][MaxEndMembers]float64
	var y [MaxEndMembers]float64
	hmax := 0.0
	for i := 0; i < m; i++ {
		if h := H[idx[i]][idx[i]]; h > hmax {
			hmax = h
		}
	}
	if !(hmax > 0) || hmax > 1e300 {
		return false
	}
	tol := 1e-13 * hmax
	for j := 0; j < m; j++ {
		d := H[idx[j]][idx[j]]
		for p := 0; p < j; p++ {
			d -= L[j][p] * L[j][p]
		}
		if d <= tol {
			return false
		}
		d = sqrt(d)
		L[j][j] = d
		for i := j + 1; i < m; i++ {
			s := H[idx[i]][idx[j]]
			for p := 0; p < j; p++ {
				s -= L[i][p] * L[j][p]
			}
			L[i][j] = s / d
		}
	}
	for i := 0; i < m; i++ {
		s := b[idx[i]]
		for p := 0; p < i; p++ {
			s -= L[i][p] * y[p]
		}
		y[i] = s / L[i][i]
	}
	for i := m - 1; i >= 0; i-- {
		s := y[i]
		for p := i + 1; p < m; p++ {
			s -= L[p][i] * y[p]
		}
		y[i] = s / L[i][i]
		n[idx[i]] = y[i]
	}
	return true
}

func refDesign(st *setup, th *[NTracers][MaxEndMembers]float64, A *[maxRows][MaxEndMembers]float64) {
	for jj, j := range st.act {
		A[0][jj] = 1
		for row := 1; row < st.r; row++ {
			if t := st.tr[row]; t == Sr87Sr86 {
				A[row][jj] = float64(th[SrNa][j] * th[Sr87Sr86][j])
			} else {
				A[row][jj] = th[t][j]
			}
		}
	}
}

func refDist2(c *tComp, y []float64) float64 {
	np := len(c.mu)
	q := 0.0
	var w [64]float64
	for i := range np {
		s := y[i] - c.mu[i]
		for p := 0; p < i; p++ {
			s -= float64(c.m[i*np+p] * w[p])
		}
		w[i] = s / c.m[i*np+i]
		q += w[i] * w[i]
	}
	return q
}
