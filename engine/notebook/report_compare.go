package notebook

import "math"

// SectionReport is one section of a budget with sections: its budget's
// headline figures as the report gives those of a budget of one catchment,
// read from the section's own cells (and the shared ones).
type SectionReport struct {
	Section        string             `json:"section"`
	AreaKm2        Number             `json:"area_km2"`
	RunoffMM       Range              `json:"runoff_mm_per_yr"`
	CationFluxes   map[string]Amount  `json:"cation_fluxes,omitempty"`
	FluxMethod     string             `json:"flux_method,omitempty"`
	Unapportioned  *Unapportioned     `json:"unapportioned,omitempty"`
	TimeScale      string             `json:"co2_time_scale,omitempty"`
	Convention     string             `json:"co2_long_term_convention,omitempty"`
	CO2            map[string]CO2Part `json:"co2_consumption,omitempty"`
	Doubtful       []string           `json:"doubtful,omitempty"` // cells of the section whose results are doubtful
	NotComputed    []string           `json:"not_computed,omitempty"`
	RecordRunoffMM Number             `json:"runoff_whole_record_mm_per_yr"`
}

// sectionReports reports each section, in document order; nil for a
// budget without sections.
func (d *Document) sectionReports() []SectionReport {
	if d.part {
		return nil
	}
	var out []SectionReport
	for _, name := range d.Sections() {
		sub := &Document{Title: name, state: d.state, funcs: d.funcs, part: true}
		for _, c := range d.Cells { // the section's own cells first: they are what firstOf finds
			if c.Section == name {
				sub.Cells = append(sub.Cells, c)
			}
		}
		for _, c := range d.Cells {
			if c.Section == "" {
				sub.Cells = append(sub.Cells, c)
			}
		}
		r := sub.Report()
		s := SectionReport{Section: name, AreaKm2: r.AreaKm2, RunoffMM: r.RunoffMM, CationFluxes: r.CationFluxes,
			FluxMethod: r.FluxMethod, Unapportioned: r.Unapportioned, TimeScale: r.TimeScale, Convention: r.Convention,
			CO2: r.CO2, RecordRunoffMM: r.RecordRunoffMM}
		for _, c := range sub.Cells {
			if c.Section != name {
				continue
			}
			switch st, _ := d.Status(c.ID); st {
			case Doubtful:
				s.Doubtful = append(s.Doubtful, c.ID)
			case UpToDate:
			default:
				s.NotComputed = append(s.NotComputed, c.ID)
			}
		}
		out = append(out, s)
	}
	return out
}

// ComparisonReport is the first computed comparison cell of a budget.
type ComparisonReport struct {
	Cell    string           `json:"cell"`
	Design  string           `json:"design"`     // "treated-control" or "before-after-control-impact"
	Formula string           `json:"difference"` // the difference taken, in words
	Budgets []ComparedBudget `json:"budgets"`
	// Draws says how each paired replicate took the apportionment draws,
	// and why.
	Draws string `json:"apportionment_draws"`
	// Differences gives, by quantity ("silicate cations", "Ca_silicate",
	// "silicate CO2", …), the difference per km² and per mm of runoff.
	Differences map[string]DifferenceReport `json:"differences"`
	Years       []ComparedYear              `json:"years"`
	Feedstock   map[string]Number           `json:"feedstock,omitempty"`
	Monitoring  []DesignPoint               `json:"monitoring_design,omitempty"`
	Figures     []ReportFigure              `json:"figures"`
	Cautions    []string                    `json:"cautions"`
}

// ComparedBudget is one budget of a comparison.
type ComparedBudget struct {
	Budget  string `json:"budget"` // "treated", "control", "treated before", "control before"
	Section string `json:"section"`
	Cell    string `json:"co2_cell"`
}

// DifferenceRange is a difference: the median and 95 % interval of the
// paired replicates, the point value and P(D > 0).
type DifferenceRange struct {
	Range
	Point Number `json:"point"`
	Above Number `json:"p_above_zero"`
}

// DifferenceReport is a quantity's difference per km² (mol/km²/yr) and per
// mm of runoff (mol/km²/mm).
type DifferenceReport struct {
	PerKm2 DifferenceRange `json:"mol_per_km2_per_yr"`
	PerMM  DifferenceRange `json:"mol_per_km2_per_mm"`
}

