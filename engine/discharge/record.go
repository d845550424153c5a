package discharge

import (
	"errors"
	"fmt"
	"math"
)

// Record is a daily discharge record: one daily mean discharge in m³/s for
// every day from Days[0] to Days[len(Days)-1], NaN on days with no value
// (gaps). Days are consecutive. Filled marks days whose value came from gap
// filling, not from the input.
type Record struct {
	Name   string    // file or station name, for messages
	Days   []Day     // consecutive days
	Q      []float64 // daily mean discharge, m³/s; NaN for a gap
	Filled []bool    // true where Fill supplied the value; nil if nothing was filled
}

// NewRecord returns a record of consecutive days starting at first, with the
// given daily discharges (m³/s, NaN for gaps). q is used, not copied.
func NewRecord(name string, first Day, q []float64) *Record {
	days := make([]Day, len(q))
	for i := range days {
		days[i] = first + Day(i)
	}
	return &Record{Name: name, Days: days, Q: q}
}

// Len returns the number of days the record spans, gaps included.
func (r *Record) Len() int { return len(r.Days) }

// First returns the first day of the record.
func (r *Record) First() Day { return r.Days[0] }

// Last returns the last day of the record.
func (r *Record) Last() Day { return r.Days[len(r.Days)-1] }

// Index returns the position of d in the record, or -1 when d lies outside.
func (r *Record) Index(d Day) int {
	if len(r.Days) == 0 || d < r.Days[0] || d > r.Days[len(r.Days)-1] {
		return -1
	}
	return int(d - r.Days[0])
}

// Errors returned by At.
var (
	ErrOutside = errors.New("date outside the discharge record")
	ErrGap     = errors.New("no discharge on that day (gap)")
)

// At returns the daily discharge (m³/s) on day d: the value a water sample
// taken on d is matched to. It returns an error wrapping ErrOutside when d
// lies outside the record, naming the record's span, and one wrapping ErrGap
// when d falls in an unfilled gap.
func (r *Record) At(d Day) (float64, error) {
	i := r.Index(d)
	if i < 0 {
		if len(r.Days) == 0 {
			return math.NaN(), fmt.Errorf("%s: %w (the record is empty)", d, ErrOutside)
		}
		return math.NaN(), fmt.Errorf("%s: %w (%s to %s)", d, ErrOutside, r.First(), r.Last())
	}
	q := r.Q[i]
	if math.IsNaN(q) {
		return q, fmt.Errorf("%s: %w", d, ErrGap)
	}
	return q, nil
}

// Span is a run of consecutive days, First to Last inclusive.
type Span struct {
	First, Last Day
}

// Days returns the number of days in the span.
func (s Span) Days() int { return int(s.Last-s.First) + 1 }

// String formats the span as "2021-03-04 to 2021-03-06 (3 days)".
func (s Span) String() string {
	if s.First == s.Last {
		return fmt.Sprintf("%s (1 day)", s.First)
	}
	return fmt.Sprintf("%s to %s (%d days)", s.First, s.Last, s.Days())
}

// Gaps lists the runs of days with no discharge, in date order.
func (r *Record) Gaps() []Span {
	var out []Span
	for i := 0; i < len(r.Q); i++ {
		if !math.IsNaN(r.Q[i]) {
			continue
		}
		j := i
		for j+1 < len(r.Q) && math.IsNaN(r.Q[j+1]) {
			j++
		}
		out = append(out, Span{r.Days[i], r.Days[j]})
		i = j
	}
	return out
}

// Missing returns the number of gap days.
func (r *Record) Missing() int {
	n := 0
	for _, q := range r.Q {
		if math.IsNaN(q) {
			n++
		}
	}
	return n
}

// FillMethod is how gaps are filled. The zero value, NoFill, leaves them.
type FillMethod int

// Gap-filling methods.
const (
	NoFill     FillMethod = iota // leave gaps as NaN
	FillLinear                   // linear interpolation in time between the days either side
)

// FillReport says what Fill did.
type FillReport struct {
	Method FillMethod
	MaxGap int    // longest gap, in days, the method was allowed to fill
	Filled []Span // gaps that were filled
	Left   []Span // gaps left open: longer than MaxGap, or at an end of the record
	Days   int    // number of days filled
}

// Fraction returns the share of the record's days that were filled.
func (f FillReport) Fraction(recordDays int) float64 {
	if recordDays == 0 {
		return 0
	}
	return float64(f.Days) / float64(recordDays)
}

// Fill returns a copy of the record with gaps of at most maxDays days filled
// by method, and a report of what was filled and what was left. Gaps at the
// start or end of the record have only one neighbour and are never filled.
// NoFill returns an unchanged copy. The receiver is not modified.
func (r *Record) Fill(method FillMethod, maxDays int) (*Record, FillReport) {
	out := &Record{Name: r.Name, Days: r.Days, Q: append([]float64(nil), r.Q...)}
	out.Filled = make([]bool, len(r.Q))
	if r.Filled != nil {
		copy(out.Filled, r.Filled)
	}
	rep := FillReport{Method: method, MaxGap: maxDays}
	for _, g := range r.Gaps() {
		i, j := r.Index(g.First), r.Index(g.Last)
		if method != FillLinear || g.Days() > maxDays || i == 0 || j == len(r.Q)-1 {
			rep.Left = append(rep.Left, g)
			continue
		}
		q0, q1 := r.Q[i-1], r.Q[j+1]
		n := float64(j - i + 2)
		for k := i; k <= j; k++ {
			t := float64(k-i+1) / n
			out.Q[k] = q0 + (q1-q0)*t
			out.Filled[k] = true
		}
		rep.Filled = append(rep.Filled, g)
		rep.Days += g.Days()
	}
	return out, rep
}

// Exceedance returns the share of days with a value whose discharge is at
// least q: its place on the flow-duration curve (0.05 for the flow exceeded
// on 5 % of days). It is NaN for a record without values.
func (r *Record) Exceedance(q float64) float64 {
	n, above := 0, 0
	for _, v := range r.Q {
		if math.IsNaN(v) {
			continue
		}
		n++
		if v >= q {
			above++
		}
	}
	if n == 0 {
		return math.NaN()
	}
	return float64(above) / float64(n)
}
