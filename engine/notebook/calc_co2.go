package notebook

import (
	"fmt"
	"math"

	"lixiv/engine/co2"
	"lixiv/engine/flux"
	"lixiv/engine/internal/quantile"
	"lixiv/engine/mix"
)

func init() { Register(KindCO2, computeCO2) }

// LongTermConvention names the conventional long-term accounting, the co2
// cell's default, for table titles and the report (docs/methods.md §9.2 asks
// the notebook to say which one is used); LongTermConventionOf names the
// one a cell uses.
const LongTermConvention = "conventional silicate sink (Ca+Mg)_sil, less its share of sulfuric acid"

// longTerm describes the long-term silicate conventions of the co2 cell's
// long_term_convention setting (docs/methods.md §9.2–9.3): a description for
// titles and the report, and the short form figure names carry.
var longTerm = map[string]struct{ label, short string }{
	"conventional": {LongTermConvention, "(Ca+Mg)_sil"},
	"alkalinity":   {"alkalinity-based silicate sink ½ Alk_sil = (Ca+Mg)_sil + ½(Na+K)_sil, less its share of sulfuric acid", "½ Alk_sil"},
}

// LongTermConventionOf names the long-term accounting of a co2 cell with
// settings s ("" for the short time scale).
func LongTermConventionOf(s *CO2Settings) string {
	if s.TimeScale != "long" {
		return ""
	}
	return longTerm[s.LongTerm].label
}

// co2Pair returns the silicate and carbonate CO2 consumption of one split
// (µmol/L). Short term: phi_sil and phi_carb (docs/methods.md §9.2-9.3).
// Long term: the conventional silicate sink, (Ca+Mg)_sil under carbonic
// acid, with the Ca+Mg share of the sulfide-derived sulfate given to
// silicate weathering taken off, since silicate weathering by sulfuric acid
// consumes no CO2 (co2.Result.SinkSil); for carbonate, phi_carb −
// Alk_carb/2 = −S_carb, zero under carbonic acid and a release of one CO2
// per sulfide-derived sulfate under sulfuric acid (§9.3).
//
// scale is "short", or for the long term its convention: "conventional"
// takes the sink above, "alkalinity" the alkalinity-based Alk_sil/2 =
// ½(Na+K)_sil + (Ca+Mg)_sil − S_sil (co2.Result.NetLongSil).
func co2Pair(s *mix.Split, so4 float64, opt *co2.Options, scale string) (sil, carb float64, err error) {
	r, err := co2.Consumption(s, so4, opt)
	if err != nil {
		return 0, 0, err
	}
	switch scale {
	case "conventional":
		return r.SinkSil, r.NetLongCarb, nil
	case "alkalinity":
		return r.NetLongSil, r.NetLongCarb, nil
	}
	return r.PhiSil, r.PhiCarb, nil
}

// otherLongSil returns the silicate part of the long-term convention not
// chosen, shown beside the chosen one; NaN on error.
func otherLongSil(s *mix.Split, so4 float64, opt *co2.Options, chosen string) float64 {
	r, err := co2.Consumption(s, so4, opt)
	if err != nil {
		return math.NaN()
	}
	if chosen == "alkalinity" {
		return r.SinkSil
	}
	return r.NetLongSil
}

// SilicatePlausibleMax is the silicate CO2 consumption (mol/km²/yr) above
// which the co2 cell flags the result for review: single catchments span
// roughly 1e3 to 1e6 mol/km²/yr (from memory), and values above about 5e6
// are flagged (common practice, no source; docs/methods.md §9.4).
const SilicatePlausibleMax = 5e6

// implausibleSilicate returns the §9.4 plausibility warning for a silicate
// CO2 consumption of perKm2 mol/km²/yr, or "".
func implausibleSilicate(perKm2 float64) string {
	if !(perKm2 > SilicatePlausibleMax) {
		return ""
	}
	return fmt.Sprintf("silicate CO2 consumption of %.3g mol/km²/yr is above %.0g, beyond what single catchments show (about 1e3 to 1e6); "+
		"check the catchment area, the units of the samples and the silicate end-member ratios", perKm2, SilicatePlausibleMax)
}

