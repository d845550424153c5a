package notebook

import (
	"fmt"
	"math"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/compare"
)

// Comparison is the value a comparison cell hands on: its settings, the
// budgets compared, how the apportionment draws entered the replicates,
// and each quantity's outcome.
type Comparison struct {
	Settings CompareSettings
	Budgets  []compared
	// Draws says how the apportionment draws were taken (once for every
	// budget, or each sample its own) and why; "" in the quick pass.
	Draws    string
	Outcomes []*compare.Outcome
	// Design holds the monitoring design's detectable increases by
	// samples a year; nil without one.
	Design []*compare.Detection
}

// outcome returns the outcome of the quantity called name, or nil.
func (v *Comparison) outcome(name string) *compare.Outcome {
	for _, o := range v.Outcomes {
		if o.Name == name {
			return o
		}
	}
	return nil
}

// formula is the design's difference as figure names give it.
func (v *Comparison) formula() string { return v.Settings.design().Formula() }

// diffFigure is a headline figure of a difference, with P(D > 0) in its
// note.
func diffFigure(name, unit string, d compare.Difference, note string) Figure {
	f := Figure{Name: name, Unit: unit, Median: d.Median, Low: d.Low, High: d.High}
	if math.IsNaN(d.Median) { // the quick pass: the point value
		f.Median = d.Point
	}
	if !math.IsNaN(d.Above) {
		note = fmt.Sprintf("P(difference > 0) = %.3f, %d paired replicates; %s", d.Above, d.Replicates, note)
	}
	f.Note = note
	return f
}

// aboveFigure is the probability that quantity name's difference per km²
// is above zero: the share of paired replicates above zero. When every
// replicate (or none) is, the note says so: the share cannot resolve the
// probability beyond 1 − 1/n with n replicates.
func aboveFigure(name string, d compare.Difference) Figure {
	f := Point(fmt.Sprintf("probability that the %s difference per km² is above zero", name), "fraction", d.Above)
	switch d.Above {
	case 1:
		f.Note = fmt.Sprintf("all %d paired replicates above zero: more replicates resolve it beyond %.4g", d.Replicates, 1-1/float64(d.Replicates))
	case 0:
		f.Note = fmt.Sprintf("none of %d paired replicates above zero: more replicates resolve it below %.4g", d.Replicates, 1/float64(d.Replicates))
	}
	return f
}

// results puts the differences, the budgets and the feedstock in the
// cell's tables and headline figures.
func (v *Comparison) results(out *Output) {
	s := &v.Settings
	note := "apportionment draws shared by every budget; the rest of each budget its own (the shared table)"
	if !strings.HasPrefix(v.Draws, "once") {
		note = "each sample's own apportionment draws: shared end-member uncertainty not carried as shared (see the warnings)"
	}
	if v.Draws == "" {
		note = "point values; intervals to follow"
	}
	for _, name := range []string{s.measureName(), "silicate cations"} {
		o := v.outcome(name)
		what := name + " yield"
		if o == nil {
			continue
		}
		if name != "silicate cations" {
			what = name + " consumption"
		}
		out.Figures = append(out.Figures,
			diffFigure(fmt.Sprintf("%s: difference in %s per km²", v.formula(), what), "mol/km²/yr", o.Yield, note),
			diffFigure(fmt.Sprintf("%s: difference in %s per mm of runoff", v.formula(), what), "mol/km²/mm", o.PerMM, note))
		if !math.IsNaN(o.Yield.Above) {
			out.Figures = append(out.Figures, aboveFigure(name, o.Yield))
		}
	}
	out.Tables = append(out.Tables, v.differenceTable("difference", "per km² of catchment", "mol/km²/yr", false),
		v.differenceTable("per-mm", "per mm of runoff (the flow-weighted mean concentration)", "mol/km²/mm", true),
		v.budgetTable(), v.sharedTable())
	v.application(out)
}

