package notebook

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"strings"
	"sync"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/discharge"
	"lixiv/engine/internal/quantile"
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
	// Mean is the weighted mean of each sample's kept draws: unlike the
	// cell-by-cell medians, its sources add up to what was measured, as
	// every draw's do, so it is the point value of apportioned fluxes.
	Mean   []mix.Split
	Lo, Hi []mix.Split // 2.5 % and 97.5 % quantiles
	// Draws is the most draws a sample has; sample i has Kept(i) of them
	// (the inverse model's posterior of each sample is a weighted sample
	// of its own, draw numbers 0 … Kept(i)−1; draws of different samples
	// are unrelated).
	Draws int
	Model string // the model that ran: "inverse", "catchment" or "forward" ("inverse" when the catchment-wide model fell back)
	// Joint is true when draw d of every sample belongs to the same draw of
	// the shared end-member ratios (the catchment-wide model): fluxes then
	// take one draw number for all samples in each bootstrap replicate
	// (flux.JointDraw).
	Joint bool
	// Catchment is what the catchment-wide model learned about the shared
	// end-members (nil for the other models and after a fall back).
	Catchment *mix.Catchment
	Sulfate   string // origin of the sulfate above the rain share: "gypsum", "sulfide" or "isotope"
	// Status, Verdict and ESS are each sample's fit as the inverse model
	// judged it (the forward model has none to judge: Rule, and an ESS of
	// its draw count).
	Status  []mix.Status
	Verdict []string
	ESS     []float64
	// Diagram is what the mixing diagrams mark: per sample, the tracer the
	// fit cannot match and the end-member ratios the posterior piles
	// against (empty for the forward model).
	Diagram Marks
	// doubtfulSample marks the samples whose result should not be trusted
	// as it stands (mix.SampleResult.Doubtful).
	doubtfulSample []bool

	// doubtful gives the reasons the apportionment is doubtful (Output.Doubtful).
	doubtful []string
	// doubtfulChains says why the catchment-wide model's chains are not to
	// be trusted ("" when they converged).
	doubtfulChains string
	// kept lists, per sample, the draw numbers with a positive weight.
	kept [][]int32
	// kw holds the weights of the kept draws (keptWeights).
	kw     [][]float64
	kwOnce sync.Once
	// redo apportions the samples again with another sulfate origin
	// (Under); with reuse, the per-sample inverse model takes over the
	// samples whose draws the origin does not change (mix.Run.Reuse).
	redo func(ctx context.Context, sulfate string, reuse bool, report func(done, total int)) (*Apportioned, error)

	// scales holds each draw's multipliers of the rain correction's
	// inputs; nil when the correction is exact (no rain uncertainty).
	scales []correct.Scale

	inverse *mix.Result
	forward [][]mix.Split
	weights [][]float64 // per sample and draw
}

// Marks says which samples a mixing diagram marks and which edges of the
// end-members' prior boxes it draws: the engine decides, the page draws.
type Marks struct {
	Names  []string  // the samples, in the order of Misfit
	Misfit []string  // per sample: the tracer the fit cannot match ("" when it fits)
	Edges  []BoxEdge // edges of prior boxes that some sample's posterior piles against
	// Shared holds the catchment-wide model's posterior of each shared
	// ratio, drawn as a box inside the end-member's prior box.
	Shared []SharedMark
}

// SharedMark is the posterior 95 % interval of one shared end-member ratio
// of the catchment-wide model.
type SharedMark struct {
	EndMember      string
	Ratio          string // such as "Ca/Na"
	Lo, Median, Hi float64
}

// BoxEdge is one edge of an end-member's prior box in a mixing diagram.
type BoxEdge struct {
	EndMember string
	Ratio     string  // such as "Ca/Na"
	Upper     bool    // the upper edge (else the lower)
	Value     float64 // the ratio at that edge of the prior's 95 % range
	Samples   []string
}

// Draw returns the split of sample i under its draw d (atmospheric and
// evaporite rows included), its weight and whether the sample has such a
// draw with a positive weight.
func (a *Apportioned) Draw(i, d int) (mix.Split, float64, bool) {
	if d < 0 || d >= len(a.weights[i]) {
		return mix.Split{}, 0, false
	}
	w := a.weights[i][d]
	if a.forward != nil {
		return a.forward[i][d], w, w > 0
	}
	_, s, _ := a.inverse.Draw(i, d)
	return s, w, w > 0
}

