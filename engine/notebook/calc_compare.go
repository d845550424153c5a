package notebook

import (
	"context"
	"errors"
	"fmt"

	"lixiv/engine/co2"
	"lixiv/engine/compare"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
)

// CompareSettings choose what a comparison cell compares and how
// (docs/methods.md §17): the design and the sections of its budgets, the
// bootstrap, the feedstock applied, and the monitoring design.
type CompareSettings struct {
	Design        string `json:"design"`                 // "treated-control" or "before-after-control-impact"
	Treated       string `json:"treated_section"`        // section of the treated catchment (after spreading, in a before-after design)
	Control       string `json:"control_section"`        // section of the control catchment (over the same period)
	TreatedBefore string `json:"treated_before_section"` // before-after design: the treated catchment before spreading
	ControlBefore string `json:"control_before_section"` // before-after design: the control catchment over that period
	Replicates    int    `json:"replicates"`             // paired bootstrap replicates
	Seed          int64  `json:"seed"`                   // seed of the paired replicates and the monitoring simulations
	// CO2Measure is the CO2 consumption set against the feedstock and
	// simulated by the monitoring design: "silicate" or "total"
	// (silicate and carbonate).
	CO2Measure  string  `json:"co2_measure"`
	TonnesPerHa float64 `json:"feedstock_t_per_ha" blank:"not given"` // feedstock spread, t/ha
	AreaHa      float64 `json:"spread_area_ha" blank:"not given"`     // area spread, ha
	CaO         float64 `json:"cao_percent"`                          // feedstock composition, wt %
	MgO         float64 `json:"mgo_percent"`
	Na2O        float64 `json:"na2o_percent"`
	K2O         float64 `json:"k2o_percent"`
	Eta         float64 `json:"co2_per_charge"`          // mol CO2 per mol of cation charge
	PerYear     int     `json:"design_samples_per_year"` // samples a year of the monitoring design; 0 = the control's own
	Years       int     `json:"design_years"`            // years of the monitoring design (in each period, before-after)
	Target      float64 `json:"target_increase_percent"` // the increase, % of the control's flux, for the samples a year needed
	Simulations int     `json:"design_simulations"`      // simulated programmes of the monitoring design
}

// defaultCompareSettings: 1000 paired replicates (docs/methods.md §8.6,
// Efron & Tibshirani 1993); η = 1 mol CO2 per mol of charge, bicarbonate in
// fresh water (docs/methods.md §17); a design of two years at the control's
// own sampling rate, asked how often to sample to see a 10 % increase (an
// example figure, our own); 500 simulated programmes, which put the
// detectable increase within a few per cent of its value (our own choice,
// to keep a recompute quick).
func defaultCompareSettings() *CompareSettings {
	return &CompareSettings{Design: "treated-control", Replicates: 1000, Seed: 1, CO2Measure: "silicate", Eta: 1,
		Years: 2, Target: 10, Simulations: 500}
}

// Kind implements Settings.
func (*CompareSettings) Kind() Kind { return KindCompare }

// Validate implements Settings.
func (s *CompareSettings) Validate() error {
	err := firstErr(
		validSection(s.Treated), validSection(s.Control), validSection(s.TreatedBefore), validSection(s.ControlBefore),
		inRange("replicates", float64(s.Replicates), 1, MaxBootstrap),
		inRange("feedstock_t_per_ha", s.TonnesPerHa, 0, 1e4),
		inRange("spread_area_ha", s.AreaHa, 0, 1e10),
		inRange("cao_percent", s.CaO, 0, 100), inRange("mgo_percent", s.MgO, 0, 100),
		inRange("na2o_percent", s.Na2O, 0, 100), inRange("k2o_percent", s.K2O, 0, 100),
		inRange("co2_per_charge", s.Eta, 0, 2),
		inRange("design_samples_per_year", float64(s.PerYear), 0, 366),
		inRange("design_years", float64(s.Years), 1, 50),
		inRange("target_increase_percent", s.Target, 0.01, 1000),
		inRange("design_simulations", float64(s.Simulations), 20, 100_000),
	)
	if err != nil {
		return err
	}
	if err := s.oxides().Validate(); err != nil {
		return fmt.Errorf("feedstock composition: %v", err)
	}
	return nil
}

func (s *CompareSettings) design() compare.Design {
	if s.Design == "before-after-control-impact" {
		return compare.BACI
	}
	return compare.TreatedControl
}