// co2Amounts attributes the silicate (or, with carb, carbonate) CO2
// consumption of a split to the measured cations, in proportion to the
// cation equivalents the source delivered (to the measured equivalents
// when it delivered none), so that each cation's estimator fluxes its part
// (flux.Apportioned): under carbonic acid alone the silicate part of Ca is
// 2 Ca_sil, and silicate CO2 is fluxed as Na_sil + K_sil + 2(Ca_sil +
// Mg_sil). pairs, when not nil, holds the silicate and carbonate figures
// of each sample's kept draws, already worked out.
func co2Amounts(a *Apportioned, opt *co2.Options, scale string, carb bool, pairs [][][2]float64) amounts {
	src, j := mix.Silicate, 0
	if carb {
		src, j = mix.Carbonate, 1
	}
	return func(i, k int, s *mix.Split, so4 float64, out *[mix.NCations]float64) {
		var v float64
		if k >= 0 && pairs != nil {
			v = pairs[i][k][j]
		} else {
			sil, cb, err := co2Pair(s, so4, opt, scale)
			v = sil
			if carb {
				v = cb
			}
			if err != nil {
				v = math.NaN()
			}
		}
		var basis [mix.NCations]float64
		tot := 0.0
		for k := range basis {
			basis[k] = cationCharge[k] * s[src][k]
			tot += basis[k]
		}
		if !(tot > 0) {
			tot = 0
			for k, sp := range mix.Cations {
				basis[k] = 0
				if c := a.Corrected[i].Input[sp]; finite(c) {
					basis[k] = cationCharge[k] * c
				}
				tot += basis[k]
			}
		}
		for k := range out {
			out[k] = 0
			if tot > 0 {
				out[k] = v * basis[k] / tot
			}
		}
	}
}

// co2Part names the two CO2 figures of the cell.
var co2Parts = []struct {
	name string
	carb bool
}{{"silicate", false}, {"carbonate", true}}

// sulfateOrigins names the sulfate origins as figure names give them.
var sulfateOrigins = map[string]string{"gypsum": "gypsum", "sulfide": "sulfide oxidation", "isotope": "the δ34S split"}

// otherOriginWords join a CO2 figure's source and the other sulfate
// origin it was computed with; shortOrigins are the origins' short names
// for chart labels (FigureBars).
const otherOriginWords = " with the sulfate from "

var shortOrigins = map[string]string{"gypsum": "gypsum", "sulfide oxidation": "sulfide", "the δ34S split": "δ34S"}

// otherOrigins returns the sulfate origins that bracket the chosen one
// (docs/methods.md §5.2: all from gypsum and all from sulfide bracket the CO2
// consumption).
func otherOrigins(chosen string) []string {
	switch chosen {
	case "gypsum":
		return []string{"sulfide"}
	case "sulfide":
		return []string{"gypsum"}
	}
	return []string{"gypsum", "sulfide"}
}

