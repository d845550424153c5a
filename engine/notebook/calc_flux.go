package notebook

import (
	"fmt"
	"math"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
)

func init() { Register(KindFluxes, computeFluxes) }

var biases = map[string]flux.Bias{"smearing": flux.Duan, "ferguson": flux.Ferguson, "none": flux.NoBias}

// period cuts the record to the site's budget period.
func period(rec *discharge.Record, site *Site) (*discharge.Record, error) {
	a, b := 0, rec.Len()-1
	if site.HasStart {
		if a = rec.Index(site.Start); a < 0 {
			return nil, fmt.Errorf("site period_start %s lies outside the discharge record (%s to %s)", site.Start, rec.First(), rec.Last())
		}
	}
	if site.HasEnd {
		if b = rec.Index(site.End); b < 0 {
			return nil, fmt.Errorf("site period_end %s lies outside the discharge record (%s to %s)", site.End, rec.First(), rec.Last())
		}
	}
	if a == 0 && b == rec.Len()-1 {
		return rec, nil
	}
	return discharge.NewRecord(rec.Name, rec.Days[a], rec.Q[a:b+1]), nil
}

func fluxSetup(e *Env, s *FluxSettings) (*Fluxes, error) {
	app, err := inputOf[*Apportioned](e, "apportionment")
	if err != nil {
		return nil, err
	}
	flow, err := inputOf[*Flow](e, "discharge")
	if err != nil {
		return nil, err
	}
	site, err := inputOf[*Site](e, "site")
	if err != nil {
		return nil, err
	}
	rec, err := period(flow.Record, site)
	if err != nil {
		return nil, err
	}
	if err := firstErr(checkBootstrapWork("bootstrap", s.Bootstrap, len(app.Names), rec.Len()),
		checkBootstrapWork("series_bootstrap", s.SeriesBootstrap, len(app.Names), rec.Len())); err != nil {
		return nil, err
	}
	// Joint draws (the catchment-wide model) are taken one draw number for
	// every sample; the other models' draws are each sample's own.
	mode := flux.PerSampleDraw
	if app.Joint {
		mode = flux.JointDraw
	}
	return &Fluxes{Record: rec, Site: site, App: app,
		Options: flux.Options{Method: estimatorMethod(s.Estimator), AreaKm2: site.AreaKm2, FirstMonth: site.WaterYearStart,
			Seasonal: s.Seasonal, Bias: biases[s.BiasCorrection]},
		Bootstrap: flux.BootstrapOptions{Replicates: s.Bootstrap, Seed: uint64(s.Seed), Draws: mode,
			DischargeError: s.DischargeUncertainty / 100, AreaError: site.AreaSigma, Cache: &flux.Cache{}},
		SeriesReplicates: s.SeriesBootstrap, Policy: s.Unapportioned, DoubtfulAbove: s.DoubtfulPercent / 100,
	}, nil
}

// meanRow is one line of the mean-annual table: the flux and yield in mol
// and in tonnes (NaN tonnes for a series without a molar mass, such as a sum
// of cations).
type meanRow struct {
	name                       string
	point                      float64 // point estimate of the mean annual flux, mol/yr
	mol, yield, tonnes, tYield flux.Interval
}

// cationSums are the cation sums whose intervals the fluxes cell reports as
// headline figures.
var cationSums = []struct {
	name string
	src  mix.Source
	ks   []int
}{{"silicate cations", mix.Silicate, []int{0, 1, 2, 3}}, {"carbonate cations", mix.Carbonate, []int{2, 3}}}

// ClosureTolerance is the largest relative difference between a cation's
// measured flux and the sum of its fluxes from the four sources that the
// fluxes cell accepts without a warning: they agree to rounding whenever
// each sample's sources add up to what was measured (flux.Apportioned).
const ClosureTolerance = 1e-6

// sideBySideReplicates returns the replicates of the estimators table.
func (v *Fluxes) sideBySideReplicates() int {
	return min(v.SeriesReplicates, max(v.Bootstrap.Replicates, 1))
}

