package notebook

import (
	"fmt"
	"math"
	"runtime"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/discharge"
	"lixiv/engine/mix"
)

// Apportioned is the value an apportionment cell hands on: per sample, the
// correction, the split of each cation among the sources as a median with
// 95 % bounds, and the sample's posterior as weighted draws of its own.
type Apportioned struct {
	Samples   *Samples
	Index     []int // positions in Samples.Table.Samples of the apportioned samples
	Names     []string
	Days      []discharge.Day
	Q         []float64 // discharge at sampling, m³/s (NaN: take the day's mean)
	Corrected []correct.Result
	Median    []mix.Split // µmol/L of each cation from each source, cell by cell
	Lo, Hi    []mix.Split // 2.5 % and 97.5 % quantiles
	Model     string      // "inverse" or "forward"
	// Status, Verdict and ESS are each sample's fit as the inverse model
	// judged it (the forward model fits by construction: Rule, and an ESS
	// of its draw count).
	Status  []mix.Status
	Verdict []string
	ESS     []float64
	// Diagram is what the mixing diagrams mark: per sample, the tracer the
	// fit cannot match and the end-member ratios the posterior piles
	// against (empty for the forward model).
	Diagram Marks

	doubtful []bool
	inverse  *mix.Result
	forward  [][]mix.Split   // forward model: every draw of every sample
	scales   []correct.Scale // forward model: each draw's rain-correction multipliers (nil: exact)
	weights  [][]float64
}

// Marks says which samples a mixing diagram marks and which edges of the
// end-members' prior boxes it draws: the engine decides, the page draws.
type Marks struct {
	Names  []string  // the samples, in the order of Misfit
	Misfit []string  // per sample: the tracer the fit cannot match ("" when it fits)
	Edges  []BoxEdge // edges of prior boxes that some sample's posterior piles against
}

// BoxEdge is one edge of an end-member's prior box in a mixing diagram.
type BoxEdge struct {
	EndMember string
	Ratio     string  // such as "Ca/Na"
	Upper     bool    // the upper edge (else the lower)
	Value     float64 // the ratio at that edge of the prior's 95 % range
	Samples   []string
}

// Kept returns the number of draws of sample i.
func (a *Apportioned) Kept(i int) int {
	if a.forward != nil {
		return len(a.forward[i])
	}
	return a.inverse.Kept(i)
}

// Draw returns the k-th draw of sample i (k < Kept(i)): the amount of each
// cation from each source in µmol/L (the atmospheric and evaporite rows of
// the correction included) and the draw's weight. The draws of a sample,
// with their weights, are its posterior; draws of different samples are
// unrelated (a flux picks each sample's draw on its own).
func (a *Apportioned) Draw(i, k int) (mix.Split, float64) {
	if a.forward != nil {
		return a.forward[i][k], 1
	}
	_, s, w := a.inverse.Draw(i, k)
	return s, w
}

// Weights returns the weight of each draw of sample i. The slice is
// shared: do not change it.
func (a *Apportioned) Weights(i int) []float64 { return a.weights[i] }

// SO4Sulf returns the sulfide-derived sulfate (µmol/L) of sample i under
// its k-th draw, which follows the draw's atmospheric sulfate.
func (a *Apportioned) SO4Sulf(i, k int) float64 {
	switch {
	case a.forward == nil:
		return a.inverse.SO4Sulf(i, k)
	case a.scales == nil:
		return a.Corrected[i].SO4Sulf
	}
	return a.Corrected[i].VarySO4Sulf(&a.scales[k])
}

// Doubtful reports whether sample i's apportionment should not be trusted
// as it stands: the data do not fit the end-members, or the posterior is
// poorly sampled (mix.SampleResult.Doubtful). A cell may be marked doubtful
// from it.
func (a *Apportioned) Doubtful(i int) bool { return a.doubtful[i] }

func init() { Register(KindApportionment, computeApportionment) }

