package flux

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"

	"lixiv/engine/discharge"
	"lixiv/engine/internal/quantile"
)

// DrawMode says how Bootstrap uses the Monte Carlo draws of a series.
type DrawMode int

// Draw modes. The zero value is PerSampleDraw.
const (
	// PerSampleDraw takes, in each replicate, one draw of each sample from
	// that sample's own weighted posterior: draw k with probability
	// Weights[i][k] / Σ_k Weights[i][k] (equal without weights). A draw of
	// weight 0 (rejected by the model) is never taken, whatever value it
	// holds. Samples may have different numbers of draws.
	PerSampleDraw DrawMode = iota
	// JointDraw takes one draw number d per replicate for every sample,
	// for models whose draw d stands for the same shared end-member values
	// in every sample (Draws[i][d] for every i; every sample with draws has
	// the same number). Draw d is taken with probability proportional to
	// its joint weight Π_i Weights[i][d], the posterior of the shared
	// values given every sample (independent data errors; common practice
	// for importance weights). A draw any sample rejected has joint weight
	// 0 and is never taken; Bootstrap returns ErrDraws when no draw is kept
	// by every sample.
	JointDraw
)

// Sources is a set of the inputs whose uncertainty Bootstrap propagates.
type Sources uint8

// The sources of a bootstrap replicate, each drawn from its own PCG stream.
const (
	// Sampling is the resampling of the samples within each reporting year.
	Sampling Sources = 1 << iota
	// Apportionment is each sample's draw from Series.Draws: the end-member
	// ratios of the inverse model, and the rain ratios and ET factor where
	// their spread is set, all enter through the draws.
	Apportionment
	// Discharge is the systematic discharge error (DischargeError).
	Discharge
	// Area is the catchment-area error (AreaError).
	Area
	// AllSources is every source.
	AllSources = Sampling | Apportionment | Discharge | Area
)

// String names the sources, as "sampling+discharge" ("none" for none).
func (s Sources) String() string {
	var parts []string
	for i, n := range []string{"sampling", "apportionment", "discharge", "area"} {
		if s&(1<<i) != 0 {
			parts = append(parts, n)
		}
	}
	if len(parts) == 0 {
		return "none"
	}
	return strings.Join(parts, "+")
}

// Alone returns the options with every source but s held at its central
// value, for a breakdown of an interval by source: the same seed, so the
// varied source takes the same values, replicate by replicate, as in a
// bootstrap of all sources together.
func (b BootstrapOptions) Alone(s Sources) BootstrapOptions {
	b.Hold = AllSources &^ s
	return b
}

// BootstrapOptions control Bootstrap. The zero value runs 1000 replicates
// with seed 0, no discharge or area error, shared draws and every source
// varied.
type BootstrapOptions struct {
	Replicates int    // number of replicates; 0 means 1000
	Seed       uint64 // seed of the PCG generators; the same seed gives the same bits natively and in WebAssembly
	// DischargeError is the relative standard deviation σ_Q of a systematic
	// error of the whole discharge record (a rating error): each replicate
	// multiplies every daily and sampled discharge by f = 1 + σ_Q ε, ε
	// standard normal, redrawn while f ≤ 0 (docs/methods.md §8.6). Since every
	// estimator's concentrations are unchanged by a common scale of Q (the
	// rating curve's intercept absorbs it), the replicate's loads and runoff
	// are multiplied by f.
	DischargeError float64
	// AreaError is the relative standard deviation σ_A of the catchment
	// area: each replicate divides yields and runoff by A(1 + σ_A ε′),
	// redrawn while that is not positive.
	AreaError float64
	// Draws says how the samples' Monte Carlo draws are taken; the zero
	// value is PerSampleDraw.
	Draws DrawMode
	// Cache, when set, keeps each measured series' replicate loads, so
	// that the bootstraps of one budget that rest on the same measured
	// species (Series without draws, and the parts of Apportioned
	// quantities) fit it once per replicate, and the replicates'
	// resampling counts, error factors and draws. Results are the same
	// with or without it.
	Cache *Cache
	// Hold lists the sources held at their central values: every sample
	// once (Sampling), each sample's point concentration, Series.C or the
	// median of its draws, or Share.Amount (Apportionment), the recorded
	// discharge (Discharge) and the given area (Area). The zero value holds none. A held source's stream is still
	// drawn from, so the others take the same values as with none held.
	// With every source held, every replicate gives the point estimate
	// (to rounding, for the rating curve's summed moments).
	Hold Sources
	// Tick, when set, is called now and then during a long bootstrap
	// (after each sample's draws are checked and after each replicate),
	// so that a caller running on one goroutine can hand control back to
	// its host. It must not change anything the bootstrap reads; results
	// do not depend on it.
	Tick func()
	// DrawNumbers, when set, gives the draw number every sample with draws
	// takes in each replicate (DrawNumbers[r] for replicate r), in place of
	// the draw stream: for budgets whose draw d stands for the same shared
	// values (end-member ratios, rain ratios) in every sample of every
	// budget, so that a caller comparing them takes one draw per replicate
	// for all (engine/compare). A sample must keep the draw it is given
	// (a positive weight); Bootstrap and BootstrapApportioned return
	// ErrDraws otherwise, and when there are fewer numbers than replicates.
	DrawNumbers []int
	// KeepReplicates keeps each replicate's loads in Uncertainty.Loads.
	KeepReplicates bool
	// Context, when set, cancels a long bootstrap: it is looked at before
	// every replicate, and the bootstrap then returns its error.
	Context context.Context
}