func computeFluxes(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*FluxSettings)
	v, err := fluxSetup(e, s)
	if err != nil {
		return nil, err
	}
	a := v.App
	if n := a.Unusable(); n == len(a.Names) {
		return nil, fmt.Errorf("no sample has a usable apportionment (%s failed; see the apportionment cell), so there is no source flux to compute", countOf(n, len(a.Names), "samples"))
	}
	// The quick pass (Document.Quick) gives point values now; the full pass
	// adds the bootstrap intervals.
	rough := e.Rough()
	out := &Output{Value: v, Rough: rough}
	var rows []meanRow
	var yName, yYear []string
	var yMol, yYield, yRunoff []float64
	reps := map[string]*flux.Uncertainty{} // each series' bootstrap, for the weathering rates
	add := func(r *flux.Result, u *flux.Uncertainty) {
		reps[r.Series] = u
		pt := func(x float64) flux.Interval { return flux.Interval{Median: x, Lo: math.NaN(), Hi: math.NaN()} }
		row := meanRow{name: r.Series, point: r.Mean.Mol, mol: pt(r.Mean.Mol), yield: pt(r.Mean.MolPerKm2),
			tonnes: pt(r.Mean.Tonnes), tYield: pt(r.Mean.TonnesPerKm2)}
		if u != nil {
			row.mol, row.yield, row.tonnes, row.tYield = u.Mean.Mol, u.Mean.MolPerKm2, u.Mean.Tonnes, u.Mean.TonnesPerKm2
		}
		rows = append(rows, row)
		for _, y := range r.Years {
			if !y.Complete() {
				continue
			}
			yName, yYear = append(yName, r.Series), append(yYear, fmt.Sprint(y.Label))
			yMol, yYield, yRunoff = append(yMol, y.Mol), append(yYield, y.MolPerKm2), append(yRunoff, y.RunoffMM)
		}
	}

	// Every series and quantity is bootstrapped with the same seed, so all
	// of them resample the same samples in each replicate, take the same
	// draw of each sample and share the replicate's discharge and area
	// errors (flux.Bootstrap's PCG streams): measured species, each cation
	// from each rock source, then the cation sums. The cation sums, the
	// headline figures, take the bootstrap setting; the others take
	// series_bootstrap replicates (the first replicates of the same
	// sequence), which keeps a recompute after an edit cheap. A job builds
	// its quantity only when its turn comes: with many draws a quantity
	// holds every draw of every sample.
	var jobs []fluxJob
	cur := 0
	tv := v.ticking(e.Ctx, func() { e.Report(cur, len(jobs)) })
	jobs = v.fluxJobs(tv, rough)
	var fits fitTables
	bySource := &sourceTable{unit: "mol/km²/yr", n: v.breakdownReplicates()}
	var figs, cover []Figure
	var runoff Figure
	var first *flux.Result // the first cation sum: the samples every apportioned quantity uses
	headline := map[string]fitted{}
	for j, jb := range jobs {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		// Progress after every series, so that a page running on one
		// goroutine can yield to the browser between bootstraps.
		cur = j
		e.Report(j, len(jobs))
		n := v.SeriesReplicates
		if jb.sum {
			n = max(v.Bootstrap.Replicates, 1)
		}
		if rough {
			n = 0
		}
		var fr fitted
		var w []string
		if jb.series != nil {
			fr, w, err = tv.fitSeries(jb.series(), n, v.Options)
		} else {
			fr, w, err = tv.fitQuantity(jb.qty(), n, v.Options)
		}
		r, u := fr.r, fr.u
		out.Warnings = append(out.Warnings, w...)
		if err != nil && (jb.sum || r == nil) {
			if jb.sum {
				return nil, err
			}
			out.Warnings = append(out.Warnings, err.Error())
			continue
		}
		if err != nil { // the point estimate stands; the bootstrap failed
			out.Warnings = append(out.Warnings, err.Error())
		}
		add(r, u)
		fits.add(r, jb.series != nil)
		if !jb.sum {
			continue
		}
		headline[r.Series] = fr
		note := v.howFluxed()
		if first == nil {
			first = r
			f, w := flowCoverage(r)
			cover, out.Warnings = f, append(out.Warnings, w...)
			// Runoff is the record's own over the complete years; its
			// interval comes from the discharge and area errors alone.
			runoff = withInterval(RunoffFigure, "mm/yr", r.Mean.RunoffMM, u, func(l *flux.LoadInterval) flux.Interval { return l.RunoffMM })
			runoff.Median = r.Mean.RunoffMM
		}
		if !rough {
			out.Warnings = append(out.Warnings, bySource.add(tv, r.Series+" yield", fr, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })...)
		}
		fl := withInterval(r.Series+" flux", "mol/yr", r.Mean.Mol, u, func(l *flux.LoadInterval) flux.Interval { return l.Mol })
		yl := withInterval(r.Series+" yield", "mol/km²/yr", r.Mean.MolPerKm2, u, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })
		fl.Note, yl.Note = note, note
		figs = append(figs, fl, yl)
	}
	e.Report(len(jobs), len(jobs))
	share := v.unapportionedShare()
	if runoff.Name != "" {
		runoff.Note = "from the flux estimate: complete reporting years; interval with the discharge and area errors"
		out.Figures = append(out.Figures, runoff)
	}
	out.Figures = append(out.Figures, figs...)
	out.Figures = append(out.Figures,
		Point("samples without a usable apportionment", "", float64(a.Unusable())),
		Point("share of the flow-weighted cation load in samples without a usable apportionment", "fraction", share))
	out.Figures = append(out.Figures, cover...)
	v.Doubtful = v.doubtfulReasons(share, first)
	out.Doubtful = v.Doubtful
	out.Figures = append(out.Figures, weatheringFigures(rows, reps, v.Site.AreaKm2)...)
	out.Tables = append(out.Tables, meanTable(rows),
		&ResultTable{Name: "annual", Title: "Flux of each complete year", Columns: []*Column{TextColumn("series", yName), TextColumn("year", yYear),
			NumColumn("flux", "mol/yr", yMol), NumColumn("yield", "mol/km²/yr", yYield), NumColumn("runoff", "mm", yRunoff)}})
	et, w := v.estimatorsTable(headline, rough)
	out.Tables = append(out.Tables, et)
	out.Warnings = append(out.Warnings, w...)
	ct, w := v.closureTable()
	out.Tables = append(out.Tables, ct)
	out.Warnings = append(out.Warnings, w...)
	out.Tables = append(out.Tables, fits.tables()...)
	if t := bySource.table(); t != nil {
		out.Tables = append(out.Tables, t)
	}
	if co, err := e.Input("carbonate"); err != nil {
		return nil, err
	} else if co != nil {
		if w := supersaturationCaution(v, co); w != "" {
			out.Warnings = append(out.Warnings, w)
		}
	}
	if w := sharedEndMemberCaution(a, "the source fluxes"); w != "" {
		out.Warnings = append(out.Warnings, w)
	}
	series := map[string]bool{}
	for _, r := range rows {
		series[r.name] = true
	}
	out.Warnings = groupSeries(out.Warnings, series)
	return out, nil
}

