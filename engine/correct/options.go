package correct

import (
	"fmt"
	"math"
)

// Excess says where chloride above Cl* comes from.
type Excess int

const (
	// Halite assigns excess Cl to halite dissolution: Na_evap = Cl_excess
	// (the default; docs/methods.md §5.1).
	Halite Excess = iota
	// HumanInput removes excess Cl and an equal amount of Na from the
	// budget as human input (road salt, sewage) and flags the sample.
	HumanInput
)

// String names the choice.
func (e Excess) String() string {
	switch e {
	case Halite:
		return "halite"
	case HumanInput:
		return "human input"
	}
	return "unknown"
}

// Sulfate says where non-atmospheric sulfate SO4* comes from (docs/methods.md
// §5.2; the scenarios are common practice, no source).
type Sulfate int

const (
	// Gypsum: all SO4* from gypsum/anhydrite, Ca_evap = SO4*, SO4_sulf = 0
	// (the default).
	Gypsum Sulfate = iota
	// Sulfide: all SO4* from sulfide oxidation, Ca_evap = 0, SO4_sulf = SO4*.
	Sulfide
	// Isotope: the sulfide share from δ34S two-end-member mixing
	// (Options.Delta34S); the rest is gypsum.
	Isotope
)

// String names the scenario.
func (s Sulfate) String() string {
	switch s {
	case Gypsum:
		return "gypsum"
	case Sulfide:
		return "sulfide oxidation"
	case Isotope:
		return "δ34S mixing"
	}
	return "unknown"
}

// Delta34S holds δ34S of sulfate (‰) for the sample and the two end-members.
type Delta34S struct {
	River     float64 // δ34S of river sulfate
	Evaporite float64 // evaporite end-member (typically +10 to +35 ‰, from memory)
	Sulfide   float64 // sulfide end-member (usually negative, from memory)
}

// Fraction returns f_sulf = (δ_riv − δ_evap)/(δ_sulf − δ_evap), the share of
// SO4* from sulfide oxidation (docs/methods.md §5.2; linear in SO4-weighted δ,
// common practice). The value is not limited to [0, 1]; Apply limits it and
// warns. Equal end-members or non-finite values are an error.
func (d Delta34S) Fraction() (float64, error) {
	den := d.Sulfide - d.Evaporite
	f := (d.River - d.Evaporite) / den
	if den == 0 || math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, fmt.Errorf("%w: δ34S end-members %g and %g ‰ with river %g ‰ give no fraction", ErrOption, d.Evaporite, d.Sulfide, d.River)
	}
	return f, nil
}

// Negative is the policy for a residual below zero after correction.
type Negative int

const (
	// Zero sets the residual to 0 and flags it with the deficit (the
	// default; docs/methods.md §5.1, common practice, no source).
	Zero Negative = iota
	// Keep keeps the negative residual and flags it.
	Keep
	// Reject rejects the sample: Apply returns a *NegativeError.
	Reject
)

// String names the policy.
func (n Negative) String() string {
	switch n {
	case Zero:
		return "set to zero"
	case Keep:
		return "keep"
	case Reject:
		return "reject"
	}
	return "unknown"
}

// Options control Apply. The zero value means the documented defaults:
// sea-salt ratios, Cl* = +Inf (with a warning), excess Cl to halite, all
// SO4* from gypsum, negative residuals set to zero and flagged.
type Options struct {
	// Rain is measured rain chemistry. When set, (X/Cl)_rain replaces the
	// sea-salt ratios and Cl* defaults to Cl_rain × F × f_dry.
	Rain *Rain
	// Ratios overrides the X/Cl ratios of the atmospheric input; nil means
	// from Rain when given, otherwise SeaSalt().
	Ratios *Ratios
	// ClCritical is Cl* in µmol/L; 0 means the default (from Rain, or +Inf).
	// Use math.Inf(1) to take all Cl as atmospheric without a warning.
	ClCritical float64
	// Excess says where Cl above Cl* comes from (default Halite).
	Excess Excess
	// Sulfate says where SO4* comes from (default Gypsum).
	Sulfate Sulfate
	// Delta34S is used when Sulfate is Isotope.
	Delta34S Delta34S
	// Negative is the policy for negative residuals (default Zero).
	Negative Negative
}

// check validates the options that do not depend on the sample.
func (o *Options) check() error {
	if o.ClCritical < 0 || math.IsNaN(o.ClCritical) {
		return fmt.Errorf("%w: critical Cl* = %g µmol/L, want > 0 (0 for the default)", ErrOption, o.ClCritical)
	}
	if o.Excess < Halite || o.Excess > HumanInput {
		return fmt.Errorf("%w: excess Cl choice %d", ErrOption, o.Excess)
	}
	if o.Sulfate < Gypsum || o.Sulfate > Isotope {
		return fmt.Errorf("%w: sulfate scenario %d", ErrOption, o.Sulfate)
	}
	if o.Negative < Zero || o.Negative > Reject {
		return fmt.Errorf("%w: negative-residual policy %d", ErrOption, o.Negative)
	}
	if o.Ratios != nil {
		for _, s := range corrected {
			if r := o.Ratios[s]; r < 0 || math.IsNaN(r) || math.IsInf(r, 0) {
				return fmt.Errorf("%w: %s/Cl ratio %g, want finite and >= 0", ErrOption, s, r)
			}
		}
	}
	return nil
}
