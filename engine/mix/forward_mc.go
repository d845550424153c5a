package mix

import (
	"math"
	"math/rand/v2"
	"slices"

	"lixiv/engine/correct"
	"lixiv/engine/internal/quantile"
)

// fwdStream is the second PCG word of the forward Monte Carlo, so that
// the forward draws differ from other users of the same seed.
const fwdStream = 0x666f7277617264 // "forward"

// monteCarlo fills Sigma, Lo, Hi, Clamped and Draws from opt.Draws seeded
// draws of the silicate ratios.
func (res *ForwardResult) monteCarlo(c *correct.Result, rat *SilicateRatios, opt *ForwardOptions) {
	n := opt.Draws
	rng := rand.New(rand.NewPCG(opt.Seed, fwdStream))
	res.Draws = make([]Split, n)
	var clamped [NCations]int
	var d forwardDraw
	sCa, sMg := newSampler(rat.CaNa.prior()), newSampler(rat.MgNa.prior())
	var sK sampler
	if opt.KFromRatio {
		sK = newSampler(rat.KNa.prior())
	}
	for k := range n {
		ca := sCa.draw(uniform(rng))
		mg := sMg.draw(uniform(rng))
		kk := math.NaN()
		if opt.KFromRatio {
			kk = sK.draw(uniform(rng))
		}
		if opt.Vary != nil {
			ck := opt.Vary(k)
			d.run(&ck, ca, mg, kk, opt.KFromRatio)
		} else {
			d.run(c, ca, mg, kk, opt.KFromRatio)
		}
		res.Draws[k] = d.split
		for i := range clamped {
			if d.deficit[i] > 0 {
				clamped[i]++
			}
		}
	}
	for i := range clamped {
		res.Clamped[i] = float64(clamped[i]) / float64(n)
	}
	col := make([]float64, n)
	for s := range res.Sigma {
		for i := range res.Sigma[s] {
			same, nan := true, false
			for k := range res.Draws {
				col[k] = res.Draws[k][s][i]
				same = same && col[k] == col[0]
				nan = nan || col[k] != col[k]
			}
			if same { // a row the ratios do not touch: no spread
				res.Sigma[s][i], res.Lo[s][i], res.Hi[s][i] = 0, col[0], col[0]
				continue
			}
			res.Sigma[s][i] = fwdStdDev(col)
			if nan {
				slices.Sort(col)
				res.Lo[s][i] = quantile.Sorted(col, 0.025)
				res.Hi[s][i] = quantile.Sorted(col, 0.975)
				continue
			}
			res.Lo[s][i] = quantile.Select(col, 0.025)
			res.Hi[s][i] = quantile.Select(col, 0.975)
		}
	}
}

// fwdStdDev returns the sample standard deviation (n − 1), 0 for n < 2.
func fwdStdDev(x []float64) float64 {
	if len(x) < 2 {
		return 0
	}
	return quantile.StdDev(x)
}