// differenceTable lists every quantity: each budget's mean annual value
// and the difference, with their 95 % intervals and P(D > 0).
func (v *Comparison) differenceTable(name, what, unit string, perMM bool) *ResultTable {
	n := len(v.Outcomes)
	names := make([]string, n)
	cols := []*Column{}
	vals := make([][3][]float64, len(v.Budgets))
	for b := range vals {
		for k := range vals[b] {
			vals[b][k] = make([]float64, n)
		}
	}
	var point, med, lo, hi, above []float64
	for i, o := range v.Outcomes {
		names[i] = o.Name
		for b := range v.Budgets {
			y, m := o.Budgets[b].Yields()
			in := y
			if perMM {
				in = m
			}
			vals[b][0][i], vals[b][1][i], vals[b][2][i] = in.Median, in.Lo, in.Hi
		}
		d := o.Yield
		if perMM {
			d = o.PerMM
		}
		point, med, lo, hi, above = append(point, d.Point), append(med, d.Median), append(lo, d.Low), append(hi, d.High), append(above, d.Above)
	}
	cols = append(cols, TextColumn("quantity", names))
	for b, c := range v.Budgets {
		cols = append(cols, NumColumn(c.role, unit, vals[b][0]), NumColumn(c.role+"_low", unit, vals[b][1]), NumColumn(c.role+"_high", unit, vals[b][2]))
	}
	cols = append(cols, NumColumn("difference", unit, med), NumColumn("difference_low", unit, lo), NumColumn("difference_high", unit, hi),
		NumColumn("p_above_zero", "fraction", above), NumColumn("point", unit, point))
	return &ResultTable{Name: name, Title: fmt.Sprintf("Mean annual yield %s of each budget and the difference %s (median and 95 %% interval of the paired replicates; point: from the budgets' point estimates)", what, v.formula()),
		Columns: cols}
}

// budgetTable lists the budgets compared.
func (v *Comparison) budgetTable() *ResultTable {
	var role, sec, cell, est, years []string
	var area, runoff, samples []float64
	for _, c := range v.Budgets {
		f := c.b.Fluxes
		role, sec, cell = append(role, roleWords[c.role]), append(sec, c.section), append(cell, c.cell)
		est = append(est, estimatorLabel(f.Options.Method))
		area = append(area, f.Site.AreaKm2)
		r := math.NaN()
		span := ""
		if len(v.Outcomes) > 0 {
			p := v.Outcomes[0].Budgets[len(role)-1].Point
			r = p.Mean.RunoffMM
			var first, last int
			for _, y := range p.Years {
				if y.Complete() {
					if first == 0 {
						first = y.Label
					}
					last = y.Label
				}
			}
			if first > 0 {
				span = fmt.Sprintf("%d–%d", first, last)
			}
		}
		runoff, years = append(runoff, r), append(years, span)
		samples = append(samples, float64(len(f.App.Names)-f.App.Unusable()))
	}
	return &ResultTable{Name: "budgets", Title: "The budgets compared: each its section's co2 cell and the fluxes it reads",
		Columns: []*Column{TextColumn("budget", role), TextColumn("section", sec), TextColumn("co2_cell", cell), TextColumn("estimator", est),
			NumColumn("area", "km²", area), NumColumn("runoff", "mm/yr", runoff), TextColumn("complete_years", years),
			NumColumn("samples", "apportioned", samples)}}
}

// sharedTable says which parts of the uncertainty each paired replicate
// draws once for every budget and which separately.
func (v *Comparison) sharedTable() *ResultTable {
	draws := v.Draws
	if draws == "" {
		draws = "(intervals to follow)"
	}
	return &ResultTable{Name: "shared", Title: "How each paired replicate draws the parts of the uncertainty",
		Columns: []*Column{TextColumn("part", []string{"sampling (samples resampled within years)", "discharge (systematic error of each record)",
			"catchment area", "apportionment (end-member ratios; rain ratios and ET factor where their spread is set)"}),
			TextColumn("drawn", []string{"separately for each budget", "separately for each budget", "separately for each budget", draws})}}
}

