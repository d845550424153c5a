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
			lam = 0.3989422804014327 * pexp(-0.5*float64(zk*zk)) / p
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