func (b *BootstrapOptions) tick() {
	if b.Tick != nil {
		b.Tick()
	}
}

// err is the error of a cancelled Context, nil while the bootstrap may go
// on.
func (b *BootstrapOptions) err() error {
	if b.Context != nil {
		return b.Context.Err()
	}
	return nil
}

// Interval is a bootstrap summary: the median and the 2.5 % and 97.5 %
// quantiles (type 7, linear between order statistics; common practice).
type Interval = quantile.Interval

// LoadInterval holds an Interval for each figure of a Load.
type LoadInterval struct {
	Mol, Tonnes, MolPerKm2, TonnesPerKm2, RunoffMM Interval
}

// YearInterval is the uncertainty of one reporting year's load.
type YearInterval struct {
	discharge.Year
	LoadInterval
}

// Uncertainty is the outcome of Bootstrap.
type Uncertainty struct {
	Series     string
	Method     Method
	Seed       uint64
	Replicates int            // replicates that gave a load
	Failed     int            // replicates that could not be fitted (left out of the intervals)
	Years      []YearInterval // per reporting year
	Mean       LoadInterval   // mean annual over complete years
	// MeanMol holds each replicate's mean annual load (mol/yr; NaN for a
	// failed replicate), so that series bootstrapped with the same seed and
	// samples can be combined replicate by replicate.
	MeanMol []float64
	// Area holds each replicate's catchment area (km², after its area
	// error), the same in every series bootstrapped with the same seed, so
	// that yields of combined replicates can be formed.
	Area []float64
	// Loads holds each replicate's loads (its reporting years and its
	// mean annual load, after the discharge and area errors), when
	// BootstrapOptions.KeepReplicates is set; nil otherwise.
	Loads    []ReplicateLoads
	Warnings []error
}

// ReplicateLoads are the loads of one bootstrap replicate: each reporting
// year's (the Uncertainty's Years, in order) and the mean annual load over
// the complete years. A failed replicate holds NaN.
type ReplicateLoads struct {
	Years []Load
	Mean  Load
}

// ErrDraws reports draws that Bootstrap cannot use.
var ErrDraws = errors.New("unusable Monte Carlo draws")

// PCG stream constants: resampling, draw choice, and discharge and area
// errors use separate streams, so series with and without draws bootstrapped
// with one seed resample the same samples and share the discharge errors.
const (
	streamResample = 0x6c697869762d7273 // "lixiv-rs"
	streamDraw     = 0x6c697869762d6472 // "lixiv-dr"
	streamError    = 0x6c697869762d6572 // "lixiv-er"
)

