package mix

import (
	"context"
	"encoding/binary"
	"errors"
	"fmt"
)

// A run's samples may be worked apart from the run that gathers them: in
// other processes or other WebAssembly instances (the page's Web Workers),
// each with a Run of its own for the same problem, options and seed.
// WorkSample works one sample there and encodes its result; PutSample sets
// it in the gathering run, which Gather then closes. Since every sample
// draws from its own streams and reads the first-stage table, which every
// Run of a seed draws alike, the result is bit for bit the one Step and
// Invert give, however the samples are shared out.

// NewGather returns a run for problem p and options o that works no
// sample itself: its samples come from PutSample, and Gather ends it. It
// draws no first-stage table.
func NewGather(p Problem, o *Options) (*Run, error) { return newRun(p, o, false) }

// Samples returns the number of waters of the run.
func (r *Run) Samples() int { return len(r.prob.Waters) }

// WorkSample works sample s through all its stages on the calling
// goroutine, calling progress (when set) with the fraction of its planned
// draws done, and returns its result encoded for PutSample. A cancelled
// context returns its error.
func (r *Run) WorkSample(ctx context.Context, s int, progress func(float64)) ([]byte, error) {
	if r.table == nil && !r.res.Samples[s].setup.skip {
		return nil, errors.New("mix: a gathering run works no sample")
	}
	const chunk = 512 // draws between looks at ctx
	w := r.begin(s)
	for !w.finished {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		w.advance(r, chunk)
		if progress != nil {
			progress(min(1, float64(w.n)/float64(max(w.planned, 1))))
		}
	}
	r.finish(w)
	return encodeSample(&r.res.Samples[s]), nil
}

// PutSample sets the result of sample s from what WorkSample returned for
// it in a run of the same problem, options and seed.
func (r *Run) PutSample(s int, b []byte) error {
	if s < 0 || s >= len(r.res.Samples) {
		return fmt.Errorf("mix: no sample %d", s)
	}
	head, k := binary.Uvarint(b)
	if k <= 0 || head > uint64(len(b)-k) {
		return fmt.Errorf("mix: sample %d: not a sample's bytes", s)
	}
	var m sampleWire
	if err := readSummary(&wireReader{b: b[k : k+int(head)]}, &m); err != nil {
		return fmt.Errorf("mix: sample %d: %v", s, err)
	}
	raw := b[k+int(head):]
	sr := &r.res.Samples[s]
	if m.Result.Name != sr.Name {
		return fmt.Errorf("mix: sample %d is %q, not %q", s, sr.Name, m.Result.Name)
	}
	st := sr.setup
	*sr = m.Result
	sr.setup = st
	for _, w := range m.Warnings {
		sr.Warnings = append(sr.Warnings, w.err())
	}
	if len(raw)%drawBytes != 0 {
		return fmt.Errorf("mix: sample %d: %d bytes of draws", s, len(raw))
	}
	sr.draws = make([]kept, len(raw)/drawBytes)
	dr := wireReader{b: raw}
	for k := range sr.draws {
		d := &sr.draws[k]
		dr.split(&d.split)
		d.so4, d.w = dr.float(), dr.float()
	}
	return nil
}

// Gather ends a run whose samples were set by PutSample: as Step does,
// it counts the draws kept sample by sample, in order, and stops at the
// one that passes Options.MaxKept (Err then says so), marking it and those
// after it Canceled; a cancelled context marks the samples not set
// Canceled.
func (r *Run) Gather(ctx context.Context) {
	for s := range r.res.Samples {
		sr := &r.res.Samples[s]
		if sr.Status == NotRun {
			r.cur = s
			r.cancel()
			return
		}
		if r.keep(s) {
			// As Step leaves them: the samples after s not begun.
			for t := s + 1; t < len(r.res.Samples); t++ {
				r.res.Samples[t].notBegun()
			}
			r.stopAt(s)
			return
		}
		r.finished.Add(1)
	}
	r.cur = len(r.res.Samples)
	r.res.Status = r.res.worst()
}

// sampleWire is a SampleResult as it travels between runs: its exported
// fields and its warnings as text with the sentinel each wraps, in the
// binary form of wire.go, its length first; its kept draws follow as raw
// bits (drawBytes each).
type sampleWire struct {
	Result   SampleResult
	Warnings []wireError
}

// wireError is an error that travelled: its text, and the index in
// sentinels of the error it wraps (-1 for none).
type wireError struct {
	Text     string
	Sentinel int
}

// sentinels are the errors a sample's warnings may wrap, so that
// errors.Is still finds them after the trip.
var sentinels = []error{ErrNoFit, ErrSkipped, ErrCanceled, ErrNotRun, ErrUnderdetermined, ErrMissingTracer,
	ErrNotSeen, ErrConfused, ErrCorrelated, ErrPoorlySampled, ErrNaFree}

func (w wireError) err() error {
	if w.Sentinel >= 0 && w.Sentinel < len(sentinels) {
		return &carried{text: w.Text, wrapped: sentinels[w.Sentinel]}
	}
	return errors.New(w.Text)
}

// carried is a warning that travelled between runs, with its sentinel.
type carried struct {
	text    string
	wrapped error
}

func (c *carried) Error() string { return c.text }
func (c *carried) Unwrap() error { return c.wrapped }

// encodeSample writes a sample's result in the wire form: the summary's
// length, the summary, then every kept draw.
func encodeSample(sr *SampleResult) []byte {
	m := sampleWire{Result: *sr}
	m.Result.Warnings = nil
	for _, w := range sr.Warnings {
		we := wireError{Text: w.Error(), Sentinel: -1}
		for i, e := range sentinels {
			if errors.Is(w, e) {
				we.Sentinel = i
				break
			}
		}
		m.Warnings = append(m.Warnings, we)
	}
	var g wireWriter
	writeSummary(&g, &m)
	d := wireWriter{b: binary.AppendUvarint(make([]byte, 0, 10+len(g.b)+len(sr.draws)*drawBytes), uint64(len(g.b)))}
	d.b = append(d.b, g.b...)
	for k := range sr.draws {
		d.split(&sr.draws[k].split)
		d.float(sr.draws[k].so4)
		d.float(sr.draws[k].w)
	}
	return d.b
}

// drawBytes is the size of a kept draw as it travels: its split, the
// sulfide sulfate and the weight, each as the 8 bytes of its bits.
const drawBytes = (int(NSources)*NCations + 2) * 8