// ChunkDraws is the number of draws the inverse model works through
// between progress reports when it runs on one goroutine (in the browser,
// or with Document.Workers = 1).
var ChunkDraws = 4000

// MaxSampleDraws caps samples × target effective sample size in one
// apportionment: each sample keeps about its draws (144 bytes each) for the
// cells below, so the cap bounds memory and work.
const MaxSampleDraws = 4_000_000

// Quick-pass limits: the first pass of Document.Quick runs the inverse
// model to a rough posterior (an engineering choice) and the full pass
// refines it.
const (
	roughDraws = 300
	roughESS   = 100
	roughMax   = 3000
)

// delta34S finds a sample's δ34S of sulfate (‰) among its unrecognised
// columns ("d34S", "δ34S-SO4", "delta34S", …).
func delta34S(meta map[string]string) (float64, bool) {
	for k, v := range meta {
		n := strings.ToLower(strings.NewReplacer(" ", "", "_", "", "-", "", "δ", "d", "(‰)", "", "‰", "", "permil", "").Replace(k))
		if n == "d34s" || n == "d34sso4" || n == "delta34s" || n == "delta34sso4" {
			if x, err := parseNum(v); err == nil {
				return x, true
			}
		}
	}
	return 0, false
}

// forwardRatios takes the forward model's silicate ratios from the first
// silicate end-member: its central value and range, which the forward
// model reads as the inverse model does (a log-normal with the range as
// its 95 % interval; a log-uniform range is read the same way).
func forwardRatios(ems []mix.EndMember) *mix.SilicateRatios {
	for _, em := range ems {
		if em.Source != mix.Silicate {
			continue
		}
		r := func(t mix.Tracer) mix.SilicateRatio {
			p := em.Ratio[t]
			if p.Dist == mix.Fixed {
				return mix.Exact(p.Value)
			}
			return mix.SilicateRatio{Value: p.Value, Lo: p.Lo, Hi: p.Hi}
		}
		return &mix.SilicateRatios{CaNa: r(mix.CaNa), MgNa: r(mix.MgNa), KNa: mix.SilicateRatio{Value: math.NaN()}}
	}
	return nil
}

