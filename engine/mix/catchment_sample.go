package mix

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// summarise turns the joint draws into sample s's result, through the
// per-sample model's summary (Run.finish): its first draws are the prior
// draws of the first stage (weight 0, for the width the priors alone
// give), then one draw per joint draw, of equal weight. For joint draw d the
// sample's own ratios are the shared ratios of d scattered by the draw's τ
// (the isotope ratio is not scattered), its data are perturbed by their
// errors, and its amounts are the exact non-negative fit of the perturbed
// data (the per-sample model's second sampler, Options.perturb).
func (c *CatchmentRun) summarise(s int) {
	r := c.base
	sr := &r.res.Samples[s]
	st := &sr.setup
	w := &sampleWork{s: s, st: st, d: len(st.dims), k: st.k, eff: 1}
	if st.skip {
		w.finished = true
		r.finish(w)
		return
	}
	n0, nk := r.opt.Draws, c.co.Keep
	w.rng = rand.New(rand.NewPCG(r.opt.Seed^scatterStream, uint64(s)))
	w.zrng = rand.New(rand.NewPCG(r.opt.Seed^errorStream, uint64(s)))
	w.stride = w.d + oFrac + w.k + int(NSources)*NCations + 1 + st.r
	w.rec = make([]float64, 0, (n0+nk)*w.stride)
	w.z = make([]float64, st.q)
	w.eta = make([]float64, w.d)
	w.u = make([]float64, w.d)
	n := r.n
	add := func(latent func(a int) float64, logL float64) {
		for i := range w.z {
			w.z[i] = normQuantile(uniform(w.zrng))
		}
		k := w.n
		w.rec = w.rec[:len(w.rec)+w.stride]
		lat := w.latents(k)
		for a := range lat {
			lat[a] = latent(a)
		}
		r.eval(w, k)
		w.rec[k*w.stride+w.d+oLogL] = logL
		w.n++
	}
	for i := range n0 {
		tab := r.table[i*int(NTracers)*n : (i+1)*int(NTracers)*n]
		for t := range NTracers {
			for _, j := range st.act {
				w.theta[t][j] = tab[int(t)*n+j]
			}
		}
		add(func(a int) float64 { return r.eta[i*len(r.dims)+st.dims[a]] }, math.Inf(-1))
	}
	var th [NTracers][MaxEndMembers]float64
	for d, x := range c.keep {
		for t := range NTracers {
			for _, j := range st.act {
				th[t][j] = r.smp[t][j].v
				if r.need[t] && !r.lik[t] {
					th[t][j] = c.extra[(d*int(NTracers)+int(t))*n+j]
				}
			}
		}
		for i, dm := range r.dims {
			th[dm.t][dm.em] = pexp(r.smp[dm.t][dm.em].fromLatent(x[i]))
		}
		var tau [MaxEndMembers]float64
		for e, j := range c.ems {
			tau[j] = c.scatterOf(x[c.nd+e])
		}
		for t := range NTracers {
			for _, j := range st.act {
				v := th[t][j]
				if r.need[t] && Tracer(t) != Sr87Sr86 && !r.smp[t][j].constant {
					v *= pexp(tau[j] * normQuantile(uniform(w.rng)))
				}
				w.theta[t][j] = v
			}
		}
		add(func(a int) float64 { return x[st.dims[a]] }, 0)
	}
	w.nStage = []int{n0, nk}
	w.finished = true
	w.stop = TargetReached
	if !c.cat.Converged {
		w.stop = Capped
	}
	r.finish(w)
	sr.Draws = nk
	if sr.Status == Rule || sr.Status == Skipped {
		return
	}
	sr.ESS = c.cat.MinESS
	sr.WellSampled = c.cat.Converged
	if !sr.WellSampled {
		sr.Warnings = append(sr.Warnings, fmt.Errorf("%w: sample %q rests on chains that have not converged (smallest ESS %.0f, largest R-hat %.3f)", ErrPoorlySampled, sr.Name, c.cat.MinESS, c.cat.MaxRHat))
	}
	sr.Verdict = r.verdict(sr)
}
