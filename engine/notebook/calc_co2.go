package notebook

import (
	"fmt"
	"math"

	"lixiv/engine/co2"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
)

func init() { Register(KindCO2, computeCO2) }

// LongTermConvention names the conventional long-term accounting, the co2
// cell's default, for table titles and the report (methods brief §9.2 asks
// the notebook to say which one is used); LongTermConventionOf names the
// one a cell uses.
const LongTermConvention = "conventional silicate sink (Ca+Mg)_sil, less its share of sulfuric acid"

// longTerm describes the long-term silicate conventions of the co2 cell's
// long_term_convention setting (methods brief §9.2–9.3): a description for
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
// (µmol/L). Short term: phi_sil and phi_carb (methods brief §9.2-9.3).
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
// are flagged (common practice, no source; methods brief §9.4).
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

func computeCO2(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*CO2Settings)
	ai, err := e.Input("apportionment")
	if err != nil {
		return nil, err
	}
	a := ai.Value.(*Apportioned)
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
	// Per litre: quantiles over the draws of each sample.
	var silMed, silLo, silHi, carbMed, carbLo, carbHi []float64
	var vs, vc, ws, va []float64
	var alkMed []float64 // long term: the other convention's silicate figure per sample
	var qb quantileBuf
	// Per draw, kept for fluxing below.
	silD, carbD, wD := make([][]float64, n), make([][]float64, n), make([][]float64, n)
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
	for i := 0; i < n; i++ {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		e.Report(i, total)
		vs, vc, ws, va = vs[:0], vc[:0], ws[:0], va[:0]
		silD[i], carbD[i], wD[i] = make([]float64, a.Draws), make([]float64, a.Draws), make([]float64, a.Draws)
		for d := 0; d < a.Draws; d++ {
			sp, w, ok := a.Draw(i, d)
			if !ok {
				continue
			}
			so4 := a.SO4Sulf(i, d)
			x, y, err := co2Pair(&sp, so4, opt, scale)
			if err != nil {
				return nil, fmt.Errorf("sample %s: %v", a.Names[i], err)
			}
			vs, vc, ws = append(vs, x), append(vc, y), append(ws, w)
			if long {
				va = append(va, otherLongSil(&sp, so4, opt, scale))
			}
			silD[i][d], carbD[i][d], wD[i][d] = x, y, w
		}
		if len(ws) == 0 {
			silD[i], carbD[i], wD[i] = nil, nil, nil
		}
		q := qb.quantiles(vs, ws, 0.025, 0.5, 0.975)
		silLo, silMed, silHi = append(silLo, q[0]), append(silMed, q[1]), append(silHi, q[2])
		q = qb.quantiles(vc, ws, 0.025, 0.5, 0.975)
		carbLo, carbMed, carbHi = append(carbLo, q[0]), append(carbMed, q[1]), append(carbHi, q[2])
		if long {
			alkMed = append(alkMed, qb.quantiles(va, ws, 0.5)[0])
		}
	}
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
		return out, nil
	}
	fv := fi.Value.(*Fluxes)
	if fv.App != a {
		out.Warnings = append(out.Warnings, "the fluxes cell reads another apportionment; its discharge record and options are used here")
		fv = &Fluxes{Record: fv.Record, Site: fv.Site, Options: fv.Options, Bootstrap: fv.Bootstrap, SeriesReplicates: fv.SeriesReplicates, App: a}
		if err := checkBootstrapWork("bootstrap", fv.Bootstrap.Replicates, n, fv.Record.Len()); err != nil {
			return nil, err
		}
	}
	done := n // progress units: per litre, then each bootstrap
	fv = fv.ticking(e.Ctx, func() { e.Report(done, total) })
	var yName, yYear []string
	var yMed, yLo, yHi, kMed, kLo, kHi []float64
	bySource := &sourceTable{unit: "mol/km²/yr", n: fv.breakdownReplicates()}
	for k, part := range []struct {
		name string
		carb bool
	}{{"silicate", false}, {"carbonate", true}} {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		ser := fv.series(part.name+" CO2", 0, false, func(i int, sp *mix.Split) float64 {
			x, y, err := co2Pair(sp, a.Corrected[i].SO4Sulf, opt, scale)
			if err != nil {
				return math.NaN()
			}
			if part.carb {
				return y
			}
			return x
		})
		if a.Draws > 1 {
			ser.Draws, ser.Weights = silD, wD
			if part.carb {
				ser.Draws = carbD
			}
		}
		boot := !e.Rough() // the quick pass: point values now, intervals in the full pass
		out.Rough = out.Rough || !boot
		reps := 0
		if boot {
			reps = max(fv.Bootstrap.Replicates, 1)
		}
		fr, w, err := fv.fit(ser, reps)
		r, u := fr.r, fr.u
		out.Warnings = append(out.Warnings, w...)
		if err != nil {
			return nil, err
		}
		if boot {
			out.Warnings = append(out.Warnings, bySource.add(fv, part.name+" CO2 consumption per km²", fr, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })...)
		}
		done = n + (k+1)*n
		e.Report(done, total)
		name := part.name + " CO2 consumption"
		perKm2 := withInterval(name+" per km²", "mol/km²/yr", r.Mean.MolPerKm2, u, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })
		if w := implausibleSilicate(perKm2.Median); w != "" && !part.carb {
			out.Warnings = append(out.Warnings, w)
		}
		out.Figures = append(out.Figures,
			withInterval(name, "mol/yr", r.Mean.Mol, u, func(l *flux.LoadInterval) flux.Interval { return l.Mol }), perKm2,
			Figure{Name: name + " as carbon", Unit: "t C/km²/yr", Median: flux.CarbonMass(perKm2.Median),
				Low: flux.CarbonMass(perKm2.Low), High: flux.CarbonMass(perKm2.High)})
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
			// The bootstrap median and interval, or the point estimate alone.
			mol := flux.Interval{Median: y.Mol, Lo: math.NaN(), Hi: math.NaN()}
			km2 := flux.Interval{Median: y.MolPerKm2, Lo: math.NaN(), Hi: math.NaN()}
			if in := intervals[y.Label]; in != nil {
				mol, km2 = in.Mol, in.MolPerKm2
			}
			yName, yYear = append(yName, part.name), append(yYear, fmt.Sprint(y.Label))
			yMed, yLo, yHi = append(yMed, mol.Median), append(yLo, mol.Lo), append(yHi, mol.Hi)
			kMed, kLo, kHi = append(kMed, km2.Median), append(kLo, km2.Lo), append(kHi, km2.Hi)
		}
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "years", Title: "CO2 consumption by year (" + title + ")", Columns: []*Column{
		TextColumn("source", yName), TextColumn("year", yYear), NumColumn("consumption", "mol/yr", yMed),
		NumColumn("consumption_low", "mol/yr", yLo), NumColumn("consumption_high", "mol/yr", yHi),
		NumColumn("per_km2", "mol/km²/yr", kMed), NumColumn("per_km2_low", "mol/km²/yr", kLo), NumColumn("per_km2_high", "mol/km²/yr", kHi)}})
	if t := bySource.table(); t != nil {
		out.Tables = append(out.Tables, t)
	}
	out.Warnings = groupSeries(out.Warnings, map[string]bool{"silicate CO2": true, "carbonate CO2": true})
	return out, nil
}
