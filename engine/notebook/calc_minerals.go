package notebook

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/mineral"
)

// MineralSettings choose the minerals of the mass balance.
type MineralSettings struct {
	// Primary and Secondary name the minerals: each a mineral of the
	// built-in table (mineral.Catalogue), "plagioclase AnNN", a formula,
	// or "name = formula". Primary minerals only dissolve; secondary ones
	// may form.
	Primary   []string `json:"primary_minerals"`
	Secondary []string `json:"secondary_minerals"`
	// Fit is "all" (every water component the minerals give) or
	// "cations" (Na, K, Ca, Mg, Cl and SO4, with SiO2 and HCO3 left as
	// checks, as Garrels & Mackenzie 1967 did).
	Fit string `json:"fit_components"`
	// Uncertainty is the relative analytical uncertainty (1σ, %) that
	// weights each component of a least-squares fit, with a floor of
	// MineralFloor; 0 weights every component alike.
	Uncertainty float64 `json:"analytical_uncertainty_percent"`
}

// MineralFloor is the least analytical uncertainty of a water component in
// the mineral balance's weights, µmol/L (about a detection limit; common
// practice, no source).
const MineralFloor = 1.0

// MaxMinerals caps the minerals of one balance.
const MaxMinerals = 16

// defaultMineralSettings: a granitic set with a little calcite, weathering
// to kaolinite (the minerals Garrels & Mackenzie 1967 balanced, with
// calcite added; an example to edit, no source), fitted to every
// component, each weighted by a 5 % analytical uncertainty (common
// practice for major ions, no source).
func defaultMineralSettings() *MineralSettings {
	return &MineralSettings{Primary: []string{"plagioclase An30", "K-feldspar", "biotite", "calcite"},
		Secondary: []string{"kaolinite"}, Fit: "all", Uncertainty: 5}
}

// Kind implements Settings.
func (*MineralSettings) Kind() Kind { return KindMinerals }

// Validate implements Settings. The mineral names are read when the cell
// computes, where a name or formula that cannot be read is a problem of
// the cell naming it, and the setting is kept as typed.
func (s *MineralSettings) Validate() error {
	if n := len(s.Primary) + len(s.Secondary); n > MaxMinerals {
		return settingErr("secondary_minerals", "%d primary and secondary minerals in all; at most %d", n, MaxMinerals)
	}
	return firstErr(inRange("analytical_uncertainty_percent", s.Uncertainty, 0, 100))
}

// MineralBalance is the value a minerals cell hands on.
type MineralBalance struct {
	Balance  *mineral.Balance
	Names    []string // samples
	Days     []string
	Water    [][mineral.NWater]float64 // the rain-corrected water of each sample, µmol/L
	Solution []mineral.Solution
	// Period holds, per mineral, its mean annual flux, with the fluxes
	// cell's estimator; nil without a fluxes cell.
	Period []MineralFlux
	// co2Reps holds, per mineral, the CO2 per mole times the sign its
	// series was fluxed with, and that series' bootstrap (nil without).
	co2Reps []co2Rep
}

type co2Rep struct {
	k float64
	u *flux.Uncertainty
}

// co2Total is the CO2 all the minerals consumed per km² and year: the sum
// of their point yields, and its median and 95 % interval over the
// bootstrap replicates, which share their seed across the minerals'
// series (replicate r resampled the same samples and drew the same
// discharge and area errors in each; as the fluxes cell's weathering
// rates are formed).
func (v *MineralBalance) co2Total(fv *Fluxes) Figure {
	total := 0.0
	for j := range v.Period {
		total += v.Period[j].CO2Yield.Median
	}
	const name = "CO2 consumed by the minerals balanced, per km²"
	n := -1
	for _, c := range v.co2Reps {
		switch {
		case c.k == 0: // consumes no CO2 (a clay), or not fluxed
		case c.u == nil || len(c.u.MeanMol) != len(c.u.Area):
			n = 0
		case n < 0 || len(c.u.MeanMol) < n:
			n = len(c.u.MeanMol)
		}
	}
	if n <= 0 {
		return Point(name, "mol/km²/yr", total)
	}
	reps := make([]float64, n)
	for r := range reps {
		for _, c := range v.co2Reps {
			if c.k != 0 {
				reps[r] += c.k * c.u.MeanMol[r] / c.u.Area[r]
			}
		}
	}
	in := flux.Summary(reps)
	return Figure{Name: name, Unit: "mol/km²/yr", Median: in.Median, Low: in.Lo, High: in.Hi}
}