func (s *CompareSettings) oxides() compare.Oxides {
	return compare.Oxides{CaO: s.CaO, MgO: s.MgO, Na2O: s.Na2O, K2O: s.K2O}
}

// compareDescriptor describes the comparison cell (package describe.go).
// compareLabels label the columns the comparison's open tables may hold.
var compareLabels = []LabelInfo{
	{"p_above_zero", "P(difference > 0)"}, {"point", "point difference"}, {"treated_before", "treated before"},
	{"control_before", "control before"}, {"per_mm", "per mm of runoff"}, {"extra_co2", "extra CO2 over the treated catchment"},
	{"share_of_potential", "share of the CO2 potential"}, {"cumulative_share", "share of the CO2 potential so far"},
	{"samples_per_year", "samples a year"}, {"detectable_increase", "smallest detectable increase"},
	{"detectable_yield", "smallest detectable increase"}, {"null_sd", "spread of the null difference"},
}

var compareDescriptor = Descriptor{Kind: KindCompare, Label: "Comparison", New: func() Settings { return defaultCompareSettings() },
	Inputs: compareRoles,
	Notes: []SettingNote{
		{Key: "design", Help: "treated − control over one period, or (after − before) treated − (after − before) control",
			Choices: []Choice{{Value: "treated-control"}, {Value: "before-after-control-impact"}}},
		{Key: "co2_measure", Help: "the CO2 consumption set against the feedstock and simulated by the monitoring design",
			Choices: []Choice{{Value: "silicate"}, {Value: "total"}}},
	},
	Tables: []TableInfo{
		{Name: "difference", Columns: []ColumnInfo{{"quantity", ""}}, Open: true, Labels: compareLabels},
		{Name: "per-mm", Columns: []ColumnInfo{{"quantity", ""}}, Open: true, Labels: compareLabels},
		{Name: "budgets", Columns: []ColumnInfo{{"budget", ""}, {"section", ""}, {"co2_cell", ""}, {"estimator", ""}, {"area", "km²"}, {"runoff", "mm/yr"}, {"complete_years", ""}, {"samples", "apportioned"}}, Labels: []LabelInfo{{"co2_cell", "co2 cell"}, {"complete_years", "complete years"}}},
		{Name: "shared", Columns: []ColumnInfo{{"part", ""}, {"drawn", ""}}},
		{Name: "feedstock", Columns: []ColumnInfo{{"oxide", ""}, {"content", "wt %"}, {"molar_mass", "g/mol"}, {"charge", "mol/kg"}}, Labels: []LabelInfo{{"molar_mass", "molar mass"}, {"charge", "cation charge"}}},
		{Name: "years", Columns: []ColumnInfo{{"year", ""}}, Open: true, Labels: compareLabels},
		{Name: "design", Columns: []ColumnInfo{{"samples_per_year", "samples/yr"}}, Open: true, Labels: compareLabels},
	},
	// A comparison's differences per km² lead the summary strip.
	Headline: []FigureInfo{
		{Name: "treated − control: difference in", Prefix: true, Rank: -1},
		{Name: "(after − before) treated − (after − before) control: difference in", Prefix: true, Rank: -1},
	},
}

// compareRoles are the budgets a comparison reads, in the order of
// compare.Design.Signs: each a co2 cell (which reads its fluxes cell).
var compareRoles = []Role{{"treated", KindCO2, false}, {"control", KindCO2, false},
	{"treated_before", KindCO2, true}, {"control_before", KindCO2, true}}

// sectionKeys name the setting that gives each role's section.
var sectionKeys = map[string]string{"treated": "treated_section", "control": "control_section",
	"treated_before": "treated_before_section", "control_before": "control_before_section"}

// sectionOf returns the section in which the comparison looks for role's
// budget ("" for the before roles of a treated − control design).
func (s *CompareSettings) sectionOf(role string) string {
	switch role {
	case "treated":
		return s.Treated
	case "control":
		return s.Control
	}
	if s.design() != compare.BACI {
		return ""
	}
	if role == "treated_before" {
		return s.TreatedBefore
	}
	return s.ControlBefore
}

// roleWords name the budgets for readers, in role order.
var roleWords = map[string]string{"treated": "treated", "control": "control", "treated_before": "treated before",
	"control_before": "control before"}