// ComparedYear is one year of the CO2 measure's difference.
type ComparedYear struct {
	Year            string `json:"year"`
	PerKm2          Range  `json:"mol_per_km2_per_yr"`
	PerMM           Range  `json:"mol_per_km2_per_mm"`
	ExtraCO2        Range  `json:"extra_t_co2"`
	Share           Range  `json:"share_of_potential"`
	CumulativeShare Range  `json:"cumulative_share_of_potential"`
}

// DesignPoint is the monitoring design at one sampling frequency.
type DesignPoint struct {
	PerYear    int    `json:"samples_per_year"`
	Increase   Number `json:"detectable_increase_percent"`
	Yield      Number `json:"detectable_mol_per_km2_per_yr"`
	Chosen     bool   `json:"chosen,omitempty"`
	NullSDPerc Number `json:"null_sd_percent"`
}

// comparisonReport reports the first computed comparison cell, or nil.
func (d *Document) comparisonReport() *ComparisonReport {
	id, o := d.firstOf(KindCompare)
	if o == nil {
		return nil
	}
	v, ok := o.Value.(*Comparison)
	if !ok {
		return nil
	}
	r := &ComparisonReport{Cell: id, Design: v.Settings.Design, Formula: v.formula(), Draws: v.Draws,
		Differences: map[string]DifferenceReport{}, Years: []ComparedYear{}, Cautions: compareCautions}
	for _, c := range v.Budgets {
		r.Budgets = append(r.Budgets, ComparedBudget{Budget: roleWords[c.role], Section: c.section, Cell: c.cell})
	}
	pk, pm := o.Table("difference"), o.Table("per-mm")
	num := func(t *ResultTable, col string, i int) Number {
		if c := t.Column(col); c != nil && i < len(c.Num) {
			return Number(c.Num[i])
		}
		return Number(math.NaN())
	}
	diff := func(t *ResultTable, i int) DifferenceRange {
		return DifferenceRange{Range: Range{num(t, "difference", i), num(t, "difference_low", i), num(t, "difference_high", i)},
			Point: num(t, "point", i), Above: num(t, "p_above_zero", i)}
	}
	for i, q := range pk.Column("quantity").Text {
		r.Differences[q] = DifferenceReport{PerKm2: diff(pk, i), PerMM: diff(pm, i)}
	}
	if t := o.Table("years"); t != nil {
		rg := func(c string, i int) Range { return Range{num(t, c, i), num(t, c+"_low", i), num(t, c+"_high", i)} }
		for i, y := range t.Column("year").Text {
			r.Years = append(r.Years, ComparedYear{Year: y, PerKm2: rg("difference", i), PerMM: rg("per_mm", i), ExtraCO2: rg("extra_co2", i),
				Share: rg("share_of_potential", i), CumulativeShare: rg("cumulative_share", i)})
		}
	}
	if t := o.Table("feedstock"); t != nil {
		r.Feedstock = map[string]Number{}
		for i, ox := range t.Column("oxide").Text {
			if ox == "all" {
				r.Feedstock["charge_mol_per_kg"] = num(t, "charge", i)
				continue
			}
			r.Feedstock[ox+"_percent"] = num(t, "content", i)
		}
		if f := o.Figure("CO2 potential of the feedstock"); f != nil {
			r.Feedstock["t_co2_per_t"] = Number(f.Median)
		}
	}
	if t := o.Table("design"); t != nil {
		for i := range t.Column("samples_per_year").Num {
			r.Monitoring = append(r.Monitoring, DesignPoint{PerYear: int(t.Column("samples_per_year").Num[i]), Increase: num(t, "detectable_increase", i),
				Yield: num(t, "detectable_yield", i), NullSDPerc: num(t, "null_sd", i), Chosen: t.Column("design").Text[i] == "chosen"})
		}
	}
	for i := range o.Figures {
		f := &o.Figures[i]
		r.Figures = append(r.Figures, ReportFigure{Name: f.Name, Unit: f.Unit, Range: rangeOf(f), Note: f.Note})
	}
	return r
}
