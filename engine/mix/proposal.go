package mix

import "math"

// Refinement (docs/methods.md §7.5: propose again from a distribution
// fitted to the weighted draws, with weights prior × likelihood /
// proposal). Every random end-member ratio is a function of a standard
// normal latent eta (sampler.latent), so its prior is N(0, I) in eta. A
// refinement stage proposes eta from the defensive mixture
//
//	q_s = λ N(0, I) + (1 − λ) sum_c π_c N(μ_c, Σ_c)
//
// with one Gaussian component for each set of present end-members (face)
// that carries a fair share of the weight so far, fitted to that face's
// draws (the posterior of the ratios differs with the face: with the
// carbonate absent, its ratios are free), π_c that share, Σ_c inflated and
// shrunk towards the pooled covariance, and towards I, when few draws carry
// the weight. Every draw of every stage is weighted by the balance
// heuristic (Veach & Guibas 1995; Owen & Zhou 2000, from memory):
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

// minShare is the smallest share of the weight for which a face gets a
// component of its own (an engineering choice).
const minShare = 0.05

// component is one Gaussian N(μ, Σ) of a proposal, Σ = L Lᵀ.
type component struct {
	pi      float64
	mu      []float64
	l       []float64 // lower triangle of L, row-major d×d
	halfDet float64   // ½ log det Σ = sum log L_ii

	// μ and L again, zero-padded to smallDim, when d <= smallDim: the
	// unrolled kernels (proposal_small.go) read these.
	mu8 [smallDim]float64
	l8  [smallDim][smallDim]float64
}

// proposal is the Gaussian mixture of a refinement stage.
type proposal struct {
	d    int
	comp []component
	cum  []float64 // cumulative π, for choosing a component
	lpi  []float64 // log π
	lc   []float64 // ell's working space, one per component
	lx   []float64 // ell's, for d <= smallDim
}

// draws is what fitProposal reads of the draws so far.
type draws struct {
	rec    []float64 // records, eta first
	stride int
	face   int // offset of the face mask in a record
	n      int
}

func (ds *draws) eta(k, d int) []float64 { return ds.rec[k*ds.stride : k*ds.stride+d] }
func (ds *draws) faceOf(k int) int       { return int(ds.rec[k*ds.stride+ds.face]) }

// fitProposal fits the mixture to the latents of the draws with weights w
// (any scale) and effective sample size ess.
func fitProposal(d int, ds *draws, w []float64, ess float64) proposal {
	all := make([]bool, ds.n)
	for k := range all {
		all[k] = w[k] > 0
	}
	pooled, tw, ok := moments(d, ds, w, all)
	if !ok {
		return priorProposal(d)
	}
	shrink(d, pooled, ess, nil)
	// Faces with a fair share of the weight (a face is a mask of the
	// end-members taking part).
	var share [1 << MaxEndMembers]float64
	var seen [1 << MaxEndMembers]bool
	var faces []int
	for k := range ds.n {
		if w[k] > 0 {
			f := ds.faceOf(k)
			if !seen[f] {
				seen[f] = true
				faces = append(faces, f)
			}
			share[f] += w[k] / tw
		}
	}
	p := proposal{d: d}
	for _, f := range faces {
		if share[f] < minShare || len(faces) == 1 {
			continue
		}
		in := make([]bool, ds.n)
		var sw, sw2 float64
		for k := range ds.n {
			if w[k] > 0 && ds.faceOf(k) == f {
				in[k] = true
				sw += w[k]
				sw2 += w[k] * w[k]
			}
		}
		c, _, ok := moments(d, ds, w, in)
		if !ok {
			continue
		}
		shrink(d, c, sw*sw/sw2, &pooled)
		p.add(share[f], c)
	}
	if len(p.comp) == 0 {
		p.add(1, pooled)
	}
	p.normalise()
	return p
}

// normalise scales the components' weights π to a sum of 1 and sets their
// running sums and logs.
func (p *proposal) normalise() {
	tot := 0.0
	for _, c := range p.comp {
		tot += c.pi
	}
	acc := 0.0
	for i := range p.comp {
		p.comp[i].pi /= tot
		acc += p.comp[i].pi
		p.cum = append(p.cum, acc)
		p.lpi = append(p.lpi, plog(p.comp[i].pi))
	}
}