// fluxJob is one series the fluxes cell fluxes: a measured species or an
// apportioned quantity, built only when its turn comes (with many draws a
// quantity holds every draw of every sample).
type fluxJob struct {
	series func() flux.Series      // a measured species, or
	qty    func() flux.Apportioned // an apportioned quantity
	sum    bool                    // a cation sum, a headline figure
}

// fluxJobs lists the series in the order they are fluxed: the measured
// species, each cation from each rock source, then the cation sums. tv
// builds the quantities.
func (v *Fluxes) fluxJobs(tv *Fluxes, rough bool) []fluxJob {
	var jobs []fluxJob
	for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Alk, chem.SiO2} {
		if countFinite(v.measuredSeries(sp).C) == 0 {
			continue
		}
		jobs = append(jobs, fluxJob{series: func() flux.Series { return v.measuredSeries(sp) }})
	}
	for _, src := range []mix.Source{mix.Silicate, mix.Carbonate} {
		for k, sp := range mix.Cations {
			if src == mix.Carbonate && (sp == chem.Na || sp == chem.K) {
				continue
			}
			jobs = append(jobs, fluxJob{qty: func() flux.Apportioned {
				return tv.quantity(sp.Symbol()+"_"+src.String(), sp.MolarMass(), v.SeriesReplicates > 0 && !rough, []int{k}, cationsOf(src, k))
			}})
		}
	}
	for _, c := range cationSums {
		jobs = append(jobs, fluxJob{qty: func() flux.Apportioned { return tv.quantity(c.name, 0, !rough, c.ks, cationsOf(c.src, c.ks...)) }, sum: true})
	}
	return jobs
}

// fitTables gathers the rating curves and the interpolation's flow
// adjustments of the series fluxed.
type fitTables struct {
	rName, sName                     []string
	rA, rB, rR2, rS, rFactor, rN, sB []float64
}