func computeApportionment(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*ApportionmentSettings)
	ai, err := e.Input("atmosphere")
	if err != nil {
		return nil, err
	}
	si, err := e.Input("sources")
	if err != nil {
		return nil, err
	}
	atm := ai.Value.(*Atmosphere)
	ems := si.Value.([]mix.EndMember)
	opt := atm.Options
	switch s.Sulfate {
	case "sulfide":
		opt.Sulfate = correct.Sulfide
	case "isotope":
		if s.D34SEvaporite == s.D34SSulfide {
			return nil, fmt.Errorf("d34s_evaporite_permil and d34s_sulfide_permil must differ")
		}
		opt.Sulfate = correct.Isotope
		opt.Delta34S = correct.Delta34S{River: s.D34SRiver, Evaporite: s.D34SEvaporite, Sulfide: s.D34SSulfide}
	}
	if s.Negative == "keep" {
		opt.Negative = correct.Keep
	}
	a := &Apportioned{Samples: atm.Samples, Model: s.Model}
	out := &Output{}
	warn := map[string]int{}
	var precs []*correct.Precision
	for _, i := range atm.Samples.Used() {
		sm := atm.Samples.Table.Samples[i]
		o := opt
		if s.Sulfate == "isotope" {
			if v, ok := delta34S(sm.Meta); ok {
				o.Delta34S.River = v // the sample's own δ34S
			}
		}
		r, err := correct.Apply(sm.C, &o)
		if err != nil {
			return nil, fmt.Errorf("sample %s (line %d): %v", sm.ID, sm.Line, err)
		}
		for _, w := range r.Warnings {
			warn[w.Error()]++
		}
		a.Index = append(a.Index, i)
		a.Names = append(a.Names, sm.ID)
		a.Days = append(a.Days, atm.Samples.Days[i])
		a.Q = append(a.Q, sm.Q)
		a.Corrected = append(a.Corrected, r)
		precs = append(precs, atm.Samples.SamplePrecision(i))
	}
	n := len(a.Index)
	if err := atm.Uncertainty.Check(); err != nil {
		return nil, err
	}
	a.Status, a.Verdict, a.ESS = make([]mix.Status, n), make([]string, n), make([]float64, n)
	a.doubtful = make([]bool, n)
	switch s.Model {
	case "forward":
		if n*s.Draws > MaxSampleDraws {
			return nil, fmt.Errorf("draws: %d samples × %d draws is above the limit of %d sample-draws; use fewer draws", n, s.Draws, MaxSampleDraws)
		}
		if err := a.runForward(e, s, ems, atm, warn); err != nil {
			return nil, err
		}
	case "inverse":
		if err := a.runInverse(e, s, ems, atm, precs, warn, out); err != nil {
			return nil, err
		}
	}
	// Medians and bounds, cell by cell, from each sample's weighted draws.
	a.Median, a.Lo, a.Hi = make([]mix.Split, n), make([]mix.Split, n), make([]mix.Split, n)
	a.weights = make([][]float64, n)
	var vals []float64
	var qb quantileBuf
	for i := 0; i < n; i++ {
		k := a.Kept(i)
		draws := make([]mix.Split, k)
		a.weights[i] = make([]float64, k)
		for j := range k {
			draws[j], a.weights[i][j] = a.Draw(i, j)
		}
		for src := mix.Source(0); src < mix.NSources; src++ {
			for c := 0; c < mix.NCations; c++ {
				vals = vals[:0]
				for j := range draws {
					vals = append(vals, draws[j][src][c])
				}
				q := qb.quantiles(vals, a.weights[i], 0.025, 0.5, 0.975)
				a.Lo[i][src][c], a.Median[i][src][c], a.Hi[i][src][c] = q[0], q[1], q[2]
			}
		}
	}
	out.Warnings = append(out.Warnings, countedWarnings(warn)...)
	out.Tables = append(out.Tables, a.shareTable(), a.amountTable())
	fit, doubt := 0, 0
	for i := range a.Status {
		if a.Status[i] == mix.Fits || a.Status[i] == mix.Rule {
			fit++
		}
		if a.doubtful[i] {
			doubt++
		}
	}
	out.Figures = append(out.Figures, Point("samples apportioned", "", float64(fit)), Point("samples without a good fit", "", float64(n-fit)),
		Point("samples doubtful", "", float64(doubt)))
	if doubt > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("%s doubtful (no fit, or a poorly sampled posterior): see the status column", plural(doubt, "sample")))
	}
	out.Value = a
	return out, nil
}

// runForward apportions every sample by the forward model.
func (a *Apportioned) runForward(e *Env, s *ApportionmentSettings, ems []mix.EndMember, atm *Atmosphere, warn map[string]int) error {
	n := len(a.Corrected)
	if !atm.Uncertainty.Zero() {
		// The rain ratios (and the ET factor) are drawn with the silicate
		// ratios, draw by draw.
		a.scales = mix.RainScales(s.Draws, uint64(s.Seed), atm.Uncertainty, atm.ScaleCl)
	}
	fo := &mix.ForwardOptions{Silicate: forwardRatios(ems), Draws: s.Draws, Seed: uint64(s.Seed)}
	a.forward = make([][]mix.Split, n)
	for i := range a.Corrected {
		if err := e.Ctx.Err(); err != nil {
			return err
		}
		if a.scales != nil {
			fo.Vary = func(k int) (v correct.Result) {
				a.Corrected[i].VaryInto(&v, &a.scales[k])
				return v
			}
		}
		fr, err := mix.Forward(&a.Corrected[i], fo)
		if err != nil {
			return fmt.Errorf("sample %s: %v", a.Names[i], err)
		}
		for _, w := range fr.Warnings {
			warn[strings.TrimPrefix(w.Error(), "mix: ")]++
		}
		a.forward[i] = fr.Draws
		a.Status[i], a.Verdict[i], a.ESS[i] = mix.Rule, "forward model (sequential subtraction)", float64(s.Draws)
		e.Report(i+1, n)
	}
	return nil
}

