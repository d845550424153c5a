package correct

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Uncertainty is the relative 1σ uncertainty of the atmospheric
// correction's inputs (methods brief §8.6: "rain ratios ± user value; ET
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
func (r *Result) Vary(k *Scale) Result {
	v := *r
	v.Warnings, v.Negatives, v.Rejected = nil, nil, false
	v.Atm, v.Evap, v.Human = chem.Composition{}, chem.Composition{}, chem.Composition{}
	for _, s := range corrected {
		v.Ratios[s] = r.Ratios[s] * k.Ratios[s]
	}
	v.ClCritical = r.ClCritical * k.ClCritical
	v.remove()
	v.splitSulfate()
	v.residuals()
	for s, x := range v.Residual {
		if !(x < 0) {
			continue
		}
		switch {
		case -x <= roundoff*v.Input[s] || v.policy == Zero:
			v.Residual[s] = 0
		case v.policy == Reject:
			v.Rejected = true
		}
	}
	return v
}
