package mix

import (
	"context"
	"errors"
	"math/rand/v2"
	"strings"
	"testing"
)

// TestCatchmentCountingCheck: too few samples for the shared ratios, or
// samples of one water type, fall back to the per-sample model with the
// reason named; a catchment that spreads along its mixing space passes.
// Four end-members read by four tracers (one equation to spare per sample,
// MinSpare) fall back; with K/Na as a fifth tracer they pass.
func TestCatchmentCountingCheck(t *testing.T) {
	spread := makeCatchment(40, 2, 1)
	four := makeCatchment(60, 4, 4)
	fourK := makeCatchment(60, 4, 4)
	fourK.prob.Tracers = append(fourK.prob.Tracers, KNa)
	few := makeCatchment(2, 3, 2)
	one := makeCatchment(40, 2, 3)
	for i := range one.prob.Waters {
		one.prob.Waters[i] = one.prob.Waters[0] // one water type, forty times
	}
	for _, tc := range []struct {
		name string
		p    Problem
		ok   bool
		why  string
	}{
		{"spread", spread.prob, true, ""},
		{"too few samples", few.prob, false, "fewer than the 10 shared ratios"},
		{"one water type", one.prob, false, "samples of one water type"},
		{"four end-members, four tracers", four.prob, false, "60 of 60 samples give fewer than two equations beyond their own amounts"},
		{"four end-members, five tracers", fourK.prob, true, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c, err := NewCatchmentRun(tc.p, &Options{Seed: 1}, nil)
			if err != nil {
				t.Fatal(err)
			}
			cat := c.Result().Catchment
			if cat.Check.OK != tc.ok {
				t.Fatalf("check %+v, want OK %v", cat.Check, tc.ok)
			}
			if tc.ok {
				return
			}
			if !strings.Contains(cat.Fallback, tc.why) || !strings.HasSuffix(cat.Fallback, "the per-sample model was run instead") {
				t.Errorf("fall back %q, want it to say %q and name the per-sample model", cat.Fallback, tc.why)
			}
			res, err := InvertCatchment(context.Background(), tc.p, &Options{Seed: 1, TargetESS: 100}, nil)
			if err != nil {
				t.Fatal(err)
			}
			if res.Joint || res.Catchment == nil || res.Catchment.Fallback == "" {
				t.Error("the fall back does not run the per-sample model with its reason")
			}
		})
	}
}

// quickCatchment is a small problem with short chains, for the tests of
// the machinery (not of the statistics).
func quickCatchment() (Problem, *Options, *CatchmentOptions) {
	sc := makeCatchment(12, 2, 11)
	return sc.prob, &Options{Seed: 20261204, Draws: 100}, &CatchmentOptions{Warmup: 400, Batch: 200, MaxSteps: 400, Keep: 100}
}

// wantCatchmentChecksum is the Result.Checksum of quickCatchment, produced
// by the native amd64 run and asserted unchanged under WebAssembly.
// Regenerate only on a deliberate change of the algorithm.
const wantCatchmentChecksum uint64 = 0x0fc32b22a1a5310a

// TestCatchmentSameBits: the same bits with any number of workers, with
// Step in any chunk size, and on every target (wantCatchmentChecksum).
func TestCatchmentSameBits(t *testing.T) {
	p, o, co := quickCatchment()
	ref, err := InvertCatchment(context.Background(), p, o, co)
	if err != nil {
		t.Fatal(err)
	}
	sum := ref.Checksum()
	t.Logf("checksum %#x", sum)
	if !ref.Joint || ref.Catchment.Fallback != "" {
		t.Fatal("not a catchment-wide run")
	}
	for _, w := range []int{1, 3} {
		oo := *o
		oo.Workers = w
		again, _ := InvertCatchment(context.Background(), p, &oo, co)
		if again.Checksum() != sum {
			t.Errorf("%d workers: checksum %#x, want %#x", w, again.Checksum(), sum)
		}
	}
	for _, chunk := range []int{1, 777, 1 << 30} {
		c, err := NewCatchmentRun(p, o, co)
		if err != nil {
			t.Fatal(err)
		}
		last := 0.0
		for !c.Step(context.Background(), chunk) {
			if pr := c.Progress(); pr < last {
				t.Fatalf("progress fell from %g to %g", last, pr)
			} else {
				last = pr
			}
		}
		if got := c.Result().Checksum(); got != sum {
			t.Errorf("Step(%d): checksum %#x, want %#x", chunk, got, sum)
		}
	}
	if wantCatchmentChecksum != 0 && sum != wantCatchmentChecksum {
		t.Errorf("checksum %#x, want %#x (the native run's)", sum, wantCatchmentChecksum)
	}
}

// TestCatchmentCancel: a cancelled run ends with its unfinished samples
// Canceled.
func TestCatchmentCancel(t *testing.T) {
	p, o, co := quickCatchment()
	ctx, cancel := context.WithCancel(context.Background())
	c, err := NewCatchmentRun(p, o, co)
	if err != nil {
		t.Fatal(err)
	}
	c.Step(ctx, 1000)
	cancel()
	if !c.Step(ctx, 1000) {
		t.Fatal("a cancelled run is not done")
	}
	if st := c.Result().Status; st != Canceled {
		t.Fatalf("status %v, want cancelled", st)
	}
	res, _ := InvertCatchment(ctx, p, o, co)
	if res.Status != Canceled {
		t.Fatalf("InvertCatchment under a cancelled context: status %v", res.Status)
	}
}

