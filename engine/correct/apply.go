package correct

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// roundoff is the relative size, against the measured value, below which a
// negative residual is taken as rounding and set to exactly zero without a
// flag (an exact sea-salt sample gives residuals of order 1e-16).
const roundoff = 1e-9

// Apply corrects one sample c (µmol/L) for atmospheric and evaporite input
// following the steps in the package documentation. opt may be nil for the
// defaults.
//
// Apply returns an error wrapping ErrOption for invalid options, ErrMissing
// when Cl (or, for the Gypsum and Isotope scenarios, a present SO4 without
// Ca) is not measured, ErrNegativeInput for a negative measured value, and a
// *NegativeError under the Reject policy; in the last case the Result is
// still filled and marked Rejected.
func Apply(c chem.Composition, opt *Options) (Result, error) {
	if opt == nil {
		opt = &Options{}
	}
	r := Result{Input: c, F: 1}
	if err := opt.check(); err != nil {
		return r, err
	}
	for s, v := range c {
		if v < 0 || math.IsInf(v, 0) {
			return r, fmt.Errorf("%w: %s = %g µmol/L", ErrNegativeInput, chem.Species(s), v)
		}
	}
	cl := c[chem.Cl]
	if math.IsNaN(cl) {
		return r, fmt.Errorf("%w: Cl is needed for the atmospheric correction", ErrMissing)
	}

	// Step 1 and 2: ratios and Cl*.
	if err := r.atmosphere(opt); err != nil {
		return r, err
	}
	r.excess, r.policy = opt.Excess, opt.Negative

	// Step 3: atmospheric input and excess chloride.
	r.remove()
	if r.ClExcess > 0 && opt.Excess == HumanInput {
		r.Warnings = append(r.Warnings, fmt.Errorf("%w: %.4g µmol/L Cl and Na above Cl* = %.4g µmol/L", ErrHumanInput, r.ClExcess, r.ClCritical))
	}

	// Step 4: sulfate.
	if err := r.sulfate(opt); err != nil {
		return r, err
	}

	// Step 5: residuals and the negative policy.
	r.residuals()
	return r, r.negatives(opt.Negative)
}

// remove fills the atmospheric input from Ratios and ClCritical, and gives
// the chloride above Cl* (with its Na) to halite or human input.
func (r *Result) remove() {
	cl := r.Input[chem.Cl]
	r.Atm[chem.Cl] = math.Min(cl, r.ClCritical)
	for _, s := range corrected {
		r.Atm[s] = r.Atm[chem.Cl] * r.Ratios[s]
	}
	r.ClExcess = cl - r.Atm[chem.Cl]
	if r.ClExcess > 0 {
		switch r.excess {
		case Halite:
			r.Evap[chem.Cl] = r.ClExcess
			r.Evap[chem.Na] = r.ClExcess
		case HumanInput:
			r.Human[chem.Cl] = r.ClExcess
			r.Human[chem.Na] = r.ClExcess
		}
	}
}

// residuals sets X* = Input − Atm − Evap − Human for every species.
func (r *Result) residuals() {
	for s := range r.Input {
		r.Residual[s] = r.Input[s] - r.Atm[s] - r.Evap[s] - r.Human[s]
	}
}

// atmosphere fills Ratios, F and ClCritical from the options.
func (r *Result) atmosphere(opt *Options) error {
	r.Ratios = SeaSalt()
	if opt.Rain != nil {
		f, err := opt.Rain.Factor()
		if err != nil {
			return err
		}
		r.F = f
		if opt.Ratios == nil {
			rat, warn, err := opt.Rain.Ratios()
			if err != nil {
				return err
			}
			r.Ratios = rat
			r.Warnings = append(r.Warnings, warn...)
		}
	}
	if opt.Ratios != nil {
		r.Ratios = *opt.Ratios
	}
	switch {
	case opt.ClCritical > 0:
		r.ClCritical = opt.ClCritical
	case opt.Rain != nil:
		cs, err := opt.Rain.ClCritical()
		if err != nil {
			return err
		}
		r.ClCritical = cs
	default:
		r.ClCritical = math.Inf(1)
		r.Warnings = append(r.Warnings, ErrAllClAtmospheric)
	}
	return nil
}