func computeCO2(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*CO2Settings)
	a, err := inputOf[*Apportioned](e, "apportionment")
	if err != nil {
		return nil, err
	}
	opt := &co2.Options{}
	if s.SulfurSplit == "carbonate" {
		opt.Sulfur = co2.AllCarbonate
	}
	long := s.TimeScale == "long"
	scale := "short"
	if long {
		scale = s.LongTerm
		if _, ok := longTerm[scale]; !ok {
			scale = "conventional" // a file written before the setting existed
		}
	}
	other := map[string]string{"conventional": "alkalinity", "alkalinity": "conventional"}[scale]
	n := len(a.Names)
	// Progress: one unit per sample here, and n units for each of the two
	// bootstraps below (when a fluxes cell is given), so that a page running
	// on one goroutine can yield to the browser as the cell goes.
	fi, err := e.Input("fluxes")
	if err != nil {
		return nil, err
	}
	total := n
	if fi != nil {
		total = 3 * n
	}
	pl, err := co2PerLitre(e, a, opt, scale, long, total)
	if err != nil {
		return nil, err
	}
	pairs := pl.pairs
	silMed, silLo, silHi, carbMed, carbLo, carbHi, alkMed := pl.silMed, pl.silLo, pl.silHi, pl.carbMed, pl.carbLo, pl.carbHi, pl.alkMed
	title := "short-term"
	silName := "median silicate CO2 consumption per litre"
	if long {
		title = "long-term, " + longTerm[scale].label
		silName += " (long-term, " + longTerm[scale].short + ")"
	}
	out := &Output{Warnings: []string{"CO2 consumption is a geochemical budget, not a carbon-removal credit"}}
	out.Tables = append(out.Tables, &ResultTable{Name: "per-litre", Title: "CO2 consumption per litre of stream water (" + title + ")",
		Columns: []*Column{TextColumn("sample", a.Names), TextColumn("date", a.dates()),
			NumColumn("silicate", "µmol/L", silMed), NumColumn("silicate_low", "µmol/L", silLo), NumColumn("silicate_high", "µmol/L", silHi),
			NumColumn("carbonate", "µmol/L", carbMed), NumColumn("carbonate_low", "µmol/L", carbLo), NumColumn("carbonate_high", "µmol/L", carbHi)}})
	out.Figures = append(out.Figures, Point(silName, "µmol/L", median(silMed)),
		Point("median carbonate CO2 consumption per litre", "µmol/L", median(carbMed)))
	if long {
		out.Figures = append(out.Figures, Point("median silicate CO2 consumption per litre under the other long-term convention ("+longTerm[other].short+")", "µmol/L", median(alkMed)))
	}

	e.Report(n, total)
	if fi == nil {
		out.Doubtful = a.doubtful
		out.Value = &CO2Budget{Settings: *s, App: a, Options: *opt, Scale: scale}
		return out, nil
	}
	fv := fi.Value.(*Fluxes)
	if fv.App != a {
		out.Warnings = append(out.Warnings, "the fluxes cell reads another apportionment; its discharge record and options are used here")
		fv = &Fluxes{Record: fv.Record, Site: fv.Site, Options: fv.Options, Bootstrap: fv.Bootstrap, SeriesReplicates: fv.SeriesReplicates,
			App: a, Policy: fv.Policy, DoubtfulAbove: fv.DoubtfulAbove}
		fv.Doubtful = fv.doubtfulReasons(fv.unapportionedShare(), nil)
		if err := checkBootstrapWork("bootstrap", fv.Bootstrap.Replicates, n, fv.Record.Len()); err != nil {
			return nil, err
		}
	}
	out.Doubtful = fv.Doubtful
	done := n // progress units: per litre, then each bootstrap
	out.Value = &CO2Budget{Settings: *s, Fluxes: fv, App: a, Options: *opt, Scale: scale}
	fv = fv.ticking(e.Ctx, func() { e.Report(done, total) })
	var years co2Years
	bySource := &sourceTable{unit: "mol/km²/yr", n: fv.breakdownReplicates()}
	boot := !e.Rough() // the quick pass: point values now, intervals in the full pass
	out.Rough = out.Rough || !boot
	headline := map[string]fitted{}
	chosen := fmt.Sprintf("sulfate above the rain share from %s (the apportionment's setting)", sulfateOrigins[a.Sulfate])
	for k, part := range co2Parts {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		reps := 0
		if boot {
			reps = max(fv.Bootstrap.Replicates, 1)
		}
		q := fv.quantity(part.name+" CO2", 0, true, []int{0, 1, 2, 3}, co2Amounts(a, opt, scale, part.carb, pairs))
		fr, w, err := fv.fitQuantity(q, reps, fv.Options)
		r, u := fr.r, fr.u
		out.Warnings = append(out.Warnings, w...)
		if err != nil {
			return nil, err
		}
		headline[part.name] = fr
		if boot {
			out.Warnings = append(out.Warnings, bySource.add(fv, part.name+" CO2 consumption per km²", fr, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })...)
		}
		done = n + (k+1)*n
		e.Report(done, total)
		name := part.name + " CO2 consumption"
		note := fv.howFluxed() + "; " + chosen
		perKm2 := withInterval(name+" per km²", "mol/km²/yr", r.Mean.MolPerKm2, u, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })
		if w := implausibleSilicate(perKm2.Median); w != "" && !part.carb {
			out.Warnings = append(out.Warnings, w)
		}
		mol := withInterval(name, "mol/yr", r.Mean.Mol, u, func(l *flux.LoadInterval) flux.Interval { return l.Mol })
		mol.Note, perKm2.Note = note, note
		out.Figures = append(out.Figures, mol, perKm2,
			Figure{Name: name + " as carbon", Unit: "t C/km²/yr", Median: flux.CarbonMass(perKm2.Median),
				Low: flux.CarbonMass(perKm2.Low), High: flux.CarbonMass(perKm2.High)})
		years.add(part.name, r, u)
	}
	out.Tables = append(out.Tables, years.table(title))
	et, w := co2Estimators(fv, headline, opt, scale, !boot, pairs)
	out.Tables = append(out.Tables, et)
	out.Warnings = append(out.Warnings, w...)
	if boot {
		figs, t, w, err := sulfateBracket(e, fv, headline, opt, scale)
		if err != nil {
			return nil, err
		}
		out.Figures = append(out.Figures, figs...)
		out.Tables = append(out.Tables, t)
		out.Warnings = append(out.Warnings, w...)
	}
	if t := bySource.table(); t != nil {
		out.Tables = append(out.Tables, t)
	}
	if w := sharedEndMemberCaution(a, "CO2 consumption"); w != "" {
		out.Warnings = append(out.Warnings, w)
	}
	out.Warnings = groupSeries(out.Warnings, map[string]bool{"silicate CO2": true, "carbonate CO2": true})
	return out, nil
}

