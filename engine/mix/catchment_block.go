package mix

import "math/rand/v2"

// Block steps of the catchment-wide chains: the parameters of one
// end-member (its shared latents and its scatter parameter) are proposed from
// the conditional, given the others, of the proposal's heaviest component
// (as a Gaussian of the same centre and scale; Metropolis within Gibbs).
// In a few dimensions such a proposal fits the target far better than one
// for every parameter at once, whose mismatches multiply.

// block is one end-member's parameters and the conditional of the
// heaviest component for them.
type block struct {
	idx, rest []int
	mu        []float64 // the component's centre, every parameter
	l         []float64 // lower Cholesky factor of the precision's block P_BB
	gain      []float64 // P_BB⁻¹ P_BR, [block][rest]
}

// makeBlocks sets the chains' blocks from the proposal's heaviest
// component: one per end-member with a scatter.
func (c *CatchmentRun) makeBlocks() {
	np := c.np
	comp := &c.prop.comps[c.heavy]
	prec := invertChol(np, comp.m)
	c.blocks = c.blocks[:0]
	for e, j := range c.ems {
		var b block
		in := make([]bool, np)
		for i, d := range c.base.dims {
			if d.em == j {
				b.idx = append(b.idx, i)
				in[i] = true
			}
		}
		b.idx = append(b.idx, c.nd+e)
		in[c.nd+e] = true
		for i := range np {
			if !in[i] {
				b.rest = append(b.rest, i)
			}
		}
		nb, nr := len(b.idx), len(b.rest)
		pbb := make([]float64, nb*nb)
		for a, i := range b.idx {
			for q, k := range b.idx {
				pbb[a*nb+q] = prec[i*np+k]
			}
		}
		l, ok := cholesky(nb, pbb)
		if !ok {
			continue
		}
		b.l, b.mu = l, comp.mu
		inv := invertChol(nb, l)
		b.gain = make([]float64, nb*nr)
		for a := range nb {
			for r, k := range b.rest {
				v := 0.0
				for q, i := range b.idx {
					v += float64(inv[a*nb+q] * prec[i*np+k])
				}
				b.gain[a*nr+r] = v
			}
		}
		c.blocks = append(c.blocks, b)
	}
}

// mean sets m to the conditional centre of the block given x's other
// parameters: μ_B − P_BB⁻¹ P_BR (x_R − μ_R).
func (b *block) mean(x, m []float64) {
	nr := len(b.rest)
	for a, i := range b.idx {
		v := b.mu[i]
		for r, k := range b.rest {
			v -= float64(b.gain[a*nr+r] * (x[k] - b.mu[k]))
		}
		m[a] = v
	}
}

// logQ returns the log density (up to a constant that does not depend on
// the block's values) of the block's values in x under the conditional t
// of centre m.
func (b *block) logQ(x, m []float64) float64 {
	nb := len(b.idx)
	// Lᵀ (x_B − m): L is lower, so row a of Lᵀ is column a of L.
	q := 0.0
	for a := range nb {
		v := 0.0
		for p := a; p < nb; p++ {
			v += float64(b.l[p*nb+a] * (x[b.idx[p]] - m[p]))
		}
		q += v * v
	}
	return -0.5 * float64(tDegrees+nb) * plog(1+q/float64(tDegrees))
}

// propose sets the block's values in y (a copy of x) to a draw of the
// conditional t of centre m: m + s L⁻ᵀ z.
func (b *block) propose(rng *rand.Rand, y, m, z []float64) {
	nb := len(b.idx)
	g := 0.0
	for range tDegrees {
		v := normQuantile(uniform(rng))
		g += v * v
	}
	s := sqrt(float64(tDegrees) / g)
	for a := range nb {
		z[a] = normQuantile(uniform(rng))
	}
	// Solve Lᵀ w = z by back substitution.
	var w [64]float64
	for a := nb - 1; a >= 0; a-- {
		v := z[a]
		for p := a + 1; p < nb; p++ {
			v -= float64(b.l[p*nb+a] * w[p])
		}
		w[a] = v / b.l[a*nb+a]
	}
	for a, i := range b.idx {
		y[i] = m[a] + float64(s*w[a])
	}
}
