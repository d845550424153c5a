package compare

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/internal/portable"
	"lixiv/engine/internal/quantile"
)

// streamPlan is the second PCG word of the monitoring simulations.
const streamPlan = 0x6c69782d706c616e // "lix-plan"

// Scatter is what the monitoring design learns from a budget: its
// discharge record, its estimator, and the samples' concentrations of the
// quantity (µmol/L) with their days and discharge at sampling (NaN: the
// day's mean).
type Scatter struct {
	Record  *discharge.Record
	Options flux.Options
	Days    []discharge.Day
	Q, C    []float64
}

// Plan is a monitoring programme: samples per year, for Years reporting
// years (in each period, for BACI).
type Plan struct {
	PerYear, Years int
}

// Power says what the simulation asks: the power wanted and the two-sided
// level of the test, the number of simulated programmes and the seed.
type Power struct {
	Power, Alpha float64 // such as 0.80 and 0.05
	Sims         int     // simulated pairs (or quartets) of programmes for the null, and as many again for the power
	Seed         uint64
	// Context, when set, cancels a long simulation: it is looked at every
	// few programmes, and Detect then returns its error.
	Context context.Context
}

// err returns the error of the cancelled context, or nil.
func (p *Power) err() error {
	if p.Context == nil {
		return nil
	}
	return p.Context.Err()
}

// Detection is the result of a simulated monitoring design.
type Detection struct {
	Plan Plan
	// Relative is the smallest increase of the treated catchment's flux,
	// as a fraction of it, that the design detects with the power asked.
	Relative float64
	// SD is the standard deviation of the simulated null difference,
	// relative to the mean simulated flux; Flux that mean (mol/km²/yr).
	SD, Flux float64
	// Failed counts simulated programmes the estimator could not flux
	// (left out).
	Failed int
	// LeftOut counts the budget's samples without a concentration and a
	// discharge above zero, which the simulation cannot learn from.
	LeftOut int
}

// generator makes the concentrations of simulated samples from a budget's
// own: ln C = b0 + b1 ln Q + e, e resampled from the samples' residuals.
type generator struct {
	b0, b1 float64
	resid  []float64
}

// newGenerator fits ln C on ln Q over the samples with C and Q above zero:
// the least-squares slope (0 with fewer than three such samples or a
// single discharge, as the flow-adjusted interpolation takes it), and the
// residuals about it.
func newGenerator(s Scatter) (*generator, int, error) {
	var lq, lc []float64
	left := 0
	for i, d := range s.Days {
		q := math.NaN()
		if i < len(s.Q) {
			q = s.Q[i]
		}
		if math.IsNaN(q) {
			if k := s.Record.Index(d); k >= 0 {
				q = s.Record.Q[k]
			}
		}
		c := s.C[i]
		if !(q > 0) || !(c > 0) || math.IsInf(c, 0) || math.IsInf(q, 0) {
			left++
			continue
		}
		lq, lc = append(lq, portable.Log(q)), append(lc, portable.Log(c))
	}
	n := len(lc)
	if n < 3 {
		return nil, left, fmt.Errorf("the design needs at least three samples with a concentration and a discharge above zero, not %d", n)
	}
	mq, mc := 0.0, 0.0
	for i := range lc {
		mq += lq[i]
		mc += lc[i]
	}
	mq /= float64(n)
	mc /= float64(n)
	sqq, sqc := 0.0, 0.0
	for i := range lc {
		sqq += (lq[i] - mq) * (lq[i] - mq)
		sqc += (lq[i] - mq) * (lc[i] - mc)
	}
	g := &generator{}
	if sqq > 0 {
		g.b1 = sqc / sqq
	}
	g.b0 = mc - g.b1*mq
	g.resid = make([]float64, n)
	for i := range lc {
		g.resid[i] = lc[i] - g.b0 - g.b1*lq[i]
	}
	return g, left, nil
}

