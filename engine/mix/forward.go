package mix

import (
	"errors"
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// SilicateRatio is a molar ratio X/Na of the silicate end-member with its
// 1σ uncertainty.
type SilicateRatio struct {
	Value float64 // central value, mol/mol
	Sigma float64 // one standard deviation, mol/mol (0 for an exact ratio)
}

// SilicateRatios are the silicate end-member ratios of the forward model.
type SilicateRatios struct {
	CaNa SilicateRatio // (Ca/Na)_sil
	MgNa SilicateRatio // (Mg/Na)_sil
	// KNa is (K/Na)_sil, used only with ForwardOptions.KFromRatio. NaN means
	// not given.
	KNa SilicateRatio
}

// ForwardSilicate returns the default silicate end-member of the forward
// model: the global silicate end-member of Gaillardet, Dupré, Louvat &
// Allègre (1999), Chem. Geol. 159, 3-30: Ca/Na 0.35 ± 0.15, Mg/Na 0.24 ±
// 0.12 (docs/methods.md §6.2: central values confirmed through a secondary
// reproduction; the ± values and their meaning are from memory and are used
// here as 1σ). No K/Na default is given, so KNa is NaN.
func ForwardSilicate() SilicateRatios {
	return SilicateRatios{
		CaNa: SilicateRatio{0.35, 0.15},
		MgNa: SilicateRatio{0.24, 0.12},
		KNa:  SilicateRatio{math.NaN(), math.NaN()},
	}
}

// ForwardOptions control Forward. The zero value means the defaults:
// ForwardSilicate ratios, all K* silicate, first-order propagation of the
// ratio uncertainties.
type ForwardOptions struct {
	// Silicate holds the end-member ratios; nil means ForwardSilicate().
	Silicate *SilicateRatios
	// KFromRatio derives K_sil = Na_sil × (K/Na)_sil instead of taking all
	// K* as silicate; K* above it is reported as unassigned.
	KFromRatio bool
	// Draws, when positive, propagates the ratio uncertainties by a seeded
	// Monte Carlo with that many draws instead of to first order.
	Draws int
	// Seed seeds the Monte Carlo generator (PCG); the same seed gives the
	// same draws on every platform.
	Seed uint64
	// Vary, when set with Draws > 0, gives the corrected sample under
	// Monte Carlo draw k (the rain correction drawn with its uncertainty,
	// correct.Result.Vary): each draw subtracts from its own correction.
	// nil means the sample's correction for every draw.
	Vary func(k int) correct.Result
}

// ForwardResult is the source apportionment of one sample by the forward
// model. All amounts are µmol/L.
type ForwardResult struct {
	// Split is the apportionment with the central ratios; a negative
	// carbonate share is set to 0 (see Deficit).
	Split Split
	// Sigma is the 1σ uncertainty of each entry of Split from the
	// end-member ratio uncertainties (first order, or the standard
	// deviation of the draws).
	Sigma Split
	// Lo and Hi are the 2.5 % and 97.5 % quantiles over the Monte Carlo
	// draws; NaN under first-order propagation.
	Lo, Hi Split
	// Deficit is, per cation, the amount by which carbonate would have
	// been negative before it was set to 0.
	Deficit [NCations]float64
	// Clamped is, per cation, the share of draws (0 or 1 under first
	// order) in which carbonate was set to 0.
	Clamped [NCations]float64
	// Unassigned is, per cation, measured amount given to no source:
	// Na removed as human input, K* above the silicate K/Na ratio.
	Unassigned [NCations]float64
	// Misfit is, per cation, measured − (Split total − Deficit +
	// Unassigned); nonzero where the correction set a negative residual
	// to zero.
	Misfit [NCations]float64
	// Draws holds every Monte Carlo draw (nil under first order), for
	// propagating the uncertainty to derived quantities such as CO2.
	Draws []Split
	// Warnings are problems that do not stop the apportionment.
	Warnings []error
}

// Forward errors and warnings.
var (
	// ErrForwardInput marks a sample the forward model cannot apportion.
	ErrForwardInput = errors.New("mix: forward model input")
	// ErrCarbonateDeficit warns that silicate Ca or Mg from the end-member
	// ratio exceeds the corrected Ca or Mg, so carbonate was set to 0.
	ErrCarbonateDeficit = errors.New("silicate ratio too high or Ca removed by calcite precipitation: carbonate set to 0")
	// ErrNoSilicateNa warns that no Na is left for silicate weathering.
	ErrNoSilicateNa = errors.New("no silicate Na after correction")
	// ErrMassBalance warns that a cation's sources do not add up to the
	// measured value.
	ErrMassBalance = errors.New("sources do not add up to the measured value")
	// ErrUnassigned warns that part of a cation was given to no source
	// (K* above the silicate K/Na ratio).
	ErrUnassigned = errors.New("part of a cation given to no source")
)

// Forward apportions the major cations of one corrected sample by
// sequential subtraction in the style of Galy & France-Lanord (1999), Chem.
// Geol. 159, 31-60 (docs/methods.md §6.1):
//
//	Na_sil  = Na* − Na_evap                      (c.Residual[Na])
//	K_sil   = K*  (or Na_sil × (K/Na)_sil with KFromRatio)
//	Ca_sil  = Na_sil × (Ca/Na)_sil
//	Mg_sil  = Na_sil × (Mg/Na)_sil
//	Ca_carb = Ca − Ca_atm − Ca_evap − Ca_sil     (set to 0 with a warning if negative)
//	Mg_carb = Mg − Mg_atm − Mg_sil               (likewise)
//
// The atmosphere and evaporite rows come from c.Atm and c.Evap. Only the
// end-member ratio uncertainties are propagated: to first order (σ(Ca_sil) =
// Na_sil σ(Ca/Na), the same for Ca_carb) or, with opt.Draws > 0, by Monte
// Carlo with each ratio drawn from a normal distribution truncated at zero
// (redrawn when negative), the clamp applied per draw. A negative Na* (kept
// by correct.Keep) is reported as negative silicate Na with a warning, and
// silicate Ca, Mg and K are then taken as 0. opt may be nil.
func Forward(c *correct.Result, opt *ForwardOptions) (ForwardResult, error) {
	var res ForwardResult
	if opt == nil {
		opt = &ForwardOptions{}
	}
	rat := ForwardSilicate()
	if opt.Silicate != nil {
		rat = *opt.Silicate
	}
	if err := fwdCheck(c, &rat, opt); err != nil {
		return res, err
	}
	// Central values.
	var cen forwardDraw
	cen.run(c, rat.CaNa.Value, rat.MgNa.Value, rat.KNa.Value, opt.KFromRatio)
	res.Split = cen.split
	res.Deficit = cen.deficit
	res.Unassigned = cen.unassigned
	res.Unassigned[fwdNa] += c.Human[chem.Na]
	for i, sp := range Cations {
		res.Misfit[i] = c.Input[sp] - (res.Split.Total(sp) - res.Deficit[i] + res.Unassigned[i])
	}
	if opt.Draws > 0 {
		res.monteCarlo(c, &rat, opt)
	} else {
		res.firstOrder(&rat, opt.KFromRatio)
	}
	res.warn(c)
	return res, nil
}

// fwdCheck rejects inputs the model cannot use.
func fwdCheck(c *correct.Result, rat *SilicateRatios, opt *ForwardOptions) error {
	if c == nil {
		return fmt.Errorf("%w: no corrected sample", ErrForwardInput)
	}
	if c.Rejected {
		return fmt.Errorf("%w: sample rejected by the correction", ErrForwardInput)
	}
	if math.IsNaN(c.Residual[chem.Na]) {
		return fmt.Errorf("%w: Na not measured", ErrForwardInput)
	}
	if opt.Draws < 0 {
		return fmt.Errorf("%w: %d draws", ErrForwardInput, opt.Draws)
	}
	check := []struct {
		name string
		r    SilicateRatio
	}{{"Ca/Na", rat.CaNa}, {"Mg/Na", rat.MgNa}}
	if opt.KFromRatio {
		check = append(check, struct {
			name string
			r    SilicateRatio
		}{"K/Na", rat.KNa})
	}
	for _, ch := range check {
		if !(ch.r.Value >= 0) || math.IsInf(ch.r.Value, 0) || !(ch.r.Sigma >= 0) || math.IsInf(ch.r.Sigma, 0) {
			return fmt.Errorf("%w: silicate %s = %g ± %g, want finite and >= 0", ErrForwardInput, ch.name, ch.r.Value, ch.r.Sigma)
		}
	}
	return nil
}

// forwardDraw is one evaluation of the forward equations.
type forwardDraw struct {
	split      Split
	deficit    [NCations]float64
	unassigned [NCations]float64
}

// Indices of the cations in Split.
const (
	fwdNa = 0
	fwdK  = 1
	fwdCa = 2
	fwdMg = 3
)

// run evaluates the forward equations with the given ratios.
func (d *forwardDraw) run(c *correct.Result, caNa, mgNa, kNa float64, kFromRatio bool) {
	for i, sp := range Cations {
		d.split[Atmosphere][i] = c.Atm[sp]
		d.split[Evaporite][i] = c.Evap[sp]
	}
	na := c.Residual[chem.Na]
	d.split[Silicate][fwdNa] = na
	// A negative Na* kept by the correction's Keep policy stays visible in
	// the silicate Na, but gives no negative silicate Ca, Mg or K.
	na = math.Max(na, 0)
	d.split[Carbonate][fwdNa] = 0
	d.split[Carbonate][fwdK] = 0
	if kFromRatio {
		k := na * kNa
		d.split[Silicate][fwdK] = k
		d.unassigned[fwdK] = c.Residual[chem.K] - k
	} else {
		d.split[Silicate][fwdK] = c.Residual[chem.K]
		d.unassigned[fwdK] = 0
	}
	for _, x := range [...]struct {
		i     int
		sp    chem.Species
		ratio float64
	}{{fwdCa, chem.Ca, caNa}, {fwdMg, chem.Mg, mgNa}} {
		sil := na * x.ratio
		carb := c.Residual[x.sp] - sil
		d.split[Silicate][x.i] = sil
		d.deficit[x.i] = 0
		if carb < 0 {
			d.deficit[x.i] = -carb
			carb = 0
		}
		d.split[Carbonate][x.i] = carb
	}
}

// firstOrder fills Sigma, Lo, Hi and Clamped by first-order propagation.
func (res *ForwardResult) firstOrder(rat *SilicateRatios, kFromRatio bool) {
	na := math.Max(res.Split[Silicate][fwdNa], 0)
	res.Sigma[Silicate][fwdCa] = na * rat.CaNa.Sigma
	res.Sigma[Carbonate][fwdCa] = na * rat.CaNa.Sigma
	res.Sigma[Silicate][fwdMg] = na * rat.MgNa.Sigma
	res.Sigma[Carbonate][fwdMg] = na * rat.MgNa.Sigma
	if kFromRatio {
		res.Sigma[Silicate][fwdK] = na * rat.KNa.Sigma
	}
	for s := range res.Lo {
		for i := range res.Lo[s] {
			res.Lo[s][i] = math.NaN()
			res.Hi[s][i] = math.NaN()
		}
	}
	for i := range res.Clamped {
		if res.Deficit[i] > 0 {
			res.Clamped[i] = 1
		}
	}
}

// warn adds the forward model's warnings.
func (res *ForwardResult) warn(c *correct.Result) {
	if !(res.Split[Silicate][fwdNa] > 0) {
		res.Warnings = append(res.Warnings, fmt.Errorf("%w: Na_sil = %.4g µmol/L, so silicate Ca and Mg are 0", ErrNoSilicateNa, res.Split[Silicate][fwdNa]))
	}
	for i, sp := range Cations {
		if res.Deficit[i] > 0 {
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s_carb = −%.4g µmol/L", ErrCarbonateDeficit, sp, res.Deficit[i]))
		}
		if res.Clamped[i] > 0 && res.Deficit[i] == 0 {
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s_carb in %.3g %% of draws", ErrCarbonateDeficit, sp, 100*res.Clamped[i]))
		}
		if math.IsNaN(c.Input[sp]) {
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s not measured", ErrForwardInput, sp))
			continue
		}
		if m := res.Misfit[i]; math.Abs(m) > 1e-9*math.Max(c.Input[sp], 1) {
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s differs by %.4g µmol/L", ErrMassBalance, sp, m))
		}
	}
	if u := res.Unassigned[fwdK]; u != 0 && !math.IsNaN(u) {
		res.Warnings = append(res.Warnings, fmt.Errorf("%w: K* − Na_sil × (K/Na)_sil = %.4g µmol/L", ErrUnassigned, u))
	}
}
