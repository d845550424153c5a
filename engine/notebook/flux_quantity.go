package notebook

import (
	"context"
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
)

// Fluxes is the value a fluxes cell hands on: what another cell needs to
// flux a quantity of its own the same way (the CO2 cell does).
type Fluxes struct {
	Record    *discharge.Record // the record over the budget period
	Site      *Site
	Options   flux.Options
	Bootstrap flux.BootstrapOptions
	// SeriesReplicates is the number of bootstrap replicates for the
	// series other than the cation sums (0: point values only).
	SeriesReplicates int
	App              *Apportioned
	// Policy says what becomes of samples without a usable apportionment:
	// "leave-out" or "fill-shares" (FluxSettings.Unapportioned).
	Policy string
	// DoubtfulAbove is the share (0 to 1) of the flow-weighted load resting
	// on samples without a usable apportionment, or of the flow the
	// samples do not bracket, above which fluxes and CO2 are doubtful.
	DoubtfulAbove float64
	// Doubtful holds the reasons the fluxes are doubtful (none when they
	// are not); the CO2 cell, which rests on them, repeats them.
	Doubtful []string
	// tick reports progress while a long quantity is built (Bootstrap.Tick
	// while it is bootstrapped); set only while a cell computes with it.
	tick func()
}

// ticking returns a copy of v whose long loops call tick and whose
// bootstraps stop when ctx is cancelled: the context and progress of the
// cell computing with it (a cell below reuses the value of a fluxes cell
// computed in an earlier run).
func (v *Fluxes) ticking(ctx context.Context, tick func()) *Fluxes {
	w := *v
	w.tick, w.Bootstrap.Tick, w.Bootstrap.Context = tick, tick, ctx
	return &w
}

// cationCharge is the charge of Na, K, Ca and Mg (mix.Cations order).
var cationCharge = [mix.NCations]float64{1, 1, 2, 2}

// amounts gives, for one split of sample i (its k-th kept draw, or -1 for
// the point value) with its sulfide-derived sulfate so4, the amount of a
// quantity attributed to each measured cation (mix.Cations order),
// µmol/L; NaN where the quantity is undefined.
type amounts func(i, k int, s *mix.Split, so4 float64, out *[mix.NCations]float64)

// cationsOf returns the amounts of the cations ks from source src, each
// attributed to itself.
func cationsOf(src mix.Source, ks ...int) amounts {
	return func(_, _ int, s *mix.Split, _ float64, out *[mix.NCations]float64) {
		*out = [mix.NCations]float64{}
		for _, k := range ks {
			out[k] = s[src][k]
		}
	}
}

// measuredName names the measured cation k as a flux part under the
// budget's policy: every sample's value, or only the apportioned samples'.
func (v *Fluxes) measuredName(k int) string {
	sym := mix.Cations[k].Symbol()
	if v.Policy == "leave-out" && v.App.Unusable() > 0 {
		return sym + " of the apportioned samples"
	}
	return sym
}

// quantity builds an apportioned quantity of the budget (flux.Apportioned)
// from per-sample amounts f: one part for each measured cation in parts,
// with the point value from each sample's mean split (whose sources add
// up to what was measured) and,
// when withDraws, one value per kept draw. Samples without a usable
// apportionment have no amount; under the leave-out policy their measured
// values are left out too.
func (v *Fluxes) quantity(name string, mass float64, withDraws bool, parts []int, f amounts) flux.Apportioned {
	a := v.App
	n := len(a.Names)
	q := flux.Apportioned{Name: name, MolarMass: mass, Days: a.Days, Q: a.Q}
	leave := v.Policy == "leave-out"
	draws := withDraws && a.Draws > 1
	for _, k := range parts {
		p := flux.Share{Of: v.measuredName(k), Measured: make([]float64, n), Amount: make([]float64, n)}
		if draws {
			p.Draws = make([][]float64, n)
		}
		q.Parts = append(q.Parts, p)
	}
	if draws {
		q.Weights = a.keptWeights(v.tick)
	}
	var out [mix.NCations]float64
	var buf mix.Split
	for i := 0; i < n; i++ {
		usable := a.Usable(i)
		for j, k := range parts {
			m := a.Corrected[i].Input[mix.Cations[k]]
			if leave && !usable {
				m = math.NaN()
			}
			q.Parts[j].Measured[i] = m
			q.Parts[j].Amount[i] = math.NaN()
		}
		if !usable {
			continue
		}
		f(i, -1, &a.Mean[i], a.Corrected[i].SO4Sulf, &out)
		for j, k := range parts {
			q.Parts[j].Amount[i] = out[k]
		}
		if !draws {
			continue
		}
		if v.tick != nil {
			v.tick()
		}
		nk := a.Kept(i)
		for j := range parts {
			q.Parts[j].Draws[i] = make([]float64, nk)
		}
		for kk := 0; kk < nk; kk++ {
			d, sp, _ := a.keptSplit(i, kk, &buf)
			f(i, kk, sp, a.SO4Sulf(i, d), &out)
			for j, k := range parts {
				q.Parts[j].Draws[i][kk] = out[k]
			}
		}
	}
	return q
}