func init() {
	Register(KindCompare, computeCompare)
	for k, v := range map[string]string{
		"design":                  "design",
		"treated_section":         "treated catchment: its section (after spreading, in a before-after design)",
		"control_section":         "control catchment: its section (over the same period)",
		"treated_before_section":  "treated catchment before spreading: its section (before-after design)",
		"control_before_section":  "control catchment over that period: its section (before-after design)",
		"replicates":              "paired bootstrap replicates",
		"co2_measure":             "CO2 consumption set against the feedstock",
		"feedstock_t_per_ha":      "feedstock spread (t/ha)",
		"spread_area_ha":          "area spread (ha)",
		"cao_percent":             "feedstock CaO (wt %)",
		"mgo_percent":             "feedstock MgO (wt %)",
		"na2o_percent":            "feedstock Na2O (wt %)",
		"k2o_percent":             "feedstock K2O (wt %)",
		"co2_per_charge":          "CO2 per mol of cation charge, η (mol/mol)",
		"design_samples_per_year": "monitoring design: samples a year (0: the control's own)",
		"design_years":            "monitoring design: years (in each period, before-after)",
		"target_increase_percent": "increase to detect (% of the control's flux)",
		"design_simulations":      "monitoring design: simulated programmes",
	} {
		settingLabels[k] = v
	}
}

// CO2Budget is the value a co2 cell hands on: its accounting and the
// fluxes it rests on (nil without a fluxes cell), for a comparison.
type CO2Budget struct {
	Settings CO2Settings
	Fluxes   *Fluxes
	App      *Apportioned
	Options  co2.Options
	Scale    string // "short", or the long-term convention
}

// compared is one budget of a comparison.
type compared struct {
	role, section, cell string
	b                   *CO2Budget
}

// comparedBudgets reads the budgets of the comparison's design, in role
// order.
func comparedBudgets(e *Env, s *CompareSettings) ([]compared, error) {
	d := s.design()
	var out []compared
	for _, r := range compareRoles[:d.Budgets()] {
		id, err := e.doc.resolve(e.Cell, r)
		if err != nil {
			return nil, err
		}
		if id == "" {
			return nil, settingErr(sectionKeys[r.Name], "the %s design needs the section of the %s budget", d, roleWords[r.Name])
		}
		in, err := e.Input(r.Name)
		if err != nil {
			return nil, err
		}
		cb, ok := in.Value.(*CO2Budget)
		if !ok || cb == nil {
			return nil, fmt.Errorf("the %s budget's co2 cell %q gave nothing to compare", roleWords[r.Name], id)
		}
		if cb.Fluxes == nil {
			return nil, fmt.Errorf("the %s budget's co2 cell %q reads no fluxes cell: a comparison needs the fluxes of every budget", roleWords[r.Name], id)
		}
		out = append(out, compared{role: r.Name, section: e.doc.Cell(id).Section, cell: id, b: cb})
	}
	for _, c := range out[1:] {
		if c.b.Settings != out[0].b.Settings {
			return nil, fmt.Errorf("the co2 cells %q and %q account CO2 differently (time scale, sulfur split, long-term convention): a comparison needs one accounting", out[0].cell, c.cell)
		}
	}
	return out, nil
}

// compareQuantity is a quantity the comparison takes the difference of.
type compareQuantity struct {
	name  string
	parts []int
	of    func(b *CO2Budget) amounts
	co2   bool // a CO2 consumption (the others are cation sums and single cations)
}

// compareQuantities lists the quantities, in table order: the cation sums
// by rock source, each cation by source, then CO2 consumption.
func compareQuantities() []compareQuantity {
	all := []int{0, 1, 2, 3}
	q := []compareQuantity{
		{name: "silicate cations", parts: all, of: func(*CO2Budget) amounts { return cationsOf(mix.Silicate, all...) }},
		{name: "carbonate cations", parts: []int{2, 3}, of: func(*CO2Budget) amounts { return cationsOf(mix.Carbonate, 2, 3) }},
	}
	for _, src := range []mix.Source{mix.Silicate, mix.Carbonate} {
		for k, sp := range mix.Cations {
			if src == mix.Carbonate && k < 2 {
				continue
			}
			q = append(q, compareQuantity{name: sp.Symbol() + "_" + src.String(), parts: []int{k},
				of: func(*CO2Budget) amounts { return cationsOf(src, k) }})
		}
	}
	co2 := func(carb bool) func(b *CO2Budget) amounts {
		return func(b *CO2Budget) amounts { return co2Amounts(b.App, &b.Options, b.Scale, carb, nil) }
	}
	q = append(q,
		compareQuantity{name: "silicate CO2", parts: all, of: co2(false), co2: true},
		compareQuantity{name: "carbonate CO2", parts: all, of: co2(true), co2: true},
		compareQuantity{name: "total CO2", parts: all, co2: true, of: func(b *CO2Budget) amounts {
			sil, carb := co2(false)(b), co2(true)(b)
			return func(i, k int, s *mix.Split, so4 float64, out *[mix.NCations]float64) {
				var o [mix.NCations]float64
				sil(i, k, s, so4, out)
				carb(i, k, s, so4, &o)
				for j := range out {
					out[j] += o[j]
				}
			}
		}})
	return q
}

