package mix

import (
	"errors"
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// SilicateRatio is a molar ratio X/Na of the silicate end-member: its
// central value and its published range, read as everywhere (docs/methods.md
// §7.3) as the 95 % interval of a log-normal with its median at the
// central value (Within). Lo = Hi = Value (or both 0) makes it exact.
type SilicateRatio struct {
	Value  float64 // central value, mol/mol
	Lo, Hi float64 // the published range, mol/mol
}

// Exact returns a silicate ratio without uncertainty.
func Exact(v float64) SilicateRatio { return SilicateRatio{Value: v, Lo: v, Hi: v} }

// exact reports whether the ratio has no spread.
func (r SilicateRatio) exact() bool { return r.Lo == r.Hi || (r.Lo == 0 && r.Hi == 0) }

// prior returns the ratio as a prior of the inverse model.
func (r SilicateRatio) prior() Prior {
	if r.exact() {
		return FixedRatio(r.Value)
	}
	return Within(r.Lo, r.Value, r.Hi)
}

// Sigma returns the first-order 1σ of the ratio: the central value times
// the σ of its logarithm, ln(Hi/Lo)/3.92.
func (r SilicateRatio) Sigma() float64 {
	if r.exact() {
		return 0
	}
	return r.Value * plog(r.Hi/r.Lo) / (2 * z975)
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
// reproduction; the ± values and their meaning are from memory), the ±
// read as the 95 % range as everywhere, the same reading PresetSilicate
// takes. No K/Na default is given, so KNa is NaN.
func ForwardSilicate() SilicateRatios {
	return SilicateRatios{
		CaNa: SilicateRatio{0.35, 0.20, 0.50},
		MgNa: SilicateRatio{0.24, 0.12, 0.36},
		KNa:  SilicateRatio{math.NaN(), math.NaN(), math.NaN()},
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
	// Monte Carlo with that many draws (log-normal ratios, drawn by the
	// portable code of the inverse model) instead of to first order.
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
	// Split is the apportionment with the central ratios. Silicate Ca and
	// Mg never exceed the corrected Ca* and Mg* (see Deficit).
	Split Split
	// Sigma is the 1σ uncertainty of each entry of Split from the
	// end-member ratio uncertainties (first order, or the standard
	// deviation of the draws).
	Sigma Split
	// Lo and Hi are the 2.5 % and 97.5 % quantiles over the Monte Carlo
	// draws; NaN under first-order propagation.
	Lo, Hi Split
	// Deficit is, per cation, the amount by which Na_sil times the
	// silicate ratio exceeded the corrected amount: silicate was capped
	// at the corrected amount and carbonate got none.
	Deficit [NCations]float64
	// Clamped is, per cation, the share of draws (0 or 1 under first
	// order) in which silicate was capped.
	Clamped [NCations]float64
	// Unassigned is, per cation, measured amount given to no source:
	// Na removed as human input, K* above the silicate K/Na ratio.
	Unassigned [NCations]float64
	// Misfit is, per cation, measured − (Split total + Unassigned);
	// nonzero where the correction set a negative residual to zero.
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
	// ErrSilicateCapped warns that Na_sil times a silicate ratio exceeds
	// the corrected Ca, Mg (or Sr), so silicate was capped at it and
	// carbonate got none (docs/methods.md §13 item 7, corrected).
	ErrSilicateCapped = errors.New("silicate ratio too high for the measured amount (or Ca removed by calcite precipitation): silicate capped at the measured amount, carbonate set to 0")
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
//	Ca_sil  = min(Na_sil × (Ca/Na)_sil, Ca*)     (capped, with a warning)
//	Mg_sil  = min(Na_sil × (Mg/Na)_sil, Mg*)     (likewise)
//	Ca_carb = Ca* − Ca_sil                       (Ca* = Ca − Ca_atm − Ca_evap)
//	Mg_carb = Mg* − Mg_sil
//
// Silicate Ca and Mg never exceed the measured (corrected) amounts, so no
// cation is invented and carbonate is never negative (docs/methods.md §7.8,
// §13 item 7). The atmosphere and evaporite rows come from c.Atm
// and c.Evap. Only the end-member ratio uncertainties are propagated: to
// first order (σ(Ca_sil) = Na_sil σ(Ca/Na), the same for Ca_carb, 0 where
// capped) or, with opt.Draws > 0, by Monte Carlo with each ratio drawn from
// its log-normal (the published range as its 95 % interval), the cap
// applied per draw. A negative Na* (kept by correct.Keep) is reported as
// negative silicate Na with a warning, and silicate Ca, Mg and K are then
// taken as 0. opt may be nil.
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
		res.Misfit[i] = c.Input[sp] - (res.Split.Total(sp) + res.Unassigned[i])
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
		if err := ch.r.check(); err != nil {
			return fmt.Errorf("%w: silicate %s: %v", ErrForwardInput, ch.name, err)
		}
	}
	return nil
}

// check reports a ratio that is not a finite number >= 0 or whose range
// does not hold it.
func (r SilicateRatio) check() error {
	bad := func(x float64) bool { return !(x >= 0) || math.IsInf(x, 0) }
	switch {
	case bad(r.Value):
		return fmt.Errorf("%g, want finite and >= 0", r.Value)
	case r.exact():
		return nil
	case bad(r.Lo) || bad(r.Hi) || !(r.Lo > 0) || r.Lo > r.Value || r.Value > r.Hi:
		return fmt.Errorf("%g in [%g, %g], want 0 < low <= central <= high", r.Value, r.Lo, r.Hi)
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
		sil, have := na*x.ratio, math.Max(c.Residual[x.sp], 0)
		d.deficit[x.i] = 0
		if sil > have {
			d.deficit[x.i] = sil - have
			sil = have
		}
		d.split[Silicate][x.i] = sil
		d.split[Carbonate][x.i] = have - sil
	}
}

// firstOrder fills Sigma, Lo, Hi and Clamped by first-order propagation.
func (res *ForwardResult) firstOrder(rat *SilicateRatios, kFromRatio bool) {
	na := math.Max(res.Split[Silicate][fwdNa], 0)
	for _, x := range []struct {
		i int
		r SilicateRatio
	}{{fwdCa, rat.CaNa}, {fwdMg, rat.MgNa}} {
		if res.Deficit[x.i] > 0 {
			continue // capped: the silicate amount does not move with the ratio
		}
		res.Sigma[Silicate][x.i] = na * x.r.Sigma()
		res.Sigma[Carbonate][x.i] = na * x.r.Sigma()
	}
	if kFromRatio {
		res.Sigma[Silicate][fwdK] = na * rat.KNa.Sigma()
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
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s_sil by %.4g µmol/L", ErrSilicateCapped, sp, res.Deficit[i]))
		}
		if res.Clamped[i] > 0 && res.Deficit[i] == 0 {
			res.Warnings = append(res.Warnings, fmt.Errorf("%w: %s_sil in %.3g %% of draws", ErrSilicateCapped, sp, 100*res.Clamped[i]))
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
