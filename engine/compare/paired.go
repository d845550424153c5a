package compare

import (
	"fmt"
	"math"

	"lixiv/engine/discharge"
	"lixiv/engine/flux"
)

// Budget is one catchment over one period as a comparison fluxes it: its
// discharge record over the period, its estimator options and its
// bootstrap's errors.
type Budget struct {
	Name    string // for messages, such as "treated"
	Record  *discharge.Record
	Options flux.Options
	// Bootstrap gives the budget's discharge and area errors and, as a
	// speed-up, a Cache to share between the quantities of the budget;
	// Pair sets its seed, replicates, draw numbers and draw mode.
	Bootstrap flux.BootstrapOptions
}

// Options control Pair.
type Options struct {
	Design     Design
	Replicates int    // bootstrap replicates; 0 means 1000
	Seed       uint64 // the comparison's seed; each budget's own parts take BudgetSeed(Seed, b)
	// Picks, when set, gives the draw each replicate takes in every sample
	// of every budget (an index into the quantities' draws; Joint.Picks):
	// the shared parts drawn once per replicate. Without it each sample
	// takes a draw from its own weighted draws (flux.Apportioned.Weights),
	// independently in each budget, which is all there is when each
	// sample's draws are its own (the inverse model): what the budgets
	// share is then not drawn as shared.
	Picks []int
	// PointOnly leaves out the bootstrap: the point values alone, every
	// interval NaN (a quick first pass).
	PointOnly bool
}

// BudgetSeed returns the seed of budget b's own parts (resampling,
// discharge and area errors, and per-sample draws without Picks): a
// SplitMix64 step from the comparison's seed, so the budgets' streams are
// unrelated.
func BudgetSeed(seed uint64, b int) uint64 {
	z := seed + uint64(b+1)*0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// Series is one budget's quantity: the point result and the bootstrap,
// with every replicate's loads.
type Series struct {
	Point *flux.Result
	Boot  *flux.Uncertainty
}

// PerMM returns the flow-normalised mean annual yield of the point result,
// mol/km²/mm (µmol/L).
func (s *Series) PerMM() float64 { return s.Point.Mean.MolPerKm2 / s.Point.Mean.RunoffMM }

// Yields returns the median and 95 % interval of the mean annual yield
// over the replicates, per km² (mol/km²/yr) and per mm of runoff
// (mol/km²/mm); the point values without an interval when there was no
// bootstrap.
func (s *Series) Yields() (perKm2, perMM flux.Interval) {
	if s.Boot == nil {
		nan := math.NaN()
		return flux.Interval{Median: s.Point.Mean.MolPerKm2, Lo: nan, Hi: nan}, flux.Interval{Median: s.PerMM(), Lo: nan, Hi: nan}
	}
	y, m := make([]float64, len(s.Boot.Loads)), make([]float64, len(s.Boot.Loads))
	for r, l := range s.Boot.Loads {
		y[r], m[r] = l.Mean.MolPerKm2, l.Mean.MolPerKm2/l.Mean.RunoffMM
	}
	return flux.Summary(y), flux.Summary(m)
}

// YearDifference is the difference of one reporting year: treated − control
// in that year, or for BACI the after year's treated − control less the
// mean of before's.
type YearDifference struct {
	Year             int // reporting-year label
	Yield, PerMM     Difference
	YieldReps, MMRep []float64
}

// Outcome is a quantity compared across the budgets.
type Outcome struct {
	Name    string
	Budgets []Series // in the design's budget order
	// Yield is the difference of the mean annual yields (mol/km²/yr), PerMM
	// of the flow-normalised ones (mol/km²/mm).
	Yield, PerMM Difference
	// YieldReps and PerMMReps hold the replicate differences, for figures
	// formed from them.
	YieldReps, PerMMReps []float64
	// Years holds the difference of each reporting year that every "after"
	// budget has complete (the treated and control years over the same
	// period), in order.
	Years []YearDifference
}

// Pair fluxes one quantity of every budget (q[b] is budget b's) with its
// estimator, bootstraps it with opt.Replicates replicates and forms the
// design's differences replicate by replicate (see the package doc).
func Pair(budgets []Budget, q []flux.Apportioned, opt Options) (*Outcome, error) {
	nb := opt.Design.Budgets()
	if len(budgets) != nb || len(q) != nb {
		return nil, fmt.Errorf("the %s design needs %d budgets, got %d (and %d quantities)", opt.Design, nb, len(budgets), len(q))
	}
	nrep := opt.Replicates
	if nrep <= 0 {
		nrep = 1000
	}
	out := &Outcome{Name: q[0].Name, Budgets: make([]Series, nb)}
	for b, bu := range budgets {
		r, err := flux.EstimateApportioned(bu.Record, q[b], bu.Options)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", bu.Name, err)
		}
		if opt.PointOnly {
			out.Budgets[b] = Series{Point: r}
			continue
		}
		bo := bu.Bootstrap
		bo.Seed, bo.Replicates, bo.KeepReplicates = BudgetSeed(opt.Seed, b), nrep, true
		bo.DrawNumbers, bo.Draws, bo.Hold = opt.Picks, flux.PerSampleDraw, 0
		u, err := flux.BootstrapApportioned(bu.Record, q[b], bu.Options, bo)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", bu.Name, err)
		}
		out.Budgets[b] = Series{Point: r, Boot: u}
	}
	d := opt.Design
	v := make([]float64, nb)
	w := make([]float64, nb)
	for b := range out.Budgets {
		v[b], w[b] = out.Budgets[b].Point.Mean.MolPerKm2, out.Budgets[b].PerMM()
	}
	pY, pM := d.Combine(v), d.Combine(w)
	if opt.PointOnly {
		nrep = 0
	}
	out.YieldReps, out.PerMMReps = make([]float64, nrep), make([]float64, nrep)
	for r := 0; r < nrep; r++ {
		for b := range out.Budgets {
			l := out.Budgets[b].Boot.Loads[r].Mean
			v[b], w[b] = l.MolPerKm2, l.MolPerKm2/l.RunoffMM
		}
		out.YieldReps[r], out.PerMMReps[r] = d.Combine(v), d.Combine(w)
	}
	out.Yield, out.PerMM = Summarise(pY, out.YieldReps), Summarise(pM, out.PerMMReps)
	out.Years = out.years(d, nrep)
	return out, nil
}

