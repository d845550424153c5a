package correct

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Uncertainty is the relative 1σ uncertainty of the atmospheric
// correction's inputs (docs/methods.md §8.6: "rain ratios ± user value; ET
// factor ± user value"). Zero means exact inputs.
type Uncertainty struct {
	// Ratios is the relative 1σ of each X/Cl ratio of the atmospheric
	// input (sea-salt or measured rain), drawn independently per species.
	Ratios float64
	// Factor is the relative 1σ of the evapotranspiration factor F =
	// P/(P−ET) of the measured-rain method. F enters only through
	// Cl* = Cl_rain × F × f_dry, so it matters only where Cl* comes from
	// measured rain.
	Factor float64
}

// Zero reports whether u leaves the correction exact.
func (u Uncertainty) Zero() bool { return u.Ratios == 0 && u.Factor == 0 }

// Check reports a negative, infinite or NaN uncertainty.
func (u Uncertainty) Check() error {
	for _, x := range []float64{u.Ratios, u.Factor} {
		if !(x >= 0) || math.IsInf(x, 0) {
			return fmt.Errorf("%w: relative uncertainty %g, want finite and >= 0", ErrOption, x)
		}
	}
	return nil
}

// Scale holds the multipliers of one Monte Carlo draw of the atmospheric
// correction's inputs; 1 everywhere leaves a Result as it is.
type Scale struct {
	Ratios     Ratios  // multiplier of each X/Cl ratio, indexed by species
	ClCritical float64 // multiplier of Cl*
}

// Unit returns the multipliers that change nothing.
func Unit() Scale {
	s := Scale{ClCritical: 1}
	for i := range s.Ratios {
		s.Ratios[i] = 1
	}
	return s
}

// Vary returns the correction r redone with its X/Cl ratios and Cl*
// multiplied by k: the atmospheric input, the excess chloride and where it
// went, the sulfate split (the sulfide share FSulf stays), the residuals and
// the negative policy of the Apply call that made r. Under the Reject
// policy a negative residual marks the result Rejected. Vary adds no
// warnings and allocates nothing, so that it can run for every draw of a
// Monte Carlo; with k = Unit() it returns r's numbers bit for bit.
//
// VaryInto fills a Result without the copies; VaryResidual, VaryRemoved
// and VarySO4Sulf give single parts of it.
func (r *Result) Vary(k *Scale) Result {
	var v Result
	r.VaryInto(&v, k)
	return v
}

// VaryInto sets *dst to r.Vary(k), writing each field once. dst may be r,
// which then becomes its own draw.
func (r *Result) VaryInto(dst *Result, k *Scale) {
	if dst != r {
		dst.Input, dst.Ratios = r.Input, r.Ratios
		dst.F, dst.SO4Star, dst.SO4Sulf, dst.FSulf = r.F, r.SO4Star, r.SO4Sulf, r.FSulf
		dst.excess, dst.policy = r.excess, r.policy
	}
	dst.Warnings, dst.Negatives, dst.Rejected = nil, nil, false
	dst.Atm, dst.Evap, dst.Human = chem.Composition{}, chem.Composition{}, chem.Composition{}
	for _, s := range corrected {
		dst.Ratios[s] = r.Ratios[s] * k.Ratios[s]
	}
	dst.ClCritical = r.ClCritical * k.ClCritical
	dst.remove()
	dst.splitSulfate()
	dst.residuals()
	for s, x := range dst.Residual {
		if !(x < 0) {
			continue
		}
		switch {
		case -x <= roundoff*dst.Input[s] || dst.policy == Zero:
			dst.Residual[s] = 0
		case dst.policy == Reject:
			dst.Rejected = true
		}
	}
}