// measureName names the CO2 consumption the settings set against the
// feedstock.
func (s *CompareSettings) measureName() string { return s.CO2Measure + " CO2" }

// quantityAt builds an apportioned quantity of the budget (as
// Fluxes.quantity does) whose draws are those of the given draw numbers,
// for every sample with a usable apportionment: draw k of each sample is
// draw number at[k], the same shared values in every sample and budget.
func (v *Fluxes) quantityAt(name string, parts []int, f amounts, at []int) flux.Apportioned {
	q := v.quantity(name, 0, false, parts, f)
	a := v.App
	q.Weights = make([][]float64, len(a.Names))
	for j := range q.Parts {
		q.Parts[j].Draws = make([][]float64, len(a.Names))
	}
	var out [mix.NCations]float64
	for i := range a.Names {
		if !a.Usable(i) {
			continue
		}
		if v.tick != nil {
			v.tick()
		}
		q.Weights[i] = make([]float64, len(at))
		for j := range q.Parts {
			q.Parts[j].Draws[i] = make([]float64, len(at))
		}
		for k, d := range at {
			sp, w, _ := a.Draw(i, d)
			q.Weights[i][k] = w
			f(i, -1, &sp, a.SO4Sulf(i, d), &out)
			for j, c := range parts {
				q.Parts[j].Draws[i][k] = out[c]
			}
		}
	}
	return q
}

// MinJointDraws is the smallest effective number of draws kept by every
// sample of the compared budgets (compare.Joint.Effective) with which the
// comparison takes one draw per replicate for all of them; with fewer,
// each sample takes its own (an engineering choice, no source).
const MinJointDraws = 50

// jointDraws decides how the apportionment draws enter the paired
// replicates: one draw number per replicate for every budget when the
// budgets share their end-members and rain correction (sharedDraws) and
// enough draws are kept by every sample; else each sample its own. It
// returns the joint draws (nil for the latter) and a sentence saying which
// and why.
func jointDraws(d *Document, bs []compared, reps int, seed uint64) (*compare.Joint, string) {
	if why := sharedDraws(d, bs); why != "" {
		return nil, ownDraws + ", since " + why
	}
	var w [][][]float64
	for _, c := range bs {
		a := c.b.App
		rows := make([][]float64, len(a.Names))
		for i := range rows {
			if a.Usable(i) {
				rows[i] = a.Weights(i)
			}
		}
		w = append(w, rows)
	}
	j, err := compare.JointDraws(w, reps, seed)
	switch {
	case errors.Is(err, compare.ErrNoJoint):
		return nil, ownDraws + ", since no draw is kept by every sample of the budgets"
	case err != nil:
		return nil, ownDraws + ": " + err.Error()
	case j.Effective < MinJointDraws:
		return nil, fmt.Sprintf(ownDraws+", since the draws kept by every sample of the budgets amount to %.3g effective draws, fewer than %d", j.Effective, MinJointDraws)
	}
	return j, fmt.Sprintf("once per replicate for every budget: one end-member table and rain correction serve them all, and %d draws (%.4g effective) are kept by every sample", len(j.Draws), j.Effective)
}

// ownDrawsWarning names the consequence of paired replicates without
// joint draws (docs/methods.md §17), shown whenever each sample takes its
// own.
const ownDrawsWarning = "apportionment draws: each replicate takes a draw of each sample by its weight, independently in each budget (the shared table says why). The end-member and rain uncertainty the budgets share is therefore not carried as shared: it does not cancel in the difference as a common error should, and within each budget it averages out over the samples as if independent. Joint draws need the forward model with one end-member table, rain correction, number of draws and seed in every budget"

