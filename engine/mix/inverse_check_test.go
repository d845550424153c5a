package mix

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"lixiv/engine/chem"
)

func hasErr(ws []error, target error) bool {
	for _, w := range ws {
		if errors.Is(w, target) {
			return true
		}
	}
	return false
}

func TestInvertWarningsAndStatus(t *testing.T) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 1, 0, 3)
	good := ws[0]
	noNa := good
	noNa.Name = "no Na"
	noNa.Conc[chem.Na] = math.NaN()
	noMg := good
	noMg.Name = "no Mg"
	noMg.Conc[chem.Mg] = math.NaN()
	far := good
	far.Name = "far outside"
	far.Conc[chem.Ca] = 1e4 * good.Conc[chem.Na] // Ca/Na 1e4: beyond every end-member
	fixed := make([]EndMember, len(truth))
	for i := range truth {
		fixed[i] = truth[i].Fix()
	}
	tests := []struct {
		name    string
		em      []EndMember
		tracers []Tracer
		water   Water
		status  Status
		warn    error
	}{
		{"under-determined: one tracer, four end-members", prior, []Tracer{CaNa}, good, Success, ErrUnderdetermined},
		{"well determined", prior, allTracers, good, Success, nil},
		{"no Na", prior, allTracers, noNa, Skipped, ErrSkipped},
		{"missing tracer left out", prior, allTracers, noMg, Success, ErrMissingTracer},
		{"no draw fits", fixed, []Tracer{CaNa, MgNa, HCO3Na, ClNa}, far, NoFit, ErrNoFit},
		{"collinear: rain and evaporite without Cl", prior, []Tracer{CaNa}, good, Success, ErrUnderdetermined},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Invert(context.Background(), Problem{EndMembers: tc.em, Tracers: tc.tracers, Waters: []Water{tc.water}}, &Options{Draws: 500, Seed: 4, MinAccepted: 1})
			if err != nil {
				t.Fatal(err)
			}
			sr := &res.Samples[0]
			if sr.Status != tc.status {
				t.Errorf("status got %v want %v (warnings %v)", sr.Status, tc.status, sr.Warnings)
			}
			if res.Status != tc.status {
				t.Errorf("result status got %v want %v", res.Status, tc.status)
			}
			if !errors.Is(sr.Err(), tc.status.Err()) {
				t.Errorf("Err got %v want %v", sr.Err(), tc.status.Err())
			}
			if tc.warn == nil {
				if len(sr.Warnings) != 0 {
					t.Errorf("warnings got %v want none", sr.Warnings)
				}
			} else if !hasErr(sr.Warnings, tc.warn) {
				t.Errorf("warnings %v lack %v", sr.Warnings, tc.warn)
			}
		})
	}
}

func TestInvertFewAccepted(t *testing.T) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 1, 0.02, 3)
	res, err := Invert(context.Background(), Problem{EndMembers: prior, Tracers: allTracers, Waters: ws}, &Options{Draws: 200, Seed: 4, MinAccepted: 199})
	if err != nil {
		t.Fatal(err)
	}
	if got := res.Samples[0]; got.Status != FewAccepted || !errors.Is(res.Status.Err(), ErrFewAccepted) {
		t.Errorf("status %v (kept %d of 200, MinAccepted 199), want %v", got.Status, got.Kept, FewAccepted)
	}
}