// add records r's rating curve, and a measured species' flow adjustment.
func (t *fitTables) add(r *flux.Result, measured bool) {
	if f := r.Rating; f != nil {
		t.rName = append(t.rName, r.Series)
		t.rA, t.rB, t.rR2, t.rS = append(t.rA, f.A), append(t.rB, f.B), append(t.rR2, f.R2), append(t.rS, f.S)
		t.rFactor, t.rN = append(t.rFactor, f.Factor), append(t.rN, f.N)
	}
	if measured && r.Method == flux.PeriodWeighted {
		t.sName, t.sB = append(t.sName, r.Series), append(t.sB, r.Slope)
	}
}

// tables gives the "rating" and "interpolation" tables, each when it has
// a row.
func (t *fitTables) tables() []*ResultTable {
	var out []*ResultTable
	if len(t.rName) > 0 {
		out = append(out, &ResultTable{Name: "rating", Title: "Rating curves ln C = ln a + b ln Q of the measured species (point fits)", Columns: []*Column{
			TextColumn("series", t.rName), NumColumn("a", "µmol/L", t.rA), NumColumn("b", "", t.rB), NumColumn("R2", "", t.rR2),
			NumColumn("s", "ln units", t.rS), NumColumn("bias_factor", "", t.rFactor), NumColumn("n", "samples", t.rN)}})
	}
	if len(t.sName) > 0 {
		out = append(out, &ResultTable{Name: "interpolation", Title: "Flow adjustment of the interpolation: slope b of ln C on ln Q of each measured species (0: plain interpolation)", Columns: []*Column{
			TextColumn("series", t.sName), NumColumn("b", "", t.sB)}})
	}
	return out
}

// weatheringFigures gives the weathering rates in t/km²/yr (docs/methods.md
// §6.1) from the point fluxes of rows, with their intervals from the
// series' replicates.
func weatheringFigures(rows []meanRow, reps map[string]*flux.Uncertainty, areaKm2 float64) []Figure {
	points := map[string]float64{}
	for _, r := range rows {
		points[r.name] = r.point
	}
	var out []Figure
	for _, wr := range weatheringRates {
		if f, ok := weatheringRate(wr.name, wr.parts, points, reps, areaKm2); ok {
			out = append(out, f)
		}
	}
	return out
}

// meanTable gives the "mean" table: each series' mean annual flux and
// yield, in mol and tonnes, with their intervals.
func meanTable(rows []meanRow) *ResultTable {
	names := make([]string, len(rows))
	for i, r := range rows {
		names[i] = r.name
	}
	meanCols := []*Column{TextColumn("series", names)}
	for _, c := range []struct {
		name, unit string
		pick       func(*meanRow) flux.Interval
	}{
		{"flux", "mol/yr", func(r *meanRow) flux.Interval { return r.mol }},
		{"yield", "mol/km²/yr", func(r *meanRow) flux.Interval { return r.yield }},
		{"mass_flux", "t/yr", func(r *meanRow) flux.Interval { return r.tonnes }},
		{"mass_yield", "t/km²/yr", func(r *meanRow) flux.Interval { return r.tYield }},
	} {
		med, lo, hi := make([]float64, len(rows)), make([]float64, len(rows)), make([]float64, len(rows))
		for i := range rows {
			in := c.pick(&rows[i])
			med[i], lo[i], hi[i] = in.Median, in.Lo, in.Hi
		}
		meanCols = append(meanCols, NumColumn(c.name, c.unit, med), NumColumn(c.name+"_low", c.unit, lo), NumColumn(c.name+"_high", c.unit, hi))
	}
	return &ResultTable{Name: "mean", Title: "Mean annual flux (bootstrap median and 95 % interval); tonnes of each species, none for cation sums", Columns: meanCols}
}

// RunoffFigure names the fluxes cell's runoff: the discharge record's own
// over the complete years of the budget period, with the interval of the
// discharge and area errors.
const RunoffFigure = "runoff over the complete years of the budget period"