// Bootstrap estimates the uncertainty of Estimate's loads. Each replicate
// (1) resamples the samples with replacement within each reporting year
// (a stratified bootstrap; Efron & Tibshirani 1993), (2) takes each
// sample's concentration from one of its Monte Carlo draws when the series
// has them (BootstrapOptions.Draws), (3) scales discharge by a systematic
// error and (4) perturbs the area, then recomputes every year's load. It
// reports the median and 95 % interval of every figure. Results depend only
// on the inputs and the seed.
func Bootstrap(rec *discharge.Record, s Series, opt Options, b BootstrapOptions) (*Uncertainty, error) {
	if rec == nil || rec.Len() == 0 {
		return nil, fmt.Errorf("%s: %w: the discharge record is empty", s.Name, ErrNoSamples)
	}
	years := rec.Years(opt.FirstMonth)
	smp, warns := match(rec, s, years)
	u := &Uncertainty{Series: s.Name, Method: opt.Method, Seed: b.Seed, Warnings: warns}
	if valued(smp) == 0 {
		return u, fmt.Errorf("%s: %w", s.Name, ErrNoSamples)
	}
	if len(s.Draws) == 0 && b.Cache != nil {
		// A measured series: its replicate loads are the cache's.
		rl, err := b.Cache.loads(rec, s, opt, b, smp, years)
		if err != nil {
			return u, err
		}
		rp := newReplicates(smp, len(s.Days), years, b)
		col := newCollector(u, years, rp.nrep, opt, s.MolarMass, b.KeepReplicates)
		out := make([]float64, len(years))
		for r := 0; r < rp.nrep; r++ {
			if err := b.err(); err != nil {
				return nil, err
			}
			fq, fa := rp.next(nil, nil)
			copy(out, rl.mol[r])
			col.add(r, out, rl.e.sumQ, fq, fa, rl.ok[r])
			b.tick()
		}
		col.finish()
		return u, nil
	}
	ps := s
	if b.Hold&Apportionment != 0 {
		ps.Draws = nil // every sample keeps its point value; the draws are not read
	}
	pk, err := newPicker(ps.Name, len(ps.Days), ps.Draws, ps.Weights, b.Draws, b.tick)
	if err != nil {
		return u, err
	}
	nrep := b.Replicates
	if nrep <= 0 {
		nrep = 1000
	}
	if err := pk.checkGiven(ps.Name, b.DrawNumbers, nrep); err != nil {
		return u, err
	}
	e := newEngine(rec, smp, years, opt)
	e.replicate = true
	rp := newReplicates(smp, len(s.Days), years, b)
	col := newCollector(u, years, rp.nrep, opt, s.MolarMass, b.KeepReplicates)
	c := make([]float64, len(smp))
	idx := make([]int, len(s.Days))
	out := make([]float64, len(years))
	// With neither the samples nor their concentrations varied, every
	// replicate has the same loads before its discharge and area errors:
	// they are computed once, into fixed.
	var fixed []float64
	fixedOK := false
	for r := 0; r < rp.nrep; r++ {
		if err := b.err(); err != nil {
			return nil, err
		}
		fq, fa := rp.next(pk, idx)
		for j, sm := range smp {
			c[j] = sm.c
			if k := idx[sm.idx]; k >= 0 {
				c[j] = ps.Draws[sm.idx][k]
			}
		}
		var ok bool
		switch {
		case b.Hold&(Sampling|Apportionment) != Sampling|Apportionment:
			ok = e.loads(opt.Method, rp.w, c, out, nil)
		case fixed == nil:
			ok = e.loads(opt.Method, rp.w, c, out, nil)
			fixed, fixedOK = append([]float64(nil), out...), ok
		default:
			ok = fixedOK
			copy(out, fixed)
		}
		col.add(r, out, e.sumQ, fq, fa, ok)
		b.tick()
	}
	col.finish()
	return u, nil
}

// valued counts the matched samples with a concentration.
func valued(smp []sample) int {
	n := 0
	for _, sm := range smp {
		if !math.IsNaN(sm.c) {
			n++
		}
	}
	return n
}