// co2PerLitreResult holds the per-litre CO2 consumption of each sample
// (quantiles over its kept draws) and the silicate and carbonate figures of
// each kept draw, for the fluxes.
type co2PerLitreResult struct {
	silMed, silLo, silHi, carbMed, carbLo, carbHi []float64
	alkMed                                        []float64 // long term: the other convention's silicate figure per sample
	pairs                                         [][][2]float64
}

// co2PerLitre works out the CO2 consumption per litre of each sample of a,
// reporting one unit of progress (of total) per sample.
func co2PerLitre(e *Env, a *Apportioned, opt *co2.Options, scale string, long bool, total int) (*co2PerLitreResult, error) {
	n := len(a.Names)
	pl := &co2PerLitreResult{pairs: make([][][2]float64, n)}
	var vs, vc, ws, va []float64
	var qb quantile.Buf
	for i := 0; i < n; i++ {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		e.Report(i, total)
		vs, vc, ws, va = vs[:0], vc[:0], ws[:0], va[:0]
		pl.pairs[i] = make([][2]float64, a.Kept(i))
		var buf mix.Split
		for k := range pl.pairs[i] {
			d, sp, w := a.keptSplit(i, k, &buf)
			so4 := a.SO4Sulf(i, d)
			x, y, err := co2Pair(sp, so4, opt, scale)
			if err != nil {
				return nil, fmt.Errorf("sample %s: %v", a.Names[i], err)
			}
			pl.pairs[i][k] = [2]float64{x, y}
			vs, vc, ws = append(vs, x), append(vc, y), append(ws, w)
			if long {
				va = append(va, otherLongSil(sp, so4, opt, scale))
			}
		}
		e.Report(i, total) // again: over many draws a sample takes a while
		q := qb.Midpoints(vs, ws, 0.025, 0.5, 0.975)
		pl.silLo, pl.silMed, pl.silHi = append(pl.silLo, q[0]), append(pl.silMed, q[1]), append(pl.silHi, q[2])
		e.Report(i, total)
		q = qb.Midpoints(vc, ws, 0.025, 0.5, 0.975)
		pl.carbLo, pl.carbMed, pl.carbHi = append(pl.carbLo, q[0]), append(pl.carbMed, q[1]), append(pl.carbHi, q[2])
		if long {
			pl.alkMed = append(pl.alkMed, qb.Midpoints(va, ws, 0.5)[0])
		}
	}
	return pl, nil
}

// co2Years gathers the rows of the "years" table: each complete year's
// CO2 consumption, with the bootstrap median and interval or the point
// estimate alone.
type co2Years struct {
	name, year                  []string
	med, lo, hi, kMed, kLo, kHi []float64
}