// MineralFlux is one mineral's mean annual flux: mol/yr, mol/km²/yr and
// the CO2 it consumed, each a median with its 95 % interval (NaN bounds in
// the quick pass), and its flux-weighted mean amount per litre.
type MineralFlux struct {
	Mol, Yield, CO2Yield flux.Interval
	MeanPerLitre         float64 // µmol/L
}

func init() { Register(KindMinerals, computeMinerals) }

// mineralPhases reads the mineral settings into phases, with the warnings
// Lookup gives on typed formulas.
func mineralPhases(s *MineralSettings) ([]mineral.Phase, []string, error) {
	var ps []mineral.Phase
	var warns []string
	for _, list := range []struct {
		key       string
		names     []string
		secondary bool
	}{{"primary_minerals", s.Primary, false}, {"secondary_minerals", s.Secondary, true}} {
		for _, n := range list.names {
			m, w, err := mineral.Lookup(n)
			if err != nil {
				return nil, nil, fmt.Errorf("%s: %v", list.key, err)
			}
			warns = append(warns, w...)
			ps = append(ps, mineral.Phase{Mineral: m, Secondary: list.secondary})
		}
	}
	return ps, warns, nil
}

// mineralWater is the water a minerals cell balances: the measured sample
// less the rain input and, when chosen, the human input (docs/methods.md
// §4), before the evaporite and sulfate corrections, so that halite,
// gypsum and pyrite can be balanced as minerals. HCO3 is the alkalinity
// (carbonate alkalinity is nearly all bicarbonate below pH 8.3; common
// practice).
func mineralWater(r *correct.Result) [mineral.NWater]float64 {
	var w [mineral.NWater]float64
	for _, m := range []struct {
		c  mineral.Component
		sp chem.Species
	}{{mineral.Na, chem.Na}, {mineral.K, chem.K}, {mineral.Ca, chem.Ca}, {mineral.Mg, chem.Mg},
		{mineral.Cl, chem.Cl}, {mineral.SO4, chem.SO4}, {mineral.HCO3, chem.Alk}, {mineral.SiO2, chem.SiO2}} {
		x := r.Input[m.sp]
		if !math.IsNaN(r.Atm[m.sp]) {
			x -= r.Atm[m.sp]
		}
		if !math.IsNaN(r.Human[m.sp]) {
			x -= r.Human[m.sp]
		}
		w[m.c] = x
	}
	return w
}