// replicates hands out what varies from one bootstrap replicate to the
// next: the resampling counts of the samples, each sample's draw and the
// discharge and area factors, each from its own PCG stream. The counts and
// factors of a seed are the same for every series with the same samples,
// so they are drawn once (repSet) and shared through BootstrapOptions.Cache.
type replicates struct {
	b    BootstrapOptions
	nrep int
	set  *repSet
	r    int       // the next replicate
	w    []float64 // this replicate's count of each matched sample
	ones []float64
	rd   *rand.Rand
}

// repSet holds every replicate's resampling counts and its discharge and
// area factors, before any source is held.
type repSet struct {
	w      [][]float64
	fq, fa []float64
}

// newReplicates prepares the replicates for the matched samples smp of a
// series of n samples.
func newReplicates(smp []sample, n int, years []discharge.Year, b BootstrapOptions) *replicates {
	rp := &replicates{b: b, nrep: b.Replicates, rd: rand.New(rand.NewPCG(b.Seed, streamDraw))}
	if rp.nrep <= 0 {
		rp.nrep = 1000
	}
	rp.ones = make([]float64, len(smp))
	for i := range rp.ones {
		rp.ones[i] = 1
	}
	if b.Cache != nil {
		rp.set = b.Cache.replicateSet(smp, years, b, rp.nrep)
	} else {
		rp.set = drawReplicates(smp, years, b, rp.nrep)
	}
	return rp
}

// drawReplicates draws nrep replicates' resampling counts (stratified by
// year) and discharge and area factors from the seed's streams.
func drawReplicates(smp []sample, years []discharge.Year, b BootstrapOptions, nrep int) *repSet {
	groups := make([][]int, len(years))
	for i, sm := range smp {
		if sm.year >= 0 {
			groups[sm.year] = append(groups[sm.year], i)
		}
	}
	rs := rand.New(rand.NewPCG(b.Seed, streamResample))
	re := rand.New(rand.NewPCG(b.Seed, streamError))
	set := &repSet{w: make([][]float64, nrep), fq: make([]float64, nrep), fa: make([]float64, nrep)}
	for r := range set.w {
		w := make([]float64, len(smp))
		for _, g := range groups {
			for range g {
				w[g[rs.IntN(len(g))]]++
			}
		}
		set.w[r] = w
		set.fq[r] = factor(re, b.DischargeError)
		set.fa[r] = factor(re, b.AreaError)
	}
	return set
}

// next moves to the next replicate: rp.w, the draw of each sample into
// idx (by the series' sample index; -1 for the point value) when pk is
// set, and the discharge and area factors. Held sources take their central
// values, but their streams are drawn from all the same.
func (rp *replicates) next(pk *picker, idx []int) (fq, fa float64) {
	r := rp.r
	rp.r++
	rp.w = rp.set.w[r]
	if rp.b.Hold&Sampling != 0 {
		rp.w = rp.ones
	}
	switch {
	case pk != nil && rp.b.DrawNumbers != nil:
		pk.given(rp.b.DrawNumbers[r], idx)
	case pk != nil:
		pk.pick(rp.rd, idx)
	}
	fq, fa = rp.set.fq[r], rp.set.fa[r]
	if rp.b.Hold&Discharge != 0 {
		fq = 1
	}
	if rp.b.Hold&Area != 0 {
		fa = 1
	}
	return fq, fa
}

// collector gathers each replicate's figures and turns them into the
// intervals of an Uncertainty.
type collector struct {
	u     *Uncertainty
	years []discharge.Year
	opt   Options
	mass  float64
	vals  [][]float64 // (year or mean) × figure, over replicates
	sumQ  []float64
	nrep  int
	// keepAll keeps every replicate's loads (KeepReplicates).
	keepAll bool
}

const figuresPerLoad = 5 // Mol, Tonnes, MolPerKm2, TonnesPerKm2, RunoffMM

func newCollector(u *Uncertainty, years []discharge.Year, nrep int, opt Options, mass float64, keep bool) *collector {
	c := &collector{u: u, years: years, opt: opt, mass: mass, nrep: nrep, sumQ: make([]float64, len(years)), keepAll: keep,
		vals: make([][]float64, (len(years)+1)*figuresPerLoad)}
	for i := range c.vals {
		c.vals[i] = make([]float64, nrep)
	}
	u.MeanMol = make([]float64, nrep)
	u.Area = make([]float64, nrep)
	return c
}

