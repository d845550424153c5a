package notebook

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// Atmosphere is the value an atmosphere cell hands on: the samples and the
// correction options the apportionment applies to each of them.
type Atmosphere struct {
	Samples *Samples
	// Use holds the positions in Samples.Table.Samples of the samples the
	// correction applies to: those the samples cell uses that have Cl.
	Use     []int
	Options correct.Options // Sulfate is left at its default; the apportionment sets it
	// Uncertainty is the relative 1σ of the rain ratios and of the ET
	// factor, which the apportionment draws with its Monte Carlo.
	Uncertainty correct.Uncertainty
	// ScaleCl says that Cl* comes from measured rain (Cl_rain × F ×
	// f_dry), so that the ET factor's uncertainty moves it.
	ScaleCl bool
}

func init() { Register(KindAtmosphere, computeAtmosphere) }

// rainSpecies are the species a rain table may give, in µmol/L.
var rainSpecies = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Sr}

// rainVWM reads a rain table: one row per event or period with an optional
// "precipitation" column (mm) and concentrations in µmol/L; the result is the
// volume-weighted mean (docs/methods.md §1.3).
func rainVWM(t *Table) (chem.Composition, error) {
	c := chem.NewComposition()
	if t == nil || len(t.Rows) == 0 {
		return c, fmt.Errorf("the rain method needs a rain table (columns such as precipitation, Na, Cl in µmol/L)")
	}
	pcol := t.Column("precipitation")
	for _, sp := range rainSpecies {
		j := t.Column(sp.Symbol())
		if j < 0 {
			continue
		}
		if len(t.Units) > j && t.Units[j] != "" && t.Units[j] != "µmol/L" && t.Units[j] != "umol/L" {
			return c, fmt.Errorf("rain table column %s: unit %q; give rain in µmol/L", sp.Symbol(), t.Units[j])
		}
		sum, wsum := 0.0, 0.0
		for r := range t.Rows {
			x, err := parseNum(t.Cell(r, j))
			if err != nil {
				return c, fmt.Errorf("rain table row %d, column %s: %v", r+1, sp.Symbol(), err)
			}
			w := 1.0
			if pcol >= 0 {
				if w, err = parseNum(t.Cell(r, pcol)); err != nil || w < 0 {
					return c, fmt.Errorf("rain table row %d, column precipitation: want a rain amount in mm", r+1)
				}
			}
			sum += x * w
			wsum += w
		}
		if wsum > 0 {
			c[sp] = sum / wsum
		}
	}
	if !c.Has(chem.Cl) || c[chem.Cl] <= 0 {
		return c, fmt.Errorf("the rain table needs a Cl column with a positive mean")
	}
	return c, nil
}