// TestSplitDiag: independent draws give R-hat near 1 and an ESS near
// their number; chains stuck in different places give a large R-hat; a
// strongly autocorrelated chain gives a small ESS (AR(1) with φ = 0.9:
// ESS ≈ n (1−φ)/(1+φ), common practice).
func TestSplitDiag(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	mk := func(m, n int, phi, shift float64) [][]float64 {
		out := make([][]float64, m)
		for j := range out {
			x := 0.0
			for range n {
				x = phi*x + rng.NormFloat64()
				out[j] = append(out[j], x+shift*float64(j))
			}
		}
		return out
	}
	for _, tc := range []struct {
		name         string
		seqs         [][]float64
		rlo, rhi     float64
		esslo, esshi float64
	}{
		{"independent", mk(8, 1000, 0, 0), 0.99, 1.01, 6500, 9500},
		{"apart", mk(8, 1000, 0, 3), 2, 100, 0, 100},
		{"ar1", mk(8, 1000, 0.9, 0), 0.99, 1.05, 250, 700},
	} {
		rh, ess := splitDiag(tc.seqs, true)
		if rh < tc.rlo || rh > tc.rhi || ess < tc.esslo || ess > tc.esshi {
			t.Errorf("%s: R-hat %.3f (want %g-%g), ESS %.0f (want %g-%g)", tc.name, rh, tc.rlo, tc.rhi, ess, tc.esslo, tc.esshi)
		}
	}
}

// TestTemper: the power of the importance weights is 1 when they are
// already even enough, else the largest whose effective number reaches the
// goal ((Σw)²/Σw², common practice).
func TestTemper(t *testing.T) {
	even := make([]float64, 100)
	skew := make([]float64, 100)
	for i := range skew {
		skew[i] = -0.2 * float64(i) // weights e^(−0.2 i): an effective number near 10
	}
	ess := func(lw []float64, beta float64) float64 {
		s, s2 := 0.0, 0.0
		for _, v := range lw {
			w := pexp(beta * v)
			s += w
			s2 += w * w
		}
		return s * s / s2
	}
	for _, tc := range []struct {
		name string
		lw   []float64
		want float64
		one  bool
	}{
		{"even", even, 50, true},
		{"skewed, low goal", skew, 5, true},
		{"skewed, goal 40", skew, 40, false},
		{"goal above the draws", skew, 1000, false},
	} {
		beta := temper(tc.lw, 0, tc.want)
		if tc.one {
			if beta != 1 {
				t.Errorf("%s: power %g, want 1", tc.name, beta)
			}
			continue
		}
		goal := min(tc.want, float64(len(tc.lw)))
		if e := ess(tc.lw, beta); !(beta < 1) || e < goal*(1-1e-6) || ess(tc.lw, beta*1.01) >= goal {
			t.Errorf("%s: power %g gives %.1f effective draws; want the largest power reaching %g", tc.name, beta, e, goal)
		}
	}
}

// TestCatchmentNotConvergedIsDoubtful: chains stopped by their cap before
// they agree leave a plain message on the catchment, and every sample that
// rests on them is not well sampled and carries the warning.
func TestCatchmentNotConvergedIsDoubtful(t *testing.T) {
	p, o, co := quickCatchment()
	co.TargetESS = 100_000 // more than the capped chains can reach
	res, err := InvertCatchment(context.Background(), p, o, co)
	if err != nil {
		t.Fatal(err)
	}
	c := res.Catchment
	if c.Converged || !strings.Contains(c.Message, "have not converged") || !strings.Contains(c.Message, "doubtful") {
		t.Fatalf("converged %v, message %q", c.Converged, c.Message)
	}
	for _, s := range res.Samples {
		if s.Status == Rule || s.Status == Skipped {
			continue
		}
		warned := false
		for _, w := range s.Warnings {
			warned = warned || errors.Is(w, ErrPoorlySampled)
		}
		if s.WellSampled || !warned {
			t.Errorf("sample %q: well sampled %v, warned %v, after chains that have not converged", s.Name, s.WellSampled, warned)
		}
	}
}

// TestNotConvergedMessage: chains that found several peaks and disagree
// are told apart from chains that mix slowly, and converged chains leave
// no message.
func TestNotConvergedMessage(t *testing.T) {
	for _, tc := range []struct {
		name  string
		cat   Catchment
		want  string
		empty bool
	}{
		{"converged", Catchment{Converged: true, Modes: 2, MaxRHat: 1.005}, "", true},
		{"separate peaks", Catchment{Chains: 4, Modes: 3, MaxRHat: 1.8, Steps: 20000}, "3 separate peaks", false},
		{"one peak, slow", Catchment{Chains: 4, Modes: 1, MaxRHat: 1.8, Steps: 20000}, "have not converged within the cap", false},
		{"two peaks, nearly mixed", Catchment{Chains: 4, Modes: 2, MaxRHat: 1.03, Steps: 20000}, "have not converged within the cap", false},
	} {
		got := notConverged(&tc.cat, 400)
		if tc.empty != (got == "") || !strings.Contains(got, tc.want) || (!tc.empty && !strings.Contains(got, "doubtful")) {
			t.Errorf("%s: %q", tc.name, got)
		}
	}
}
