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
	"lixiv/engine/mix"
)

// Apportioned is the value an apportionment cell hands on: per sample, the
// correction and the split of each cation among the sources, as a median
// with 95 % bounds and draw by draw.
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
	Mean    []mix.Split
	Lo, Hi  []mix.Split // 2.5 % and 97.5 % quantiles
	Draws   int         // draw numbers run; Draw(i, d) for d < Draws
	Model   string      // "inverse" or "forward"
	Sulfate string      // origin of the sulfate above the rain share: "gypsum", "sulfide" or "isotope"

	// doubtful gives the reasons the apportionment is doubtful (Output.Doubtful).
	doubtful []string
	// kept lists, per sample, the draw numbers with a positive weight.
	kept [][]int32
	// kw holds the weights of the kept draws (keptWeights).
	kw     [][]float64
	kwOnce sync.Once
	// redo apportions the samples again with another sulfate origin
	// (Under).
	redo func(ctx context.Context, sulfate string, report func(done, total int)) (*Apportioned, error)

	// scales holds each draw's multipliers of the rain correction's
	// inputs; nil when the correction is exact (no rain uncertainty).
	scales []correct.Scale

	inverse *mix.Result
	forward [][]mix.Split
	weights [][]float64 // per sample and draw; 0 for a draw not kept
	// splits holds every draw of every sample, expanded for code that
	// indexes it directly (the fluxes cell's series); nil when not expanded.
	splits [][]mix.Split
}