// ownDraws says, at the start of a sentence, how the draws are taken
// without joint draws.
const ownDraws = "each sample's own draw, by its weight, separately in each budget"

// budgetFluxOptions returns a budget of the comparison for compare.Pair:
// its record, estimator and its own discharge and area errors.
func budgetFluxOptions(ctx context.Context, c compared, tick func()) compare.Budget {
	f := c.b.Fluxes
	return compare.Budget{Name: roleWords[c.role], Record: f.Record, Options: f.Options,
		Bootstrap: flux.BootstrapOptions{DischargeError: f.Bootstrap.DischargeError, AreaError: f.Bootstrap.AreaError,
			Cache: &flux.Cache{}, Tick: tick, Context: ctx}}
}

func computeCompare(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*CompareSettings)
	bs, err := comparedBudgets(e, s)
	if err != nil {
		return nil, err
	}
	d := s.design()
	rough := e.Rough()
	out := &Output{Rough: rough}
	v := &Comparison{Settings: *s, Budgets: bs}
	out.Value = v
	qs := compareQuantities()
	total := len(qs) + 1
	done := 0
	tick := func() { e.Report(done, total) }
	budgets := make([]compare.Budget, len(bs))
	fluxes := make([]*Fluxes, len(bs))
	for b, c := range bs {
		f := c.b.Fluxes
		if err := checkBootstrapWork("replicates", s.Replicates, len(f.App.Names), f.Record.Len()); err != nil {
			return nil, err
		}
		budgets[b] = budgetFluxOptions(e.Ctx, c, tick)
		fluxes[b] = c.b.Fluxes.ticking(e.Ctx, tick)
		if c.b.Fluxes.Options.Method != bs[0].b.Fluxes.Options.Method {
			out.Warnings = append(out.Warnings, fmt.Sprintf("the %s budget fluxes with the %s estimator, the %s budget with the %s: their biases need not cancel in the difference",
				roleWords[c.role], estimatorLabel(c.b.Fluxes.Options.Method), roleWords[bs[0].role], estimatorLabel(bs[0].b.Fluxes.Options.Method)))
		}
		for _, r := range c.b.Fluxes.Doubtful {
			out.Doubtful = append(out.Doubtful, roleWords[c.role]+" budget: "+r)
		}
	}
	opt := compare.Options{Design: d, Replicates: s.Replicates, Seed: uint64(s.Seed), PointOnly: rough}
	var joint *compare.Joint
	if !rough {
		joint, v.Draws = jointDraws(e.doc, bs, s.Replicates, uint64(s.Seed))
		if joint != nil {
			opt.Picks = joint.Picks
		} else {
			out.Warnings = append(out.Warnings, ownDrawsWarning)
		}
	}
	for _, q := range qs {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		e.Report(done, total)
		per := make([]flux.Apportioned, len(bs))
		for b, c := range bs {
			f := q.of(c.b)
			if joint != nil {
				per[b] = fluxes[b].quantityAt(q.name, q.parts, f, joint.Draws)
			} else {
				per[b] = fluxes[b].quantity(q.name, 0, !rough, q.parts, f)
			}
		}
		o, err := compare.Pair(budgets, per, opt)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", q.name, err)
		}
		v.Outcomes = append(v.Outcomes, o)
		done++
	}
	v.results(out)
	if !rough {
		if err := v.monitoring(e, out); err != nil {
			out.Warnings = append(out.Warnings, "monitoring design: "+err.Error())
		}
	}
	e.Report(total, total)
	out.Warnings = append(out.Warnings, compareCautions...)
	return out, nil
}

// compareCautions are shown on every comparison (docs/methods.md §12, §17).
var compareCautions = []string{
	"a measured difference is not a carbon-removal credit: crediting needs baselines, counterfactuals, leakage, downstream losses, permanence and verification under the applicable protocol and local law; defer to it",
	"soils may hold the cations a feedstock releases on their exchange sites for years before the streams carry them: a small early difference does not show that little weathered",
	"downstream losses — carbonate precipitation in rivers and the sea, and CO2 degassing — may cancel part of the uptake the stream water shows",
	"a Na-normalised apportionment books the Ca and Mg of a Na-poor feedstock (basalt, olivine) partly as carbonate (docs/methods.md §12): compare the total cations and total CO2 as well",
	"treated − control assumes the catchments would have been alike without the feedstock, and a before-after design that both would have changed alike; neither can be tested from the data alone",
}
