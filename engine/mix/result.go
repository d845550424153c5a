package mix

import (
	"encoding/binary"
	"hash/fnv"
	"math"

	"lixiv/engine/internal/quantile"
)

// Interval is a posterior median with its 2.5 % and 97.5 % quantiles.
type Interval = quantile.Interval

// Quantiles holds a Split for each of the 2.5 %, 50 % and 97.5 % posterior
// quantiles (taken cell by cell, so the three Splits need not add up like
// a single draw does).
type Quantiles struct{ Lo, Median, Hi Split }

// Result is the outcome of an inversion.
type Result struct {
	Seed       uint64         // seed the draws came from
	Options    Options        // the options in effect, defaults filled in
	EndMembers []EndMember    // the end-members, in the order of Alpha
	Tracers    []Tracer       // the tracers fitted
	Samples    []SampleResult // one per water, in input order
	Status     Status         // the worst sample status (NotRun while a Run is unfinished)
	// Confusions lists end-members the chosen tracers cannot tell from a
	// mix of the others, found before the run from the priors alone.
	Confusions []Confusion
	// Joint is true when draw k of every sample belongs to the same draw
	// of shared end-member ratios (the catchment-wide model): every sample
	// with draws has the same number, all of equal weight, and a flux may
	// take one draw number for all samples.
	Joint bool
	// Catchment is what the catchment-wide model learned about the shared
	// end-members (nil for the per-sample model).
	Catchment *Catchment
}

// SampleResult is the posterior of one water sample: a weighted sample of
// draws (every draw counts, with its importance weight) and its summary.
type SampleResult struct {
	Name    string
	Status  Status
	Verdict string // the status in words, such as "fits; the end-member ranges decide the split"
	// WellSampled is false when the effective sample size stayed below
	// min(200, Options.TargetESS): the quantiles are then rough.
	WellSampled bool
	// PriorDecided is true when for some end-member's Na fraction, or some
	// rock source's share of Na, Ca or Mg, the posterior 95 % width is at
	// least 0.8 of the width the end-member ranges alone give these data
	// (the unweighted prior draws) and at least 0.1: the data did not
	// narrow the split.
	PriorDecided bool
	// NoRock is the posterior probability that no end-member contributes
	// at all: rain (and the correction's evaporite) explain the water.
	NoRock float64
	Draws  int     // draws taken, over all stages
	Stages int     // the prior stage and the refinement stages
	Stop   Stop    // why the refinement ended
	ESS    float64 // effective sample size (sum w)² / sum w² (NaN for a rule)
	// PPP is the posterior predictive probability of the misfit: the
	// weighted share of replicated data sets whose χ² exceeds that of the
	// data. Below 0.01 the sample does not fit (docs/methods.md §7.7).
	PPP   float64
	Alpha []Interval // fraction of the sample's Na from each end-member (0 for one that took no part)
	// PriorWidth is, per end-member, the posterior 95 % width of its Na
	// fraction over the width its prior ranges alone give these data (the
	// unweighted prior draws): near 1, the ranges decide the split.
	PriorWidth []float64
	// Corr is the posterior correlation of the Na the end-members bring
	// (NaN for an end-member that took no part or does not vary); near −1
	// the data fix the sum of two but not the split between them
	// (docs/methods.md §7.9; the fractions of two end-members alone are always
	// perfectly anticorrelated, their amounts are not).
	Corr   [][]float64
	Amount Quantiles // µmol/L of each cation from each source
	Share  Quantiles // fraction of each cation from each source
	// Misfit is the datum the fit matches worst (nil for a rule or a
	// skipped sample).
	Misfit *Misfit
	// Bounds lists the end-member ratios whose posterior median lies
	// beyond their prior's 95 % range: the data push against it.
	Bounds   []Bound
	Active   []bool  // the end-members that took part
	Warnings []error // problems that did not stop the inversion

	setup setup
	draws []kept
}

