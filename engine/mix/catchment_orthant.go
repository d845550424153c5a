package mix

// logOrthant returns the log of the chance that a draw of the Gaussian
// N(μ, H⁻¹) of a sample's amounts is non-negative in every component, H =
// L Lᵀ of order K: the orthant's chance of the catchment-wide model's
// marginal likelihood (sampleLogL). The amounts of one sample are strongly
// correlated (their sum is held by Na), so the product of the marginal
// chances is far off where the unconstrained optimum lies near or beyond a
// face; this takes their correlation into account by the Mendell–Elston
// approximation (Mendell & Elston 1974, Biometrics 30; Kamakura 1989,
// Biometrics 45; both from memory): the components are conditioned on one
// at a time, each time the chance that the next is non-negative is that of
// its current Gaussian, and the Gaussian of the rest is moved to the
// moments it has given the component's truncation, by regression on it.
// The most constraining component (smallest μ_i/σ_i) is taken first (as
// Genz 1992 orders his variables, from memory). Deterministic, and exact
// for one component; measured against a brute-force integral in
// catchment_lik_test.go.
func logOrthant(K int, L *[MaxEndMembers][MaxEndMembers]float64, mu *vec6) float64 {
	var S mat6
	covariance(K, L, &S)
	m := *mu
	left := uint8(1<<K - 1) // the components not yet conditioned on
	lp, pr := 0.0, 1.0
	for range K {
		// The most constraining component left: the first of the smallest
		// z (every z is computed; those of components done, or past K, are
		// not looked at).
		z0, z1, z2 := m[0]/sqrt(S[0][0]), m[1]/sqrt(S[1][1]), m[2]/sqrt(S[2][2])
		z3, z4, z5 := m[3]/sqrt(S[3][3]), m[4]/sqrt(S[4][4]), m[5]/sqrt(S[5][5])
		k, zk := -1, 0.0
		if left&1 != 0 {
			k, zk = 0, z0
		}
		if left&2 != 0 && (k < 0 || z1 < zk) {
			k, zk = 1, z1
		}
		if left&4 != 0 && (k < 0 || z2 < zk) {
			k, zk = 2, z2
		}
		if left&8 != 0 && (k < 0 || z3 < zk) {
			k, zk = 3, z3
		}
		if left&16 != 0 && (k < 0 || z4 < zk) {
			k, zk = 4, z4
		}
		if left&32 != 0 && (k < 0 || z5 < zk) {
			k, zk = 5, z5
		}
		if zk > farInside {
			break // every component left is non-negative but for a chance below 1e-11
		}
		left &^= 1 << k
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
		// v = 1 − z λ − λ². The rows of the components left are updated
		// whole, with the pivot's row as it was: the entries in the columns
		// of the components done (or past K) are never read again.
		sk := sqrt(S[k][k])
		v := 1 - float64(zk*lam) - float64(lam*lam)
		if v <= 0 { // max(v, 0): +0 for ±0, NaN kept
			v = 0
		}
		shift := float64(sk * lam)
		c := S[k]
		ckk, w := c[k], 1-v
		for i := 0; i < K; i++ {
			if left&(1<<i) == 0 {
				continue
			}
			ci := c[i]
			m[i] += float64(ci / ckk * shift)
			s := &S[i]
			s[0] -= float64(ci*c[0]) / ckk * w
			s[1] -= float64(ci*c[1]) / ckk * w
			s[2] -= float64(ci*c[2]) / ckk * w
			s[3] -= float64(ci*c[3]) / ckk * w
			s[4] -= float64(ci*c[4]) / ckk * w
			s[5] -= float64(ci*c[5]) / ckk * w
			if s[i] < 1e-300 { // max(s[i], 1e-300)
				s[i] = 1e-300
			}
		}
	}
	return lp + plog(pr)
}

