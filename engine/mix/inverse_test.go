package mix

import (
	"context"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// corrected runs the default correction (sea salt, all Cl atmospheric).
func corrected(t testing.TB, name string, c chem.Composition, opt *correct.Options) Water {
	t.Helper()
	r, err := correct.Apply(c, opt)
	if err != nil {
		t.Fatal(err)
	}
	return Water{Name: name, Correction: &r, Sr87Sr86: math.NaN()}
}

// invertOne inverts waters against the corrected-water presets with the
// default tracers.
func invertOne(t testing.TB, ems []EndMember, tracers []Tracer, ws ...Water) *Result {
	t.Helper()
	res, err := Invert(context.Background(), Problem{EndMembers: ems, Tracers: tracers, Waters: ws}, &Options{Seed: 7, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

var defaultTracers = []Tracer{CaNa, MgNa, HCO3Na}

// TestEdgeWaters answers the single-source waters of docs/methods.md
// (§7.8, §13 items 2, 6 and 7) within 1 % of the measured cation:
// diluted seawater (Millero et al. 2008 molalities × 1000 at two
// dilutions) is all atmosphere, with no rock-derived cations; a pure
// calcite water (Ca 1000, Alk 2000, no Na; Na* = 0) gives all its Ca to
// carbonate by the Na-free rule; a pure albite water (Na 100, Alk 100, no
// Ca or Mg) gives all its Na to silicate and invents no silicate Ca or Mg,
// while saying that it does not fit the silicate ratios of the preset.
func TestEdgeWaters(t *testing.T) {
	sea := fwdSample(map[chem.Species]float64{chem.Na: 486.0597, chem.Mg: 54.7421, chem.Ca: 10.6568, chem.K: 10.5797,
		chem.Sr: 0.0940, chem.Cl: 565.7647, chem.SO4: 29.2643, chem.Alk: 0})
	calcite := fwdSample(map[chem.Species]float64{chem.Ca: 1000, chem.Alk: 2000, chem.Na: 0, chem.K: 0, chem.Mg: 0, chem.Cl: 0})
	albite := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.Alk: 100, chem.K: 0, chem.Ca: 0, chem.Mg: 0, chem.Cl: 0})
	res := invertOne(t, DefaultEndMembers(false), defaultTracers,
		corrected(t, "seawater", sea.Scale(1e-3), nil), corrected(t, "seawater ×0.1", sea.Scale(1e-4), nil),
		corrected(t, "calcite", calcite, nil), corrected(t, "albite", albite, nil))
	cat := func(s int, src Source, c int) float64 { return res.Samples[s].Amount.Median[src][c] }
	for s := range 2 {
		sr := &res.Samples[s]
		for c, sp := range Cations {
			meas := res.Samples[s].setup.x[c].Value + res.Samples[s].setup.atm[c].Value
			rock := cat(s, Silicate, c) + cat(s, Carbonate, c) + cat(s, Evaporite, c)
			if rock > 0.01*meas {
				t.Errorf("%s: rock-derived %s %.4g µmol/L, over 1 %% of %.4g", sr.Name, sp, rock, meas)
			}
		}
		if sr.Status != Fits && sr.Status != Rule {
			t.Errorf("%s: %v (%s)", sr.Name, sr.Status, sr.Verdict)
		}
	}
	if sr := &res.Samples[2]; sr.Status != Rule || !fwdHas(sr.Warnings, ErrNaFree) || !strings.Contains(sr.Verdict, "carbonate") {
		t.Errorf("calcite: %v, %q; want the Na-free rule", sr.Status, sr.Verdict)
	}
	if got := cat(2, Carbonate, 2); math.Abs(got-1000) > 10 {
		t.Errorf("calcite: carbonate Ca %.4g, want 1000 within 1 %%", got)
	}
	if got := cat(2, Silicate, 2) + cat(2, Silicate, 0); got != 0 {
		t.Errorf("calcite: silicate Na + Ca %g, want 0", got)
	}
	sr := &res.Samples[3]
	if got := cat(3, Silicate, 0); math.Abs(got-100) > 1 {
		t.Errorf("albite: silicate Na %.4g, want 100 within 1 %%", got)
	}
	for _, c := range []int{2, 3} {
		// Ca* = Mg* = 0 ± 0.5 (the precision floor): no silicate Ca or Mg
		// beyond what the measurement allows.
		if med, hi := sr.Amount.Median[Silicate][c], sr.Amount.Hi[Silicate][c]; med > 0.1 || hi > 1.2 {
			t.Errorf("albite: silicate %s %.3g [.., %.3g] µmol/L; want a median within a fifth of a floor of 0, at most 2.4 floors", Cations[c], med, hi)
		}
	}
	if sr.Status != NoFit || sr.Misfit == nil || !strings.Contains(sr.Verdict, "does not fit") {
		t.Errorf("albite: %v, %q; want a verdict that the silicate ratios do not fit", sr.Status, sr.Verdict)
	}
	low := false
	for _, b := range sr.Bounds {
		low = low || !b.Upper && res.EndMembers[b.EndMember].Source == Silicate
	}
	if !low {
		t.Errorf("albite: bounds %+v; want a silicate ratio at the lower edge of its range", sr.Bounds)
	}
}

// TestEvaporiteNeedsClNa checks that the evaporite end-member takes part
// only with the Cl/Na tracer (docs/methods.md §7.9): without it, it is
// left out with a warning and gets nothing; with it, a water whose Cl
// above the rain input is halite gets that Na as evaporite.
func TestEvaporiteNeedsClNa(t *testing.T) {
	sea := correct.SeaSalt()
	c := fwdSample(map[chem.Species]float64{chem.Cl: 100 + 60, chem.K: 100*sea[chem.K] + 12, chem.Ca: 100*sea[chem.Ca] + 35 + 9,
		chem.Mg: 100*sea[chem.Mg] + 24 + 1.2, chem.Alk: 233})
	c[chem.Na] = 100*sea[chem.Na] + 100 + 60 // silicate 100, halite 60
	w := corrected(t, "halite and silicate", c, &correct.Options{ClCritical: 100})
	blind := invertOne(t, DefaultEndMembers(false), defaultTracers, w)
	sr := &blind.Samples[0]
	if !fwdHas(sr.Warnings, ErrNotSeen) || sr.Active[0] {
		t.Errorf("without Cl/Na: evaporite active %v, warnings %v; want it left out", sr.Active[0], sr.Warnings)
	}
	if got := sr.Amount.Median[Evaporite][0]; math.Abs(got-60) > 3 {
		t.Errorf("without Cl/Na: evaporite Na %.4g, want the correction's halite 60", got)
	}
	seen := invertOne(t, DefaultEndMembers(false), append(defaultTracers[:3:3], ClNa), w)
	sr = &seen.Samples[0]
	if !sr.Active[0] || fwdHas(sr.Warnings, ErrNotSeen) {
		t.Errorf("with Cl/Na: evaporite active %v, warnings %v; want it taking part", sr.Active[0], sr.Warnings)
	}
	if got := sr.Amount.Median[Evaporite][0]; math.Abs(got-60) > 6 {
		t.Errorf("with Cl/Na: evaporite Na %.4g, want about 60", got)
	}
	if got := sr.Amount.Median[Silicate][0]; math.Abs(got-100) > 10 {
		t.Errorf("with Cl/Na: silicate Na %.4g, want about 100", got)
	}
}

// TestConfusion finds an end-member that the chosen tracers cannot tell
// from a mix of two others, and the tracer that would separate them.
func TestConfusion(t *testing.T) {
	a, b := PresetSilicate(), PresetCarbonate()
	mid := EndMember{Name: "mixed-up", Source: Silicate, Ref: "test"}
	for tr := range NTracers {
		pa, pb := a.Ratio[tr], b.Ratio[tr]
		if pa.Value == 0 || pb.Value == 0 {
			continue
		}
		v := 0.98*pa.Value + 0.02*pb.Value // 2 % carbonate by Na
		mid.Ratio[tr] = Within(v/1.3, v, v*1.3)
	}
	mid.Ratio[ClNa] = Within(0.8, 1, 1.25) // only Cl/Na tells it apart
	p := Problem{EndMembers: []EndMember{a, b, mid}, Tracers: defaultTracers}
	r, err := NewRun(p, nil)
	if err != nil {
		t.Fatal(err)
	}
	var found *Confusion
	for i, c := range r.Result().Confusions {
		if c.EndMember == 2 {
			found = &r.Result().Confusions[i]
		}
	}
	if found == nil {
		t.Fatalf("confusions %+v; want the mixed-up end-member", r.Result().Confusions)
	}
	if found.Separator != ClNa || !strings.Contains(found.Text, "Cl/Na would separate them") {
		t.Errorf("confusion %+v; want Cl/Na as the separator", *found)
	}
	// The presets with the default tracers are not confused (the
	// evaporite end-member takes no part without Cl/Na).
	r, _ = NewRun(Problem{EndMembers: DefaultEndMembers(false), Tracers: defaultTracers}, nil)
	if len(r.Result().Confusions) != 0 {
		t.Errorf("presets: %+v; want no confusion", r.Result().Confusions)
	}
}

// TestVerdicts checks the words of the status: a water with three times
// more Mg than Ca fits only with carbonate ratios beyond their ranges, and
// says so; with fifteen times more and end-members held to hard bounds
// (log-uniform priors), no mix fits and the verdict names the tracer; an
// exactly determined water is decided by the end-member ranges.
func TestVerdicts(t *testing.T) {
	fit := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 15, chem.Ca: 35 + 300, chem.Mg: 24 + 90, chem.Alk: 233 + 780, chem.Cl: 0})
	edge, mg := fit, fit
	edge[chem.Mg], mg[chem.Mg] = 1000, 5000
	res := invertOne(t, DefaultEndMembers(false), defaultTracers, corrected(t, "fits", fit, nil), corrected(t, "edge", edge, nil))
	hard := DefaultEndMembers(false)
	for j := range hard {
		for tr, p := range hard[j].Ratio {
			if p.Dist == LogNormal {
				hard[j].Ratio[tr] = Range(p.Lo, p.Value, p.Hi)
			}
		}
	}
	bounded := invertOne(t, hard, defaultTracers, corrected(t, "Mg", mg, nil))
	if sr := &res.Samples[0]; sr.Status != Fits || !strings.HasPrefix(sr.Verdict, "fits") || sr.Doubtful() {
		t.Errorf("fits: %v %q", sr.Status, sr.Verdict)
	}
	sr := &bounded.Samples[0]
	if sr.Status != NoFit || sr.Misfit == nil || sr.Misfit.Tracer < 0 || !strings.Contains(sr.Verdict, "does not fit: "+sr.Misfit.Tracer.String()) || !sr.Doubtful() {
		t.Errorf("Mg: %v %q %+v; want 'does not fit: <tracer> …'", sr.Status, sr.Verdict, sr.Misfit)
	}
	if sr.PPP >= fitLevel {
		t.Errorf("Mg: posterior predictive probability %g, want below %g", sr.PPP, fitLevel)
	}
	if sr := &res.Samples[1]; len(sr.Bounds) == 0 || !strings.HasPrefix(sr.Verdict, "fits only with") || !sr.Doubtful() {
		t.Errorf("edge: %q, bounds %+v; want a fit that needs ratios beyond their ranges, doubtful", sr.Verdict, sr.Bounds)
	}
	// One tracer, two end-members: Na and Ca* fix the two amounts for any
	// ratios, so the split of Ca follows the ratios' ranges.
	few := fit
	few[chem.Ca] = 35 + 40
	exact := invertOne(t, DefaultEndMembers(false), []Tracer{CaNa}, corrected(t, "exact", few, nil))
	if sr := &exact.Samples[0]; !sr.PriorDecided || !strings.Contains(sr.Verdict, "the end-member ranges decide the split") {
		t.Errorf("exactly determined: %q, prior widths %v", sr.Verdict, sr.PriorWidth)
	}
}

