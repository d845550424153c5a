package mix

import "math"

// Refinement (science.md §7.3, revised: "propose again from a distribution
// fitted to the weighted draws ... weights = prior x likelihood /
// proposal"). Every random end-member ratio is a function of a standard
// normal latent eta (sampler.latent), so its prior is N(0, I) in eta. A
// refinement stage proposes eta from the defensive mixture
//
//	q_s = λ N(0, I) + (1 − λ) N(μ_s, Σ_s)
//
// with μ_s and Σ_s the weighted mean and covariance of all earlier draws
// (Σ inflated, and shrunk towards I when few draws carry the weight), and
// every draw of every stage is weighted by the balance heuristic (Veach &
// Guibas 1995; Owen & Zhou 2000, from memory):
//
//	w = φ(eta) L / sum_s (N_s/N) q_s(eta),
//
// with φ the N(0, I) density, L the likelihood and N_s the draws of stage
// s (stage 0 proposes from the prior itself). The prior component keeps
// the weights bounded by L/λ where the fit misses part of the posterior.

// defensive is λ, the share of prior draws in a refinement stage (an
// engineering choice, no source).
const defensive = 0.1

// inflate multiplies the fitted standard deviations, so that the proposal
// is a little wider than the weighted draws (an engineering choice).
const inflate = 1.15

// proposal is the Gaussian part N(μ, Σ) of a refinement stage, Σ = L Lᵀ.
type proposal struct {
	d       int
	mu      []float64
	l       []float64 // lower triangle of L, row-major d×d
	halfDet float64   // ½ log det Σ = sum log L_ii
}

// fitProposal fits the proposal to the latents eta[k*stride : k*stride+d]
// of n draws with weights w (any scale) and effective sample size ess.
func fitProposal(d int, eta []float64, stride int, w []float64, ess float64) proposal {
	p := proposal{d: d, mu: make([]float64, d), l: make([]float64, d*d)}
	tw := 0.0
	for k, wk := range w {
		if wk == 0 {
			continue
		}
		tw += wk
		e := eta[k*stride : k*stride+d]
		for i := range d {
			p.mu[i] += wk * e[i]
		}
	}
	for i := range d {
		p.mu[i] /= tw
	}
	cov := make([]float64, d*d)
	for k, wk := range w {
		if wk == 0 {
			continue
		}
		e := eta[k*stride : k*stride+d]
		for i := range d {
			di := e[i] - p.mu[i]
			for j := 0; j <= i; j++ {
				cov[i*d+j] += wk * di * (e[j] - p.mu[j])
			}
		}
	}
	// Shrink towards the prior's unit covariance in proportion to how few
	// draws carry the weight: with an effective sample of ess the
	// covariance has about ess − 1 degrees of freedom, so blend in d + 2
	// pseudo-draws of I.
	a := float64(d+2) / (ess + float64(d+2))
	for i := range d {
		for j := 0; j <= i; j++ {
			v := (1 - a) * cov[i*d+j] / tw
			if i == j {
				v += a
			}
			cov[i*d+j] = inflate * inflate * v
		}
	}
	for jit := 0.0; ; jit = math.Max(1e-9, 10*jit) {
		if p.cholesky(cov, jit) {
			return p
		}
	}
}

// cholesky factors cov + jit I into p.l, reporting false if it is not
// positive definite.
func (p *proposal) cholesky(cov []float64, jit float64) bool {
	d := p.d
	p.halfDet = 0
	for j := range d {
		s := cov[j*d+j] + jit
		for k := range j {
			s -= p.l[j*d+k] * p.l[j*d+k]
		}
		if !(s > 1e-12) {
			return false
		}
		s = sqrt(s)
		p.l[j*d+j] = s
		p.halfDet += plog(s)
		for i := j + 1; i < d; i++ {
			v := cov[i*d+j]
			for k := range j {
				v -= p.l[i*d+k] * p.l[j*d+k]
			}
			p.l[i*d+j] = v / s
		}
	}
	return true
}

// draw sets eta = μ + L z for standard normal z.
func (p *proposal) draw(z, eta []float64) {
	d := p.d
	for i := range d {
		v := p.mu[i]
		for k := 0; k <= i; k++ {
			v += float64(p.l[i*d+k] * z[k])
		}
		eta[i] = v
	}
}

// ell returns log of N(eta; μ, Σ) over the prior density N(eta; 0, I).
// u is working space of length d.
func (p *proposal) ell(eta, u []float64) float64 {
	d := p.d
	q, e := 0.0, 0.0
	for i := range d {
		v := eta[i] - p.mu[i]
		for k := range i {
			v -= p.l[i*d+k] * u[k]
		}
		u[i] = v / p.l[i*d+i]
		q += u[i] * u[i]
		e += eta[i] * eta[i]
	}
	return 0.5*(e-q) - p.halfDet
}