// runInverse apportions every sample by the inverse model.
func (a *Apportioned) runInverse(e *Env, s *ApportionmentSettings, ems []mix.EndMember, atm *Atmosphere, precs []*correct.Precision, warn map[string]int, out *Output) error {
	n := len(a.Corrected)
	var tracers []mix.Tracer
	for _, t := range s.Tracers {
		tr, err := mix.ParseTracer(t)
		if err != nil {
			return fmt.Errorf("tracers: %v", err)
		}
		tracers = append(tracers, tr)
	}
	p := mix.Problem{EndMembers: ems, Tracers: tracers}
	for i := range a.Corrected {
		p.Waters = append(p.Waters, mix.Water{Name: a.Names[i], Correction: &a.Corrected[i],
			Sr87Sr86: atm.Samples.Table.Samples[a.Index[i]].Sr87Sr86, Precision: precs[i]})
	}
	prec := atm.Samples.Precision
	mo := &mix.Options{Draws: s.Draws, TargetESS: s.TargetESS, MaxDraws: s.MaxDraws, Seed: uint64(s.Seed),
		Precision: &prec, IsoErr: atm.Samples.IsoPrecision, Rain: atm.Uncertainty, ScaleCl: atm.ScaleCl, Workers: e.Workers()}
	if e.Rough() {
		// The quick pass: a rough posterior now, refined in the full pass.
		mo.Draws, mo.TargetESS, mo.MaxDraws = min(mo.Draws, roughDraws), min(mo.TargetESS, roughESS), min(mo.MaxDraws, roughMax)
		out.Rough = true
	}
	if n*mo.TargetESS > MaxSampleDraws {
		return fmt.Errorf("target_ess: %d samples × %d is above the limit of %d; lower target_ess", n, mo.TargetESS, MaxSampleDraws)
	}
	var res *mix.Result
	if e.Workers() == 1 || runtime.GOOS == "js" {
		// One goroutine, in chunks: the progress callback runs between
		// chunks, so a page can yield to the browser there. The chunk
		// size does not change the result.
		run, err := mix.NewRun(p, mo)
		if err != nil {
			return err
		}
		for !run.Step(e.Ctx, ChunkDraws) {
			e.Report(int(run.Progress()*1000), 1000)
		}
		e.Report(1000, 1000)
		res = run.Result()
	} else {
		mo.Progress = func(done, total int) { e.Report(done, total) }
		var err error
		if res, err = mix.Invert(e.Ctx, p, mo); err != nil {
			return err
		}
	}
	if err := e.Ctx.Err(); err != nil {
		return err
	}
	a.inverse = res
	for _, c := range res.Confusions {
		out.Warnings = append(out.Warnings, "identifiability: "+c.Text)
	}
	edges := map[string]*BoxEdge{}
	var order []string
	a.Diagram.Misfit, a.Diagram.Names = make([]string, n), a.Names
	for i := range res.Samples {
		sr := &res.Samples[i]
		a.Status[i], a.Verdict[i], a.ESS[i], a.doubtful[i] = sr.Status, sr.Verdict, sr.ESS, sr.Doubtful()
		for _, w := range sr.Warnings {
			// Grouped by kind: "end-member left out, no tracer sees it: …".
			warn[strings.TrimPrefix(w.Error(), "mix: ")]++
		}
		if sr.Status == mix.NoFit && sr.Misfit != nil {
			a.Diagram.Misfit[i] = "Na"
			if sr.Misfit.Tracer >= 0 {
				a.Diagram.Misfit[i] = sr.Misfit.Tracer.String()
			}
		}
		for _, b := range sr.Bounds {
			name := ems[b.EndMember].Name
			key := fmt.Sprintf("%s|%s|%v", name, b.Tracer, b.Upper)
			if edges[key] == nil {
				edges[key] = &BoxEdge{EndMember: name, Ratio: b.Tracer.String(), Upper: b.Upper, Value: b.Limit}
				order = append(order, key)
			}
			edges[key].Samples = append(edges[key].Samples, a.Names[i])
		}
	}
	for _, k := range order {
		a.Diagram.Edges = append(a.Diagram.Edges, *edges[k])
	}
	if res.Status != mix.Fits && res.Status != mix.Rule {
		out.Warnings = append(out.Warnings, "inversion: "+res.Status.String()+" for some samples (see the status column)")
	}
	return nil
}