// Kept returns the number of draws of sample i with a positive weight.
func (a *Apportioned) Kept(i int) int { return len(a.kept[i]) }

// KeptDraw returns the k-th kept draw of sample i (k < Kept(i)): its draw
// number, split and weight.
func (a *Apportioned) KeptDraw(i, k int) (d int, split mix.Split, weight float64) {
	d = int(a.kept[i][k])
	split, weight, _ = a.Draw(i, d)
	return d, split, weight
}

// keptSplit is KeptDraw without a copy where the splits are stored: the
// forward model's own, or else copied into buf.
func (a *Apportioned) keptSplit(i, k int, buf *mix.Split) (d int, split *mix.Split, weight float64) {
	d = int(a.kept[i][k])
	if a.forward != nil {
		return d, &a.forward[i][d], a.weights[i][d]
	}
	*buf, weight, _ = a.Draw(i, d)
	return d, buf, weight
}

// keptWeights returns the weights of each sample's kept draws, one slice
// for every caller (flux.Cache shares the draws taken among the quantities
// built on it). tick, when not nil, is called before each sample's, so
// that a caller on one goroutine can hand control back to its host.
func (a *Apportioned) keptWeights(tick func()) [][]float64 {
	a.kwOnce.Do(func() {
		a.kw = make([][]float64, len(a.kept))
		for i, ks := range a.kept {
			if len(ks) == 0 {
				continue
			}
			if tick != nil {
				tick()
			}
			a.kw[i] = make([]float64, len(ks))
			for k, d := range ks {
				a.kw[i][k] = a.weights[i][d]
			}
		}
	})
	return a.kw
}

// Usable reports whether sample i has a usable apportionment: at least
// one kept draw, and, for the inverse model, data that some mix of the
// end-members fits (or that the Na-free rule answers): a sample that does
// not fit rests on a failed fit (docs/methods.md §7.7, §8.8).
func (a *Apportioned) Usable(i int) bool {
	if len(a.kept[i]) == 0 {
		return false
	}
	if a.inverse != nil {
		st := a.Status[i]
		return st == mix.Fits || st == mix.Rule
	}
	return true
}

// Doubtful reports whether sample i's apportionment should not be trusted
// as it stands: the data do not fit the end-members, fit them only with
// ratios beyond their prior ranges, or the posterior is poorly sampled
// (mix.SampleResult.Doubtful).
func (a *Apportioned) Doubtful(i int) bool { return a.doubtfulSample[i] }

// Unusable counts the samples without a usable apportionment.
func (a *Apportioned) Unusable() int {
	n := 0
	for i := range a.kept {
		if !a.Usable(i) {
			n++
		}
	}
	return n
}

// Under returns the samples apportioned again with the sulfate above the
// rain share from another origin ("gypsum" or "sulfide"), every other
// setting unchanged, for the CO2 cell's sulfate bracket (docs/methods.md
// §5.2). The per-sample inverse model works again only the samples whose
// data the origin changes (those with sulfate above their rain share) and
// takes the others over from a, bit for bit what working them again gives
// (every sample draws from its own streams; mix.Run.Reuse).
func (a *Apportioned) Under(ctx context.Context, sulfate string, report func(done, total int)) (*Apportioned, error) {
	if a.redo == nil {
		return nil, fmt.Errorf("this apportionment cannot be repeated with another sulfate origin")
	}
	return a.redo(ctx, sulfate, true, report)
}

// SulfateAboveRain reports whether any sample has sulfate above its rain
// share (SO4* > 0), the only case in which the sulfate origin changes the
// apportionment.
func (a *Apportioned) SulfateAboveRain() bool {
	for i := range a.Corrected {
		if a.Corrected[i].SO4Star > 0 {
			return true
		}
	}
	return false
}

// howMany says how many of the samples of an inversion neither fit nor
// were answered by a rule: "all 12 samples", or "3 of 12 samples".
func howMany(samples []mix.SampleResult) string {
	bad := 0
	for i := range samples {
		if samples[i].Status != mix.Fits && samples[i].Status != mix.Rule {
			bad++
		}
	}
	if bad == len(samples) {
		if bad == 1 {
			return "the only sample"
		}
		return fmt.Sprintf("all %d samples", bad)
	}
	return fmt.Sprintf("%d of %d samples", bad, len(samples))
}