func computeAtmosphere(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*AtmosphereSettings)
	smp, err := inputOf[*Samples](e, "samples")
	if err != nil {
		return nil, err
	}
	site, err := e.Input("site")
	if err != nil {
		return nil, err
	}
	opt := correct.Options{ClCritical: s.CriticalChloride}
	if s.ExcessChloride == "human" {
		opt.Excess = correct.HumanInput
	}
	ratios := correct.SeaSalt()
	ratios[chem.Na], ratios[chem.K], ratios[chem.Ca], ratios[chem.Mg] = s.NaPerCl, s.KPerCl, s.CaPerCl, s.MgPerCl
	ratios[chem.SO4], ratios[chem.Sr] = s.SO4PerCl, s.SrPerCl
	out := &Output{}
	switch s.Method {
	case "sea-salt":
		opt.Ratios = &ratios
		if s.CriticalChloride == 0 {
			opt.ClCritical = math.Inf(1)
			out.Warnings = append(out.Warnings, "no critical chloride set: all Cl is taken as atmospheric")
		}
	case "rain":
		vwm, err := rainVWM(e.Cell.Table)
		if err != nil {
			return nil, err
		}
		if site == nil {
			return nil, fmt.Errorf("the rain method needs a site cell with precipitation and evapotranspiration")
		}
		st := site.Value.(*Site)
		opt.Rain = &correct.Rain{Composition: vwm, P: st.P, ET: st.ET, DryFactor: s.DryDeposition}
		if _, err := opt.Rain.Factor(); err != nil {
			return nil, fmt.Errorf("site: %v", err)
		}
	}
	var used []int
	for _, i := range smp.Used() {
		if smp.Table.Samples[i].C.Has(chem.Cl) {
			used = append(used, i)
			continue
		}
		out.Messages = append(out.Messages, smp.leftOut(i, chem.Cl, fmt.Sprintf(
			"sample %s has no Cl value: left out of the atmospheric correction, which is scaled by Cl, and of the cells that read it (apportionment, fluxes, CO2); it stays in the samples table; give its Cl to bring it back",
			sampleName(smp.Table.Samples[i]))))
	}
	if len(used) == 0 {
		return out, fmt.Errorf("no sample the budget uses has a Cl value, and the atmospheric correction is scaled by Cl: add Cl to the samples table (a column such as \"Cl (mg/L)\")")
	}
	ids := make([]string, len(used))
	cols := map[string][]float64{}
	names := []string{"Cl_atm", "Na_atm", "K_atm", "Ca_atm", "Mg_atm", "SO4_atm", "Cl_excess", "Na_evaporite", "Na_atm_share"}
	warn := map[string]int{}
	corrected := make([]correct.Result, len(used))
	for k, i := range used {
		sm := smp.Table.Samples[i]
		ids[k] = sm.ID
		r, err := correct.Apply(sm.C, &opt)
		if errors.Is(err, correct.ErrMissing) && !sm.C.Has(chem.Ca) {
			// Without Ca the sulfate above the rain's share cannot go to
			// gypsum. Nothing this cell shows depends on that split (its
			// ratio of Ca is blank anyway); the apportionment, which knows
			// the sulfate source, leaves the sample out by name.
			o := opt
			o.Sulfate = correct.Sulfide
			r, err = correct.Apply(sm.C, &o)
		}
		if err != nil {
			return nil, fmt.Errorf("sample %s (line %d): %v", sm.ID, sm.Line, err)
		}
		for _, w := range r.Warnings {
			warn[w.Error()]++
		}
		corrected[k] = r
		vals := []float64{r.Atm[chem.Cl], r.Atm[chem.Na], r.Atm[chem.K], r.Atm[chem.Ca], r.Atm[chem.Mg], r.Atm[chem.SO4],
			r.ClExcess, r.Evap[chem.Na], r.Atm[chem.Na] / sm.C[chem.Na]}
		for j, n := range names {
			cols[n] = append(cols[n], vals[j])
		}
	}
	tcols := []*Column{TextColumn("sample", ids)}
	for _, n := range names {
		unit := "µmol/L"
		if n == "Na_atm_share" {
			unit = "fraction"
		}
		tcols = append(tcols, NumColumn(n, unit, cols[n]))
	}
	title := "Atmospheric input per sample"
	if s.RatioUncertainty > 0 || (s.Method == "rain" && s.CriticalChloride == 0 && s.FactorUncertainty > 0) {
		title += " (central values; the apportionment draws the rain inputs with their uncertainty)"
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "rain", Title: title, Columns: tcols})
	dates := make([]string, len(used))
	for k, i := range used {
		dates[k] = smp.Days[i].String()
	}
	rt, blank := ratioTable(ids, dates, corrected)
	out.Tables = append(out.Tables, rt)
	out.Warnings = append(out.Warnings, countedWarnings(warn)...)
	if blank > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("ratios: Na* ≤ 0 after correction in %d of %d samples; their ratios to Na are left blank", blank, len(used)))
	}
	if s.Method == "rain" && s.RatioUncertainty == 0 {
		out.Warnings = append(out.Warnings, "the measured rain ratios are taken as exact; set the rain ratio uncertainty (%) to carry their spread through the apportionment")
	}
	if w := rainExcessWarning(cols["Na_atm_share"]); w != "" {
		out.Warnings = append(out.Warnings, w)
	}
	if w := allAtmosphericNote(cols["Na_atm_share"]); w != "" {
		out.Warnings = append(out.Warnings, w)
	}
	out.Figures = append(out.Figures, Point("median atmospheric share of Na", "fraction", median(cols["Na_atm_share"])))
	unc := correct.Uncertainty{Ratios: s.RatioUncertainty / 100}
	if opt.Rain != nil && s.CriticalChloride == 0 {
		unc.Factor = s.FactorUncertainty / 100
	}
	out.Value = &Atmosphere{Samples: smp, Use: used, Options: opt, Uncertainty: unc, ScaleCl: unc.Factor > 0}
	return out, nil
}