// keep records replicate r's loads in u.Loads when asked.
func (c *collector) keep(r int, yl []YearLoad, mean Load) {
	if c.u.Loads == nil {
		c.u.Loads = make([]ReplicateLoads, c.nrep)
	}
	ys := make([]Load, len(yl))
	for y := range yl {
		ys[y] = yl[y].Load
	}
	c.u.Loads[r] = ReplicateLoads{Years: ys, Mean: mean}
}

// add records replicate r: out holds each year's load in mol before the
// discharge factor fq (it is scaled in place), sumQ each year's summed
// discharge; fa is the area factor; ok is false for a replicate the
// estimator could not fit. A replicate without a mean annual load counts
// as failed.
func (c *collector) add(r int, out, sumQ []float64, fq, fa float64, ok bool) {
	ropt := c.opt
	ropt.AreaKm2 = c.opt.AreaKm2 * fa
	for y := range out {
		out[y] *= fq
		c.sumQ[y] = sumQ[y] * fq
		if !ok {
			out[y] = math.NaN()
		}
	}
	ny := len(c.years)
	yl, mean, _ := summarise(c.years, out, c.sumQ, make([]int, ny), ropt, c.mass, nil, c.u.Series)
	if !ok || math.IsNaN(mean.Mol) || math.IsInf(mean.Mol, 0) {
		c.u.Failed++
	}
	for y := 0; y <= ny; y++ {
		l := mean
		if y < ny {
			l = yl[y].Load
		}
		c.vals[y*figuresPerLoad+0][r] = l.Mol
		c.vals[y*figuresPerLoad+1][r] = l.Tonnes
		c.vals[y*figuresPerLoad+2][r] = l.MolPerKm2
		c.vals[y*figuresPerLoad+3][r] = l.TonnesPerKm2
		c.vals[y*figuresPerLoad+4][r] = l.RunoffMM
	}
	c.u.MeanMol[r] = mean.Mol
	c.u.Area[r] = ropt.AreaKm2
	if c.keepAll {
		c.keep(r, yl, mean)
	}
}

// finish summarises the replicates into the Uncertainty.
func (c *collector) finish() {
	u := c.u
	u.Replicates = c.nrep - u.Failed
	if u.Failed > 0 {
		u.Warnings = append(u.Warnings, fmt.Errorf("%s: %d of %d replicates could not be fitted and are left out of the intervals", u.Series, u.Failed, c.nrep))
	}
	li := func(y int) LoadInterval {
		v := c.vals[y*figuresPerLoad:]
		return LoadInterval{Mol: summary(v[0]), Tonnes: summary(v[1]), MolPerKm2: summary(v[2]),
			TonnesPerKm2: summary(v[3]), RunoffMM: summary(v[4])}
	}
	ny := len(c.years)
	u.Years = make([]YearInterval, ny)
	for y := range c.years {
		u.Years[y] = YearInterval{Year: c.years[y], LoadInterval: li(y)}
	}
	u.Mean = li(ny)
}

// maxRedraws bounds factor's redrawing: for σ up to 10 (1000 %) a draw is
// positive with probability above 0.46, so 1000 redraws all failing has a
// probability below 1e-300; a σ that is NaN or infinite stops there.
const maxRedraws = 1000

// factor returns 1 + sd·ε, redrawn while not positive (at most maxRedraws
// times, NaN then, which leaves the replicate out of the intervals); it
// always consumes at least one normal draw so that streams stay aligned
// when sd is 0.
func factor(rng *rand.Rand, sd float64) float64 {
	for range maxRedraws {
		if f := 1 + sd*normal(rng); f > 0 {
			return f
		}
	}
	return math.NaN()
}

// Summary returns the median and 95 % interval of the non-NaN values of v
// (NaN throughout when there are none), as Bootstrap reports its figures:
// for quantities formed replicate by replicate from several series
// (Uncertainty.MeanMol). v is not changed.
func Summary(v []float64) Interval { return summary(v) }

// summary returns the median and 95 % interval of the non-NaN values of v.
func summary(v []float64) Interval { return quantile.NotNaN(v) }
