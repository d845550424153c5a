package mix

import "math"

// Convergence of the chains: split R-hat and the multi-chain effective
// sample size (Gelman et al. 2013, Bayesian Data Analysis, 3rd ed., §11.4
// and §11.5; Vehtari et al. 2021, Bayesian Analysis 16, for the split chains
// and Geyer's monotone sequence; both from memory), computed on each
// parameter as the chains hold it (the latent of a shared ratio, a monotone
// map of its log).

// diagnose reports whether every shared latent has R-hat below RHatLimit
// and an ESS of at least the target, over the kept steps so far, and the
// smallest ESS (0 when some R-hat is too large: the effective sample
// sizes, whose autocorrelations cost most, are then not computed).
func (c *CatchmentRun) diagnose() (ok bool, minESS float64) {
	var ratios []int
	for i, d := range c.base.dims {
		if !c.seen[d.em] {
			continue
		}
		if !(c.rhat(i) < RHatLimit) {
			return false, 0
		}
		ratios = append(ratios, i)
	}
	minESS = math.Inf(1)
	for _, v := range c.diags(ratios) {
		minESS = min(minESS, v[1])
	}
	return minESS >= float64(c.co.TargetESS), minESS
}

// diags returns the split R-hat and the effective sample size of each
// parameter of idx over every chain's kept steps (diag), and keeps them for
// the kept steps so far: the summary of the shared ratios takes up those
// of the last convergence check.
func (c *CatchmentRun) diags(idx []int) [][2]float64 {
	steps := c.chains[0].t - c.co.Warmup
	if c.diagAt != steps || c.diagOf == nil {
		c.diagAt, c.diagOf = steps, map[int][2]float64{}
	}
	out := make([][2]float64, len(idx))
	for k, i := range idx {
		v, ok := c.diagOf[i]
		if !ok {
			v[0], v[1] = c.diag(i)
			c.diagOf[i] = v
		}
		out[k] = v
	}
	return out
}

// rhat returns the split R-hat of parameter i over every chain's kept
// steps.
func (c *CatchmentRun) rhat(i int) float64 {
	rh, _ := c.split(i, false)
	return rh
}

// diag returns the split R-hat and the effective sample size of parameter
// i over every chain's kept steps.
func (c *CatchmentRun) diag(i int) (rhat, ess float64) { return c.split(i, true) }

// split returns the split R-hat of parameter i and, when withESS, its
// effective sample size.
func (c *CatchmentRun) split(i int, withESS bool) (rhat, ess float64) {
	steps := c.chains[0].t - c.co.Warmup
	half := steps / 2
	if half < 4 {
		return 2, 0
	}
	var seqs [][]float64
	for _, ch := range c.chains {
		for h := range 2 {
			s := make([]float64, half)
			for k := range half {
				s[k] = ch.hist[(h*half+k)*c.np+i]
			}
			seqs = append(seqs, s)
		}
	}
	return splitDiag(seqs, withESS)
}

// splitDiag returns R-hat and (when withESS) the effective sample size of
// m sequences of equal length n (the halves of the chains).
func splitDiag(seqs [][]float64, withESS bool) (rhat, ess float64) {
	m, n := len(seqs), len(seqs[0])
	fn := float64(n)
	means := make([]float64, m)
	vars := make([]float64, m)
	grand := 0.0
	for j, s := range seqs {
		t := 0.0
		for _, v := range s {
			t += v
		}
		means[j] = t / fn
		grand += means[j]
		q := 0.0
		for _, v := range s {
			q += (v - means[j]) * (v - means[j])
		}
		vars[j] = q / (fn - 1)
	}
	grand /= float64(m)
	W, B := 0.0, 0.0
	for j := range m {
		W += vars[j]
		B += (means[j] - grand) * (means[j] - grand)
	}
	W /= float64(m)
	B = B * fn / float64(m-1)
	vplus := (fn-1)/fn*W + B/fn
	if !(W > 0) {
		return 1, float64(m * n) // a constant parameter: nothing to mix
	}
	rhat = sqrt(vplus / W)
	if !withESS {
		return rhat, 0
	}
	// Autocorrelations, lag by lag, summed in pairs while positive and
	// made monotone (Geyer's initial monotone sequence).
	rho := func(t int) float64 {
		ac := 0.0
		for j, s := range seqs {
			q := 0.0
			mu := means[j]
			for k := 0; k+t < n; k++ {
				q += (s[k] - mu) * (s[k+t] - mu)
			}
			ac += q / fn
		}
		ac /= float64(m)
		return 1 - (W-ac)/vplus
	}
	sum := 0.0
	prev := 1e300
	for t := 0; t+1 < n; t += 2 {
		p := rho(t) + rho(t+1)
		if !(p > 0) {
			break
		}
		p = min(p, prev)
		prev = p
		sum += p
	}
	tau := -1 + 2*sum
	total := float64(m * n)
	tau = max(tau, plog(10)/max(plog(total), 1)) // at most mn log10(mn), as is usual
	return rhat, total / tau
}
