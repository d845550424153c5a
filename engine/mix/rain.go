package mix

import (
	"math/rand/v2"

	"lixiv/engine/correct"
)

// rainStream is the second PCG word of the rain-correction draws, so that
// they differ from the end-member draws of the same seed.
const rainStream = 0x7261696e2d756e63 // "rain-unc"

// RainScales draws the multipliers of the atmospheric correction's inputs
// for draws Monte Carlo draws (docs/methods.md §8.6: rain ratios and the ET
// factor ± a user value). Each X/Cl ratio of correct.Corrected() gets its
// own multiplier exp(u.Ratios z), and Cl* the multiplier exp(u.Factor z)
// when scaleCl is set (Cl* from measured rain), else 1: log-normal with
// median 1 and σ of the logarithm the relative uncertainty, which keeps
// every ratio positive (common practice, no source). Draw d stands for the
// same rain in every sample, like the end-member draws. The numbers come
// from one PCG stream in a fixed order (every species, then Cl*, for each
// draw, whether or not an uncertainty is zero), through the portable
// normal quantile and exp, so a seed gives the same bits natively and in
// WebAssembly.
func RainScales(draws int, seed uint64, u correct.Uncertainty, scaleCl bool) []correct.Scale {
	rng := rand.New(rand.NewPCG(seed, rainStream))
	z := func() float64 {
		return normQuantile((float64(rng.Uint64()>>11) + 0.5) * 0x1p-53)
	}
	sp := correct.Corrected()
	out := make([]correct.Scale, draws)
	for d := range out {
		out[d] = correct.Unit()
		for _, s := range sp {
			out[d].Ratios[s] = pexp(u.Ratios * z())
		}
		f := pexp(u.Factor * z())
		if scaleCl {
			out[d].ClCritical = f
		}
	}
	return out
}