func TestProblemErrors(t *testing.T) {
	_, prior := catchment()
	noIso := prior[2]
	noIso.Ratio[Sr87Sr86] = Prior{}
	badPrior := prior[2]
	badPrior.Ratio[CaNa] = Range(0.5, 0.3, 0.2)
	seven := append(slices.Clone(prior), prior[:3]...)
	tests := []struct {
		name string
		p    Problem
		o    *Options
	}{
		{"too many draws", Problem{EndMembers: prior, Tracers: []Tracer{CaNa}}, &Options{Draws: MaxDraws + 1}},
		{"no end-members", Problem{Tracers: []Tracer{CaNa}}, nil},
		{"seven end-members", Problem{EndMembers: seven, Tracers: []Tracer{CaNa}}, nil},
		{"no tracers", Problem{EndMembers: prior}, nil},
		{"tracer twice", Problem{EndMembers: prior, Tracers: []Tracer{CaNa, CaNa}}, nil},
		{"unknown tracer", Problem{EndMembers: prior, Tracers: []Tracer{NTracers}}, nil},
		{"isotope tracer, end-member without isotope", Problem{EndMembers: []EndMember{prior[0], noIso}, Tracers: []Tracer{Sr87Sr86}}, nil},
		{"reversed range", Problem{EndMembers: []EndMember{prior[0], badPrior}, Tracers: []Tracer{CaNa}}, nil},
		{"unnamed end-member", Problem{EndMembers: []EndMember{{Source: Silicate}}, Tracers: []Tracer{CaNa}}, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := Invert(context.Background(), tc.p, tc.o); err == nil {
				t.Error("got no error")
			} else if _, err2 := NewRun(tc.p, tc.o); err2 == nil || err2.Error() != err.Error() {
				t.Errorf("NewRun error %v differs from Invert's %v", err2, err)
			}
		})
	}
}

func TestRunCancelAndProgress(t *testing.T) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 4, 0.02, 3)
	p := Problem{EndMembers: prior, Tracers: allTracers, Waters: ws}
	t.Run("progress", func(t *testing.T) {
		last, calls := 0, 0
		r, err := NewRun(p, &Options{Draws: 300, Seed: 1, Progress: func(done, total int) {
			if done < last || total != 1200 {
				t.Errorf("progress %d of %d after %d", done, total, last)
			}
			last = done
			calls++
		}})
		if err != nil {
			t.Fatal(err)
		}
		steps := 0
		for !r.Step(context.Background(), 250) {
			steps++
			if r.Progress() <= 0 || r.Progress() >= 1 {
				t.Errorf("Progress() = %g mid-run", r.Progress())
			}
		}
		if last != 1200 || r.Progress() != 1 || r.Result().Status == NotRun {
			t.Errorf("final progress %d, %g, status %v; want 1200, 1, done", last, r.Progress(), r.Result().Status)
		}
		if calls < 5 {
			t.Errorf("progress called %d times, want one per chunk (>= 5)", calls)
		}
	})
	t.Run("cancelled Step", func(t *testing.T) {
		r, _ := NewRun(p, &Options{Draws: 300, Seed: 1})
		ctx, cancel := context.WithCancel(context.Background())
		r.Step(ctx, 400) // first sample done, second part-way
		cancel()
		if !r.Step(ctx, 400) {
			t.Fatal("Step after cancel did not finish the run")
		}
		res := r.Result()
		if st := res.Samples[0].Status; st == NotRun || st == Canceled || res.Samples[1].Status != Canceled || res.Status != Canceled {
			t.Errorf("statuses %v %v, run %v; want finished, cancelled, cancelled", res.Samples[0].Status, res.Samples[1].Status, res.Status)
		}
		if !errors.Is(res.Status.Err(), ErrCanceled) {
			t.Errorf("Err() = %v", res.Status.Err())
		}
	})
	t.Run("cancelled Invert", func(t *testing.T) {
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		res, err := Invert(ctx, p, &Options{Draws: 300})
		if err != nil {
			t.Fatal(err)
		}
		for i, s := range res.Samples {
			if s.Status != Canceled {
				t.Errorf("sample %d: %v, want cancelled", i, s.Status)
			}
		}
	})
}