// computeMinerals balances the rain-corrected water of each sample the
// atmosphere cell corrects (Atmosphere.Use) against the chosen minerals (docs/methods.md §16) and, with a fluxes cell, fluxes each
// mineral's amount over the period with that cell's estimator.
func computeMinerals(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*MineralSettings)
	ps, warns, err := mineralPhases(s)
	if err != nil {
		return nil, err
	}
	var checks []mineral.Component
	if s.Fit == "cations" {
		checks = []mineral.Component{mineral.SiO2, mineral.HCO3}
	}
	b, err := mineral.NewBalance(ps, checks...)
	if err != nil {
		return nil, err
	}
	b.Relative, b.Floor = s.Uncertainty/100, MineralFloor
	atm, err := inputOf[*Atmosphere](e, "atmosphere")
	if err != nil {
		return nil, err
	}
	v := &MineralBalance{Balance: b}
	out := &Output{Value: v, Warnings: warns}
	opt := atm.Options
	var days []dayOf
	negative := map[string]int{}
	for _, i := range atm.Use {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		sm := atm.Samples.Table.Samples[i]
		r, err := correct.Apply(sm.C, &opt)
		if err != nil {
			return nil, fmt.Errorf("sample %s (line %d): %v", sm.ID, sm.Line, err)
		}
		w := mineralWater(&r)
		for c, x := range w {
			if x < 0 && b.Fitted(mineral.Component(c)) {
				negative[mineral.Component(c).String()]++
			}
		}
		v.Names, v.Days = append(v.Names, sm.ID), append(v.Days, atm.Samples.Days[i].String())
		v.Water, v.Solution = append(v.Water, w), append(v.Solution, b.Solve(w))
		days = append(days, dayOf{atm.Samples.Days[i], sm.Q, cationCharges(sm.C)})
	}
	if len(negative) > 0 {
		var parts []string
		for _, k := range sortedNames(negative) {
			parts = append(parts, fmt.Sprintf("%s in %s", k, plural(negative[k], "sample")))
		}
		out.Warnings = append(out.Warnings, "the rain correction leaves less than nothing of "+strings.Join(parts, ", ")+
			"; balanced as it is (a residual, not a mineral, takes it up)")
	}
	notes := map[string]int{}
	unsolved, held := 0, 0
	for i, sol := range v.Solution {
		if sol.Fit == mineral.NoFit || sol.Fit == mineral.UnderDetermined {
			unsolved++
		}
		if len(sol.HeldAtZero) > 0 {
			held++
		}
		if sol.Message != "" {
			notes[sol.Message+": "+v.Names[i]]++
		}
	}
	out.Warnings = append(out.Warnings, countedByMessage(notes)...)
	out.Warnings = append(out.Warnings, v.leansHigh()...)
	out.Tables = append(out.Tables, v.mineralTable(), v.amountTable(), v.residualTable())
	out.Figures = append(out.Figures, Point("samples balanced", "", float64(len(v.Solution)-unsolved)),
		Point("samples not balanced", "", float64(unsolved)),
		Point("samples with a primary mineral held at zero", "", float64(held)))
	fi, err := e.Input("fluxes")
	if err != nil {
		return nil, err
	}
	if fi != nil && unsolved == len(v.Solution) {
		out.Warnings = append(out.Warnings, "no sample balanced: nothing to flux")
	}
	if fi != nil && unsolved < len(v.Solution) {
		fv := fi.Value.(*Fluxes)
		w, err := v.flux(e, fv, days)
		out.Warnings = append(out.Warnings, w...)
		if err != nil {
			return nil, err
		}
		out.Rough = e.Rough()
		out.Tables = append(out.Tables, v.periodTable())
		out.Figures = append(out.Figures, v.co2Total(fv))
		for j, p := range v.Balance.Phases {
			y := v.Period[j].Yield
			name := p.Key + " dissolved, per km²"
			if p.Secondary {
				name = p.Key + " dissolved, per km² (below zero: formed)"
			}
			out.Figures = append(out.Figures, Figure{Name: name, Unit: "mol/km²/yr", Median: y.Median, Low: y.Lo, High: y.Hi})
		}
	}
	out.Tables = append(out.Tables, catalogueTable())
	return out, nil
}

// LeanShare is the share of samples above which a mineral held at zero is
// said to lean high: a tenth (common practice, no source).
const LeanShare = 0.1