// rainExcessWarning returns a warning when the atmospheric share of Na,
// Na_atm/Na_riv, is above 1 in some samples, or "". The share is kept as
// computed, not capped: a share above 1 means the rain correction (Cl_atm ×
// (Na/Cl)_rain) takes more Na than the river carries, the Na deficit of the
// docs/methods.md §5.1 (cation exchange, or Cl that is not from rain, such as
// road salt or sewage; common practice), and Na* is set to 0 with its own
// warning.
//
// A share within shareTolerance of 1 is not warned about: diluted seawater
// gives a share of 1 up to the rounding of the ratios and the analyses
// (allAtmosphericNote says so instead).
func rainExcessWarning(share []float64) string {
	n, max := 0, 0.0
	for _, x := range share {
		if x > 1+shareTolerance {
			n++
			max = math.Max(max, x)
		}
	}
	if n == 0 {
		return ""
	}
	return fmt.Sprintf("atmospheric share of Na above 1 in %d of %d samples (largest %.3g): rain supplies more Na than the river carries; "+
		"Na was lost (cation exchange) or Cl is not from rain (road salt, sewage, evaporite); see the Cl* setting", n, len(share), max)
}

// shareTolerance is how far above 1 an atmospheric share of Na is still
// read as "all the Na is atmospheric": major-ion analyses and rain ratios
// carry errors of a few percent (common practice, no source).
const shareTolerance = 0.02

// allAtmosphericNote says in how many samples the atmosphere accounts for
// all the Na within shareTolerance (a share from 1 to 1.02, as diluted
// seawater gives), or "".
func allAtmosphericNote(share []float64) string {
	n, max := 0, 0.0
	for _, x := range share {
		if x > 1+1e-9 && x <= 1+shareTolerance {
			n++
			max = math.Max(max, x)
		}
	}
	if n == 0 {
		return ""
	}
	return fmt.Sprintf("the atmosphere accounts for all the Na in %d of %d samples (atmospheric share up to %.4g, within %g %% of 1, as in rain or diluted seawater): their Na is taken as all atmospheric",
		n, len(share), max, 100*shareTolerance)
}

// ratioSpecies are the numerators of the ratios table, with their column names.
var ratioSpecies = []struct {
	name string
	sp   chem.Species
}{{"Ca/Na", chem.Ca}, {"Mg/Na", chem.Mg}, {"HCO3/Na", chem.HCO3}, {"K/Na", chem.K}}

// ratioTable gives each sample's molar ratios to Na after the rain,
// evaporite and human-input corrections, X*/Na* (the residuals of
// correct.Apply), for the mixing diagrams. HCO3 falls back to alkalinity
// (µeq/L, taken as µmol/L of HCO3) when the sample has no HCO3 column. A
// sample whose Na* is zero or below has NaN ratios; blank counts them.
func ratioTable(ids, dates []string, rs []correct.Result) (t *ResultTable, blank int) {
	cols := make([][]float64, len(ratioSpecies))
	for j := range cols {
		cols[j] = make([]float64, len(rs))
	}
	for i := range rs {
		res := &rs[i].Residual
		na := res[chem.Na]
		if !(na > 0) {
			blank++
		}
		for j, rsp := range ratioSpecies {
			x := res[rsp.sp]
			if rsp.sp == chem.HCO3 && math.IsNaN(x) {
				x = res[chem.Alk]
			}
			cols[j][i] = math.NaN()
			if na > 0 {
				cols[j][i] = x / na
			}
		}
	}
	tc := []*Column{TextColumn("sample", ids), TextColumn("date", dates)}
	for j, rsp := range ratioSpecies {
		tc = append(tc, NumColumn(rsp.name, "mol/mol", cols[j]))
	}
	return &ResultTable{Name: "ratios", Title: "Ratios to Na after rain and evaporite correction (X*/Na*)", Columns: tc}, blank
}

// countedWarnings groups messages by their text before the first colon (the
// kind of problem) and gives each group's count and first example.
func countedWarnings(m map[string]int) []string {
	type group struct {
		n     int
		first string
	}
	groups := map[string]*group{}
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	var order []string
	for _, k := range keys {
		head, _, _ := strings.Cut(k, ":")
		g := groups[head]
		if g == nil {
			g = &group{first: k}
			groups[head] = g
			order = append(order, head)
		}
		g.n += m[k]
	}
	out := make([]string, len(order))
	for i, h := range order {
		g := groups[h]
		switch {
		case g.n == 1:
			out[i] = g.first + " (1 sample)"
		case g.first == h:
			out[i] = fmt.Sprintf("%s (%d samples)", h, g.n)
		default:
			out[i] = fmt.Sprintf("%s (%d samples; for example %s)", h, g.n, strings.TrimSpace(strings.TrimPrefix(g.first, h+":")))
		}
	}
	return out
}