func TestKernelsMatchGeneralSolver(t *testing.T) {
	// The kernels (unrolled for two to four end-members, looped for five and
	// six) must keep the same draws with the same fractions as the general
	// face-enumerating solver.
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 8, 0.03, 12)
	for _, n := range []int{2, 3, 4, 5, 6} {
		for _, tr := range [][]Tracer{allTracers, {CaNa, MgNa, ClNa}, {CaNa, HCO3Na}, {MgNa}} {
			em := append(slices.Clone(prior), PresetBasaltic(), PresetGranitic())[:n]
			if n <= 4 {
				em = prior[4-n:]
			}
			r, err := NewRun(Problem{EndMembers: em, Tracers: tr, Waters: ws}, &Options{Draws: 2000, Seed: 9})
			if err != nil {
				t.Fatal(err)
			}
			r.Step(context.Background(), math.MaxInt)
			for s := range ws {
				sr := &r.res.Samples[s]
				var a [MaxEndMembers]float64
				k := 0
				for d := 0; d < 2000; d++ {
					chi2, ok := r.general(&sr.prep, d, sr.prep.thresh, &a)
					kept := k < len(sr.kept) && int(sr.kept[k]) == d
					if ok != kept {
						if math.Abs(chi2-sr.prep.thresh) > 1e-6 {
							t.Fatalf("n=%d %v sample %d draw %d: general keeps %v (chi2 %g, bound %g), kernel %v", n, tr, s, d, ok, chi2, sr.prep.thresh, kept)
						}
					}
					if ok && kept {
						// Same misfit; the fractions agree too unless the
						// problem is ill-conditioned (rain against evaporite) or under-determined,
						// where the minimum is a flat valley.
						if kc := sr.chi2[k]; math.Abs(chi2-kc) > 1e-6*math.Max(1, kc) {
							t.Fatalf("n=%d %v sample %d draw %d: chi2 general %.12g kernel %.12g", n, tr, s, d, chi2, kc)
						}
						for j := 0; j < n && !hasErr(sr.Warnings, ErrIllConditioned) && !hasErr(sr.Warnings, ErrUnderdetermined); j++ {
							if math.Abs(a[j]-sr.alpha[k*n+j]) > 1e-6 {
								t.Fatalf("n=%d %v sample %d draw %d: alpha general %v kernel %v", n, tr, s, d, a[:n], sr.alpha[k*n:k*n+n])
							}
						}
					}
					if kept {
						k++
					}
				}
			}
		}
	}
}

func TestFixedPriorsMatchForwardMixing(t *testing.T) {
	// When the priors collapse to fixed ratios, the inverse model must give
	// back the split of a water mixed forward from those end-members:
	// X from end-member j = alpha_j Na (X/Na)_j (docs/methods.md §7.1).
	truth, _ := catchment()
	for _, n := range []int{2, 3, 4} {
		em := truth[4-n:]
		rng := rand.New(rand.NewPCG(uint64(n), 1))
		for trial := 0; trial < 5; trial++ {
			alpha := make([]float64, n)
			s := 0.0
			for j := range alpha {
				alpha[j] = 0.1 + rng.Float64()
				s += alpha[j]
			}
			for j := range alpha {
				alpha[j] /= s
			}
			w := mixWater("forward mix", em, alpha, 120)
			res, err := Invert(context.Background(), Problem{EndMembers: em, Tracers: allTracers, Waters: []Water{w}}, &Options{Draws: 20, Seed: 1})
			if err != nil {
				t.Fatal(err)
			}
			sr := &res.Samples[0]
			if sr.Status != Success {
				t.Fatalf("n=%d: status %v %v", n, sr.Status, sr.Warnings)
			}
			var want Split
			for j, e := range em {
				want[e.Source][0] += alpha[j] * 120
				for c := 1; c < NCations; c++ {
					want[e.Source][c] += alpha[j] * 120 * e.Ratio[cationTracer[c]].Value
				}
			}
			for src := range NSources {
				for c := range NCations {
					g, wv := sr.Amount.Median[src][c], want[src][c]
					if math.Abs(g-wv) > 1e-6*math.Max(1, wv) {
						t.Errorf("n=%d trial %d %v %v: inverse %.9g, forward mixing %.9g", n, trial, src, Cations[c], g, wv)
					}
					if sr.Amount.Lo[src][c] != g || sr.Amount.Hi[src][c] != g {
						t.Errorf("n=%d %v %v: fixed priors give interval [%g, %g]", n, src, Cations[c], sr.Amount.Lo[src][c], sr.Amount.Hi[src][c])
					}
				}
			}
		}
	}
}

func TestWeightScoringDeterministic(t *testing.T) {
	p, o := determinismProblem(Weight)
	a, _ := Invert(context.Background(), p, o)
	r, _ := NewRun(p, o)
	for !r.Step(context.Background(), 333) {
	}
	if a.Checksum() != r.Result().Checksum() {
		t.Errorf("weighted: Invert %#x, Step %#x", a.Checksum(), r.Result().Checksum())
	}
	t.Logf("weighted checksum %#x", a.Checksum())
	if a.Checksum() != wantWeightChecksum {
		t.Errorf("weighted checksum got %#x want %#x (native reference)", a.Checksum(), wantWeightChecksum)
	}
	s := &a.Samples[0]
	if !(s.ESS > 1 && s.ESS <= float64(s.Kept)) {
		t.Errorf("ESS %g outside (1, %d]", s.ESS, s.Kept)
	}
}

