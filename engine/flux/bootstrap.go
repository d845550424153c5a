package flux

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"

	"lixiv/engine/discharge"
)

// DrawMode says how Bootstrap uses the Monte Carlo draws of a series.
type DrawMode int

// Draw modes. The zero value is SharedDraw.
const (
	// SharedDraw picks one draw index d per replicate and takes draw d of
	// every sample, keeping the pairing of the inverse mixing model, which
	// uses the same end-member draw d for every sample. With Weights, d is
	// chosen with probability proportional to the mean over samples of each
	// sample's normalised weight of d. Every sample must have the same
	// number of draws.
	SharedDraw DrawMode = iota
	// PerSampleDraw picks a draw for each sample on its own, in proportion
	// to that sample's Weights (equal without them).
	PerSampleDraw
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
	// standard normal, redrawn while f ≤ 0 (science brief §8.6). Since every
	// estimator's concentrations are unchanged by a common scale of Q (the
	// rating curve's intercept absorbs it), the replicate's loads and runoff
	// are multiplied by f.
	DischargeError float64
	// AreaError is the relative standard deviation σ_A of the catchment
	// area: each replicate divides yields and runoff by A(1 + σ_A ε′),
	// redrawn while that is not positive.
	AreaError float64
	Draws     DrawMode
	// Hold lists the sources held at their central values: every sample
	// once (Sampling), each sample's point concentration, Series.C or the
	// median of its draws (Apportionment), the recorded discharge (Discharge) and the given area
	// (Area). The zero value holds none. A held source's stream is still
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
	// Context, when set, cancels a long bootstrap: it is looked at before
	// every replicate, and Bootstrap then returns its error.
	Context context.Context
}

func (b *BootstrapOptions) tick() {
	if b.Tick != nil {
		b.Tick()
	}
}

// Interval is a bootstrap summary: the median and the 2.5 % and 97.5 %
// quantiles (type 7, linear between order statistics; common practice).
type Interval struct {
	Median, Lo, Hi float64
}