// Draw returns the split of sample i under draw d (atmospheric and
// evaporite rows included), its weight and whether the draw was kept. Draw
// d stands for the same end-member values in every sample, so derived
// fluxes can be propagated draw by draw. The split is worked out from the
// model's result on each call; nothing per draw is stored but the weight.
func (a *Apportioned) Draw(i, d int) (mix.Split, float64, bool) {
	if a.splits != nil {
		w := a.weights[i][d]
		return a.splits[i][d], w, w > 0
	}
	s, _, ok := a.drawAt(i, d)
	w := a.weights[i][d]
	return s, w, ok && w > 0
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
// split is a.splits' own, or else worked out into buf.
func (a *Apportioned) keptSplit(i, k int, buf *mix.Split) (d int, split *mix.Split, weight float64) {
	d = int(a.kept[i][k])
	if a.splits != nil {
		return d, &a.splits[i][d], a.weights[i][d]
	}
	*buf, weight, _ = a.Draw(i, d)
	return d, buf, weight
}

// keptWeights returns the weights of each sample's kept draws, one slice
// for every caller (flux.Cache shares the draws taken among the quantities
// built on it).
func (a *Apportioned) keptWeights() [][]float64 {
	a.kwOnce.Do(func() {
		a.kw = make([][]float64, len(a.kept))
		for i, ks := range a.kept {
			if len(ks) == 0 {
				continue
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
// one kept draw.
func (a *Apportioned) Usable(i int) bool { return len(a.kept[i]) > 0 }

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
// setting unchanged, for the CO2 cell's sulfate bracket (docs/methods.md §5.2).
func (a *Apportioned) Under(ctx context.Context, sulfate string, report func(done, total int)) (*Apportioned, error) {
	if a.redo == nil {
		return nil, fmt.Errorf("this apportionment cannot be repeated with another sulfate origin")
	}
	return a.redo(ctx, sulfate, report)
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

// howMany says how many of the samples of an inversion did not succeed:
// "all 12 samples", or "3 of 12 samples".
func howMany(samples []mix.SampleResult) string {
	bad := 0
	for i := range samples {
		if samples[i].Status != mix.Success {
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

// Weights returns the weight of each draw of sample i (0 for a draw not
// kept). The slice is shared: do not change it.
func (a *Apportioned) Weights(i int) []float64 { return a.weights[i] }

// drawAt works out the split of sample i under draw d from the model's
// result: the forward model's draw, or the inverse model's with the
// atmospheric and evaporite amounts added.
func (a *Apportioned) drawAt(i, d int) (mix.Split, float64, bool) {
	if a.forward != nil {
		return a.forward[i][d], 1, true
	}
	s, w, ok := a.inverse.SplitAt(i, d)
	if !ok {
		return s, 0, false
	}
	a.addRemoved(i, d, &s)
	return s, w, true
}

// SO4Sulf returns the sulfide-derived sulfate (µmol/L) of sample i under
// draw d, which follows the draw's atmospheric sulfate.
func (a *Apportioned) SO4Sulf(i, d int) float64 {
	if a.scales == nil {
		return a.Corrected[i].SO4Sulf
	}
	return a.Corrected[i].VarySO4Sulf(&a.scales[d])
}

// addRemoved adds to s the atmospheric and evaporite amounts the
// correction removed from sample i under draw d.
func (a *Apportioned) addRemoved(i, d int, s *mix.Split) {
	atm, evap := &a.Corrected[i].Atm, &a.Corrected[i].Evap
	if a.scales != nil {
		var va, ve chem.Composition
		a.Corrected[i].VaryRemoved(&a.scales[d], &va, &ve)
		atm, evap = &va, &ve
	}
	for k, sp := range mix.Cations {
		s[mix.Atmosphere][k] += atm[sp]
		s[mix.Evaporite][k] += evap[sp]
	}
}

func init() { Register(KindApportionment, computeApportionment) }

// ChunkDraws is the number of sample-draws the inverse model works through
// between progress reports when it runs on one goroutine (in the browser,
// or with Document.Workers = 1).
var ChunkDraws = 20000

// expandSplits says whether an apportionment may store every draw of every
// sample (128 bytes each) in Apportioned.splits, which makes the fluxes
// cell's series quick to build. It does so only up to expandLimit
// sample-draws; above that, Draw works each split out from the model's
// result when asked, and an apportionment of 100 samples × 10,000 draws
// holds about 8 MB (the draw weights) instead of about 130 MB.
var expandSplits = true

// expandLimit is the largest samples × draws whose splits are stored
// (about 64 MB).
const expandLimit = 500_000

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
// silicate end-member: the central value, and as 1σ a quarter of the prior
// range (a range read as about ±2σ; an assumption, no source).
func forwardRatios(ems []mix.EndMember) *mix.SilicateRatios {
	for _, em := range ems {
		if em.Source != mix.Silicate {
			continue
		}
		r := func(t mix.Tracer) mix.SilicateRatio {
			p := em.Ratio[t]
			if p.Dist == mix.Fixed {
				return mix.SilicateRatio{Value: p.Value}
			}
			return mix.SilicateRatio{Value: p.Value, Sigma: (p.Hi - p.Lo) / 4}
		}
		return &mix.SilicateRatios{CaNa: r(mix.CaNa), MgNa: r(mix.MgNa), KNa: mix.SilicateRatio{Value: math.NaN()}}
	}
	return nil
}

func computeApportionment(e *Env) (*Output, error) {
	s := *e.Cell.Settings.(*ApportionmentSettings)
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
	workers := e.Workers()
	a, out, err := apportion(e.Ctx, workers, e.Report, &s, atm, ems, true)
	if err != nil {
		return out, err // out, when not nil, says which samples it could not take
	}
	a.redo = func(ctx context.Context, sulfate string, report func(done, total int)) (*Apportioned, error) {
		o := s
		o.Sulfate = sulfate
		b, _, err := apportion(ctx, workers, report, &o, atm, ems, false)
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
func apportion(ctx context.Context, workers int, report func(done, total int), s *ApportionmentSettings, atm *Atmosphere, ems []mix.EndMember, summary bool) (*Apportioned, *Output, error) {
	opt := atm.Options
	switch s.Sulfate {
	case "sulfide":
		opt.Sulfate = correct.Sulfide
	case "isotope":
		if s.D34SEvaporite == s.D34SSulfide {
			return nil, nil, settingErr("d34s_sulfide_permil", "must differ from the %s", SettingLabel("d34s_evaporite_permil"))
		}
		opt.Sulfate = correct.Isotope
		opt.Delta34S = correct.Delta34S{River: s.D34SRiver, Evaporite: s.D34SEvaporite, Sulfide: s.D34SSulfide}
	}
	if s.Negative == "keep" {
		opt.Negative = correct.Keep
	}
	a := &Apportioned{Samples: atm.Samples, Model: s.Model, Draws: s.Draws}
	out := &Output{}
	warn := map[string]int{}
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
			return nil, nil, fmt.Errorf("sample %s (line %d): %v", sm.ID, sm.Line, err)
		}
		for _, w := range r.Warnings {
			warn[w.Error()]++
		}
		a.Index = append(a.Index, i)
		a.Names = append(a.Names, sm.ID)
		a.Days = append(a.Days, atm.Samples.Days[i])
		a.Q = append(a.Q, sm.Q)
		a.Corrected = append(a.Corrected, r)
	}
	n := len(a.Index)
	if n == 0 {
		return nil, out, fmt.Errorf("no sample can be apportioned: %v", out.Messages.Err())
	}
	if err := checkSampleDraws(s.Model, n, s.Draws); err != nil {
		return nil, nil, err
	}
	status := make([]string, n)
	kept := make([]float64, n)
	if err := atm.Uncertainty.Check(); err != nil {
		return nil, nil, err
	}
	if !atm.Uncertainty.Zero() {
		// The rain ratios (and the ET factor) are drawn once per draw and
		// shared by every sample, like the end-member ratios.
		a.scales = mix.RainScales(s.Draws, uint64(s.Seed), atm.Uncertainty, atm.ScaleCl)
	}
	switch s.Model {
	case "forward":
		fo := &mix.ForwardOptions{Silicate: forwardRatios(ems), Draws: s.Draws, Seed: uint64(s.Seed)}
		a.forward = make([][]mix.Split, n)
		for i := range a.Corrected {
			if err := ctx.Err(); err != nil {
				return nil, nil, err
			}
			if a.scales != nil {
				fo.Vary = func(k int) (v correct.Result) {
					a.Corrected[i].VaryInto(&v, &a.scales[k])
					return v
				}
			}
			fr, err := mix.Forward(&a.Corrected[i], fo)
			if err != nil {
				return nil, nil, fmt.Errorf("sample %s: %v", a.Names[i], err)
			}
			for _, w := range fr.Warnings {
				warn[w.Error()]++
			}
			a.forward[i] = fr.Draws
			status[i], kept[i] = "success", 1
			report(i+1, n)
		}
	case "inverse":
		var tracers []mix.Tracer
		for _, t := range s.Tracers {
			tr, err := mix.ParseTracer(t)
			if err != nil {
				return nil, nil, settingErr("tracers", "%v", err)
			}
			tracers = append(tracers, tr)
		}
		p := mix.Problem{EndMembers: ems, Tracers: tracers}
		for i, r := range a.Corrected {
			p.Waters = append(p.Waters, mix.Water{Name: a.Names[i], Conc: r.Residual,
				Sr87Sr86: atm.Samples.Table.Samples[a.Index[i]].Sr87Sr86})
		}
		mo := &mix.Options{Draws: s.Draws, Seed: uint64(s.Seed), Workers: workers}
		if a.scales != nil {
			mo.Vary = func(i, d int) (c chem.Composition, ok bool) {
				rejected := a.Corrected[i].VaryResidual(&a.scales[d], &c)
				return c, !rejected
			}
		}
		var res *mix.Result
		if workers == 1 || runtime.GOOS == "js" {
			// One goroutine, in chunks: the progress callback runs between
			// chunks, so a page can yield to the browser there. The chunk
			// size does not change the result.
			run, err := mix.NewRun(p, mo)
			if err != nil {
				return nil, nil, err
			}
			for !run.Step(ctx, ChunkDraws) {
				report(int(run.Progress()*float64(run.Total())), run.Total())
			}
			report(run.Total(), run.Total())
			res = run.Result()
		} else {
			mo.Progress = func(done, total int) { report(done, total) }
			var err error
			if res, err = mix.Invert(ctx, p, mo); err != nil {
				return nil, nil, err
			}
		}
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		a.inverse = res
		for i := range res.Samples {
			sr := &res.Samples[i]
			status[i], kept[i] = sr.Status.String(), sr.AcceptRate
			for _, w := range sr.Warnings {
				warn[w.Error()]++
			}
		}
		if res.Status != mix.Success {
			out.Warnings = append(out.Warnings, "inversion: "+res.Status.String()+" for "+howMany(res.Samples)+" (see the status column)")
		}
	}
	// Medians and bounds, cell by cell, from the draws, one sample at a
	// time: only that sample's draws are expanded.
	a.Median, a.Lo, a.Hi, a.Mean = make([]mix.Split, n), make([]mix.Split, n), make([]mix.Split, n), make([]mix.Split, n)
	vals, ws := make([]float64, 0, s.Draws), make([]float64, 0, s.Draws)
	var draws []mix.Split
	var qb quantileBuf
	a.weights = make([][]float64, n)
	a.kept = make([][]int32, n)
	if expandSplits && n*a.Draws <= expandLimit {
		a.splits = make([][]mix.Split, n)
	}
	for i := 0; i < n; i++ {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		if a.inverse != nil { // the draws are done; keep reporting while they are summarised
			report(a.inverse.Draws*n, a.inverse.Draws*n)
		}
		draws, ws = draws[:0], ws[:0]
		a.weights[i] = make([]float64, a.Draws)
		a.kept[i] = nil
		if a.splits != nil {
			a.splits[i] = make([]mix.Split, a.Draws)
		}
		if a.inverse != nil {
			for k := 0; k < a.inverse.Kept(i); k++ {
				d, sp, w := a.inverse.Draw(i, k)
				a.addRemoved(i, d, &sp)
				draws = append(draws, sp)
				ws = append(ws, w)
				a.weights[i][d] = w
				if w > 0 {
					a.kept[i] = append(a.kept[i], int32(d))
				}
				if a.splits != nil {
					a.splits[i][d] = sp
				}
			}
		} else {
			for d := 0; d < a.Draws; d++ {
				sp, w, _ := a.drawAt(i, d)
				draws = append(draws, sp)
				ws = append(ws, w)
				a.weights[i][d] = w
				if w > 0 {
					a.kept[i] = append(a.kept[i], int32(d))
				}
				if a.splits != nil {
					a.splits[i][d] = sp
				}
			}
		}
		a.Mean[i] = meanSplit(draws, ws)
		for src := mix.Source(0); src < mix.NSources && summary; src++ {
			for k := 0; k < mix.NCations; k++ {
				vals = vals[:0]
				for _, sp := range draws {
					vals = append(vals, sp[src][k])
				}
				q := qb.quantiles(vals, ws, 0.025, 0.5, 0.975)
				a.Lo[i][src][k], a.Median[i][src][k], a.Hi[i][src][k] = q[0], q[1], q[2]
			}
		}
	}
	if a.splits != nil {
		a.inverse, a.forward = nil, nil // everything is in splits now
	}
	out.Warnings = append(out.Warnings, countedWarnings(warn)...)
	if summary {
		out.Tables = append(out.Tables, a.shareTable(status, kept), a.amountTable())
	}
	fit := 0
	for _, st := range status {
		if st == "success" {
			fit++
		}
	}
	out.Figures = append(out.Figures, Point("samples apportioned", "", float64(fit)), Point("samples without a good fit", "", float64(n-fit)))
	a.Sulfate = s.Sulfate
	// Doubtful when no sample, or fewer than three in four, could be
	// apportioned (a quarter: an engineering choice, no source).
	if bad := a.Unusable(); bad == n && n > 0 {
		a.doubtful = []string{"no sample has a usable apportionment (" + countOf(bad, n, "samples") + " failed)"}
	} else if 4*bad > n {
		a.doubtful = []string{fmt.Sprintf("%s have no usable apportionment (more than a quarter)", countOf(bad, n, "samples"))}
	}
	out.Doubtful = a.doubtful
	out.Value = a
	return a, out, nil
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

// shareTable lists, per sample, the share of each cation from each source
// with its 95 % bounds.
func (a *Apportioned) shareTable(status []string, kept []float64) *ResultTable {
	cols := []*Column{TextColumn("sample", a.Names), TextColumn("date", a.dates()), TextColumn("status", status),
		NumColumn("accepted", "fraction", kept)}
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
	return &ResultTable{Name: "shares", Title: "Share of each cation from each source (median, 2.5 % and 97.5 %)", Columns: cols}
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