// wantWeightChecksum is the checksum of determinismProblem under Weight
// scoring from the native run; it is also asserted under WebAssembly.
const wantWeightChecksum uint64 = 0xe5f654c9cd9835a0

func TestPerturbedData(t *testing.T) {
	// With Perturb the measured ratios are drawn per sample and draw; the
	// result must still be independent of workers and chunking, match the
	// native checksum under WebAssembly, and cover the truth.
	p, o := determinismProblem(Accept)
	o.Perturb = true
	a, _ := Invert(context.Background(), p, o)
	o1 := *o
	o1.Workers = 1
	b, _ := Invert(context.Background(), p, &o1)
	r, _ := NewRun(p, o)
	for !r.Step(context.Background(), 71) {
	}
	sums := []uint64{a.Checksum(), b.Checksum(), r.Result().Checksum()}
	t.Logf("perturbed checksum %#x", sums[0])
	if sums[0] != sums[1] || sums[0] != sums[2] {
		t.Errorf("checksums differ across drivers: %#x", sums)
	}
	if sums[0] != wantPerturbChecksum {
		t.Errorf("perturbed checksum got %#x want %#x (native reference)", sums[0], wantPerturbChecksum)
	}
	plain, _ := determinismProblem(Accept)
	if c, _ := Invert(context.Background(), plain, &Options{Draws: 600, Seed: 20261201}); c.Checksum() == sums[0] {
		t.Error("Perturb changed nothing")
	}

	truth, prior := catchment()
	ws, as := catchmentWaters(truth, 20, 0.02, 15)
	res, err := Invert(context.Background(), Problem{EndMembers: prior, Tracers: allTracers, Waters: ws}, &Options{Draws: 6000, Seed: 3, Perturb: true, MinAccepted: 50})
	if err != nil {
		t.Fatal(err)
	}
	for _, src := range []Source{Silicate, Carbonate} {
		for c := range NCations {
			hit := 0
			for s := range ws {
				v := trueShare(truth, as[s], src, c)
				if res.Samples[s].Share.Lo[src][c] <= v && v <= res.Samples[s].Share.Hi[src][c] {
					hit++
				}
			}
			if hit < 18 {
				t.Errorf("%v %v: %d of 20 intervals contain the truth, want >= 18", src, Cations[c], hit)
			}
		}
	}
}

// wantPerturbChecksum is the native checksum of determinismProblem with
// Perturb; asserted equal under WebAssembly as well.
const wantPerturbChecksum uint64 = 0xf00d990717414c2d

func TestSummaryMatchesDraws(t *testing.T) {
	// The per-sample quantiles must be those of the per-draw splits that
	// Result.Draw hands to the flux code (to rounding: the summary scales
	// share quantiles by the measured concentration).
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 3, 0.02, 31)
	ws[1].Conc[chem.Mg] = math.NaN() // unmeasured: model amounts
	res, err := Invert(context.Background(), Problem{EndMembers: prior, Tracers: []Tracer{CaNa, HCO3Na, ClNa, SrNa}, Waters: ws}, &Options{Draws: 800, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	for s := range ws {
		sr := &res.Samples[s]
		if sr.Kept < 2 {
			t.Fatalf("sample %d: %d kept", s, sr.Kept)
		}
		for src := range NSources {
			for c := range NCations {
				var am []float64
				for k := 0; k < sr.Kept; k++ {
					_, split, _ := res.Draw(s, k)
					am = append(am, split[src][c])
				}
				got := Interval{sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c]}
				want := interval(am)
				tol := 1e-12 * math.Max(1, math.Abs(want.Hi))
				if math.Abs(got.Lo-want.Lo) > tol || math.Abs(got.Median-want.Median) > tol || math.Abs(got.Hi-want.Hi) > tol {
					t.Errorf("sample %d %v %v: amount quantiles %v, from the draws %v", s, src, Cations[c], got, want)
				}
			}
		}
	}
}