// application sets the measured extra CO2 uptake against the feedstock
// applied: its CO2 potential, and the share of it taken up each year and
// over the years compared.
func (v *Comparison) application(out *Output) {
	s := &v.Settings
	o := v.outcome(s.measureName())
	if o == nil {
		return
	}
	ox := s.oxides()
	app := compare.Application{TonnesPerHa: s.TonnesPerHa, AreaHa: s.AreaHa, Oxides: ox, Eta: s.Eta}
	area := v.Budgets[0].b.Fluxes.Site.AreaKm2
	toT := area * chem.MassCO2 * 1e-6 // mol/km²/yr over the treated catchment → t CO2/yr
	extra := o.Yield.Scaled(toT)
	out.Figures = append(out.Figures, diffFigure("extra "+s.measureName()+" taken up over the treated catchment", "t CO2/yr", extra,
		fmt.Sprintf("the difference per km² times the treated catchment's %.4g km²", area)))
	given := ox.Charge() > 0
	if given {
		var name []string
		var pct, mass, charge []float64
		for _, p := range ox.Parts() {
			name, pct, mass, charge = append(name, p.Name), append(pct, p.Percent), append(mass, p.MolarMass), append(charge, p.Charge)
		}
		name, pct, mass, charge = append(name, "all"), append(pct, ox.CaO+ox.MgO+ox.Na2O+ox.K2O), append(mass, math.NaN()), append(charge, ox.Charge())
		out.Tables = append(out.Tables, &ResultTable{Name: "feedstock", Title: "The feedstock's oxides and the cation charge each can release (docs/methods.md §17: 10 × 2 × wt % ÷ M, Renforth 2012)",
			Columns: []*Column{TextColumn("oxide", name), NumColumn("content", "wt %", pct), NumColumn("molar_mass", "g/mol", mass), NumColumn("charge", "mol/kg", charge)}})
		out.Figures = append(out.Figures, Point("cation charge the feedstock can release", "mol/kg", ox.Charge()),
			Point("CO2 potential of the feedstock", "t CO2/t", ox.Potential(s.Eta)))
	}
	applied := given && app.Tonnes() > 0
	if applied {
		out.Figures = append(out.Figures, Point("feedstock spread", "t", app.Tonnes()), Point("CO2 potential of the application", "t CO2", app.PotentialTonnes()))
		if ha := area * 100; s.AreaHa > ha {
			out.Warnings = append(out.Warnings, fmt.Sprintf("the area spread (%g ha) is larger than the treated catchment (%.4g ha)", s.AreaHa, ha))
		}
		share := 1 / app.PotentialTonnes()
		out.Figures = append(out.Figures, diffFigure("share of the application's CO2 potential taken up a year", "fraction", extra.Scaled(share),
			"the extra uptake a year over the CO2 potential of the feedstock spread"))
	} else {
		out.Warnings = append(out.Warnings, "give the feedstock spread (t/ha), the area spread (ha) and its oxide composition to set the extra uptake against the feedstock's CO2 potential")
	}
	// Each year compared, and the years so far added up, replicate by
	// replicate.
	var year []string
	cols := make([][]float64, 15)
	var cum []float64
	cumPoint := 0.0
	for _, y := range o.Years {
		year = append(year, fmt.Sprint(y.Year))
		cumPoint += y.Yield.Point * toT
		if cum == nil {
			cum = make([]float64, len(y.YieldReps))
		}
		for r := range cum {
			cum[r] += y.YieldReps[r] * toT
		}
		cd := compare.Summarise(cumPoint, cum)
		share := math.NaN()
		if applied {
			share = 1 / app.PotentialTonnes()
		}
		ex := y.Yield.Scaled(toT)
		for k, d := range []compare.Difference{y.Yield, y.PerMM, ex, ex.Scaled(share), cd.Scaled(share)} {
			m := d.Median
			if math.IsNaN(m) {
				m = d.Point
			}
			cols[3*k], cols[3*k+1], cols[3*k+2] = append(cols[3*k], m), append(cols[3*k+1], d.Low), append(cols[3*k+2], d.High)
		}
	}
	units := []string{"mol/km²/yr", "mol/km²/mm", "t CO2/yr", "fraction", "fraction"}
	names := []string{"difference", "per_mm", "extra_co2", "share_of_potential", "cumulative_share"}
	tc := []*Column{TextColumn("year", year)}
	for k, n := range names {
		tc = append(tc, NumColumn(n, units[k], cols[3*k]), NumColumn(n+"_low", units[k], cols[3*k+1]), NumColumn(n+"_high", units[k], cols[3*k+2]))
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "years", Title: fmt.Sprintf("%s consumption, %s, each year compared: per km², per mm of runoff, the extra uptake over the treated catchment, and its share of the application's CO2 potential, that year and added up over the years so far", s.measureName(), v.formula()),
		Columns: tc})
	if applied && len(o.Years) > 0 {
		cd := compare.Summarise(cumPoint, cum).Scaled(1 / app.PotentialTonnes())
		out.Figures = append(out.Figures, diffFigure("share of the application's CO2 potential taken up over the years compared", "fraction", cd,
			fmt.Sprintf("the extra uptake of the %d years compared, added up replicate by replicate", len(o.Years))))
	}
}