// fitted is one series or apportioned quantity fluxed by fit: the point
// result, its bootstrap (nil without one), and what was fluxed, so that it
// can be bootstrapped again one source at a time.
type fitted struct {
	s   *flux.Series      // a measured series, or
	a   *flux.Apportioned // an apportioned quantity
	opt flux.Options
	r   *flux.Result
	u   *flux.Uncertainty
}

// name is the series' or quantity's name.
func (f *fitted) name() string {
	if f.s != nil {
		return f.s.Name
	}
	return f.a.Name
}

// boot bootstraps what f fluxed with options b.
func (f *fitted) boot(rec *discharge.Record, b flux.BootstrapOptions) (*flux.Uncertainty, error) {
	if f.s != nil {
		return flux.Bootstrap(rec, *f.s, f.opt, b)
	}
	return flux.BootstrapApportioned(rec, *f.a, f.opt, b)
}

// bootOptions returns the budget's bootstrap options with reps replicates.
func (v *Fluxes) bootOptions(reps int) flux.BootstrapOptions {
	bo := v.Bootstrap
	bo.Replicates = reps
	return bo
}

// fitSeries fluxes a measured series with the budget's estimator and, with
// reps above 0, bootstraps it.
func (v *Fluxes) fitSeries(s flux.Series, reps int, opt flux.Options) (fitted, []string, error) {
	f := fitted{s: &s, opt: opt}
	r, err := flux.Estimate(v.Record, s, opt)
	if err != nil {
		return f, nil, fmt.Errorf("%s: %v", s.Name, err)
	}
	return v.finish(f, r, reps)
}

// fitQuantity fluxes an apportioned quantity with estimator opt.Method
// applied to its measured species and, with reps above 0, bootstraps it.
// There is no fallback: an estimator that cannot take a measured species
// is a problem named as such.
func (v *Fluxes) fitQuantity(q flux.Apportioned, reps int, opt flux.Options) (fitted, []string, error) {
	f := fitted{a: &q, opt: opt}
	r, err := flux.EstimateApportioned(v.Record, q, opt)
	if err != nil {
		return f, nil, err
	}
	return v.finish(f, r, reps)
}

// finish keeps the point result of f, collects its warnings and runs its
// bootstrap.
func (v *Fluxes) finish(f fitted, r *flux.Result, reps int) (fitted, []string, error) {
	var warns []string
	f.r = r
	for _, w := range r.Warnings {
		warns = append(warns, w.Error())
	}
	if reps <= 0 {
		return f, warns, nil
	}
	u, err := f.boot(v.Record, v.bootOptions(reps))
	if err != nil {
		return f, warns, fmt.Errorf("%s: bootstrap: %v", f.name(), err)
	}
	if u.Failed > 0 {
		warns = append(warns, fmt.Sprintf("%s: %d of %d bootstrap replicates could not be fitted", f.name(), u.Failed, u.Failed+u.Replicates))
	}
	f.u = u
	return f, warns, nil
}

// fitAmounts fluxes per-sample amounts of a quantity (a mineral's moles,
// say) on the samples days, with the budget's estimator and, with reps
// above 0, its bootstrap, as apportioned quantities are fluxed
// (docs/methods.md §8.7): through the samples' measured cation charge, to
// which the estimator (a rating curve, say) is fitted, the quantity taking
// its flow-weighted share in each year's samples. The amounts may be zero
// or negative; no estimator is switched.
func (v *Fluxes) fitAmounts(name string, days []dayOf, amount []float64, reps int) (fitted, []string, error) {
	n := len(days)
	q := flux.Apportioned{Name: name, Days: make([]discharge.Day, n), Q: make([]float64, n),
		Parts: []flux.Share{{Of: "cation charge of the balanced samples", Measured: make([]float64, n), Amount: amount}}}
	for i, d := range days {
		q.Days[i], q.Q[i], q.Parts[0].Measured[i] = d.day, d.q, d.tz
	}
	return v.fitQuantity(q, reps, v.Options)
}