// leansHigh names the primary minerals held at zero in more than
// LeanShare of the samples balanced: small against the analytical noise,
// their amounts are cut at zero where the noise would make them negative,
// so their means lean high (docs/validation.md measures it).
func (v *MineralBalance) leansHigh() []string {
	held := make([]int, len(v.Balance.Phases))
	n := 0
	for _, s := range v.Solution {
		if s.Fit == mineral.LeastSquares || s.Fit == mineral.Exact {
			n++
		}
		for _, j := range s.HeldAtZero {
			held[j]++
		}
	}
	var out []string
	for j, h := range held {
		if n > 0 && float64(h) > LeanShare*float64(n) {
			out = append(out, fmt.Sprintf("%s is held at zero in %d of %d samples: it is small against the analytical noise, and its amounts and flux lean high",
				v.Balance.Phases[j].Key, h, n))
		}
	}
	return out
}

// dayOf is a sample's day and discharge at sampling.
type dayOf struct {
	day discharge.Day
	q   float64
	tz  float64 // measured cation charge Na + K + 2Ca + 2Mg, µeq/L
}

// flux fluxes each mineral's amounts with the fluxes cell's estimator and
// bootstrap (point values in the quick pass), through the samples'
// measured cation charge (Fluxes.fitAmounts). A secondary mineral that
// only forms is fluxed as the amount formed, then given its sign back.
func (v *MineralBalance) flux(e *Env, fv *Fluxes, days []dayOf) ([]string, error) {
	var warns []string
	n := len(v.Solution)
	reps := fv.SeriesReplicates
	if e.Rough() {
		reps = 0
	}
	if err := checkBootstrapWork("series_bootstrap", reps, n, fv.Record.Len()); err != nil {
		return nil, err
	}
	j := 0
	fv = fv.ticking(e.Ctx, func() { e.Report(j, len(v.Balance.Phases)) })
	for j = range v.Balance.Phases {
		p := v.Balance.Phases[j]
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		e.Report(j, len(v.Balance.Phases))
		amt := make([]float64, n)
		sign := 1.0
		if p.Secondary {
			sign = -1
			for _, sol := range v.Solution {
				if sol.Amount[j] > 0 {
					sign = 1
				}
			}
		}
		for i, sol := range v.Solution {
			amt[i] = sign * sol.Amount[j]
		}
		f, w, err := fv.fitAmounts(p.Key, days, amt, reps)
		warns = append(warns, w...)
		if err != nil {
			warns = append(warns, err.Error())
			v.Period = append(v.Period, MineralFlux{Mol: nanInterval(), Yield: nanInterval(), CO2Yield: nanInterval(), MeanPerLitre: math.NaN()})
			v.co2Reps = append(v.co2Reps, co2Rep{})
			continue
		}
		pick := func(point float64, in func(*flux.LoadInterval) flux.Interval) flux.Interval {
			if f.u == nil {
				return scaled(flux.Interval{Median: point, Lo: math.NaN(), Hi: math.NaN()}, sign)
			}
			return scaled(in(&f.u.Mean), sign)
		}
		mf := MineralFlux{Mol: pick(f.r.Mean.Mol, func(l *flux.LoadInterval) flux.Interval { return l.Mol }),
			Yield: pick(f.r.Mean.MolPerKm2, func(l *flux.LoadInterval) flux.Interval { return l.MolPerKm2 })}
		mf.CO2Yield = scaled(mf.Yield, p.CO2PerMole())
		mf.MeanPerLitre = sign * f.r.Mean.MolPerKm2 / f.r.Mean.RunoffMM // mol/km²/yr ÷ mm/yr = µmol/L
		v.Period = append(v.Period, mf)
		v.co2Reps = append(v.co2Reps, co2Rep{sign * p.CO2PerMole(), f.u})
	}
	e.Report(len(v.Balance.Phases), len(v.Balance.Phases))
	return groupSeries(warns, phaseKeys(v.Balance)), nil
}

func phaseKeys(b *mineral.Balance) map[string]bool {
	m := map[string]bool{}
	for _, p := range b.Phases {
		m[p.Key] = true
	}
	return m
}

func nanInterval() flux.Interval {
	return flux.Interval{Median: math.NaN(), Lo: math.NaN(), Hi: math.NaN()}
}