// TestCorrelatedAmounts warns where two end-members the tracers see alike
// trade their Na.
func TestCorrelatedAmounts(t *testing.T) {
	a := PresetSilicate()
	b := PresetSilicate()
	b.Name = "silicate again"
	c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 15, chem.Ca: 35, chem.Mg: 24, chem.Alk: 233, chem.Cl: 0})
	res := invertOne(t, []EndMember{a, b}, defaultTracers, corrected(t, "twins", c, nil))
	sr := &res.Samples[0]
	if !fwdHas(sr.Warnings, ErrCorrelated) || !(sr.Corr[0][1] < -corrWarn) {
		t.Errorf("twins: correlation %v, warnings %v; want ρ below −0.9 and a warning", sr.Corr, sr.Warnings)
	}
}

// TestRefinementStops checks the two ends of the refinement: the target ESS
// is reached at the defaults, and a cap below it stops the sample there,
// saying so.
func TestRefinementStops(t *testing.T) {
	c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 15, chem.Ca: 335, chem.Mg: 114, chem.Alk: 1013, chem.Cl: 30})
	w := corrected(t, "mixed", c, nil)
	p := Problem{EndMembers: DefaultEndMembers(false), Tracers: defaultTracers, Waters: []Water{w}}
	res, err := Invert(context.Background(), p, &Options{Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	if sr := &res.Samples[0]; sr.Stop != TargetReached || sr.ESS < 1000 || !sr.WellSampled {
		t.Errorf("defaults: stop %v, ESS %.0f", sr.Stop, sr.ESS)
	}
	res, _ = Invert(context.Background(), p, &Options{Seed: 2, Draws: 100, MaxDraws: 300})
	if sr := &res.Samples[0]; sr.Stop != Capped || sr.Draws != 300 {
		t.Errorf("capped: stop %v after %d draws, want the cap of 300", sr.Stop, sr.Draws)
	}
}

// TestStepMatchesInvert checks that Run.Step in any chunks and Invert on
// any number of workers give the same bits, and that cancelling marks the
// unfinished samples.
func TestStepMatchesInvert(t *testing.T) {
	p := Problem{EndMembers: DefaultEndMembers(false), Tracers: defaultTracers, Waters: benchWaters(6)}
	o := &Options{Seed: 9, TargetESS: 300}
	ref, err := Invert(context.Background(), p, &Options{Seed: 9, TargetESS: 300, Workers: 3})
	if err != nil {
		t.Fatal(err)
	}
	for _, chunk := range []int{1, 97, 5000} {
		r, err := NewRun(p, o)
		if err != nil {
			t.Fatal(err)
		}
		last := 0.0
		for !r.Step(context.Background(), chunk) {
			if pr := r.Progress(); pr < last {
				t.Fatalf("chunk %d: progress went back from %g to %g", chunk, last, pr)
			} else {
				last = pr
			}
		}
		if r.Result().Checksum() != ref.Checksum() {
			t.Errorf("chunks of %d: result differs from Invert's", chunk)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	r, _ := NewRun(p, o)
	r.Step(ctx, 500)
	cancel()
	r.Step(ctx, 500)
	if got := r.Result().Samples[5].Status; got != Canceled {
		t.Errorf("after cancelling: last sample %v, want cancelled", got)
	}
}

// TestPublishedRangeReading checks the one reading of a published ±: the
// range is the 95 % interval of a log-normal with its median at the
// central value, σ of ln = ln(hi/lo)/3.92 (docs/methods.md §7.3).
func TestPublishedRangeReading(t *testing.T) {
	s := newSampler(Within(0.2, 0.35, 0.5))
	want := math.Log(0.5/0.2) / (2 * distuv.UnitNormal.Quantile(0.975)) // gonum's normal quantile
	if math.Abs(s.sigmaLn()-want) > 1e-12 || math.Abs(pexp(s.fromLatent(0))-0.35) > 1e-12 {
		t.Errorf("σ of ln %g, median %g; want %g and 0.35", s.sigmaLn(), pexp(s.fromLatent(0)), want)
	}
	o := OneSigma(0.35, 0.15) // a source that says 1σ
	if so := newSampler(o); math.Abs(so.sigmaLn()-math.Log(1+0.15/0.35)) > 1e-9 {
		t.Errorf("one sigma: σ of ln %g, want ln(1 + 0.15/0.35)", so.sigmaLn())
	}
	for _, e := range []EndMember{PresetSilicate(), PresetCarbonate(), PresetEvaporite(), PresetGranitic(), PresetBasaltic()} {
		for tr, p := range e.Ratio {
			if p.Dist == LogUniform {
				t.Errorf("%s %s: a log-uniform preset; every published range reads as log-normal", e.Name, Tracer(tr))
			}
		}
	}
}