// cationCharges returns Na + K + 2Ca + 2Mg of c, µeq/L, over the cations
// measured (NaN when none is).
func cationCharges(c chem.Composition) float64 {
	t, some := 0.0, false
	for k, sp := range mix.Cations {
		if x := c[sp]; finite(x) {
			t += cationCharge[k] * x
			some = true
		}
	}
	if !some {
		return math.NaN()
	}
	return t
}

// measuredSeries returns the measured species sp of every apportioned
// sample as a flux series.
func (v *Fluxes) measuredSeries(sp chem.Species) flux.Series {
	a := v.App
	c := make([]float64, len(a.Names))
	for i := range c {
		c[i] = a.Corrected[i].Input[sp]
	}
	s := flux.ForSpecies(sp, a.Days, c)
	s.Q = a.Q
	return s
}

// howFluxed describes how the budget's apportioned fluxes were computed,
// for the note beside their headline figures.
func (v *Fluxes) howFluxed() string {
	note := fmt.Sprintf("%s estimator on each measured cation, times the flow-weighted share of it from the source in each year's samples", estimatorLabel(v.Options.Method))
	if n := v.App.Unusable(); n > 0 {
		if v.Policy == "leave-out" {
			note += fmt.Sprintf("; %d samples without a usable apportionment left out", n)
		} else {
			note += fmt.Sprintf("; %d samples without a usable apportionment filled with the flow-weighted source shares of the apportioned samples of their year", n)
		}
	}
	return note
}

// unapportionedShare returns the share of the flow-weighted cation load
// (Σ Q_i TZ+_i over the samples the record covers, TZ+ = Na + K + 2Ca +
// 2Mg in µeq/L) carried by samples without a usable apportionment.
func (v *Fluxes) unapportionedShare() float64 {
	a := v.App
	var all, bad float64
	for i := range a.Names {
		k := v.Record.Index(a.Days[i])
		if k < 0 {
			continue // outside the budget period
		}
		q := math.NaN()
		if i < len(a.Q) {
			q = a.Q[i]
		}
		if math.IsNaN(q) {
			q = v.Record.Q[k]
		}
		tz := cationCharges(a.Corrected[i].Input)
		if !finite(q) || !finite(tz) {
			continue
		}
		all += q * tz
		if !a.Usable(i) {
			bad += q * tz
		}
	}
	if all == 0 {
		return 0
	}
	return bad / all
}

// doubtfulReasons gives the reasons fluxes resting on the samples of r are
// doubtful under the limit v.DoubtfulAbove: samples without a usable
// apportionment that carried more of the flow-weighted cation load, or
// more of the flow before the first or after the last sample or (for the
// rating curve) outside the sampled discharges.
func (v *Fluxes) doubtfulReasons(share float64, r *flux.Result) []string {
	lim := v.DoubtfulAbove
	var out []string
	if n := v.App.Unusable(); n > 0 && share > lim {
		what := "left out"
		if v.Policy != "leave-out" {
			what = "filled with the source shares of the others"
		}
		out = append(out, fmt.Sprintf("%s without a usable apportionment carried %.0f %% of the flow-weighted cation load (above %.0f %%); they are %s",
			countOf(n, len(v.App.Names), "samples"), 100*share, 100*lim, what))
	}
	if r != nil && r.HeldFlow > lim {
		out = append(out, fmt.Sprintf("%.0f %% of the flow passed before the first or after the last apportioned sample (above %.0f %%)", 100*r.HeldFlow, 100*lim))
	}
	if r != nil && r.Method == flux.Rating && r.OutsideFlow > lim {
		out = append(out, fmt.Sprintf("%.0f %% of the flow passed outside the sampled discharges, where the rating curve extrapolates (above %.0f %%)", 100*r.OutsideFlow, 100*lim))
	}
	return out
}

// countOf says "all 12 samples" when n is all of them, else "3 of 12
// samples".
func countOf(n, of int, what string) string {
	if n == of {
		if n == 1 {
			return "the only one of the " + what
		}
		return fmt.Sprintf("all %d %s", n, what)
	}
	return fmt.Sprintf("%d of %d %s", n, of, what)
}