// gaussian is a mean and a covariance (lower triangle, row-major).
type gaussian struct {
	mu, cov []float64
}

// moments returns the weighted mean and covariance of the draws in, their
// total weight, and false when they carry none.
func moments(d int, ds *draws, w []float64, in []bool) (gaussian, float64, bool) {
	g := gaussian{mu: make([]float64, d), cov: make([]float64, d*d)}
	if d <= smallDim && ds.stride >= smallDim {
		tw, ok := momentsSmall(d, ds, w, in, g)
		return g, tw, ok
	}
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

// shrink blends d + 2 pseudo-draws of the target covariance (the pooled
// one, or the prior's I when nil) into g, whose effective sample is ess,
// and inflates it.
func shrink(d int, g gaussian, ess float64, to *gaussian) {
	a := float64(d+2) / (ess + float64(d+2))
	for i := range d {
		for j := 0; j <= i; j++ {
			t := 0.0
			switch {
			case to != nil:
				t = to.cov[i*d+j]
			case i == j:
				t = 1
			}
			g.cov[i*d+j] = inflate * inflate * ((1-a)*g.cov[i*d+j] + a*t)
		}
	}
}

// add appends a component of weight pi and moments g.
func (p *proposal) add(pi float64, g gaussian) {
	d := p.d
	c := component{pi: pi, mu: g.mu, l: make([]float64, d*d)}
	for jit := 0.0; jit < 1e3; jit = max(1e-9, 10*jit) {
		if c.cholesky(d, g.cov, jit) {
			c.pad(d)
			p.comp = append(p.comp, c)
			return
		}
	}
}

// priorProposal returns N(0, I), the prior itself, for when nothing
// usable can be fitted (no draw with a finite weight).
func priorProposal(d int) proposal {
	c := component{pi: 1, mu: make([]float64, d), l: make([]float64, d*d)}
	for i := range d {
		c.l[i*d+i] = 1
	}
	c.pad(d)
	return proposal{d: d, comp: []component{c}, cum: []float64{1}, lpi: []float64{0}}
}

// cholesky factors cov + jit I into c.l, reporting false if it is not
// positive definite.
func (c *component) cholesky(d int, cov []float64, jit float64) bool {
	c.halfDet = 0
	for j := range d {
		s := cov[j*d+j] + jit
		for k := range j {
			s -= c.l[j*d+k] * c.l[j*d+k]
		}
		if !(s > 1e-12) {
			return false
		}
		s = sqrt(s)
		c.l[j*d+j] = s
		c.halfDet += plog(s)
		for i := j + 1; i < d; i++ {
			v := cov[i*d+j]
			for k := range j {
				v -= c.l[i*d+k] * c.l[j*d+k]
			}
			c.l[i*d+j] = v / s
		}
	}
	return true
}

// draw sets eta = μ_c + L_c z for standard normal z, the component c chosen
// by the uniform u.
func (p *proposal) draw(u float64, z, eta []float64) {
	ci := len(p.comp) - 1
	for i, c := range p.cum {
		if u < c {
			ci = i
			break
		}
	}
	c := &p.comp[ci]
	d := p.d
	if d <= smallDim {
		if d > 0 && cap(z) >= smallDim && cap(eta) >= smallDim {
			c.affine(d, (*[smallDim]float64)(z[:smallDim]), (*[smallDim]float64)(eta[:smallDim]))
			return
		}
		var zs, ys [smallDim]float64
		copy(zs[:], z[:d])
		c.affine(d, &zs, &ys)
		copy(eta[:d], ys[:d])
		return
	}
	for i := range d {
		v := c.mu[i]
		for k := 0; k <= i; k++ {
			v += float64(c.l[i*d+k] * z[k])
		}
		eta[i] = v
	}
}

// ellLoop is ell for any d, by loops.
func (p *proposal) ellLoop(eta, u []float64) float64 {
	d := p.d
	eta, u = eta[:d], u[:d]
	e := 0.0
	for i := range d {
		e += eta[i] * eta[i]
	}
	top, sum := math.Inf(-1), 0.0
	if len(p.lc) < len(p.comp) {
		p.lc = make([]float64, len(p.comp))
	}
	lc := p.lc
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
