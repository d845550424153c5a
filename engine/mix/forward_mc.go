package mix

import (
	"math"
	"math/rand/v2"
	"slices"

	"lixiv/engine/correct"
	"lixiv/engine/internal/order"
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
				res.Lo[s][i] = fwdQuantile(col, 0.025)
				res.Hi[s][i] = fwdQuantile(col, 0.975)
				continue
			}
			res.Lo[s][i] = fwdQuantileUnsorted(col, 0.025)
			res.Hi[s][i] = fwdQuantileUnsorted(col, 0.975)
		}
	}
}

// fwdStdDev returns the sample standard deviation (n − 1), 0 for n < 2.
func fwdStdDev(x []float64) float64 {
	if len(x) < 2 {
		return 0
	}
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	ss := 0.0
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}

// fwdQuantileUnsorted returns fwdQuantile of x sorted, bit for bit,
// without sorting: it selects the two order statistics it interpolates
// between, reordering x, which must hold no NaN. Values that compare equal
// have the same bits but for ±0, and the interpolation gives +0 from any
// two zeros and the same result from one zero of either sign, so the
// order in which equal values land does not show.
func fwdQuantileUnsorted(x []float64, p float64) float64 {
	h := p * float64(len(x)-1)
	lo := int(math.Floor(h))
	if len(x) == 0 || lo >= len(x)-1 {
		slices.Sort(x)
		return fwdQuantile(x, p)
	}
	a := order.Select(x, lo)
	b := order.Min(x[lo+1:]) // the right of lo holds the larger ones
	return a + (h-float64(lo))*(b-a)
}

// fwdQuantile returns the p quantile of sorted x by linear interpolation
// between order statistics (type 7, common practice).
func fwdQuantile(x []float64, p float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	h := p * float64(len(x)-1)
	lo := int(math.Floor(h))
	if lo >= len(x)-1 {
		return x[len(x)-1]
	}
	return x[lo] + (h-float64(lo))*(x[lo+1]-x[lo])
}
