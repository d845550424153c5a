package mix

import (
	"context"
	"math"
	"reflect"
	"testing"
)

// TestWireRoundTrip: a summary with NaN, infinities, a nil and an empty
// slice, a misfit and bounds comes back field for field.
func TestWireRoundTrip(t *testing.T) {
	nan := math.NaN()
	in := sampleWire{Result: SampleResult{Name: "W-1 ü", Status: NoFit, Verdict: "does not fit", WellSampled: true,
		NoRock: 0.25, Draws: 12000, Stages: 3, Stop: Capped, ESS: nan, PPP: math.Inf(1),
		Alpha: []Interval{{Lo: 0.1, Median: 0.2, Hi: nan}}, PriorWidth: []float64{}, Corr: [][]float64{nil, {1, nan}},
		Misfit: &Misfit{Tracer: -1, Measured: 3, Fitted: 2, Lo: 1, Hi: 4, Z: -2.5, Text: "Na"},
		Bounds: []Bound{{EndMember: 2, Tracer: MgNa, Upper: true, Limit: 0.5, Median: 0.6}}, Active: []bool{true, false}},
		Warnings: []wireError{{Text: "poorly sampled", Sentinel: 9}, {Text: "other", Sentinel: -1}}}
	in.Result.Amount.Median[1][2] = nan
	in.Result.Share.Hi[0][0] = -0.5
	var w wireWriter
	writeSummary(&w, &in)
	var out sampleWire
	if err := readSummary(&wireReader{b: w.b}, &out); err != nil {
		t.Fatal(err)
	}
	// NaN is not equal to itself: compare the bits through the written form.
	var again wireWriter
	writeSummary(&again, &out)
	if string(again.b) != string(w.b) {
		t.Errorf("the summary changed on its way:\nin  %+v\nout %+v", in, out)
	}
	if out.Result.PriorWidth == nil || out.Result.Corr[0] != nil || !reflect.DeepEqual(out.Result.Active, in.Result.Active) ||
		*out.Result.Misfit != *in.Result.Misfit || !reflect.DeepEqual(out.Warnings, in.Warnings) {
		t.Errorf("nil, empty or pointed-to fields changed: %+v", out)
	}
	for cut := range w.b {
		if err := readSummary(&wireReader{b: w.b[:cut]}, &sampleWire{}); err == nil {
			t.Errorf("the summary cut to %d of %d bytes was read without an error", cut, len(w.b))
		}
	}
}

// FuzzPutSample: bytes that are not a sample's result are refused with
// an error, never a panic, and a sample's own bytes are taken.
func FuzzPutSample(f *testing.F) {
	p, o := determinismProblem()
	w, err := NewRun(p, o)
	if err != nil {
		f.Fatal(err)
	}
	good, err := w.WorkSample(context.Background(), 0, nil)
	if err != nil {
		f.Fatal(err)
	}
	if g, err := NewGather(p, o); err != nil || g.PutSample(0, good) != nil {
		f.Fatalf("the sample's own bytes were not taken: %v", err)
	}
	f.Add(good)
	f.Add(good[:len(good)/2])
	f.Add([]byte{})
	f.Add([]byte{0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0x01})
	f.Fuzz(func(t *testing.T, b []byte) {
		g, err := NewGather(p, o)
		if err != nil {
			t.Fatal(err)
		}
		_ = g.PutSample(0, b)
	})
}