// Misfit describes the datum the fit matches worst, as ratios to Na where
// it has one.
type Misfit struct {
	Tracer   Tracer  // the tracer, or -1 for Na itself
	Measured float64 // the measured ratio to Na (µmol/L for Na)
	Fitted   float64 // the weighted median of the fitted values
	Lo, Hi   float64 // the smallest and largest value any draw gives
	Z        float64 // weighted mean of the standardised residual (measured − fitted)/σ
	Text     string  // in words
}

// Bound is an end-member ratio whose posterior piles against an edge of
// its prior.
type Bound struct {
	EndMember int
	Tracer    Tracer
	Upper     bool    // the upper edge (else the lower)
	Limit     float64 // the ratio at that edge of the prior's 95 % range
	Median    float64 // the posterior median of the ratio
}

// kept is one stored draw of a sample.
type kept struct {
	split Split
	so4   float64
	w     float64
}

// Err returns the sample's status error (nil when it fits or was
// answered by a rule).
func (s *SampleResult) Err() error { return s.Status.Err() }

// Doubtful reports whether the sample's result should not be trusted as
// it stands: it does not fit, fits only with end-member ratios beyond
// their prior ranges, is poorly sampled, or was not inverted.
func (s *SampleResult) Doubtful() bool {
	return s.Status != Fits && s.Status != Rule || !s.WellSampled || len(s.Bounds) > 0
}

// worst returns the status of the whole result.
func (r *Result) worst() Status {
	w := Fits
	for i := range r.Samples {
		st := r.Samples[i].Status
		if st == NotRun {
			return NotRun
		}
		w = max(w, st)
	}
	return w
}

// Kept returns the number of draws stored for sample s: every draw with a
// weight above 1e-12 of the largest (lighter ones carry no measurable
// share of the posterior).
func (r *Result) Kept(s int) int { return len(r.Samples[s].draws) }

// Draw returns the k-th stored draw of sample s (k < Kept(s)): its draw
// number d (= k: draws belong to their sample), the amount of each cation
// from each source in µmol/L (the correction's atmospheric and evaporite
// amounts included), and its weight. The draws with their weights are the
// sample's posterior; a flux can pick one in proportion to its weight.
func (r *Result) Draw(s, k int) (d int, split Split, weight float64) {
	dr := &r.Samples[s].draws[k]
	return k, dr.split, dr.w
}

// SO4Sulf returns the sulfide-derived sulfate (µmol/L) of the k-th stored
// draw of sample s, which follows the draw's atmospheric sulfate.
func (r *Result) SO4Sulf(s, k int) float64 { return r.Samples[s].draws[k].so4 }

// Checksum returns a 64-bit FNV-1a hash of the bits of every number in the
// result: statuses, summaries and every stored draw. Two runs agree bit for
// bit exactly when their checksums agree (barring a hash collision).
func (r *Result) Checksum() uint64 {
	h := fnv.New64a()
	var b [8]byte
	put := func(v uint64) {
		binary.LittleEndian.PutUint64(b[:], v)
		h.Write(b[:])
	}
	f := func(x float64) { put(math.Float64bits(x)) }
	sp := func(s *Split) {
		for src := range NSources {
			for c := range NCations {
				f(s[src][c])
			}
		}
	}
	put(r.Seed)
	for i := range r.Samples {
		s := &r.Samples[i]
		put(uint64(s.Status))
		h.Write([]byte(s.Verdict))
		put(uint64(s.Draws))
		f(s.ESS)
		f(s.PPP)
		for _, a := range s.Alpha {
			f(a.Lo)
			f(a.Median)
			f(a.Hi)
		}
		for _, v := range s.PriorWidth {
			f(v)
		}
		for _, q := range []*Quantiles{&s.Amount, &s.Share} {
			sp(&q.Lo)
			sp(&q.Median)
			sp(&q.Hi)
		}
		for k := range s.draws {
			sp(&s.draws[k].split)
			f(s.draws[k].so4)
			f(s.draws[k].w)
		}
	}
	return h.Sum64()
}
