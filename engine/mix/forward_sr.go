package mix

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// ForwardSrNa returns the default silicate (Sr/Na)_sil: 1000 Sr/Na = 3 ± 1
// for the global silicate end-member of Gaillardet et al. (1999), Chem.
// Geol. 159, 3-30 (docs/methods.md §6.2; ± from memory, used as 1σ).
func ForwardSrNa() SilicateRatio { return SilicateRatio{Value: 0.003, Sigma: 0.001} }

// SrSplit is the strontium of one sample by source, µmol/L, from the
// optional Sr step of the forward model (docs/methods.md §6.1):
//
//	Sr_sil  = Na_sil × (Sr/Na)_sil
//	Sr_carb = Sr − Sr_atm − Sr_sil      (set to 0 with a warning if negative)
//
// Evaporite Sr is neglected (common practice, no source).
type SrSplit struct {
	Amount  [NSources]float64 // Sr from each source
	Sigma   [NSources]float64 // 1σ from (Sr/Na)_sil, first order
	Deficit float64           // amount by which Sr_carb was negative before it was set to 0
}

// ForwardSr apportions the Sr of a corrected sample, given Na_sil from a
// forward result and the silicate (Sr/Na)_sil; the uncertainty is
// propagated to first order. It returns an error when Sr was not measured
// or the ratio is invalid, and warnings for a clamped carbonate share.
func ForwardSr(c *correct.Result, f *ForwardResult, srNa SilicateRatio) (SrSplit, []error, error) {
	var s SrSplit
	if c == nil || f == nil {
		return s, nil, fmt.Errorf("%w: no corrected sample or forward result", ErrForwardInput)
	}
	if math.IsNaN(c.Residual[chem.Sr]) {
		return s, nil, fmt.Errorf("%w: Sr not measured", ErrForwardInput)
	}
	if !(srNa.Value >= 0) || math.IsInf(srNa.Value, 0) || !(srNa.Sigma >= 0) || math.IsInf(srNa.Sigma, 0) {
		return s, nil, fmt.Errorf("%w: silicate Sr/Na = %g ± %g, want finite and >= 0", ErrForwardInput, srNa.Value, srNa.Sigma)
	}
	na := math.Max(f.Split[Silicate][fwdNa], 0) // no negative silicate Sr from a kept negative Na*
	s.Amount[Atmosphere] = c.Atm[chem.Sr]
	s.Amount[Evaporite] = c.Evap[chem.Sr]
	s.Amount[Silicate] = na * srNa.Value
	s.Sigma[Silicate] = na * srNa.Sigma
	s.Sigma[Carbonate] = na * srNa.Sigma
	carb := c.Residual[chem.Sr] - s.Amount[Silicate]
	var warn []error
	if carb < 0 {
		s.Deficit = -carb
		carb = 0
		warn = append(warn, fmt.Errorf("%w: Sr_carb = −%.4g µmol/L", ErrCarbonateDeficit, s.Deficit))
	}
	s.Amount[Carbonate] = carb
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