func (a *Apportioned) dates() []string {
	d := make([]string, len(a.Days))
	for i, x := range a.Days {
		d[i] = x.String()
	}
	return d
}

// shareTable lists, per sample, its status, effective sample size, and
// the share of each cation from each source with its 95 % bounds.
func (a *Apportioned) shareTable() *ResultTable {
	cols := []*Column{TextColumn("sample", a.Names), TextColumn("date", a.dates()), TextColumn("status", a.Verdict),
		NumColumn("ESS", "draws", a.ESS)}
	for k, sp := range mix.Cations {
		for src := mix.Source(0); src < mix.NSources; src++ {
			name := sp.Symbol() + "_" + src.String()
			med, lo, hi := make([]float64, len(a.Names)), make([]float64, len(a.Names)), make([]float64, len(a.Names))
			for i := range a.Names {
				m := a.Corrected[i].Input[sp]
				med[i], lo[i], hi[i] = a.Median[i][src][k]/m, a.Lo[i][src][k]/m, a.Hi[i][src][k]/m
			}
			cols = append(cols, NumColumn(name, "fraction", med), NumColumn(name+"_low", "fraction", lo), NumColumn(name+"_high", "fraction", hi))
		}
	}
	return &ResultTable{Name: "shares", Title: "Share of each cation from each source (median, 2.5 % and 97.5 %), with each sample's status and effective sample size", Columns: cols}
}

// amountTable lists the median µmol/L of each cation from each source.
func (a *Apportioned) amountTable() *ResultTable {
	cols := []*Column{TextColumn("sample", a.Names), TextColumn("date", a.dates())}
	for k, sp := range mix.Cations {
		for src := mix.Source(0); src < mix.NSources; src++ {
			v := make([]float64, len(a.Names))
			for i := range a.Names {
				v[i] = a.Median[i][src][k]
			}
			cols = append(cols, NumColumn(sp.Symbol()+"_"+src.String(), "µmol/L", v))
		}
	}
	so4 := make([]float64, len(a.Names))
	for i := range a.Names {
		so4[i] = a.Corrected[i].SO4Sulf
	}
	cols = append(cols, NumColumn("SO4_sulfide", "µmol/L", so4))
	return &ResultTable{Name: "amounts", Title: "Median amount of each cation from each source", Columns: cols}
}

// cationsOrder and sourceNames follow mix.Cations and mix.Source.
var cationsOrder = mix.Cations
var sourceNames = [mix.NSources]string{"atmosphere", "evaporite", "silicate", "carbonate"}

// precisionSpecies are the species whose relative precision a samples
// table column may set, by their symbols in lower case.
var precisionSpecies = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Sr, chem.Alk, chem.HCO3}

// precisionColumn reads a header such as "Na rsd (%)", "rsd_Ca" or "Mg RSD
// %": a relative 1σ in percent for the species named. It returns false for
// any other header.
func precisionColumn(h string) (chem.Species, bool) {
	k := strings.ToLower(strings.NewReplacer(" ", "", "_", "", "-", "", "(", "", ")", "", "%", "").Replace(h))
	for _, sp := range precisionSpecies {
		sym := strings.ToLower(sp.Symbol())
		if k == sym+"rsd" || k == "rsd"+sym {
			return sp, true
		}
	}
	return 0, false
}