// sideBySide fluxes a quantity with each estimator of estimators: the
// headline's own fit (when ok) for the estimator chosen, else the quantity
// build makes, bootstrapped with series_bootstrap replicates of the same
// seed (point values only in the quick pass). label names it in warnings.
func (v *Fluxes) sideBySide(label string, headline fitted, ok bool, build func(draws bool) flux.Apportioned, rough bool) ([]fitted, []string) {
	n := v.sideBySideReplicates()
	if rough {
		n = 0
	}
	var q *flux.Apportioned
	var out []fitted
	var warns []string
	if ok && headline.a != nil && (n == 0 || headline.a.Weights != nil) {
		q = headline.a // the headline's own quantity, with draws when they are needed
	}
	for _, e := range estimators {
		m := e.Method
		f := headline
		if !ok || m != v.Options.Method {
			if q == nil {
				x := build(n > 0)
				q = &x
			}
			o := v.Options
			o.Method = m
			var err error
			if f, _, err = v.fitQuantity(*q, n, o); err != nil {
				warns = append(warns, fmt.Sprintf("%s, %s estimator: %v", label, estimatorLabel(m), err))
			}
		}
		out = append(out, f)
	}
	return out, warns
}

// estimatorsTable gives the cation sums with each of the four estimators,
// with their bootstrap intervals, side by side (sideBySide).
func (v *Fluxes) estimatorsTable(headline map[string]fitted, rough bool) (*ResultTable, []string) {
	var name, method []string
	var point, med, lo, hi, ymed, ylo, yhi, nrep []float64
	var warns []string
	for _, c := range cationSums {
		h, ok := headline[c.name]
		fs, w := v.sideBySide(c.name, h, ok, func(draws bool) flux.Apportioned {
			return v.quantity(c.name, 0, draws, c.ks, cationsOf(c.src, c.ks...))
		}, rough)
		warns = append(warns, w...)
		for k, f := range fs {
			name, method = append(name, c.name), append(method, estimators[k].Value)
			row := sideRow(f)
			pt := math.NaN()
			if f.r != nil {
				pt = f.r.Mean.Mol
			}
			point = append(point, pt)
			med, lo, hi = append(med, row[0]), append(lo, row[1]), append(hi, row[2])
			ymed, ylo, yhi = append(ymed, row[3]), append(ylo, row[4]), append(yhi, row[5])
			nrep = append(nrep, row[6])
		}
	}
	return &ResultTable{Name: "estimators", Title: "Mean annual flux by estimator, side by side (bootstrap median and 95 % interval; point values when replicates is 0)", Columns: []*Column{
		TextColumn("series", name), TextColumn("estimator", method), NumColumn("point", "mol/yr", point),
		NumColumn("flux", "mol/yr", med), NumColumn("flux_low", "mol/yr", lo), NumColumn("flux_high", "mol/yr", hi),
		NumColumn("yield", "mol/km²/yr", ymed), NumColumn("yield_low", "mol/km²/yr", ylo), NumColumn("yield_high", "mol/km²/yr", yhi),
		NumColumn("replicates", "", nrep)}}, warns
}

// sideRow gives a fitted quantity's flux and yield (median, low, high)
// and its replicates: the bootstrap's, or the point values alone.
func sideRow(f fitted) [7]float64 {
	nan := math.NaN()
	switch {
	case f.r == nil:
		return [7]float64{nan, nan, nan, nan, nan, nan, 0}
	case f.u == nil:
		return [7]float64{f.r.Mean.Mol, nan, nan, f.r.Mean.MolPerKm2, nan, nan, 0}
	}
	m, y := f.u.Mean.Mol, f.u.Mean.MolPerKm2
	return [7]float64{m.Median, m.Lo, m.Hi, y.Median, y.Lo, y.Hi, float64(f.u.Replicates)}
}