// scaled multiplies an interval by k, swapping the bounds when k < 0.
func scaled(in flux.Interval, k float64) flux.Interval {
	out := flux.Interval{Median: in.Median * k, Lo: in.Lo * k, Hi: in.Hi * k}
	if k < 0 {
		out.Lo, out.Hi = out.Hi, out.Lo
	}
	if k == 0 {
		out = flux.Interval{Median: 0, Lo: 0, Hi: 0}
		if math.IsNaN(in.Lo) {
			out.Lo, out.Hi = math.NaN(), math.NaN()
		}
	}
	return out
}

// role describes a phase's role for tables.
func role(p mineral.Phase) string {
	if p.Secondary {
		return "secondary (may form)"
	}
	return "primary (dissolves)"
}

// mineralTable lists the minerals of the balance with their reactions.
func (v *MineralBalance) mineralTable() *ResultTable {
	var key, name, formula, roles, source, reaction []string
	var co2 []float64
	for _, p := range v.Balance.Phases {
		key, name, formula = append(key, p.Key), append(name, p.Name), append(formula, p.Text)
		roles, source = append(roles, role(p)), append(source, p.Source)
		r := p.Reaction().String()
		if r == "" {
			r = "none: the Al of the others ends in it"
		}
		co2, reaction = append(co2, p.CO2PerMole()), append(reaction, r)
	}
	return &ResultTable{Name: "minerals", Title: "Minerals of the balance: formula, role, CO2 consumed per mole and the balanced reaction with carbonic acid",
		Columns: []*Column{TextColumn("mineral", key), TextColumn("name", name), TextColumn("formula", formula), TextColumn("role", roles),
			NumColumn("CO2_per_mol", "mol/mol", co2), TextColumn("reaction", reaction), TextColumn("source", source)}}
}

// fitText describes how a sample was balanced: the components fitted
// (with Al, which the secondary phase balances exactly) and the minerals.
func fitText(b *mineral.Balance, s mineral.Solution) string {
	if s.Fit != mineral.LeastSquares && s.Fit != mineral.Exact {
		return s.Fit.String()
	}
	rows, al := s.Rows, ""
	if b.AlBalanced() {
		rows, al = rows+1, " with Al"
	}
	return fmt.Sprintf("%s (%d components%s, %d minerals)", s.Fit, rows, al, len(b.Phases))
}

// fitColumn gives each sample's fit: in full where it differs from the
// fit most samples share, which is returned for the table's title, and
// in a word where it does not.
func (v *MineralBalance) fitColumn() (fit []string, common string) {
	full := make([]string, len(v.Solution))
	count := map[string]int{}
	for i, s := range v.Solution {
		full[i] = fitText(v.Balance, s)
		if count[full[i]]++; count[full[i]] > count[common] {
			common = full[i]
		}
	}
	fit = make([]string, len(full))
	for i, f := range full {
		fit[i] = f
		if f == common {
			fit[i] = v.Solution[i].Fit.String()
		}
	}
	return fit, common
}

// amountTable lists each sample's moles of each mineral per litre: the
// stacked-bar chart's data.
func (v *MineralBalance) amountTable() *ResultTable {
	n := len(v.Solution)
	note := make([]string, n)
	fit, common := v.fitColumn()
	co2 := make([]float64, n)
	for i, s := range v.Solution {
		note[i] = s.Message
		for _, c := range s.CO2 {
			co2[i] += c
		}
	}
	cols := []*Column{TextColumn("sample", v.Names), TextColumn("date", v.Days), TextColumn("fit", fit)}
	for j, p := range v.Balance.Phases {
		x := make([]float64, n)
		for i, s := range v.Solution {
			x[i] = s.Amount[j]
		}
		cols = append(cols, NumColumn(p.Key, "µmol/L", x))
	}
	cols = append(cols, NumColumn("CO2_consumed", "µmol/L", co2), TextColumn("note", note))
	title := "Moles of each mineral per litre of stream water (above zero dissolved, below zero formed) and the CO2 they consumed"
	if common != "" {
		title += "; most samples: " + common
	}
	return &ResultTable{Name: "amounts", Title: title, Columns: cols}
}

