package notebook

import (
	"context"
	"fmt"
	"math"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
)

// Fluxes is the value a fluxes cell hands on: what another cell needs to
// flux a series of its own the same way (the CO2 cell does).
type Fluxes struct {
	Record    *discharge.Record // the record over the budget period
	Site      *Site
	Options   flux.Options
	Bootstrap flux.BootstrapOptions
	// SeriesReplicates is the number of bootstrap replicates for the
	// series other than the cation sums (0: point values only).
	SeriesReplicates int
	App              *Apportioned
	// tick reports progress while a long series is built (Bootstrap.Tick
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

func init() { Register(KindFluxes, computeFluxes) }

var methods = map[string]flux.Method{"discharge-weighted": flux.FlowWeighted, "interpolation": flux.PeriodWeighted,
	"rating-curve": flux.Rating, "beale": flux.Beale}

// estimatorName returns the settings word for a flux method.
func estimatorName(m flux.Method) string {
	for k, v := range methods {
		if v == m {
			return k
		}
	}
	return m.String()
}

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

// series builds a flux series from a per-sample quantity f of each draw's
// split; the point value is f of the cell-by-cell median.
func (v *Fluxes) series(name string, mass float64, withDraws bool, f func(i int, s *mix.Split) float64) flux.Series {
	a := v.App
	n := len(a.Names)
	s := flux.Series{Name: name, MolarMass: mass, Days: a.Days, Q: a.Q, C: make([]float64, n)}
	if withDraws && a.Draws > 1 {
		s.Draws, s.Weights = make([][]float64, n), make([][]float64, n)
	}
	for i := 0; i < n; i++ {
		s.C[i] = f(i, &a.Median[i])
		if s.Draws == nil {
			continue
		}
		if v.tick != nil {
			v.tick()
		}
		d := make([]float64, a.Draws)
		total := 0.0
		var sp mix.Split // outside the loop: f takes its address
		for k := 0; k < a.Draws; k++ {
			if w := a.weights[i][k]; w > 0 {
				if a.splits != nil {
					d[k] = f(i, &a.splits[i][k])
				} else {
					sp, _, _ = a.Draw(i, k)
					d[k] = f(i, &sp)
				}
				total += w
			}
		}
		if total > 0 {
			s.Draws[i], s.Weights[i] = d, a.weights[i]
		}
	}
	return s
}

// estimate fluxes one series, falling back to the interpolation estimator
// when the rating curve cannot take it (zero or negative values), and
// bootstraps it when boot is set.
func (v *Fluxes) estimate(s flux.Series, boot bool) (*flux.Result, *flux.Uncertainty, []string, error) {
	reps := 0
	if boot {
		reps = max(v.Bootstrap.Replicates, 1)
	}
	return v.estimateN(s, reps)
}

// estimateN is estimate with reps bootstrap replicates (0: none).
func (v *Fluxes) estimateN(s flux.Series, reps int) (*flux.Result, *flux.Uncertainty, []string, error) {
	f, warns, err := v.fit(s, reps)
	return f.r, f.u, warns, err
}

// fitted is one series fluxed by fit: the point result, its bootstrap (nil
// without one), and the series and options used (the estimator after any
// fallback), so that it can be bootstrapped again one source at a time.
type fitted struct {
	s   flux.Series
	opt flux.Options
	r   *flux.Result
	u   *flux.Uncertainty
}

// fit does estimateN's work and keeps what it used.
func (v *Fluxes) fit(s flux.Series, reps int) (fitted, []string, error) {
	var warns []string
	opt := v.Options
	if opt.Method == flux.Rating {
		// ln C needs C > 0: a series with zero or negative values (clamped
		// carbonate, CO2 released by sulfuric acid) would lose those samples
		// from the fit, so it takes the interpolation estimator instead.
		// A few non-positive Monte Carlo draws (under 1 %) only cost the
		// bootstrap replicates that pick them, which Bootstrap reports.
		point, draws, total := nonPositive(s)
		if point > 0 || float64(draws) > 0.01*float64(total) {
			warns = append(warns, fmt.Sprintf("%s: %d sample values and %d of %d draws are zero or negative, which a rating curve cannot fit; used interpolation",
				s.Name, point, draws, total))
			opt.Method = flux.PeriodWeighted
		}
	}
	r, err := flux.Estimate(v.Record, s, opt)
	if err != nil && opt.Method == flux.Rating {
		warns = append(warns, fmt.Sprintf("%s: the rating curve failed (%v); used interpolation", s.Name, err))
		opt.Method = flux.PeriodWeighted
		r, err = flux.Estimate(v.Record, s, opt)
	}
	f := fitted{s: s, opt: opt}
	if err != nil {
		return f, warns, fmt.Errorf("%s: %v", s.Name, err)
	}
	f.r = r
	for _, w := range r.Warnings {
		warns = append(warns, w.Error())
	}
	if reps <= 0 {
		return f, warns, nil
	}
	bo := v.Bootstrap
	bo.Replicates = reps
	u, err := flux.Bootstrap(v.Record, s, opt, bo)
	if err != nil {
		return f, warns, fmt.Errorf("%s: bootstrap: %v", s.Name, err)
	}
	if u.Failed > 0 {
		warns = append(warns, fmt.Sprintf("%s: %d of %d bootstrap replicates could not be fitted", s.Name, u.Failed, u.Failed+u.Replicates))
	}
	f.u = u
	return f, warns, nil
}

func fluxSetup(e *Env, s *FluxSettings) (*Fluxes, error) {
	ai, err := e.Input("apportionment")
	if err != nil {
		return nil, err
	}
	di, err := e.Input("discharge")
	if err != nil {
		return nil, err
	}
	si, err := e.Input("site")
	if err != nil {
		return nil, err
	}
	site := si.Value.(*Site)
	rec, err := period(di.Value.(*Flow).Record, site)
	if err != nil {
		return nil, err
	}
	app := ai.Value.(*Apportioned)
	if err := firstErr(checkBootstrapWork("bootstrap", s.Bootstrap, len(app.Names), rec.Len()),
		checkBootstrapWork("series_bootstrap", s.SeriesBootstrap, len(app.Names), rec.Len())); err != nil {
		return nil, err
	}
	return &Fluxes{Record: rec, Site: site, App: app,
		Options: flux.Options{Method: methods[s.Estimator], AreaKm2: site.AreaKm2, FirstMonth: site.WaterYearStart,
			Seasonal: s.Seasonal, Bias: biases[s.BiasCorrection]},
		Bootstrap: flux.BootstrapOptions{Replicates: s.Bootstrap, Seed: uint64(s.Seed),
			DischargeError: s.DischargeUncertainty / 100, AreaError: site.AreaSigma},
		SeriesReplicates: s.SeriesBootstrap,
	}, nil
}

// sumOf returns f summing the given source's cations (in mol, each counted once).
func sumOf(src mix.Source, cations ...int) func(int, *mix.Split) float64 {
	return func(_ int, s *mix.Split) float64 {
		t := 0.0
		for _, k := range cations {
			t += s[src][k]
		}
		return t
	}
}

// meanRow is one line of the mean-annual table: the flux and yield in mol
// and in tonnes (NaN tonnes for a series without a molar mass, such as a sum
// of cations).
type meanRow struct {
	name, unit                 string
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

func computeFluxes(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*FluxSettings)
	v, err := fluxSetup(e, s)
	if err != nil {
		return nil, err
	}
	a := v.App
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
	// The estimators side by side, for the cation sums (point values).
	var eName, eMethod []string
	var eMol, eYield []float64
	for _, c := range cationSums {
		ser := v.series(c.name, 0, false, sumOf(c.src, c.ks...))
		for _, m := range []flux.Method{flux.FlowWeighted, flux.PeriodWeighted, flux.Rating, flux.Beale} {
			o := v.Options
			o.Method = m
			mol, yield := math.NaN(), math.NaN()
			if r, err := flux.Estimate(v.Record, ser, o); err == nil {
				mol, yield = r.Mean.Mol, r.Mean.MolPerKm2
			}
			eName, eMethod = append(eName, c.name), append(eMethod, estimatorName(m))
			eMol, eYield = append(eMol, mol), append(eYield, yield)
		}
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "estimators", Title: "Mean annual flux by estimator (point values)", Columns: []*Column{
		TextColumn("series", eName), TextColumn("estimator", eMethod), NumColumn("flux", "mol/yr", eMol), NumColumn("yield", "mol/km²/yr", eYield)}})

	// Every series is bootstrapped with the same seed, so all of them
	// resample the same samples in each replicate and share its discharge and
	// area errors (flux.Bootstrap's PCG streams): measured species, each
	// cation from each rock source, then the cation sums. The cation sums,
	// the headline figures, take the bootstrap setting; the other series
	// take series_bootstrap replicates (the first replicates of the same
	// sequence), which keeps a recompute after an edit cheap.
	// A job builds its series only when its turn comes: with many draws a
	// series holds every draw of every sample, so building them all first
	// would hold them all in memory and run long without a progress report.
	type job struct {
		build func() flux.Series
		sum   bool
	}
	var jobs []job
	// tv is v reporting progress from inside a long series, so that a page
	// on one goroutine can yield to the browser there too.
	cur := 0
	tv := v.ticking(e.Ctx, func() { e.Report(cur, len(jobs)) })
	for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Alk, chem.SiO2} {
		c := make([]float64, len(a.Names))
		for i := range c {
			c[i] = a.Corrected[i].Input[sp]
		}
		if countFinite(c) == 0 {
			continue
		}
		jobs = append(jobs, job{build: func() flux.Series {
			ser := flux.ForSpecies(sp, a.Days, c)
			ser.Q = a.Q
			return ser
		}})
	}
	for _, src := range []mix.Source{mix.Silicate, mix.Carbonate} {
		for k, sp := range mix.Cations {
			if src == mix.Carbonate && (sp == chem.Na || sp == chem.K) {
				continue
			}
			jobs = append(jobs, job{build: func() flux.Series {
				return tv.series(sp.Symbol()+"_"+src.String(), sp.MolarMass(), v.SeriesReplicates > 0 && !rough, sumOf(src, k))
			}})
		}
	}
	for _, c := range cationSums {
		jobs = append(jobs, job{build: func() flux.Series { return tv.series(c.name, 0, !rough, sumOf(c.src, c.ks...)) }, sum: true})
	}
	var rName []string
	var rA, rB, rR2, rS, rFactor, rN []float64
	bySource := &sourceTable{unit: "mol/km²/yr", n: v.breakdownReplicates()}
	var figs, cover []Figure
	var runoff Figure
	for j, jb := range jobs {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		// Progress after every series, so that a page running on one
		// goroutine can yield to the browser between bootstraps.
		cur = j
		e.Report(j, len(jobs))
		reps := v.SeriesReplicates
		if jb.sum {
			reps = max(v.Bootstrap.Replicates, 1)
		}
		if rough {
			reps = 0
		}
		ser := jb.build()
		fr, w, err := tv.fit(ser, reps)
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
		if f := r.Rating; f != nil {
			rName = append(rName, r.Series)
			rA, rB, rR2, rS = append(rA, f.A), append(rB, f.B), append(rR2, f.R2), append(rS, f.S)
			rFactor, rN = append(rFactor, f.Factor), append(rN, f.N)
		}
		if !jb.sum {
			continue
		}
		if runoff.Name == "" { // the first cation sum: the samples every apportioned series uses
			f, w := flowCoverage(r)
			cover, out.Warnings = f, append(out.Warnings, w...)
		}
		if !rough {
			out.Warnings = append(out.Warnings, bySource.add(tv, ser.Name+" yield", fr, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })...)
		}
		runoff = withInterval("runoff", "mm/yr", r.Mean.RunoffMM, u, func(l *flux.LoadInterval) flux.Interval { return l.RunoffMM })
		figs = append(figs, withInterval(ser.Name+" flux", "mol/yr", r.Mean.Mol, u, func(l *flux.LoadInterval) flux.Interval { return l.Mol }),
			withInterval(ser.Name+" yield", "mol/km²/yr", r.Mean.MolPerKm2, u, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 }))
	}
	e.Report(len(jobs), len(jobs))
	if runoff.Name != "" {
		out.Figures = append(out.Figures, runoff)
	}
	out.Figures = append(out.Figures, figs...)
	out.Figures = append(out.Figures, cover...)
	// Weathering rates in t/km²/yr (methods brief §6.1), from the point
	// fluxes, and their intervals from the series' replicates.
	points := map[string]float64{}
	for _, r := range rows {
		points[r.name] = r.point
	}
	for _, wr := range weatheringRates {
		if f, ok := weatheringRate(wr.name, wr.parts, points, reps, v.Site.AreaKm2); ok {
			out.Figures = append(out.Figures, f)
		}
	}

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
	out.Tables = append(out.Tables, &ResultTable{Name: "mean", Title: "Mean annual flux (bootstrap median and 95 % interval); tonnes of each species, none for cation sums", Columns: meanCols},
		&ResultTable{Name: "annual", Title: "Flux of each complete year", Columns: []*Column{TextColumn("series", yName), TextColumn("year", yYear),
			NumColumn("flux", "mol/yr", yMol), NumColumn("yield", "mol/km²/yr", yYield), NumColumn("runoff", "mm", yRunoff)}})
	if len(rName) > 0 {
		out.Tables = append(out.Tables, &ResultTable{Name: "rating", Title: "Rating curves ln C = ln a + b ln Q (point fits)", Columns: []*Column{
			TextColumn("series", rName), NumColumn("a", "µmol/L", rA), NumColumn("b", "", rB), NumColumn("R2", "", rR2),
			NumColumn("s", "ln units", rS), NumColumn("bias_factor", "", rFactor), NumColumn("n", "samples", rN)}})
	}
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
	series := map[string]bool{}
	for _, r := range rows {
		series[r.name] = true
	}
	out.Warnings = groupSeries(out.Warnings, series)
	return out, nil
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
// holds the end values (methods brief §8.2); the share of flow outside the
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
			where = "where the rating curve extrapolates (methods brief §8.3)"
		}
		warns = append(warns, fmt.Sprintf("%.2g %% of the flow passed on days with discharge outside the sampled range, %s; annual loads may be biased", 100*r.OutsideFlow, where))
	}
	if r.TopSampled > coverageTopLimit {
		warns = append(warns, fmt.Sprintf("the highest sampled discharge is reached on %.2g %% of days: the floods went unsampled, which biases annual loads (methods brief §12)", 100*r.TopSampled))
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

// nonPositive counts the sample values of a series that are zero or
// negative, and the kept draws that are, out of all kept draws.
func nonPositive(s flux.Series) (point, draws, total int) {
	for i, c := range s.C {
		if c <= 0 {
			point++
		}
		if s.Draws != nil && s.Draws[i] != nil {
			for d, x := range s.Draws[i] {
				if s.Weights[i][d] > 0 {
					total++
					if x <= 0 {
						draws++
					}
				}
			}
		}
	}
	return point, draws, total
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

// weatheringRates are the fluxes cell's weathering rates (methods brief
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
// one at a time (methods brief §8.6), in table order.
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
		u, err := flux.Bootstrap(v.Record, f.s, f.opt, bo)
		if err != nil {
			warns = append(warns, fmt.Sprintf("%s: %s alone: %v", f.s.Name, us.name, err))
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
