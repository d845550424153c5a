package mix

import (
	"context"
	"errors"
	"fmt"
	"testing"
)

// TestSharedSamplesSameBits works the samples of determinismProblem in
// runs of their own, one run per sample, in reverse order, and gathers
// them: every field of every sample (its warnings by text, its kept draws)
// and the result's checksum equal those of a run driven by Step, also when
// the run stops at Options.MaxKept, and a warning still wraps its
// sentinel.
func TestSharedSamplesSameBits(t *testing.T) {
	p, o := determinismProblem()
	for _, maxKept := range []int{0, 30} {
		oo := *o
		oo.MaxKept = maxKept
		run, err := NewRun(p, &oo)
		if err != nil {
			t.Fatal(err)
		}
		for !run.Step(context.Background(), 700) {
		}
		ref, refErr := run.Result(), run.Err()
		if (refErr != nil) != (maxKept > 0) {
			t.Fatalf("MaxKept %d: Step gave %v; the case is meant to stop at the cap only when one is set", maxKept, refErr)
		}
		g, err := NewGather(p, &oo)
		if err != nil {
			t.Fatal(err)
		}
		for s := g.Samples() - 1; s >= 0; s-- {
			w, err := NewRun(p, &oo)
			if err != nil {
				t.Fatal(err)
			}
			b, err := w.WorkSample(context.Background(), s, nil)
			if err != nil {
				t.Fatal(err)
			}
			if err := g.PutSample(s, b); err != nil {
				t.Fatal(err)
			}
		}
		g.Gather(context.Background())
		got := g.Result()
		if fmt.Sprint(g.Err()) != fmt.Sprint(refErr) {
			t.Errorf("MaxKept %d: error %v, want %v", maxKept, g.Err(), refErr)
		}
		if got.Checksum() != ref.Checksum() || got.Status != ref.Status {
			t.Errorf("MaxKept %d: checksum %#x status %v, want %#x %v", maxKept, got.Checksum(), got.Status, ref.Checksum(), ref.Status)
		}
		for s := range ref.Samples {
			if a, b := printSample(got.Samples[s]), printSample(ref.Samples[s]); a != b {
				t.Errorf("MaxKept %d, sample %d differs:\n got %.300s\nwant %.300s", maxKept, s, a, b)
			}
		}
	}
	wire := wireError{Text: "mix: posterior poorly sampled: x", Sentinel: 9}
	if !errors.Is(wire.err(), ErrPoorlySampled) {
		t.Error("a warning that travelled lost its sentinel")
	}
}

func TestGatherUnfinished(t *testing.T) {
	p, o := determinismProblem()
	g, err := NewGather(p, o)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := g.WorkSample(context.Background(), 0, nil); err == nil {
		t.Error("a gathering run worked a sample")
	}
	g.Gather(context.Background())
	for s, sr := range g.Result().Samples {
		if sr.Status != Canceled {
			t.Errorf("sample %d not set: status %v, want canceled", s, sr.Status)
		}
	}
	if err := g.PutSample(0, []byte("junk")); err == nil {
		t.Error("junk bytes set a sample")
	}
}

// printSample prints every field of a sample result, the one it points to
// included, so that two print alike only when they hold the same bits
// (%v prints -0 and NaN as such).
func printSample(sr SampleResult) string {
	m := sr.Misfit
	sr.Misfit = nil
	return fmt.Sprintf("%+v %+v", sr, m)
}