// Contains reports whether v lies within [Lo, Hi].
func (iv Interval) Contains(v float64) bool { return v >= iv.Lo && v <= iv.Hi }

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
	Area     []float64
	Warnings []error
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
// has them, (3) scales discharge by a systematic error and (4) perturbs the
// area, then recomputes every year's load. It reports the median and 95 %
// interval of every figure. Results depend only on the inputs and the seed.
func Bootstrap(rec *discharge.Record, s Series, opt Options, b BootstrapOptions) (*Uncertainty, error) {
	if rec == nil || rec.Len() == 0 {
		return nil, fmt.Errorf("%s: %w: the discharge record is empty", s.Name, ErrNoSamples)
	}
	nrep := b.Replicates
	if nrep <= 0 {
		nrep = 1000
	}
	years := rec.Years(opt.FirstMonth)
	smp, warns := match(rec, s, years)
	u := &Uncertainty{Series: s.Name, Method: opt.Method, Seed: b.Seed, Warnings: warns}
	if len(smp) == 0 {
		return u, fmt.Errorf("%s: %w", s.Name, ErrNoSamples)
	}
	ps := s
	if b.Hold&Apportionment != 0 {
		ps.Draws = nil // every sample keeps its point value; the draws are not read
	}
	pick, err := newPicker(ps, smp, b.Draws, b.tick)
	if err != nil {
		return u, err
	}
	e := newEngine(rec, smp, years, opt)
	e.replicate = true
	groups := make([][]int, len(years))
	for i, sm := range smp {
		groups[sm.year] = append(groups[sm.year], i)
	}
	rs := rand.New(rand.NewPCG(b.Seed, streamResample))
	rd := rand.New(rand.NewPCG(b.Seed, streamDraw))
	re := rand.New(rand.NewPCG(b.Seed, streamError))

	ny := len(years)
	const nf = 5 // figures per load
	vals := make([][]float64, (ny+1)*nf)
	for i := range vals {
		vals[i] = make([]float64, nrep)
	}
	u.MeanMol = make([]float64, nrep)
	u.Area = make([]float64, nrep)
	w := make([]float64, len(smp))
	c := make([]float64, len(smp))
	out := make([]float64, ny)
	// With neither the samples nor their concentrations varied, every
	// replicate has the same loads before its discharge and area errors:
	// they are computed once, into fixed.
	var fixed []float64
	fixedOK := false
	for r := 0; r < nrep; r++ {
		if b.Context != nil && b.Context.Err() != nil {
			return nil, b.Context.Err()
		}
		for i := range w {
			w[i] = 0
		}
		for _, g := range groups {
			for range g {
				w[g[rs.IntN(len(g))]]++
			}
		}
		if b.Hold&Sampling != 0 {
			for i := range w {
				w[i] = 1
			}
		}
		pick(rd, c)
		fq := factor(re, b.DischargeError)
		fa := factor(re, b.AreaError)
		if b.Hold&Discharge != 0 {
			fq = 1
		}
		if b.Hold&Area != 0 {
			fa = 1
		}
		var ok bool
		switch {
		case b.Hold&(Sampling|Apportionment) != Sampling|Apportionment:
			ok = e.loads(opt.Method, w, c, out, nil)
		case fixed == nil:
			ok = e.loads(opt.Method, w, c, out, nil)
			fixed, fixedOK = append([]float64(nil), out...), ok
		default:
			ok = fixedOK
			copy(out, fixed)
		}
		ropt := opt
		ropt.AreaKm2 = opt.AreaKm2 * fa
		sumQ := make([]float64, ny)
		for y := range out {
			out[y] *= fq
			sumQ[y] = e.sumQ[y] * fq
		}
		if !ok {
			u.Failed++
			for y := range out {
				out[y] = math.NaN()
			}
		}
		yl, mean, _ := summarise(years, out, sumQ, make([]int, ny), ropt, s.MolarMass, nil, s.Name)
		for y := 0; y <= ny; y++ {
			l := mean
			if y < ny {
				l = yl[y].Load
			}
			vals[y*nf+0][r] = l.Mol
			vals[y*nf+1][r] = l.Tonnes
			vals[y*nf+2][r] = l.MolPerKm2
			vals[y*nf+3][r] = l.TonnesPerKm2
			vals[y*nf+4][r] = l.RunoffMM
		}
		u.MeanMol[r] = mean.Mol
		u.Area[r] = ropt.AreaKm2
		b.tick()
	}
	u.Replicates = nrep - u.Failed
	if u.Failed > 0 {
		u.Warnings = append(u.Warnings, fmt.Errorf("%s: %d of %d replicates could not be fitted and are left out of the intervals", s.Name, u.Failed, nrep))
	}
	li := func(y int) LoadInterval {
		return LoadInterval{
			Mol: summary(vals[y*nf+0]), Tonnes: summary(vals[y*nf+1]), MolPerKm2: summary(vals[y*nf+2]),
			TonnesPerKm2: summary(vals[y*nf+3]), RunoffMM: summary(vals[y*nf+4]),
		}
	}
	u.Years = make([]YearInterval, ny)
	for y := range years {
		u.Years[y] = YearInterval{Year: years[y], LoadInterval: li(y)}
	}
	u.Mean = li(ny)
	return u, nil
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
func summary(v []float64) Interval {
	s := make([]float64, 0, len(v))
	for _, x := range v {
		if !math.IsNaN(x) {
			s = append(s, x)
		}
	}
	if len(s) == 0 {
		return Interval{math.NaN(), math.NaN(), math.NaN()}
	}
	sort.Float64s(s)
	return Interval{Median: Quantile(s, 0.5), Lo: Quantile(s, 0.025), Hi: Quantile(s, 0.975)}
}

// Quantile returns the p-quantile of sorted values by linear interpolation
// between order statistics (Hyndman & Fan 1996 type 7; common practice).
func Quantile(sorted []float64, p float64) float64 {
	n := len(sorted)
	if n == 0 {
		return math.NaN()
	}
	h := p * float64(n-1)
	lo := int(math.Floor(h))
	if lo >= n-1 {
		return sorted[n-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

// newPicker returns a function that fills c with one replicate's
// concentrations: the samples' values, or draws from s.Draws.
func newPicker(s Series, smp []sample, mode DrawMode, tick func()) (func(*rand.Rand, []float64), error) {
	base := make([]float64, len(smp))
	for i, sm := range smp {
		base[i] = sm.c
	}
	if len(s.Draws) == 0 {
		return func(_ *rand.Rand, c []float64) { copy(c, base) }, nil
	}
	draws := make([][]float64, len(smp))
	nd := -1
	for i, sm := range smp {
		tick()
		if sm.idx < len(s.Draws) && len(s.Draws[sm.idx]) > 0 {
			draws[i] = s.Draws[sm.idx]
			for d, v := range draws[i] {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					return nil, fmt.Errorf("%s: %w: sample %d draw %d is %g", s.Name, ErrDraws, sm.idx+1, d, v)
				}
			}
			if mode == SharedDraw {
				if nd >= 0 && len(draws[i]) != nd {
					return nil, fmt.Errorf("%s: %w: shared draws need the same number of draws for every sample (sample %d has %d, others %d)", s.Name, ErrDraws, sm.idx+1, len(draws[i]), nd)
				}
				nd = len(draws[i])
			}
		}
	}
	// Cumulative weights, per sample or shared.
	cum := make([][]float64, len(smp))
	if s.Weights != nil {
		for i, sm := range smp {
			if draws[i] == nil {
				continue
			}
			tick()
			if sm.idx >= len(s.Weights) || len(s.Weights[sm.idx]) != len(draws[i]) {
				return nil, fmt.Errorf("%s: %w: sample %d needs one weight per draw", s.Name, ErrDraws, sm.idx+1)
			}
			cw := make([]float64, len(draws[i]))
			t := 0.0
			for d, v := range s.Weights[sm.idx] {
				if !(v >= 0) || math.IsInf(v, 0) {
					return nil, fmt.Errorf("%s: %w: sample %d weight %d is %g", s.Name, ErrDraws, sm.idx+1, d, v)
				}
				t += v
				cw[d] = t
			}
			if !(t > 0) {
				return nil, fmt.Errorf("%s: %w: sample %d has no positive weight", s.Name, ErrDraws, sm.idx+1)
			}
			cum[i] = cw
		}
	}
	pickOne := func(rng *rand.Rand, cw []float64, n int) int {
		if cw == nil {
			return rng.IntN(n)
		}
		x := rng.Float64() * cw[len(cw)-1]
		return min(sort.Search(n, func(i int) bool { return cw[i] > x }), n-1)
	}
	if mode == PerSampleDraw {
		return func(rng *rand.Rand, c []float64) {
			for i := range c {
				if draws[i] == nil {
					c[i] = base[i]
					continue
				}
				c[i] = draws[i][pickOne(rng, cum[i], len(draws[i]))]
			}
		}, nil
	}
	var shared []float64
	if s.Weights != nil {
		shared = make([]float64, nd)
		for i := range smp {
			if cum[i] == nil {
				continue
			}
			tot := cum[i][nd-1]
			prev := 0.0
			for d := range nd {
				shared[d] += (cum[i][d] - prev) / tot
				prev = cum[i][d]
			}
		}
		for d := 1; d < nd; d++ {
			shared[d] += shared[d-1]
		}
	}
	return func(rng *rand.Rand, c []float64) {
		d := pickOne(rng, shared, nd)
		for i := range c {
			if draws[i] == nil {
				c[i] = base[i]
				continue
			}
			c[i] = draws[i][d]
		}
	}, nil
}
