package mix

import (
	"encoding/binary"
	"errors"
	"math"
)

// The summary of a sample travels between runs in a plain binary form of
// our own, written and read field by field below: integers as varints,
// floats as the 8 bytes of their bits (NaN and the infinities included),
// strings and slices with their length first, and a slice's length stored
// plus one so that a nil slice comes back nil and an empty one empty. A
// reflection-based encoder would do the same for a large part of the
// page's download.

// wireWriter appends the fields of a sample's summary to b.
type wireWriter struct{ b []byte }

func (w *wireWriter) int(x int) { w.b = binary.AppendVarint(w.b, int64(x)) }
func (w *wireWriter) float(x float64) {
	w.b = binary.LittleEndian.AppendUint64(w.b, math.Float64bits(x))
}
func (w *wireWriter) bool(x bool) {
	if x {
		w.b = append(w.b, 1)
	} else {
		w.b = append(w.b, 0)
	}
}
func (w *wireWriter) string(s string) { w.int(len(s)); w.b = append(w.b, s...) }

// length writes the length of a slice of n elements, nil or not.
func (w *wireWriter) length(n int, isNil bool) {
	if isNil {
		w.int(0)
		return
	}
	w.int(n + 1)
}
func (w *wireWriter) floats(v []float64) {
	w.length(len(v), v == nil)
	for _, x := range v {
		w.float(x)
	}
}
func (w *wireWriter) split(s *Split) {
	for src := range s {
		for _, x := range s[src] {
			w.float(x)
		}
	}
}
func (w *wireWriter) quantiles(q *Quantiles) { w.split(&q.Lo); w.split(&q.Median); w.split(&q.Hi) }

// errWire is the error of bytes that are not a sample's summary.
var errWire = errors.New("not a sample's summary")

// wireReader reads what wireWriter wrote; the first failure sticks in err.
type wireReader struct {
	b   []byte
	err error
}

func (r *wireReader) fail() { r.err, r.b = errWire, nil }
func (r *wireReader) int() int {
	x, k := binary.Varint(r.b)
	if k <= 0 {
		r.fail()
		return 0
	}
	r.b = r.b[k:]
	return int(x)
}
func (r *wireReader) float() float64 {
	if len(r.b) < 8 {
		r.fail()
		return 0
	}
	x := math.Float64frombits(binary.LittleEndian.Uint64(r.b))
	r.b = r.b[8:]
	return x
}
func (r *wireReader) bool() bool {
	if len(r.b) < 1 || r.b[0] > 1 {
		r.fail()
		return false
	}
	x := r.b[0] == 1
	r.b = r.b[1:]
	return x
}
func (r *wireReader) string() string {
	n := r.int()
	if n < 0 || n > len(r.b) {
		r.fail()
		return ""
	}
	s := string(r.b[:n])
	r.b = r.b[n:]
	return s
}

// length reads a slice's length: -1 for nil. Each element takes at least
// one byte, which bounds what bad bytes can make it allocate.
func (r *wireReader) length() int {
	n := r.int() - 1
	if n < -1 || n > len(r.b) {
		r.fail()
		return -1
	}
	return n
}
func (r *wireReader) floats() []float64 {
	n := r.length()
	if n < 0 {
		return nil
	}
	v := make([]float64, n)
	for i := range v {
		v[i] = r.float()
	}
	return v
}
func (r *wireReader) split(s *Split) {
	for src := range s {
		for c := range s[src] {
			s[src][c] = r.float()
		}
	}
}
func (r *wireReader) quantiles(q *Quantiles) { r.split(&q.Lo); r.split(&q.Median); r.split(&q.Hi) }

// writeSummary writes m, every exported field of the sample's result and
// its warnings.
func writeSummary(w *wireWriter, m *sampleWire) {
	s := &m.Result
	w.string(s.Name)
	w.int(int(s.Status))
	w.string(s.Verdict)
	w.bool(s.WellSampled)
	w.bool(s.PriorDecided)
	w.float(s.NoRock)
	w.int(s.Draws)
	w.int(s.Stages)
	w.int(int(s.Stop))
	w.float(s.ESS)
	w.float(s.PPP)
	w.length(len(s.Alpha), s.Alpha == nil)
	for _, a := range s.Alpha {
		w.float(a.Lo)
		w.float(a.Median)
		w.float(a.Hi)
	}
	w.floats(s.PriorWidth)
	w.length(len(s.Corr), s.Corr == nil)
	for _, row := range s.Corr {
		w.floats(row)
	}
	w.quantiles(&s.Amount)
	w.quantiles(&s.Share)
	w.bool(s.Misfit != nil)
	if f := s.Misfit; f != nil {
		w.int(int(f.Tracer))
		for _, x := range []float64{f.Measured, f.Fitted, f.Lo, f.Hi, f.Z} {
			w.float(x)
		}
		w.string(f.Text)
	}
	w.length(len(s.Bounds), s.Bounds == nil)
	for _, b := range s.Bounds {
		w.int(b.EndMember)
		w.int(int(b.Tracer))
		w.bool(b.Upper)
		w.float(b.Limit)
		w.float(b.Median)
	}
	w.length(len(s.Active), s.Active == nil)
	for _, a := range s.Active {
		w.bool(a)
	}
	w.length(len(m.Warnings), m.Warnings == nil)
	for _, e := range m.Warnings {
		w.string(e.Text)
		w.int(e.Sentinel)
	}
}

// readSummary reads what writeSummary wrote into m.
func readSummary(r *wireReader, m *sampleWire) error {
	s := &m.Result
	s.Name = r.string()
	s.Status = Status(r.int())
	s.Verdict = r.string()
	s.WellSampled = r.bool()
	s.PriorDecided = r.bool()
	s.NoRock = r.float()
	s.Draws = r.int()
	s.Stages = r.int()
	s.Stop = Stop(r.int())
	s.ESS = r.float()
	s.PPP = r.float()
	if n := r.length(); n >= 0 {
		s.Alpha = make([]Interval, n)
		for i := range s.Alpha {
			s.Alpha[i] = Interval{Lo: r.float(), Median: r.float(), Hi: r.float()}
		}
	}
	s.PriorWidth = r.floats()
	if n := r.length(); n >= 0 {
		s.Corr = make([][]float64, n)
		for i := range s.Corr {
			s.Corr[i] = r.floats()
		}
	}
	r.quantiles(&s.Amount)
	r.quantiles(&s.Share)
	if r.bool() {
		f := &Misfit{Tracer: Tracer(r.int())}
		f.Measured, f.Fitted, f.Lo, f.Hi, f.Z = r.float(), r.float(), r.float(), r.float(), r.float()
		f.Text = r.string()
		s.Misfit = f
	}
	if n := r.length(); n >= 0 {
		s.Bounds = make([]Bound, n)
		for i := range s.Bounds {
			b := &s.Bounds[i]
			b.EndMember, b.Tracer, b.Upper = r.int(), Tracer(r.int()), r.bool()
			b.Limit, b.Median = r.float(), r.float()
		}
	}
	if n := r.length(); n >= 0 {
		s.Active = make([]bool, n)
		for i := range s.Active {
			s.Active[i] = r.bool()
		}
	}
	if n := r.length(); n >= 0 {
		m.Warnings = make([]wireError, n)
		for i := range m.Warnings {
			m.Warnings[i] = wireError{Text: r.string(), Sentinel: r.int()}
		}
	}
	if r.err == nil && len(r.b) != 0 {
		r.fail()
	}
	return r.err
}