// sulfate splits SO4* between gypsum and sulfide oxidation.
func (r *Result) sulfate(opt *Options) error {
	so4 := r.Input[chem.SO4]
	if math.IsNaN(so4) {
		r.SO4Star = math.NaN()
		r.Warnings = append(r.Warnings, fmt.Errorf("%w: SO4, so no gypsum or sulfide sulfate was assigned", ErrMissing))
		return nil
	}
	r.SO4Star = so4 - r.Atm[chem.SO4]
	star := math.Max(r.SO4Star, 0) // a negative SO4* shows as a negative residual
	switch opt.Sulfate {
	case Gypsum:
		r.FSulf = 0
	case Sulfide:
		r.FSulf = 1
	case Isotope:
		f, err := opt.Delta34S.Fraction()
		if err != nil {
			return err
		}
		if f < 0 || f > 1 {
			lim := math.Min(math.Max(f, 0), 1)
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %.4g set to %g (river δ34S %g ‰, end-members %g and %g ‰)",
				ErrSulfideFraction, f, lim, opt.Delta34S.River, opt.Delta34S.Evaporite, opt.Delta34S.Sulfide))
			f = lim
		}
		r.FSulf = f
	}
	if (1-r.FSulf)*star > 0 && math.IsNaN(r.Input[chem.Ca]) {
		return fmt.Errorf("%w: Ca is needed to remove gypsum sulfate", ErrMissing)
	}
	r.splitSulfate()
	return nil
}

// splitSulfate gives SO4* (from SO4 less its atmospheric share) to gypsum,
// with an equal amount of Ca, and to sulfide oxidation in the shares FSulf
// sets. A missing SO4 leaves both at zero.
func (r *Result) splitSulfate() {
	so4 := r.Input[chem.SO4]
	if math.IsNaN(so4) {
		return
	}
	r.SO4Star = so4 - r.Atm[chem.SO4]
	star := math.Max(r.SO4Star, 0)
	gyp := (1 - r.FSulf) * star
	r.Evap[chem.SO4] = gyp
	r.Evap[chem.Ca] += gyp
	r.SO4Sulf = r.FSulf * star
}

// negatives records residuals below zero and applies the policy.
func (r *Result) negatives(policy Negative) error {
	for s, v := range r.Residual {
		if !(v < 0) {
			continue
		}
		if -v <= roundoff*r.Input[s] {
			r.Residual[s] = 0
			continue
		}
		sp := chem.Species(s)
		r.Negatives = append(r.Negatives, Deficit{Species: sp, Amount: v})
		switch policy {
		case Zero:
			r.Residual[s] = 0
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s* = %.4g µmol/L set to 0", ErrNegativeResidual, sp, v))
		case Keep:
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s* = %.4g µmol/L kept", ErrNegativeResidual, sp, v))
		case Reject:
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s* = %.4g µmol/L, sample rejected", ErrNegativeResidual, sp, v))
		}
	}
	if policy == Reject && len(r.Negatives) > 0 {
		r.Rejected = true
		return &NegativeError{Deficits: append([]Deficit(nil), r.Negatives...)}
	}
	return nil
}

// Bracket runs Apply under the two end scenarios of sulfate origin, all
// gypsum and all sulfide oxidation, which bracket the CO2 result (docs/methods.md
// §5.2). opt.Sulfate is ignored.
func Bracket(c chem.Composition, opt *Options) (gypsum, sulfide Result, err error) {
	var o Options
	if opt != nil {
		o = *opt
	}
	o.Sulfate = Gypsum
	gypsum, err = Apply(c, &o)
	if err != nil {
		return gypsum, sulfide, fmt.Errorf("gypsum scenario: %w", err)
	}
	o.Sulfate = Sulfide
	sulfide, err = Apply(c, &o)
	if err != nil {
		return gypsum, sulfide, fmt.Errorf("sulfide scenario: %w", err)
	}
	return gypsum, sulfide, nil
}
