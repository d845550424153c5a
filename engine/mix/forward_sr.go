package mix

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// ForwardSrNa returns the default silicate (Sr/Na)_sil: 1000 Sr/Na = 3 ± 1
// for the global silicate end-member of Gaillardet et al. (1999), Chem.
// Geol. 159, 3-30 (docs/methods.md §6.2; ± from memory, read as the 95 %
// range as everywhere).
func ForwardSrNa() SilicateRatio { return SilicateRatio{Value: 0.003, Lo: 0.002, Hi: 0.004} }

// SrSplit is the strontium of one sample by source, µmol/L, from the
// optional Sr step of the forward model (docs/methods.md §6.1):
//
//	Sr_sil  = min(Na_sil × (Sr/Na)_sil, Sr*)   (capped, with a warning)
//	Sr_carb = Sr* − Sr_sil
//
// Evaporite Sr is neglected (common practice, no source).
type SrSplit struct {
	Amount  [NSources]float64 // Sr from each source
	Sigma   [NSources]float64 // 1σ from (Sr/Na)_sil, first order
	Deficit float64           // amount by which Na_sil × (Sr/Na)_sil exceeded Sr*: silicate Sr was capped at Sr*
}

// ForwardSr apportions the Sr of a corrected sample, given Na_sil from a
// forward result and the silicate (Sr/Na)_sil; the uncertainty is
// propagated to first order. It returns an error when Sr was not measured
// or the ratio is invalid, and a warning when silicate Sr was capped.
func ForwardSr(c *correct.Result, f *ForwardResult, srNa SilicateRatio) (SrSplit, []error, error) {
	var s SrSplit
	if c == nil || f == nil {
		return s, nil, fmt.Errorf("%w: no corrected sample or forward result", ErrForwardInput)
	}
	if math.IsNaN(c.Residual[chem.Sr]) {
		return s, nil, fmt.Errorf("%w: Sr not measured", ErrForwardInput)
	}
	if err := srNa.check(); err != nil {
		return s, nil, fmt.Errorf("%w: silicate Sr/Na: %v", ErrForwardInput, err)
	}
	na := math.Max(f.Split[Silicate][fwdNa], 0) // no negative silicate Sr from a kept negative Na*
	s.Amount[Atmosphere] = c.Atm[chem.Sr]
	s.Amount[Evaporite] = c.Evap[chem.Sr]
	sil, have := na*srNa.Value, math.Max(c.Residual[chem.Sr], 0)
	var warn []error
	if sil > have {
		s.Deficit = sil - have
		sil = have
		warn = append(warn, fmt.Errorf("%w: Sr_sil by %.4g µmol/L", ErrSilicateCapped, s.Deficit))
	} else {
		s.Sigma[Silicate] = na * srNa.Sigma()
		s.Sigma[Carbonate] = na * srNa.Sigma()
	}
	s.Amount[Silicate] = sil
	s.Amount[Carbonate] = have - sil
	return s, warn, nil
}

// SrRatio returns the 87Sr/86Sr of a mixture, each source weighted by its
// Sr: sum_j Sr_j R_j / sum_j Sr_j (docs/methods.md §6.4; exact mixing weights
// by 86Sr, which differs by under 1e-5 for ratios between 0.708 and 0.720).
// Sources with no Sr are ignored, so their ratio may be NaN. It returns NaN
// when there is no Sr at all.
func SrRatio(sr, ratio [NSources]float64) float64 {
	num, den := 0.0, 0.0
	for j := range sr {
		if sr[j] == 0 {
			continue
		}
		num += sr[j] * ratio[j]
		den += sr[j]
	}
	if den == 0 {
		return math.NaN()
	}
	return num / den
}