// add adds the complete years of r (source name), with u's intervals.
func (t *co2Years) add(name string, r *flux.Result, u *flux.Uncertainty) {
	intervals := map[int]*flux.YearInterval{}
	if u != nil {
		for i := range u.Years {
			intervals[u.Years[i].Label] = &u.Years[i]
		}
	}
	for _, y := range r.Years {
		if !y.Complete() {
			continue
		}
		mol := flux.Interval{Median: y.Mol, Lo: math.NaN(), Hi: math.NaN()}
		km2 := flux.Interval{Median: y.MolPerKm2, Lo: math.NaN(), Hi: math.NaN()}
		if in := intervals[y.Label]; in != nil {
			mol, km2 = in.Mol, in.MolPerKm2
		}
		t.name, t.year = append(t.name, name), append(t.year, fmt.Sprint(y.Label))
		t.med, t.lo, t.hi = append(t.med, mol.Median), append(t.lo, mol.Lo), append(t.hi, mol.Hi)
		t.kMed, t.kLo, t.kHi = append(t.kMed, km2.Median), append(t.kLo, km2.Lo), append(t.kHi, km2.Hi)
	}
}

// table gives the "years" table of the time scale title.
func (t *co2Years) table(title string) *ResultTable {
	return &ResultTable{Name: "years", Title: "CO2 consumption by year (" + title + ")", Columns: []*Column{
		TextColumn("source", t.name), TextColumn("year", t.year), NumColumn("consumption", "mol/yr", t.med),
		NumColumn("consumption_low", "mol/yr", t.lo), NumColumn("consumption_high", "mol/yr", t.hi),
		NumColumn("per_km2", "mol/km²/yr", t.kMed), NumColumn("per_km2_low", "mol/km²/yr", t.kLo), NumColumn("per_km2_high", "mol/km²/yr", t.kHi)}}
}

// co2Pairs works out the silicate and carbonate CO2 figures of every kept
// draw of every sample of a (NaN where co2Pair fails), calling tick
// before each sample so that a page running on one goroutine can hand
// its thread back.
func co2Pairs(a *Apportioned, opt *co2.Options, scale string, tick func()) [][][2]float64 {
	out := make([][][2]float64, len(a.Names))
	var buf mix.Split
	for i := range out {
		tick()
		out[i] = make([][2]float64, a.Kept(i))
		for k := range out[i] {
			d, sp, _ := a.keptSplit(i, k, &buf)
			x, y, err := co2Pair(sp, a.SO4Sulf(i, d), opt, scale)
			if err != nil {
				x, y = math.NaN(), math.NaN()
			}
			out[i][k] = [2]float64{x, y}
		}
	}
	return out
}

// co2Estimators gives the silicate and carbonate CO2 consumption per km²
// with each of the four estimators, side by side with their intervals
// (Fluxes.sideBySide).
func co2Estimators(fv *Fluxes, headline map[string]fitted, opt *co2.Options, scale string, rough bool, pairs [][][2]float64) (*ResultTable, []string) {
	var name, method []string
	var med, lo, hi, nrep []float64
	var warns []string
	for _, part := range co2Parts {
		h, ok := headline[part.name]
		fs, w := fv.sideBySide(part.name+" CO2", h, ok, func(draws bool) flux.Apportioned {
			return fv.quantity(part.name+" CO2", 0, draws, []int{0, 1, 2, 3}, co2Amounts(fv.App, opt, scale, part.carb, pairs))
		}, rough)
		warns = append(warns, w...)
		for k, f := range fs {
			row := sideRow(f)
			name, method = append(name, part.name), append(method, estimators[k].Value)
			med, lo, hi, nrep = append(med, row[3]), append(lo, row[4]), append(hi, row[5]), append(nrep, row[6])
		}
	}
	return &ResultTable{Name: "estimators", Title: "CO2 consumption per km² by estimator, side by side (bootstrap median and 95 % interval; point values when replicates is 0)",
		Columns: []*Column{TextColumn("source", name), TextColumn("estimator", method), NumColumn("per_km2", "mol/km²/yr", med),
			NumColumn("per_km2_low", "mol/km²/yr", lo), NumColumn("per_km2_high", "mol/km²/yr", hi), NumColumn("replicates", "", nrep)}}, warns
}