// covariance sets S = H⁻¹ = L⁻ᵀ L⁻¹ for H = L Lᵀ of order K: W = L⁻¹ by
// forward substitution, row by row, then S = Wᵀ W (W is lower: W[a][i] = 0
// for a < i, and zero past K, so the sums run to the last row).
func covariance(K int, L, S *mat6) {
	var W mat6
	l := &L[0]
	W[0][0] = 1 / l[0]
	if K > 1 {
		l, w := &L[1], &W
		w[1][0] = (0 - float64(l[0]*w[0][0])) / l[1]
		w[1][1] = 1 / l[1]
	}
	if K > 2 {
		l, w := &L[2], &W
		w[2][0] = (0 - float64(l[0]*w[0][0]) - float64(l[1]*w[1][0])) / l[2]
		w[2][1] = (0 - float64(l[1]*w[1][1])) / l[2]
		w[2][2] = 1 / l[2]
	}
	if K > 3 {
		l, w := &L[3], &W
		w[3][0] = (0 - float64(l[0]*w[0][0]) - float64(l[1]*w[1][0]) - float64(l[2]*w[2][0])) / l[3]
		w[3][1] = (0 - float64(l[1]*w[1][1]) - float64(l[2]*w[2][1])) / l[3]
		w[3][2] = (0 - float64(l[2]*w[2][2])) / l[3]
		w[3][3] = 1 / l[3]
	}
	if K > 4 {
		l, w := &L[4], &W
		w[4][0] = (0 - float64(l[0]*w[0][0]) - float64(l[1]*w[1][0]) - float64(l[2]*w[2][0]) - float64(l[3]*w[3][0])) / l[4]
		w[4][1] = (0 - float64(l[1]*w[1][1]) - float64(l[2]*w[2][1]) - float64(l[3]*w[3][1])) / l[4]
		w[4][2] = (0 - float64(l[2]*w[2][2]) - float64(l[3]*w[3][2])) / l[4]
		w[4][3] = (0 - float64(l[3]*w[3][3])) / l[4]
		w[4][4] = 1 / l[4]
	}
	if K > 5 {
		l, w := &L[5], &W
		w[5][0] = (0 - float64(l[0]*w[0][0]) - float64(l[1]*w[1][0]) - float64(l[2]*w[2][0]) - float64(l[3]*w[3][0]) - float64(l[4]*w[4][0])) / l[5]
		w[5][1] = (0 - float64(l[1]*w[1][1]) - float64(l[2]*w[2][1]) - float64(l[3]*w[3][1]) - float64(l[4]*w[4][1])) / l[5]
		w[5][2] = (0 - float64(l[2]*w[2][2]) - float64(l[3]*w[3][2]) - float64(l[4]*w[4][2])) / l[5]
		w[5][3] = (0 - float64(l[3]*w[3][3]) - float64(l[4]*w[4][3])) / l[5]
		w[5][4] = (0 - float64(l[4]*w[4][4])) / l[5]
		w[5][5] = 1 / l[5]
	}
	w0, w1, w2, w3, w4, w5 := &W[0], &W[1], &W[2], &W[3], &W[4], &W[5]
	if K > 0 {
		S[0][0] = 0.0 + float64(w0[0]*w0[0]) + float64(w1[0]*w1[0]) + float64(w2[0]*w2[0]) + float64(w3[0]*w3[0]) + float64(w4[0]*w4[0]) + float64(w5[0]*w5[0])
	}
	if K > 1 {
		S[1][0] = 0.0 + float64(w1[1]*w1[0]) + float64(w2[1]*w2[0]) + float64(w3[1]*w3[0]) + float64(w4[1]*w4[0]) + float64(w5[1]*w5[0])
		S[0][1] = S[1][0]
		S[1][1] = 0.0 + float64(w1[1]*w1[1]) + float64(w2[1]*w2[1]) + float64(w3[1]*w3[1]) + float64(w4[1]*w4[1]) + float64(w5[1]*w5[1])
	}
	if K > 2 {
		S[2][0] = 0.0 + float64(w2[2]*w2[0]) + float64(w3[2]*w3[0]) + float64(w4[2]*w4[0]) + float64(w5[2]*w5[0])
		S[0][2] = S[2][0]
		S[2][1] = 0.0 + float64(w2[2]*w2[1]) + float64(w3[2]*w3[1]) + float64(w4[2]*w4[1]) + float64(w5[2]*w5[1])
		S[1][2] = S[2][1]
		S[2][2] = 0.0 + float64(w2[2]*w2[2]) + float64(w3[2]*w3[2]) + float64(w4[2]*w4[2]) + float64(w5[2]*w5[2])
	}
	if K > 3 {
		S[3][0] = 0.0 + float64(w3[3]*w3[0]) + float64(w4[3]*w4[0]) + float64(w5[3]*w5[0])
		S[0][3] = S[3][0]
		S[3][1] = 0.0 + float64(w3[3]*w3[1]) + float64(w4[3]*w4[1]) + float64(w5[3]*w5[1])
		S[1][3] = S[3][1]
		S[3][2] = 0.0 + float64(w3[3]*w3[2]) + float64(w4[3]*w4[2]) + float64(w5[3]*w5[2])
		S[2][3] = S[3][2]
		S[3][3] = 0.0 + float64(w3[3]*w3[3]) + float64(w4[3]*w4[3]) + float64(w5[3]*w5[3])
	}
	if K > 4 {
		S[4][0] = 0.0 + float64(w4[4]*w4[0]) + float64(w5[4]*w5[0])
		S[0][4] = S[4][0]
		S[4][1] = 0.0 + float64(w4[4]*w4[1]) + float64(w5[4]*w5[1])
		S[1][4] = S[4][1]
		S[4][2] = 0.0 + float64(w4[4]*w4[2]) + float64(w5[4]*w5[2])
		S[2][4] = S[4][2]
		S[4][3] = 0.0 + float64(w4[4]*w4[3]) + float64(w5[4]*w5[3])
		S[3][4] = S[4][3]
		S[4][4] = 0.0 + float64(w4[4]*w4[4]) + float64(w5[4]*w5[4])
	}
	if K > 5 {
		S[5][0] = 0.0 + float64(w5[5]*w5[0])
		S[0][5] = S[5][0]
		S[5][1] = 0.0 + float64(w5[5]*w5[1])
		S[1][5] = S[5][1]
		S[5][2] = 0.0 + float64(w5[5]*w5[2])
		S[2][5] = S[5][2]
		S[5][3] = 0.0 + float64(w5[5]*w5[3])
		S[3][5] = S[5][3]
		S[5][4] = 0.0 + float64(w5[5]*w5[4])
		S[4][5] = S[5][4]
		S[5][5] = 0.0 + float64(w5[5]*w5[5])
	}
}

// farInside is the μ_i/σ_i beyond which a component counts as surely
// non-negative (Φ(7) = 1 − 1.3e-12).
const farInside = 7

// logPhiMills returns log Φ(z) and the ratio λ = φ(z)/Φ(z) of the
// standard normal density to its distribution function far in the lower
// tail (z <= −8), where Φ underflows, from the asymptotic series of Mills'
// ratio (Abramowitz & Stegun 1964, 26.2.12, from memory).
func logPhiMills(z float64) (logP, lam float64) {
	x := -z
	x2 := float64(x * x)
	// R(x) = (1 − Φ(x))/φ(x) ≈ (1 − 1/x² + 3/x⁴ − 15/x⁶ + 105/x⁸)/x.
	inv := 1 / x2
	s := 1 - float64(inv*(1-float64(inv*(3-float64(inv*(15-float64(105*inv)))))))
	r := s / x
	return -0.5*x2 - 0.9189385332046728 + plog(r), 1 / r
}