// residualTable lists what the minerals leave unexplained of each water.
func (v *MineralBalance) residualTable() *ResultTable {
	n := len(v.Solution)
	cols := []*Column{TextColumn("sample", v.Names), TextColumn("date", v.Days)}
	checks := map[mineral.Component]bool{}
	for _, c := range v.Balance.Checks {
		checks[c] = true
	}
	var checked []string
	for c := mineral.Component(0); c < mineral.NWater; c++ {
		x := make([]float64, n)
		for i, s := range v.Solution {
			x[i] = s.Residual[c]
		}
		unit := "µmol/L"
		if c == mineral.HCO3 {
			unit = "µeq/L"
		}
		cols = append(cols, NumColumn(c.String(), unit, x))
		if checks[c] {
			checked = append(checked, c.String())
		}
	}
	title := "Residuals: the rain-corrected water less what the minerals give it"
	if len(checked) > 0 {
		title += " (" + strings.Join(checked, " and ") + " not fitted, checks only)"
	}
	return &ResultTable{Name: "residuals", Title: title, Columns: cols}
}

// periodTable lists each mineral's mean annual flux and the CO2 it
// consumed: the CO2 chart's data.
func (v *MineralBalance) periodTable() *ResultTable {
	var key []string
	var cols [][]float64
	add := func(in ...float64) {
		if cols == nil {
			cols = make([][]float64, len(in))
		}
		for k, x := range in {
			cols[k] = append(cols[k], x)
		}
	}
	for j, p := range v.Balance.Phases {
		f := v.Period[j]
		key = append(key, p.Key)
		add(f.Mol.Median, f.Yield.Median, f.Yield.Lo, f.Yield.Hi, f.MeanPerLitre, p.CO2PerMole(), f.CO2Yield.Median, f.CO2Yield.Lo, f.CO2Yield.Hi)
	}
	return &ResultTable{Name: "period", Title: "Mean annual flux of each mineral over the period (fluxes cell's estimator; above zero dissolved, below zero formed) and the CO2 it consumed",
		Columns: []*Column{TextColumn("mineral", key), NumColumn("flux", "mol/yr", cols[0]),
			NumColumn("yield", "mol/km²/yr", cols[1]), NumColumn("yield_low", "mol/km²/yr", cols[2]), NumColumn("yield_high", "mol/km²/yr", cols[3]),
			NumColumn("flux_weighted_mean", "µmol/L", cols[4]), NumColumn("CO2_per_mol", "mol/mol", cols[5]),
			NumColumn("CO2_consumed", "mol/km²/yr", cols[6]), NumColumn("CO2_consumed_low", "mol/km²/yr", cols[7]), NumColumn("CO2_consumed_high", "mol/km²/yr", cols[8])}}
}

// catalogueTable lists the built-in minerals a user can name.
func catalogueTable() *ResultTable {
	var key, name, formula, roles, source []string
	var co2 []float64
	for _, m := range mineral.Catalogue {
		key, name, formula = append(key, m.Key), append(name, m.Name), append(formula, m.Text)
		roles = append(roles, role(mineral.Phase{Mineral: m, Secondary: m.Secondary}))
		source, co2 = append(source, m.Source), append(co2, m.CO2PerMole())
	}
	return &ResultTable{Name: "catalogue", Title: `Built-in minerals: name one in primary_minerals or secondary_minerals, or write "plagioclase AnNN", a formula, or "name = formula"`,
		Columns: []*Column{TextColumn("mineral", key), TextColumn("name", name), TextColumn("formula", formula), TextColumn("usual_role", roles),
			NumColumn("CO2_per_mol", "mol/mol", co2), TextColumn("source", source)}}
}