// closureTable checks that each cation's fluxes from the four sources add
// up to its measured flux over the same samples (point estimates), and
// warns beyond ClosureTolerance.
func (v *Fluxes) closureTable() (*ResultTable, []string) {
	var name []string
	var src [mix.NSources + 1][]float64 // the four sources, then the human input removed
	var sum, meas, diff []float64
	var warns []string
	a := v.App
	for k, sp := range mix.Cations {
		total := 0.0
		row := [mix.NSources + 1]float64{}
		var part flux.Share
		for s := range row {
			f := func(i, _ int, _ *mix.Split, _ float64, out *[mix.NCations]float64) {
				*out = [mix.NCations]float64{}
				out[k] = a.Corrected[i].Human[sp]
			}
			if s < int(mix.NSources) {
				f = cationsOf(mix.Source(s), k)
			}
			q := v.quantity(sp.Symbol(), sp.MolarMass(), false, []int{k}, f)
			part = q.Parts[0]
			r, err := flux.EstimateApportioned(v.Record, q, v.Options)
			row[s] = math.NaN()
			if err == nil {
				row[s] = r.Mean.Mol
			}
			total += row[s]
		}
		m := math.NaN()
		if r, err := flux.Estimate(v.Record, flux.Series{Name: part.Of, Days: v.App.Days, C: part.Measured, Q: v.App.Q}, v.Options); err == nil {
			m = r.Mean.Mol
		}
		d := (total - m) / m
		if !finite(total) || !finite(m) {
			continue
		}
		name = append(name, sp.Symbol())
		for s := range src {
			src[s] = append(src[s], row[s])
		}
		sum, meas, diff = append(sum, total), append(meas, m), append(diff, d)
		if math.Abs(d) > ClosureTolerance {
			warns = append(warns, fmt.Sprintf("the fluxes of %s from the four sources and the human input add up to %.6g mol/yr, the measured %s to %.6g mol/yr (%.2g apart): some samples' sources do not add up to what was measured (a residual below zero set to zero, say)",
				sp.Symbol(), total, sp.Symbol(), m, d))
		}
	}
	cols := []*Column{TextColumn("cation", name)}
	for s := mix.Source(0); s < mix.NSources; s++ {
		cols = append(cols, NumColumn(sourceNames[s], "mol/yr", src[s]))
	}
	cols = append(cols, NumColumn("human_input", "mol/yr", src[mix.NSources]), NumColumn("sum_of_sources", "mol/yr", sum),
		NumColumn("measured", "mol/yr", meas), NumColumn("difference", "fraction of measured", diff))
	return &ResultTable{Name: "closure", Title: fmt.Sprintf("Each cation's fluxes from the four sources, and the human input the rain correction removed, against its measured flux over the same samples (point estimates; they agree to %.0g when each sample's sources add up)", ClosureTolerance),
		Columns: cols}, warns
}

// Flow-coverage limits above which the fluxes cell warns (common practice,
// no source): a tenth of the flow on days the samples do not bracket in time
// or in discharge, or a highest sample exceeded on more than one day in
// twenty (below the 95th percentile of the flow-duration curve).
const (
	coverageFlowLimit = 0.10
	coverageTopLimit  = 0.05
)

// flowCoverage gives the sample coverage of the discharge record for the
// series of r as headline figures, and cautions when it is poor: the share
// of flow before the first or after the last sample, where interpolation
// holds the end values (docs/methods.md §8.2); the share of flow outside the
// sampled discharge range, where a rating curve extrapolates (§8.3); and
// the share of days with at least the highest sampled discharge, the
// sample coverage of the flow-duration curve (§12: sparse sampling that
// misses floods biases annual loads).
func flowCoverage(r *flux.Result) ([]Figure, []string) {
	figs := []Figure{
		Point("share of flow before the first or after the last sample", "fraction", r.HeldFlow),
		Point("share of flow outside the sampled discharge range", "fraction", r.OutsideFlow),
		Point("share of days with at least the highest sampled discharge", "fraction", r.TopSampled),
	}
	var warns []string
	if r.HeldFlow > coverageFlowLimit {
		warns = append(warns, fmt.Sprintf("%.2g %% of the flow passed before the first or after the last sample, where the concentrations are held or modelled, not measured; annual loads may be biased", 100*r.HeldFlow))
	}
	if r.OutsideFlow > coverageFlowLimit {
		where := "where no sample shows how concentration follows discharge"
		if r.Method == flux.Rating {
			where = "where the rating curve extrapolates (docs/methods.md §8.3)"
		}
		warns = append(warns, fmt.Sprintf("%.2g %% of the flow passed on days with discharge outside the sampled range, %s; annual loads may be biased", 100*r.OutsideFlow, where))
	}
	if r.TopSampled > coverageTopLimit {
		warns = append(warns, fmt.Sprintf("the highest sampled discharge is reached on %.2g %% of days: the floods went unsampled, which biases annual loads (docs/methods.md §12)", 100*r.TopSampled))
	}
	return figs, warns
}

// withInterval is a headline figure: the bootstrap median and 95 % interval
// pick takes from the mean-annual figures of u or, without a bootstrap (the
// quick pass), the point estimate v without an interval.
func withInterval(name, unit string, v float64, u *flux.Uncertainty, pick func(*flux.LoadInterval) flux.Interval) Figure {
	if u == nil {
		return Point(name, unit, v)
	}
	in := pick(&u.Mean)
	return Figure{Name: name, Unit: unit, Median: in.Median, Low: in.Lo, High: in.Hi}
}

