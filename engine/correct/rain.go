package correct

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Rain is measured rain chemistry for the measured-rain correction
// (docs/methods.md §4.3).
type Rain struct {
	// Composition holds volume-weighted mean rain concentrations, µmol/L.
	// Cl must be present and positive.
	Composition chem.Composition
	// P is mean annual precipitation, mm/yr (required, > 0).
	P float64
	// ET is mean annual evapotranspiration, mm/yr. When ET is 0 and R is
	// positive, F = P/R is used instead.
	ET float64
	// R is mean annual runoff, mm/yr, used only when ET is 0.
	R float64
	// DryFactor is f_dry >= 1, the dry and occult deposition factor applied
	// to Cl*; 0 means 1 (common practice, no source).
	DryFactor float64
}

// Factor returns the evapotranspiration concentration factor
// F = P/(P−ET), or P/R when ET is 0 and R is positive (docs/methods.md §4.3).
func (r *Rain) Factor() (float64, error) {
	switch {
	case !(r.P > 0) || math.IsInf(r.P, 0):
		return 0, fmt.Errorf("%w: precipitation P = %g mm/yr, want > 0", ErrOption, r.P)
	case r.ET < 0 || math.IsNaN(r.ET):
		return 0, fmt.Errorf("%w: evapotranspiration ET = %g mm/yr, want >= 0", ErrOption, r.ET)
	case r.ET == 0 && r.R > 0:
		return r.P / r.R, nil
	case r.ET >= r.P:
		return 0, fmt.Errorf("%w: evapotranspiration ET = %g mm/yr is not below precipitation P = %g mm/yr", ErrOption, r.ET, r.P)
	}
	return r.P / (r.P - r.ET), nil
}

// dry returns f_dry, defaulting 0 to 1.
func (r *Rain) dry() (float64, error) {
	switch {
	case r.DryFactor == 0:
		return 1, nil
	case r.DryFactor < 1 || math.IsNaN(r.DryFactor) || math.IsInf(r.DryFactor, 0):
		return 0, fmt.Errorf("%w: dry deposition factor %g, want >= 1", ErrOption, r.DryFactor)
	}
	return r.DryFactor, nil
}

// ClCritical returns Cl* = Cl_rain × F × f_dry, the largest river Cl that
// can be atmospheric (docs/methods.md §4.3).
func (r *Rain) ClCritical() (float64, error) {
	f, err := r.Factor()
	if err != nil {
		return 0, err
	}
	d, err := r.dry()
	if err != nil {
		return 0, err
	}
	cl := r.Composition[chem.Cl]
	if !(cl > 0) || math.IsInf(cl, 0) {
		return 0, fmt.Errorf("%w: rain Cl = %g µmol/L, want > 0", ErrOption, cl)
	}
	return cl * f * d, nil
}

// Ratios returns (X/Cl)_rain for the species in Corrected. A species the
// rain analysis lacks (NaN) takes the sea-salt ratio instead, and a warning
// naming it is returned.
func (r *Rain) Ratios() (Ratios, []error, error) {
	cl := r.Composition[chem.Cl]
	if !(cl > 0) || math.IsInf(cl, 0) {
		return Ratios{}, nil, fmt.Errorf("%w: rain Cl = %g µmol/L, want > 0", ErrOption, cl)
	}
	sea := SeaSalt()
	var out Ratios
	var warn []error
	for _, s := range corrected {
		x := r.Composition[s]
		switch {
		case math.IsNaN(x):
			out[s] = sea[s]
			warn = append(warn, fmt.Errorf("%w: rain %s not measured; sea-salt %s/Cl = %.6g used", ErrRainFallback, s, s, sea[s]))
		case x < 0 || math.IsInf(x, 0):
			return Ratios{}, nil, fmt.Errorf("%w: rain %s = %g µmol/L, want >= 0", ErrOption, s, x)
		default:
			out[s] = x / cl
		}
	}
	out[chem.Cl] = 1
	return out, warn, nil
}