// Weights returns the weight of each draw of sample i. The slice is
// shared: do not change it.
func (a *Apportioned) Weights(i int) []float64 { return a.weights[i] }

// SO4Sulf returns the sulfide-derived sulfate (µmol/L) of sample i under
// its draw d, which follows the draw's atmospheric sulfate.
func (a *Apportioned) SO4Sulf(i, d int) float64 {
	switch {
	case a.forward == nil:
		return a.inverse.SO4Sulf(i, d)
	case a.scales == nil:
		return a.Corrected[i].SO4Sulf
	}
	return a.Corrected[i].VarySO4Sulf(&a.scales[d])
}

func init() { Register(KindApportionment, computeApportionment) }

// ChunkDraws is the number of draws the inverse model works through
// between progress reports when it runs on one goroutine (in the browser,
// or with Document.Workers = 1).
var ChunkDraws = 4000

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
// its 95 % interval, docs/methods.md §7.3; a log-uniform range is read the
// same way).
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

// apportionInputs returns the rain cell's and the sources cell's outputs
// the apportionment cell of e reads.
func apportionInputs(e *Env) (*Atmosphere, []mix.EndMember, error) {
	atm, err := inputOf[*Atmosphere](e, "atmosphere")
	if err != nil {
		return nil, nil, err
	}
	ems, err := inputOf[[]mix.EndMember](e, "sources")
	return atm, ems, err
}

func computeApportionment(e *Env) (*Output, error) {
	s := *e.Cell.Settings.(*ApportionmentSettings)
	atm, ems, err := apportionInputs(e)
	if err != nil {
		return nil, err
	}
	iv := e.inverter()
	rough := e.Rough()
	a, out, err := apportion(e.Ctx, iv, e.Report, &s, atm, ems, true, rough)
	if err != nil {
		return out, err // out, when not nil, says which samples it could not take
	}
	a.redo = func(ctx context.Context, sulfate string, reuse bool, report func(done, total int)) (*Apportioned, error) {
		o := s
		o.Sulfate = sulfate
		ov := iv
		ov.job.Sulfate = sulfate
		if reuse {
			ov.reuse = a.inverse
		}
		b, _, err := apportion(ctx, ov, report, &o, atm, ems, false, rough)
		return b, err
	}
	return out, nil
}

// apportion corrects every sample and splits its cations among the
// sources with the settings s, reporting progress; computeApportionment
// runs it for the cell, and Apportioned.Under again with another sulfate
// origin. Without summary it leaves out what only the cell shows (the
// per-sample quantiles Median, Lo and Hi, and the tables): the draws,
// their weights and each sample's mean split are all fluxes need.
func apportion(ctx context.Context, iv inverter, report func(done, total int), s *ApportionmentSettings, atm *Atmosphere, ems []mix.EndMember, summary, rough bool) (*Apportioned, *Output, error) {
	opt, err := correctOptions(s, atm)
	if err != nil {
		return nil, nil, err
	}
	a := &Apportioned{Samples: atm.Samples, Model: s.Model, Draws: s.Draws}
	out := &Output{}
	warn := map[string]int{}
	precs, err := correctSamples(a, atm, opt, s, out, warn)
	if err != nil {
		return nil, nil, err
	}
	n := len(a.Index)
	if n == 0 {
		return nil, out, fmt.Errorf("no sample can be apportioned: %v", out.Messages.Err())
	}
	if err := atm.Uncertainty.Check(); err != nil {
		return nil, nil, err
	}
	a.Status, a.Verdict, a.ESS = make([]mix.Status, n), make([]string, n), make([]float64, n)
	a.doubtfulSample = make([]bool, n)
	last := [2]int{0, 1} // the progress last reported
	rep := func(done, total int) { last = [2]int{done, total}; report(done, total) }
	switch s.Model {
	case "forward":
		err = apportionForward(ctx, rep, a, s, atm, ems, n, warn)
	case "inverse", "catchment":
		err = apportionInverse(ctx, iv, rep, a, s, atm, ems, precs, n, rough, out, warn)
	}
	if err != nil {
		return nil, nil, err
	}
	// The summaries take a while over many draws: each sample reports the
	// last progress again, so that the page hands its thread back to the
	// browser between samples.
	if err := summariseDraws(ctx, a, n, summary, func() { report(last[0], last[1]) }); err != nil {
		return nil, nil, err
	}
	conclude(a, s, n, summary, out, warn)
	return a, out, nil
}

