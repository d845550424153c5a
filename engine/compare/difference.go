package compare

import (
	"math"
	"sort"

	"lixiv/engine/flux"
	"lixiv/engine/internal/quantile"
)

// Design says how the budgets of a comparison combine.
type Design int

// The designs.
const (
	// TreatedControl is treated − control over the same period.
	TreatedControl Design = iota
	// BACI is (after − before) treated − (after − before) control.
	BACI
)

// String names the design as the notebook's settings do.
func (d Design) String() string {
	if d == BACI {
		return "before-after-control-impact"
	}
	return "treated-control"
}

// Formula writes the difference the design takes.
func (d Design) Formula() string {
	if d == BACI {
		return "(after − before) treated − (after − before) control"
	}
	return "treated − control"
}

// Budgets returns the number of budgets the design combines: 2 or 4.
func (d Design) Budgets() int {
	if d == BACI {
		return 4
	}
	return 2
}

// Signs returns the sign each budget takes in the difference, for budgets in
// the order treated (after), control (after), treated before, control
// before.
func (d Design) Signs() []float64 {
	if d == BACI {
		return []float64{1, -1, -1, 1}
	}
	return []float64{1, -1}
}

// Combine returns the design's difference of one value of each budget.
func (d Design) Combine(v []float64) float64 {
	s := 0.0
	for b, sg := range d.Signs() {
		s += sg * v[b]
	}
	return s
}

// Difference is a difference with its uncertainty: the point value (from
// the budgets' point estimates), the median and 95 % interval of its
// replicates, and the share of replicates above zero.
type Difference struct {
	Point, Median, Low, High float64
	// Above is P(D > 0), the share of replicates above zero (NaN without
	// replicates).
	Above      float64
	Replicates int // replicates with a value
}

// Summarise returns the difference with point value point and replicates
// reps (NaN replicates, from failed fits, left out).
func Summarise(point float64, reps []float64) Difference {
	iv := flux.Summary(reps)
	d := Difference{Point: point, Median: iv.Median, Low: iv.Lo, High: iv.Hi, Above: math.NaN()}
	above := 0
	for _, x := range reps {
		if !math.IsNaN(x) {
			d.Replicates++
			if x > 0 {
				above++
			}
		}
	}
	if d.Replicates > 0 {
		d.Above = float64(above) / float64(d.Replicates)
	}
	return d
}

// Detected reports whether the 95 % interval excludes zero.
func (d Difference) Detected() bool { return d.Low > 0 || d.High < 0 }

// Scaled returns the difference with every value times k > 0 (a change of
// unit: mol/km²/yr to t CO2/yr over a catchment, say).
func (d Difference) Scaled(k float64) Difference {
	d.Point, d.Median, d.Low, d.High = d.Point*k, d.Median*k, d.Low*k, d.High*k
	return d
}

// quantileOf returns the p-quantile of the non-NaN values of v (type 7).
func quantileOf(v []float64, p float64) float64 {
	s := make([]float64, 0, len(v))
	for _, x := range v {
		if !math.IsNaN(x) {
			s = append(s, x)
		}
	}
	sort.Float64s(s)
	return quantile.Sorted(s, p)
}