func countFinite(x []float64) int {
	n := 0
	for _, v := range x {
		if finite(v) {
			n++
		}
	}
	return n
}

// groupSeries folds messages that differ only in the series they name
// ("Na: year … left out", "K: year … left out") into one, with the number
// of series; other messages pass through once each.
func groupSeries(ws []string, series map[string]bool) []string {
	count := map[string]int{}
	first := map[string]string{}
	var order []string
	for _, w := range ws {
		key := w
		if head, rest, ok := strings.Cut(w, ": "); ok && series[head] {
			key = rest
		}
		if count[key] == 0 {
			order = append(order, key)
			first[key] = w
		}
		count[key]++
	}
	out := make([]string, len(order))
	for i, k := range order {
		if count[k] == 1 {
			out[i] = first[k]
		} else {
			out[i] = fmt.Sprintf("%s (%d series)", k, count[k])
		}
	}
	return out
}

// dedupe drops repeated messages, keeping the first of each.
func dedupe(ws []string) []string {
	seen := map[string]bool{}
	var out []string
	for _, w := range ws {
		if !seen[w] {
			seen[w] = true
			out = append(out, w)
		}
	}
	return out
}

// ratePart is one term of a weathering rate: the mean annual flux of a
// series, times k, in tonnes of species sp.
type ratePart struct {
	series string
	sp     chem.Species
	k      float64
}

// weatheringRates are the fluxes cell's weathering rates (docs/methods.md
// §6.1, Gaillardet et al. 1999 style, from memory): SWR from the silicate
// cations, and with SiO2; CWR from the carbonate cations, and with the
// carbonate carbon ½ HCO3_carb M_HCO3, where HCO3_carb = 2(Ca+Mg)_carb, so
// (Ca+Mg)_carb mol of HCO3 mass.
var weatheringRates = []struct {
	name  string
	parts []ratePart
}{
	{"silicate weathering rate (cations)", siliCations},
	{"silicate weathering rate (cations + SiO2)", append(append([]ratePart(nil), siliCations...), ratePart{"SiO2", chem.SiO2, 1})},
	{"carbonate weathering rate (cations)", carbCations},
	{"carbonate weathering rate (cations + carbonate carbon, ½ HCO3_carb)", append(append([]ratePart(nil), carbCations...),
		ratePart{"Ca_carbonate", chem.HCO3, 1}, ratePart{"Mg_carbonate", chem.HCO3, 1})},
}

var (
	siliCations = []ratePart{{"Na_silicate", chem.Na, 1}, {"K_silicate", chem.K, 1}, {"Ca_silicate", chem.Ca, 1}, {"Mg_silicate", chem.Mg, 1}}
	carbCations = []ratePart{{"Ca_carbonate", chem.Ca, 1}, {"Mg_carbonate", chem.Mg, 1}}
)

// weatheringRate returns a weathering rate in t/km²/yr: the point value
// from the point fluxes, and, when every part was bootstrapped, the median
// and 95 % interval over replicates. The series share their seed, so
// replicate r of each resampled the same samples and drew the same
// discharge and area errors: the rate of replicate r is Σ k mol_r M ×
// 1e-6 / area_r. ok is false when a part's series is absent (no SiO2).
func weatheringRate(name string, parts []ratePart, points map[string]float64, reps map[string]*flux.Uncertainty, areaKm2 float64) (Figure, bool) {
	fp := make([]flux.Part, len(parts))
	n := -1
	for i, p := range parts {
		x, ok := points[p.series]
		if !ok {
			return Figure{}, false
		}
		fp[i] = flux.Part{Species: p.sp, MolPerYr: p.k * x}
		u := reps[p.series]
		switch {
		case u == nil || len(u.MeanMol) == 0 || len(u.Area) != len(u.MeanMol):
			n = 0
		case n < 0 || len(u.MeanMol) < n:
			n = len(u.MeanMol)
		}
	}
	f := Point(name, "t/km²/yr", flux.WeatheringRate(areaKm2, fp...))
	if n <= 0 {
		return f, true
	}
	rate := make([]float64, n)
	for r := range rate {
		for i, p := range parts {
			fp[i].MolPerYr = p.k * reps[p.series].MeanMol[r]
		}
		rate[r] = flux.WeatheringRate(reps[parts[0].series].Area[r], fp...)
	}
	in := flux.Summary(rate)
	f.Median, f.Low, f.High = in.Median, in.Lo, in.Hi
	return f, true
}