// countedByMessage groups "message: sample" entries by message, naming up
// to three samples of each.
func countedByMessage(m map[string]int) []string {
	by := map[string][]string{}
	for _, k := range sortedNames(m) {
		i := strings.LastIndex(k, ": ")
		by[k[:i]] = append(by[k[:i]], k[i+2:])
	}
	var out []string
	for _, msg := range sortedNames(by) {
		names := by[msg]
		ex := names
		if len(ex) > 3 {
			ex = ex[:3]
		}
		more := ""
		if len(names) > 3 {
			more = ", …"
		}
		out = append(out, fmt.Sprintf("%s (%s: %s%s)", msg, plural(len(names), "sample"), strings.Join(ex, ", "), more))
	}
	return out
}

// sortedNames returns the keys of m in order.
func sortedNames[V any](m map[string]V) []string {
	k := make([]string, 0, len(m))
	for x := range m {
		k = append(k, x)
	}
	slices.Sort(k)
	return k
}

// MineralReport is the minerals cell in the JSON report.
type MineralReport struct {
	Cell     string          `json:"cell"`
	Fit      string          `json:"fit_components"`
	Minerals []MineralPhase  `json:"minerals"`
	Samples  []MineralSample `json:"samples"`
}

// MineralPhase is one mineral of the balance in the JSON report; its
// yields are left out without a fluxes cell.
type MineralPhase struct {
	Mineral   string `json:"mineral"`
	Formula   string `json:"formula"`
	Role      string `json:"role"`
	CO2PerMol Number `json:"co2_per_mol"`
	Reaction  string `json:"reaction"`
	Source    string `json:"source"`
	Yield     *Range `json:"mol_per_km2_per_yr,omitempty"`
	CO2Yield  *Range `json:"co2_mol_per_km2_per_yr,omitempty"`
}

// MineralSample is one sample's balance in the JSON report (µmol/L).
type MineralSample struct {
	Sample    string            `json:"sample"`
	Date      string            `json:"date"`
	Fit       string            `json:"fit"`
	Amounts   map[string]Number `json:"umol_per_litre"`
	Residuals map[string]Number `json:"residuals_umol_per_litre"`
	Note      string            `json:"note,omitempty"`
}

// mineralReport reports the first computed minerals cell, or nil.
func (d *Document) mineralReport() *MineralReport {
	id, o := d.firstOf(KindMinerals)
	if o == nil {
		return nil
	}
	v := o.Value.(*MineralBalance)
	r := &MineralReport{Cell: id, Fit: d.Cell(id).Settings.(*MineralSettings).Fit, Minerals: []MineralPhase{}, Samples: []MineralSample{}}
	rng := func(in flux.Interval) *Range { return &Range{Number(in.Median), Number(in.Lo), Number(in.Hi)} }
	for j, p := range v.Balance.Phases {
		mp := MineralPhase{Mineral: p.Key, Formula: p.Text, Role: role(p), CO2PerMol: Number(p.CO2PerMole()),
			Reaction: p.Reaction().String(), Source: p.Source}
		if v.Period != nil {
			mp.Yield, mp.CO2Yield = rng(v.Period[j].Yield), rng(v.Period[j].CO2Yield)
		}
		r.Minerals = append(r.Minerals, mp)
	}
	for i, s := range v.Solution {
		ms := MineralSample{Sample: v.Names[i], Date: v.Days[i], Fit: fitText(v.Balance, s), Amounts: map[string]Number{}, Residuals: map[string]Number{}, Note: s.Message}
		for j, p := range v.Balance.Phases {
			ms.Amounts[p.Key] = Number(s.Amount[j])
		}
		for c := mineral.Component(0); c < mineral.NWater; c++ {
			ms.Residuals[c.String()] = Number(s.Residual[c])
		}
		r.Samples = append(r.Samples, ms)
	}
	return r
}