// correctOptions are the corrections' options under the settings s:
// the sulfate origin, with the δ34S end-members, and negative residuals.
func correctOptions(s *ApportionmentSettings, atm *Atmosphere) (correct.Options, error) {
	opt := atm.Options
	switch s.Sulfate {
	case "sulfide":
		opt.Sulfate = correct.Sulfide
	case "isotope":
		if s.D34SEvaporite == s.D34SSulfide {
			return opt, settingErr("d34s_sulfide_permil", "must differ from the %s", SettingLabel("d34s_evaporite_permil"))
		}
		opt.Sulfate = correct.Isotope
		opt.Delta34S = correct.Delta34S{River: s.D34SRiver, Evaporite: s.D34SEvaporite, Sulfide: s.D34SSulfide}
	}
	if s.Negative == "keep" {
		opt.Negative = correct.Keep
	}
	return opt, nil
}

// correctSamples corrects each sample the rain cell uses into a, leaving
// out (with a message in out) those without the Ca the sulfate split
// needs, counts the corrections' warnings in warn, and returns each kept
// sample's precision.
func correctSamples(a *Apportioned, atm *Atmosphere, opt correct.Options, s *ApportionmentSettings, out *Output, warn map[string]int) ([]*correct.Precision, error) {
	var precs []*correct.Precision
	for _, i := range atm.Use {
		sm := atm.Samples.Table.Samples[i]
		o := opt
		if s.Sulfate == "isotope" {
			if v, ok := delta34S(sm.Meta); ok {
				o.Delta34S.River = v // the sample's own δ34S
			}
		}
		r, err := correct.Apply(sm.C, &o)
		if errors.Is(err, correct.ErrMissing) && !sm.C.Has(chem.Ca) {
			out.Messages = append(out.Messages, atm.Samples.leftOut(i, chem.Ca, fmt.Sprintf(
				"sample %s has no Ca value: left out of the apportionment and of the cells that read it (fluxes, CO2); its sulfate above the rain's share goes partly to gypsum, which brings as much Ca; give its Ca, or set %s to sulfide",
				sampleName(sm), quoteSetting("sulfate"))))
			continue
		}
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
	return precs, nil
}

// apportionForward splits each corrected sample of a by the forward
// model, s.Draws draws each, counting its warnings in warn.
func apportionForward(ctx context.Context, report func(done, total int), a *Apportioned, s *ApportionmentSettings, atm *Atmosphere, ems []mix.EndMember, n int, warn map[string]int) error {
	if err := checkSampleDraws(s.Model, n, s.Draws); err != nil {
		return err
	}
	if !atm.Uncertainty.Zero() {
		// The rain ratios (and the ET factor) are drawn with the
		// silicate ratios, draw by draw.
		a.scales = mix.RainScales(s.Draws, uint64(s.Seed), atm.Uncertainty, atm.ScaleCl)
	}
	fo := &mix.ForwardOptions{Silicate: forwardRatios(ems), Draws: s.Draws, Seed: uint64(s.Seed)}
	a.forward = make([][]mix.Split, n)
	for i := range a.Corrected {
		if err := ctx.Err(); err != nil {
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
		report(i+1, n)
	}
	return nil
}

// apportionInverse fits the inverse model, or the catchment-wide model,
// to the corrected samples of a, with the precisions precs, counting its
// warnings in warn and saying in out what the whole run found.
func apportionInverse(ctx context.Context, iv inverter, report func(done, total int), a *Apportioned, s *ApportionmentSettings, atm *Atmosphere, ems []mix.EndMember, precs []*correct.Precision, n int, rough bool, out *Output, warn map[string]int) error {
	var tracers []mix.Tracer
	for _, t := range s.Tracers {
		tr, err := mix.ParseTracer(t)
		if err != nil {
			return settingErr("tracers", "%v", err)
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
		Precision: &prec, IsoErr: atm.Samples.IsoPrecision, Rain: atm.Uncertainty, ScaleCl: atm.ScaleCl, Workers: iv.workers}
	if rough {
		// The quick pass: a rough posterior now, refined in the full pass.
		mo.Draws, mo.TargetESS, mo.MaxDraws = min(mo.Draws, roughDraws), min(mo.TargetESS, roughESS), min(mo.MaxDraws, roughMax)
		out.Rough = true
	}
	if err := checkInverseDraws(n, mo); err != nil {
		return err
	}
	mo.MaxKept = MaxSampleDraws
	var co *mix.CatchmentOptions
	if s.Model == "catchment" {
		if err := checkCatchmentSamples(n); err != nil {
			return err
		}
		co = &mix.CatchmentOptions{Keep: catchmentKeep, Searches: iv.doc.searchesOf(iv.job)}
		if rough {
			co = &mix.CatchmentOptions{Warmup: 600, Batch: 400, MaxSteps: 400, Keep: 200}
		}
	}
	res, err := invert(ctx, iv, report, p, mo, co)
	if err != nil {
		return err
	}
	if c := res.Catchment; c != nil && rough {
		iv.doc.keepSearches(iv.job, c.Searches())
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	a.inverse = res
	if c := res.Catchment; c != nil {
		a.catchment(c, ems, out)
	}
	a.Draws = 0
	for i := range res.Samples {
		a.Draws = max(a.Draws, res.Kept(i))
	}
	a.diagram(res, ems)
	for _, c := range res.Confusions {
		out.Warnings = append(out.Warnings, "identifiability: "+c.Text)
	}
	for i := range res.Samples {
		sr := &res.Samples[i]
		a.Status[i], a.Verdict[i], a.ESS[i], a.doubtfulSample[i] = sr.Status, sr.Verdict, sr.ESS, sr.Doubtful()
		for _, w := range sr.Warnings {
			// Grouped by kind: "end-member left out, no tracer sees it: …".
			warn[strings.TrimPrefix(w.Error(), "mix: ")]++
		}
	}
	if res.Status != mix.Fits && res.Status != mix.Rule {
		out.Warnings = append(out.Warnings, "inversion: "+res.Status.String()+" for "+howMany(res.Samples)+" (see the status column)")
	}
	return nil
}

// summariseDraws keeps each sample's draws, their weights and mean split
// in a, and with summary its medians and 95 % bounds, cell by cell,
// calling tick before each sample and each cell's quantiles.
func summariseDraws(ctx context.Context, a *Apportioned, n int, summary bool, tick func()) error {
	// Medians and bounds, cell by cell, from each sample's weighted draws.
	a.Median, a.Lo, a.Hi, a.Mean = make([]mix.Split, n), make([]mix.Split, n), make([]mix.Split, n), make([]mix.Split, n)
	var vals, ws []float64
	var draws []mix.Split
	var qb quantile.Buf
	a.weights = make([][]float64, n)
	a.kept = make([][]int32, n)
	for i := 0; i < n; i++ {
		if err := ctx.Err(); err != nil {
			return err
		}
		tick()
		nd := a.Draws
		if a.inverse != nil {
			nd = a.inverse.Kept(i)
		}
		draws, ws = draws[:0], ws[:0]
		a.weights[i] = make([]float64, nd)
		a.kept[i] = nil
		for d := 0; d < nd; d++ {
			var sp mix.Split
			w := 1.0
			if a.inverse != nil {
				_, sp, w = a.inverse.Draw(i, d)
			} else {
				sp = a.forward[i][d]
			}
			draws = append(draws, sp)
			ws = append(ws, w)
			a.weights[i][d] = w
			if w > 0 {
				a.kept[i] = append(a.kept[i], int32(d))
			}
		}
		a.Mean[i] = meanSplit(draws, ws)
		for src := mix.Source(0); src < mix.NSources && summary; src++ {
			for k := 0; k < mix.NCations; k++ {
				tick() // each quantile sorts every draw of the sample
				vals = vals[:0]
				for _, sp := range draws {
					vals = append(vals, sp[src][k])
				}
				q := qb.Midpoints(vals, ws, 0.025, 0.5, 0.975)
				a.Lo[i][src][k], a.Median[i][src][k], a.Hi[i][src][k] = q[0], q[1], q[2]
			}
		}
	}
	return nil
}

// conclude adds to out the warnings counted in warn, the tables (with
// summary), the figures and the reasons a is doubtful.
func conclude(a *Apportioned, s *ApportionmentSettings, n int, summary bool, out *Output, warn map[string]int) {
	out.Warnings = append(out.Warnings, countedWarnings(warn)...)
	if summary {
		out.Tables = append(out.Tables, a.shareTable(), a.amountTable())
	}
	fit, doubt := 0, 0
	for i := range a.Status {
		if a.Status[i] == mix.Fits || a.Status[i] == mix.Rule {
			fit++
		}
		if a.doubtfulSample[i] {
			doubt++
		}
	}
	out.Figures = append(out.Figures, Point("samples apportioned", "", float64(fit)), Point("samples without a good fit", "", float64(n-fit)),
		Point("samples doubtful", "", float64(doubt)))
	a.Sulfate = s.Sulfate
	// Doubtful when no sample, or fewer than three in four, could be
	// apportioned, or when more than a quarter of the samples do not fit,
	// fit only with end-member ratios beyond their ranges or are poorly
	// sampled (a quarter: an engineering choice, no source).
	if bad := a.Unusable(); bad == n && n > 0 {
		a.doubtful = []string{"no sample has a usable apportionment (" + countOf(bad, n, "samples") + " failed)"}
	} else if 4*bad > n {
		a.doubtful = []string{fmt.Sprintf("%s have no usable apportionment (more than a quarter)", countOf(bad, n, "samples"))}
	}
	if 4*doubt > n {
		a.doubtful = append(a.doubtful, fmt.Sprintf("%s do not fit the end-members, fit them only with ratios beyond their ranges, or are poorly sampled (more than a quarter; see the status column)", countOf(doubt, n, "samples")))
	}
	if a.doubtfulChains != "" {
		a.doubtful = append(a.doubtful, a.doubtfulChains)
	}
	out.Doubtful = a.doubtful
	out.Value = a
}

// catchmentKeep is the number of joint draws the catchment-wide model
// hands on (mix.CatchmentOptions.Keep).
const catchmentKeep = 1000

// invert runs the inverse model (or, with co, the catchment-wide model) on
// the problem: through the document's Farm when it has one; otherwise on
// one goroutine in chunks, the progress callback between them, in the
// browser or with one worker (the chunk size does not change the result);
// otherwise on every worker. A run stopped at the draws it
// may keep (mix.ErrTooManyKept) is an error that names the settings.
func invert(ctx context.Context, iv inverter, report func(done, total int), p mix.Problem, mo *mix.Options, co *mix.CatchmentOptions) (*mix.Result, error) {
	switch {
	case iv.capture != nil: // FarmWork takes the problem
		*iv.capture, *iv.problem = *mo, p
		if co != nil {
			*iv.catchment = *co
		}
		return nil, errCaptured
	case iv.farm != nil && co == nil:
		return iv.farmed(ctx, report, p, mo)
	case iv.farm != nil:
		return iv.farmedCatchment(ctx, report, p, mo, co)
	}
	if iv.workers == 1 || runtime.GOOS == "js" {
		type stepper interface {
			Step(context.Context, int) bool
			Progress() float64
			Result() *mix.Result
			Err() error
		}
		var run stepper
		var err error
		if co != nil {
			run, err = mix.NewCatchmentRun(p, mo, co)
		} else {
			var r *mix.Run
			if r, err = mix.NewRun(p, mo); err == nil {
				r.Reuse(iv.reuse)
				run = r
			}
		}
		if err != nil {
			return nil, err
		}
		for !run.Step(ctx, ChunkDraws) {
			report(int(run.Progress()*1000), 1000)
		}
		report(1000, 1000)
		if err := run.Err(); err != nil {
			return nil, keptErr(err)
		}
		return run.Result(), ctx.Err()
	}
	mo.Progress = func(done, total int) { report(done, total) }
	var res *mix.Result
	var err error
	if co != nil {
		res, err = mix.InvertCatchment(ctx, p, mo, co)
	} else {
		res, err = mix.InvertReusing(ctx, p, mo, iv.reuse)
	}
	if err != nil {
		return nil, keptErr(err)
	}
	return res, ctx.Err()
}

// catchment hands on what the catchment-wide model learned: after a fall
// back to the per-sample model, a warning that says why; otherwise the
// joint draws, the shared ratios' table (prior and posterior side by
// side) and their boxes on the mixing diagrams, and, when the chains have
// not converged, a plain message that marks the result doubtful.
func (a *Apportioned) catchment(c *mix.Catchment, ems []mix.EndMember, out *Output) {
	if c.Fallback != "" {
		a.Model = "inverse"
		out.Warnings = append(out.Warnings, "catchment-wide model: "+c.Fallback)
		return
	}
	a.Catchment, a.Joint = c, true
	out.Warnings = append(out.Warnings, "catchment-wide model: "+c.Check.Text)
	if !c.Converged {
		a.doubtfulChains = c.Message
	}
	n := len(c.Ratios)
	em, ratio := make([]string, n), make([]string, n)
	col := func() []float64 { return make([]float64, n) }
	plo, pmed, phi, lo, med, hi, rh, ess := col(), col(), col(), col(), col(), col(), col(), col()
	for i, r := range c.Ratios {
		em[i], ratio[i] = ems[r.EndMember].Name, r.Tracer.String()
		plo[i], pmed[i], phi[i] = r.Prior.Lo, r.Prior.Median, r.Prior.Hi
		lo[i], med[i], hi[i] = r.Posterior.Lo, r.Posterior.Median, r.Posterior.Hi
		rh[i], ess[i] = r.RHat, r.ESS
		a.Diagram.Shared = append(a.Diagram.Shared, SharedMark{EndMember: em[i], Ratio: ratio[i], Lo: lo[i], Median: med[i], Hi: hi[i]})
	}
	for _, sc := range c.Scatter {
		em = append(em, ems[sc.EndMember].Name)
		ratio = append(ratio, "scatter (σ of ln ratio)")
		plo, pmed, phi = append(plo, 0.1*0.03133798202142), append(pmed, 0.1*0.6744897501960817), append(phi, 0.1*2.241402727604947)
		lo, med, hi = append(lo, sc.Posterior.Lo), append(med, sc.Posterior.Median), append(hi, sc.Posterior.Hi)
		rh, ess = append(rh, sc.RHat), append(ess, sc.ESS)
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "shared", Title: fmt.Sprintf(
		"Shared end-member ratios of the catchment-wide model: prior and posterior (median, 2.5 %% and 97.5 %%), with the chains' R-hat and effective sample size (%d chains, %d steps each after %d warm-up steps)",
		c.Chains, c.Steps, c.Warmup), Columns: []*Column{TextColumn("end-member", em), TextColumn("ratio", ratio),
		NumColumn("prior", "mol/mol", pmed), NumColumn("prior_low", "mol/mol", plo), NumColumn("prior_high", "mol/mol", phi),
		NumColumn("posterior", "mol/mol", med), NumColumn("posterior_low", "mol/mol", lo), NumColumn("posterior_high", "mol/mol", hi),
		NumColumn("R-hat", "", rh), NumColumn("ESS", "draws", ess)}})
}

// meanSplit returns the weighted mean of the splits with positive weight
// (NaN throughout when there is none).
func meanSplit(draws []mix.Split, ws []float64) mix.Split {
	var m mix.Split
	t := 0.0
	for d := range draws {
		w := ws[d]
		if !(w > 0) {
			continue
		}
		t += w
		for src := range m {
			for k := range m[src] {
				m[src][k] += w * draws[d][src][k]
			}
		}
	}
	for src := range m {
		for k := range m[src] {
			if t > 0 {
				m[src][k] /= t
			} else {
				m[src][k] = math.NaN()
			}
		}
	}
	return m
}

func (a *Apportioned) dates() []string {
	d := make([]string, len(a.Days))
	for i, x := range a.Days {
		d[i] = x.String()
	}
	return d
}

// shareTable lists, per sample, its status in words, its effective sample
// size, and the share of each cation from each source with its 95 % bounds.
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

// diagram sets the marks of the mixing diagrams from the inversion: the
// samples that do not fit, with the tracer they miss, and the edges of the
// prior boxes that posteriors press against.
func (a *Apportioned) diagram(res *mix.Result, ems []mix.EndMember) {
	edges := map[string]*BoxEdge{}
	var order []string
	a.Diagram.Misfit, a.Diagram.Names = make([]string, len(res.Samples)), a.Names
	for i := range res.Samples {
		sr := &res.Samples[i]
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
}

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