// uncertaintySources are the inputs the "uncertainty by source" table varies
// one at a time (docs/methods.md §8.6), in table order.
var uncertaintySources = []struct {
	name string
	src  flux.Sources
}{
	{"sampling (samples resampled within years)", flux.Sampling},
	{"apportionment (end-member draws, with the rain ratios and ET factor where their spread is set)", flux.Apportionment},
	{"discharge (systematic error)", flux.Discharge},
	{"catchment area", flux.Area},
}

// BreakdownReplicates is the most bootstrap replicates the "uncertainty by
// source" table takes for each source alone; fewer when the bootstrap
// setting is lower, none when series_bootstrap is 0.
const BreakdownReplicates = 200

// breakdownReplicates returns the replicates for each source alone.
func (v *Fluxes) breakdownReplicates() int {
	return min(BreakdownReplicates, v.SeriesReplicates, max(v.Bootstrap.Replicates, 1))
}

// sourceTable collects the rows of the "uncertainty by source" table: for
// each headline figure, all sources together, then each source alone.
type sourceTable struct {
	figure, source         []string
	med, lo, hi, rel, reps []float64
	unit                   string
	n                      int // replicates for each source alone
}

func (t *sourceTable) row(figure, source string, in flux.Interval, reps int) {
	t.figure, t.source = append(t.figure, figure), append(t.source, source)
	t.med, t.lo, t.hi = append(t.med, in.Median), append(t.lo, in.Lo), append(t.hi, in.Hi)
	t.rel, t.reps = append(t.rel, (in.Hi-in.Lo)/math.Abs(in.Median)), append(t.reps, float64(reps))
}

// add adds the rows of one headline figure of f, taken by pick: all
// sources from f's bootstrap, then each source alone with the others held
// at their central values, bootstrapped with t.n replicates of the same seed
// (the first replicates of the same sequence). It returns warnings.
func (t *sourceTable) add(v *Fluxes, figure string, f fitted, pick func(*flux.LoadInterval) flux.Interval) []string {
	if f.u == nil || t.n <= 0 {
		return nil
	}
	t.row(figure, "all sources", pick(&f.u.Mean), f.u.Replicates)
	var warns []string
	for _, us := range uncertaintySources {
		bo := v.Bootstrap.Alone(us.src)
		bo.Replicates = t.n
		u, err := f.boot(v.Record, bo)
		if err != nil {
			warns = append(warns, fmt.Sprintf("%s: %s alone: %v", f.name(), us.name, err))
			continue
		}
		t.row(figure, us.name, pick(&u.Mean), u.Replicates)
	}
	return warns
}

// table returns the result table, or nil without rows.
func (t *sourceTable) table() *ResultTable {
	if len(t.figure) == 0 {
		return nil
	}
	return &ResultTable{Name: "by-source",
		Title: fmt.Sprintf("Uncertainty by source: median and 95 %% interval with each source varied alone, the others held at their central values "+
			"(%d replicates each, so approximate), beside all sources together; one-at-a-time widths do not add up to the total (common practice)", t.n),
		Columns: []*Column{TextColumn("figure", t.figure), TextColumn("source", t.source),
			NumColumn("median", t.unit, t.med), NumColumn("low", t.unit, t.lo), NumColumn("high", t.unit, t.hi),
			NumColumn("relative_width", "fraction of the median", t.rel), NumColumn("replicates", "", t.reps)}}
}

// sharedEndMemberCaution says, for an apportionment whose draws are each
// sample's own (the forward and per-sample inverse models), that the
// source fluxes' intervals leave out an end-member error every sample
// shares: drawn independently per sample, it averages away over the
// samples (docs/methods.md §7.6; docs/validation.md measures how far such
// intervals fall short). Joint draws (the catchment-wide model) carry it.
func sharedEndMemberCaution(a *Apportioned, what string) string {
	if a == nil || a.Joint || a.Draws == 0 {
		return ""
	}
	return "the intervals of " + what + " take each sample's end-member draws as its own: an end-member composition " +
		"shared by every sample is averaged away, so they are too narrow when the samples share their end-members, as one " +
		"catchment's usually do (docs/validation.md); the catchment-wide apportionment model carries that shared uncertainty"
}