// tiled returns a record of years complete reporting years made of the
// complete years of rec, in order and repeated as needed, starting with
// the first of them (a year of 366 days taken into one of 365 loses its
// last day; one of 365 into 366 repeats its last). A record with no
// complete year but at least 365 days lends its 365-day spans from its
// first day instead, each set into a reporting year from its start. It
// fails on a record shorter than a year.
func tiled(rec *discharge.Record, firstMonth, years int) (*discharge.Record, error) {
	type block struct{ start, days int } // indices into rec
	var full []block
	label := 0
	for _, y := range rec.Years(firstMonth) {
		if y.Complete() {
			if label == 0 {
				label = y.Label
			}
			full = append(full, block{rec.Index(y.Start), y.Days})
		}
	}
	if len(full) == 0 {
		for i := 0; i+365 <= rec.Len(); i += 365 {
			full = append(full, block{i, 365})
		}
		if len(full) == 0 {
			return nil, fmt.Errorf("the discharge record is shorter than a year: no programme can be simulated on it")
		}
		label = discharge.YearOf(rec.First(), firstMonth) + 1
	}
	start, _ := discharge.YearBounds(label, firstMonth)
	var q []float64
	for k := range years {
		src := full[k%len(full)]
		s, e := discharge.YearBounds(label+k, firstMonth)
		n := int(e-s) + 1
		for j := range n {
			q = append(q, rec.Q[src.start+min(j, src.days-1)])
		}
	}
	return discharge.NewRecord(rec.Name, start, q), nil
}

// programme simulates one monitoring programme over the days of rec,
// perYear samples a year evenly spaced at a random phase, and fluxes it; it
// returns the mean annual yield (mol/km²/yr), NaN when the estimator fails.
func (g *generator) programme(rng *rand.Rand, rec *discharge.Record, perYear int, opt flux.Options, buf *flux.Series) float64 {
	step := 365.25 / float64(perYear)
	phase := rng.Float64() * step
	buf.Days, buf.C = buf.Days[:0], buf.C[:0]
	for t := phase; t < float64(rec.Len()); t += step {
		k := int(t)
		q := rec.Q[k]
		if !(q > 0) {
			continue
		}
		e := g.resid[rng.IntN(len(g.resid))]
		buf.Days = append(buf.Days, rec.Days[k])
		buf.C = append(buf.C, portable.Exp(g.b0+g.b1*portable.Log(q)+e))
	}
	r, err := flux.Estimate(rec, *buf, opt)
	if err != nil {
		return math.NaN()
	}
	return r.Mean.MolPerKm2
}

// Detect simulates the monitoring design plan on the budget's own data (see
// the package doc) and returns the smallest relative increase of the
// treated catchment's flux it detects with power p.Power at two-sided
// level p.Alpha: of p.Sims simulated null differences (identical
// catchments, each with its own programme on the same discharge record),
// the central 1 − α gives the test's bounds; of p.Sims more, the increase
// at which each first exceeds the upper bound is worked out, and the
// p.Power quantile of those is the detectable increase (detections below
// the lower bound, negligible at such a power, are not counted).
func Detect(s Scatter, d Design, plan Plan, p Power) (*Detection, error) {
	if plan.PerYear < 1 || plan.Years < 1 {
		return nil, fmt.Errorf("a programme needs at least one sample a year and one year, not %d and %d", plan.PerYear, plan.Years)
	}
	if p.Sims < 20 || !(p.Power > 0 && p.Power < 1) || !(p.Alpha > 0 && p.Alpha < 1) {
		return nil, fmt.Errorf("the simulation needs at least 20 programmes, a power and a level between 0 and 1")
	}
	g, left, err := newGenerator(s)
	if err != nil {
		return nil, err
	}
	periods := 1
	if d == BACI {
		periods = 2
	}
	rec, err := tiled(s.Record, s.Options.FirstMonth, periods*plan.Years)
	if err != nil {
		return nil, err
	}
	// Period k is its years of the tiled record, as a record of its own.
	fy := rec.Years(s.Options.FirstMonth)[0].Label
	starts := make([]int, periods+1)
	for k := range periods {
		st, _ := discharge.YearBounds(fy+k*plan.Years, s.Options.FirstMonth)
		starts[k] = rec.Index(st)
	}
	starts[periods] = rec.Len()
	recs := make([]*discharge.Record, periods)
	for k := range recs {
		recs[k] = discharge.NewRecord(rec.Name, rec.Days[starts[k]], rec.Q[starts[k]:starts[k+1]])
	}
	opt := s.Options
	rng := rand.New(rand.NewPCG(p.Seed, streamPlan))
	signs := d.Signs()
	var buf flux.Series
	det := &Detection{Plan: plan, LeftOut: left}
	// One simulation: the null difference and the treated "after" flux.
	sim := func() (float64, float64) {
		v := make([]float64, len(signs))
		for b := range signs {
			k := 0 // treated and control after: the last period
			if b < 2 {
				k = periods - 1
			}
			v[b] = g.programme(rng, recs[k], plan.PerYear, opt, &buf)
		}
		return d.Combine(v), v[0]
	}
	null := make([]float64, 0, p.Sims)
	var fluxes []float64
	for len(null) < p.Sims {
		if err := p.err(); err != nil {
			return nil, err
		}
		x, t := sim()
		if math.IsNaN(x) {
			det.Failed++
			if det.Failed > p.Sims {
				return nil, fmt.Errorf("the estimator failed on %d simulated programmes; the design cannot be simulated", det.Failed)
			}
			continue
		}
		null, fluxes = append(null, x), append(fluxes, t)
	}
	sort.Float64s(null)
	hi := quantile.Sorted(null, 1-p.Alpha/2)
	deltas := make([]float64, 0, p.Sims)
	for len(deltas) < p.Sims {
		if err := p.err(); err != nil {
			return nil, err
		}
		x, t := sim()
		if math.IsNaN(x) || !(t > 0) {
			det.Failed++
			if det.Failed > p.Sims {
				return nil, fmt.Errorf("the estimator failed on %d simulated programmes; the design cannot be simulated", det.Failed)
			}
			continue
		}
		// The treated after flux scales with its concentrations: an
		// increase δ adds δ t to the difference.
		deltas = append(deltas, math.Max(0, (hi-x)/t))
		fluxes = append(fluxes, t)
	}
	sort.Float64s(deltas)
	det.Relative = quantile.Sorted(deltas, p.Power)
	m := mean(fluxes)
	det.Flux, det.SD = m, stdDev(null)/m
	return det, nil
}

