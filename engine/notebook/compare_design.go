package notebook

import (
	"fmt"
	"math"
	"slices"

	"lixiv/engine/compare"
	"lixiv/engine/mix"
)

// DesignFrequencies are the samples a year of the comparison's design
// curve: quarterly, every other month, monthly, fortnightly, weekly and
// twice a week (with the design's own frequency added).
var DesignFrequencies = []int{4, 6, 12, 26, 52, 104}

// Design power and level of the monitoring design: 80 % power at a
// two-sided 5 % level (common practice).
const (
	DesignPower = 0.80
	DesignAlpha = 0.05
)

// MaxDesignWork caps the monitoring design's work for one sampling
// frequency: simulations × 2 (the null and the power) × budgets × days of
// a programme. The design simulates about sixteen frequencies (its curve
// and the bisection for the samples a year needed), so it stays within
// about twice the fluxes cell's MaxBootstrapWork (an engineering choice).
const MaxDesignWork = MaxBootstrapWork / 8

// ownRate returns the samples a year of a budget: its apportioned samples
// within its record over the record's length in years, at least 1.
func ownRate(f *Fluxes) int {
	n := 0
	for i, day := range f.App.Days {
		if f.App.Usable(i) && f.Record.Index(day) >= 0 {
			n++
		}
	}
	return max(1, int(math.Round(float64(n)/(float64(f.Record.Len())/365.25))))
}

// scatterOf returns what the monitoring design learns from the control
// budget: each apportioned sample's amount of the CO2 measure (its mean
// split), day and discharge, with the budget's record and estimator.
func (v *Comparison) scatterOf(c compared) compare.Scatter {
	f, a := c.b.Fluxes, c.b.App
	var q compareQuantity
	for _, x := range compareQuantities() {
		if x.name == v.Settings.measureName() {
			q = x
		}
	}
	amt := q.of(c.b)
	sc := compare.Scatter{Record: f.Record, Options: f.Options}
	var out [mix.NCations]float64
	for i := range a.Names {
		if !a.Usable(i) {
			continue
		}
		amt(i, -1, &a.Mean[i], a.Corrected[i].SO4Sulf, &out)
		t := 0.0
		for _, k := range q.parts {
			t += out[k]
		}
		qi := math.NaN()
		if i < len(a.Q) {
			qi = a.Q[i]
		}
		sc.Days, sc.Q, sc.C = append(sc.Days, a.Days[i]), append(sc.Q, qi), append(sc.C, t)
	}
	return sc
}

// monitoring simulates the monitoring design on the control budget's own
// data (compare.Detect): the smallest increase of the CO2 measure it
// detects at each frequency of DesignFrequencies and the design's own,
// and the samples a year needed for the target increase.
func (v *Comparison) monitoring(e *Env, out *Output) error {
	s := &v.Settings
	ctl := v.Budgets[1]
	sc := v.scatterOf(ctl)
	d := s.design()
	perYear := s.PerYear
	if perYear == 0 {
		perYear = ownRate(ctl.b.Fluxes)
	}
	freqs := append([]int(nil), DesignFrequencies...)
	if !slices.Contains(freqs, perYear) {
		freqs = append(freqs, perYear)
		slices.Sort(freqs)
	}
	days := int(math.Round(float64(s.Years) * 365.25))
	if work := s.Simulations * 2 * d.Budgets() * days; work > MaxDesignWork {
		return fmt.Errorf("%s: %s simulations × 2 × %d programmes × %s days is %s, above the limit of %s; use at most %s simulations, or fewer years",
			SettingName("design_simulations"), grouped(s.Simulations), d.Budgets(), grouped(days), grouped(work), grouped(MaxDesignWork),
			grouped(max(1, MaxDesignWork/(2*d.Budgets()*days))))
	}
	p := compare.Power{Power: DesignPower, Alpha: DesignAlpha, Sims: s.Simulations, Seed: uint64(s.Seed), Context: e.Ctx}
	base := math.NaN()
	if o := v.outcome(s.measureName()); o != nil {
		base = o.Budgets[1].Point.Mean.MolPerKm2
	}
	var chosen *compare.Detection
	for k, n := range freqs {
		if err := e.Ctx.Err(); err != nil {
			return err
		}
		e.Report(k, len(freqs)+1)
		det, err := compare.Detect(sc, d, compare.Plan{PerYear: n, Years: s.Years}, p)
		if err != nil {
			return err
		}
		v.Design = append(v.Design, det)
		if n == perYear {
			chosen = det
		}
	}
	if chosen.LeftOut > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("monitoring design: %d of the control's samples have no %s above zero or no discharge, and are left out of the scatter it simulates from",
			chosen.LeftOut, s.measureName()))
	}
	var n, inc, abs, sd []float64
	var mark []string
	for _, det := range v.Design {
		n, inc, abs = append(n, float64(det.Plan.PerYear)), append(inc, 100*det.Relative), append(abs, det.Relative*base)
		sd = append(sd, 100*det.SD)
		m := ""
		if det == chosen {
			m = "chosen"
		}
		mark = append(mark, m)
	}
	how := fmt.Sprintf("simulated on the control budget's own samples and discharge record (%d programmes, its %s estimator; %s at %.0f %% power, two-sided %.0f %% level)",
		s.Simulations, estimatorLabel(sc.Options.Method), d.Formula(), 100*DesignPower, 100*DesignAlpha)
	out.Tables = append(out.Tables, &ResultTable{Name: "design", Title: fmt.Sprintf("Monitoring design: the smallest increase of the %s flux detectable over %d years (each period, before-after) against samples a year, %s", s.measureName(), s.Years, how),
		Columns: []*Column{NumColumn("samples_per_year", "samples/yr", n), NumColumn("detectable_increase", "% of the control's flux", inc),
			NumColumn("detectable_yield", "mol/km²/yr", abs), NumColumn("null_sd", "% of the flux", sd), TextColumn("design", mark)}})
	short := fmt.Sprintf("%d programmes simulated on the control's own data with its %s estimator; %.0f %% power, two-sided %.0f %% level",
		s.Simulations, estimatorLabel(sc.Options.Method), 100*DesignPower, 100*DesignAlpha)
	f := Point(fmt.Sprintf("smallest increase of the %s flux detectable with %d samples a year over %d years", s.measureName(), perYear, s.Years), "% of the control's flux", 100*chosen.Relative)
	f.Note = short
	fa := Point(fmt.Sprintf("smallest increase of the %s flux detectable with %d samples a year over %d years, per km²", s.measureName(), perYear, s.Years), "mol/km²/yr", chosen.Relative*base)
	fa.Note = short
	out.Figures = append(out.Figures, f, fa)
	e.Report(len(freqs), len(freqs)+1)
	need, det, ok, err := compare.SamplesPerYear(sc, d, s.Years, s.Target/100, p, 365, v.Design...)
	if err != nil {
		return err
	}
	name := fmt.Sprintf("samples a year needed to detect a %g %% increase of the %s flux over %d years", s.Target, s.measureName(), s.Years)
	if !ok {
		out.Figures = append(out.Figures, Point(name, "samples/yr", math.NaN()))
		out.Warnings = append(out.Warnings, fmt.Sprintf("monitoring design: even daily samples over %d years detect only a %.3g %% increase of the %s flux, not %g %%: lengthen the design",
			s.Years, 100*det.Relative, s.measureName(), s.Target))
		return nil
	}
	fn := Point(name, "samples/yr", float64(need))
	fn.Note = fmt.Sprintf("detects %.3g %%; %s", 100*det.Relative, short)
	out.Figures = append(out.Figures, fn)
	return nil
}