// sulfateBracket gives the CO2 consumption per km² under the other origins
// of the sulfate above the rain share (all gypsum, all sulfide oxidation;
// docs/methods.md §5.2, which bracket the result), as headline figures with
// series_bootstrap intervals, and a table of every origin with the span of
// their medians. When no sample has sulfate above its rain share the
// origins give the same result, which the table says without apportioning
// again.
func sulfateBracket(e *Env, fv *Fluxes, headline map[string]fitted, opt *co2.Options, scale string) ([]Figure, *ResultTable, []string, error) {
	a := fv.App
	var figs []Figure
	var warns []string
	var origin, part []string
	var med, lo, hi []float64
	row := func(o, p string, in flux.Interval) {
		origin, part = append(origin, o), append(part, p)
		med, lo, hi = append(med, in.Median), append(lo, in.Lo), append(hi, in.Hi)
	}
	span := map[string][2]float64{}
	widen := func(p string, x float64) {
		sp, ok := span[p]
		if !ok {
			sp = [2]float64{x, x}
		}
		span[p] = [2]float64{math.Min(sp[0], x), math.Max(sp[1], x)}
	}
	for _, p := range co2Parts {
		in := headline[p.name].u.Mean.MolPerKm2
		row(a.Sulfate+" (chosen)", p.name, in)
		widen(p.name, in.Median)
	}
	// The cell's progress stays where it is; reporting it again lets the
	// page hand its thread back during the rerun.
	tick := func() {
		if fv.Bootstrap.Tick != nil {
			fv.Bootstrap.Tick()
		}
	}
	for _, o := range otherOrigins(a.Sulfate) {
		fo := *fv
		if a.SulfateAboveRain() {
			b, err := a.Under(e.Ctx, o, func(int, int) { tick() })
			if err != nil {
				return nil, nil, nil, fmt.Errorf("sulfate from %s: %v", sulfateOrigins[o], err)
			}
			fo.App = b
		}
		pairs := co2Pairs(fo.App, opt, scale, tick)
		for _, p := range co2Parts {
			q := fo.quantity(p.name+" CO2", 0, true, []int{0, 1, 2, 3}, co2Amounts(fo.App, opt, scale, p.carb, pairs))
			f, _, err := fo.fitQuantity(q, fv.sideBySideReplicates(), fv.Options)
			if err != nil {
				warns = append(warns, fmt.Sprintf("%s CO2 with the sulfate from %s: %v", p.name, sulfateOrigins[o], err))
				continue
			}
			fig := withInterval(p.name+" CO2 consumption per km²"+otherOriginWords+sulfateOrigins[o], "mol/km²/yr",
				f.r.Mean.MolPerKm2, f.u, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })
			row(o, p.name, flux.Interval{Median: fig.Median, Lo: fig.Low, Hi: fig.High})
			widen(p.name, fig.Median)
			fig.Note = p.name // replaced below
			figs = append(figs, fig)
		}
	}
	for i := range figs {
		sp := span[figs[i].Note]
		figs[i].Note = fmt.Sprintf("another origin of the sulfate above the rain share; the medians of the origins span %.4g to %.4g mol/km²/yr", sp[0], sp[1])
	}
	for _, p := range co2Parts {
		sp := span[p.name]
		row("span of the origins", p.name, flux.Interval{Median: math.NaN(), Lo: sp[0], Hi: sp[1]})
	}
	title := "CO2 consumption per km² with the sulfate above the rain share from each origin (docs/methods.md §5.2: all gypsum and all sulfide oxidation bracket the result)"
	if !a.SulfateAboveRain() {
		title += "; no sample has sulfate above its rain share, so every origin gives the same result"
	}
	return figs, &ResultTable{Name: "sulfate", Title: title, Columns: []*Column{TextColumn("origin", origin), TextColumn("source", part),
		NumColumn("per_km2", "mol/km²/yr", med), NumColumn("per_km2_low", "mol/km²/yr", lo), NumColumn("per_km2_high", "mol/km²/yr", hi)}}, warns, nil
}