// mean returns the mean of v.
func mean(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x
	}
	return s / float64(len(v))
}

// stdDev returns the standard deviation of v (n − 1).
func stdDev(v []float64) float64 {
	m := mean(v)
	s := 0.0
	for _, x := range v {
		s += (x - m) * (x - m)
	}
	return math.Sqrt(s / float64(len(v)-1))
}

// SamplesPerYear returns the fewest samples a year, from 1 to maxPerYear,
// with which the design detects an increase of target (a fraction of the
// flux) with the power asked, by bisection on the simulated detectable
// increase, and that design's Detection; ok is false when even maxPerYear
// does not (the Detection is then maxPerYear's). Detections already
// simulated for other frequencies with the same years, design, power and
// seed (a curve) narrow the bisection.
func SamplesPerYear(s Scatter, d Design, years int, target float64, p Power, maxPerYear int, known ...*Detection) (n int, det *Detection, ok bool, err error) {
	at := func(k int) (*Detection, error) {
		for _, x := range known {
			if x != nil && x.Plan.PerYear == k && x.Plan.Years == years {
				return x, nil
			}
		}
		return Detect(s, d, Plan{PerYear: k, Years: years}, p)
	}
	lo, hi := 0, maxPerYear // lo fails (or is 0), hi succeeds
	var best *Detection
	for _, x := range known {
		if x == nil || x.Plan.Years != years || x.Plan.PerYear > maxPerYear {
			continue
		}
		if x.Relative <= target && x.Plan.PerYear <= hi {
			hi, best = x.Plan.PerYear, x
		}
		if x.Relative > target && x.Plan.PerYear > lo {
			lo = x.Plan.PerYear
		}
	}
	if best == nil {
		top, err := at(maxPerYear)
		if err != nil {
			return 0, nil, false, err
		}
		if top.Relative > target {
			return maxPerYear, top, false, nil
		}
		best = top
	}
	if lo >= hi { // the simulated curve is not monotone here: take the known success
		return hi, best, true, nil
	}
	for hi-lo > 1 {
		m := (lo + hi) / 2
		dm, err := at(m)
		if err != nil {
			return 0, nil, false, err
		}
		if dm.Relative <= target {
			hi, best = m, dm
		} else {
			lo = m
		}
	}
	return hi, best, true, nil
}