// years forms the difference of each reporting year that the "after"
// budgets (treated and control) both have complete; "before" budgets
// enter with their mean annual values.
func (o *Outcome) years(d Design, nrep int) []YearDifference {
	// The index of each complete year in each after budget's results.
	at := []map[int]int{{}, {}}
	for b := range 2 {
		for y, yl := range o.Budgets[b].Point.Years {
			if yl.Complete() {
				at[b][yl.Label] = y
			}
		}
	}
	var out []YearDifference
	nb := d.Budgets()
	v, w := make([]float64, nb), make([]float64, nb)
	for _, yl := range o.Budgets[0].Point.Years {
		if !yl.Complete() {
			continue
		}
		i0, ok := at[1][yl.Label]
		if !ok {
			continue
		}
		idx := []int{at[0][yl.Label], i0}
		pick := func(b int, years []flux.Load, mean flux.Load) (float64, float64) {
			l := mean
			if b < 2 {
				l = years[idx[b]]
			}
			return l.MolPerKm2, l.MolPerKm2 / l.RunoffMM
		}
		for b := range nb {
			s := &o.Budgets[b]
			ys := make([]flux.Load, len(s.Point.Years))
			for k := range ys {
				ys[k] = s.Point.Years[k].Load
			}
			v[b], w[b] = pick(b, ys, s.Point.Mean)
		}
		yd := YearDifference{Year: yl.Label, YieldReps: make([]float64, nrep), MMRep: make([]float64, nrep)}
		pY, pM := d.Combine(v), d.Combine(w)
		for r := 0; r < nrep; r++ {
			for b := range nb {
				l := o.Budgets[b].Boot.Loads[r]
				v[b], w[b] = pick(b, l.Years, l.Mean)
			}
			yd.YieldReps[r], yd.MMRep[r] = d.Combine(v), d.Combine(w)
		}
		yd.Yield, yd.PerMM = Summarise(pY, yd.YieldReps), Summarise(pM, yd.MMRep)
		out = append(out, yd)
	}
	return out
}

// Sum returns the replicate-by-replicate sum of several replicate series
// (NaN where any is NaN), for a difference formed from others (the
// cumulative difference over the years, say).
func Sum(reps ...[]float64) []float64 {
	if len(reps) == 0 {
		return nil
	}
	out := make([]float64, len(reps[0]))
	for _, r := range reps {
		for i := range out {
			if i < len(r) {
				out[i] += r[i]
			} else {
				out[i] = math.NaN()
			}
		}
	}
	return out
}
