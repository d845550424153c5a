package plot

import "math"

// Axis maps data values onto a pixel range, linearly or by log10.
type Axis struct {
	Label    string  // axis title, with its unit, such as "Q (m³/s)"
	Log      bool    // logarithmic (base 10)
	Min, Max float64 // data range; set by the series added, or fixed by the caller
	Fixed    bool    // keep Min and Max as set
	Time     bool    // values are days since 1970-01-01; ticks show dates
	Names    []string

	lo, hi float64 // pixel range
	seen   bool
}

// include widens the axis to hold v (ignored when fixed, not finite, or
// not positive on a log axis).
func (a *Axis) include(v float64) {
	if a.Fixed || math.IsNaN(v) || math.IsInf(v, 0) || (a.Log && v <= 0) {
		return
	}
	if !a.seen {
		a.Min, a.Max, a.seen = v, v, true
		return
	}
	a.Min = math.Min(a.Min, v)
	a.Max = math.Max(a.Max, v)
}

// finish gives the axis a usable range: padded, never empty.
func (a *Axis) finish() {
	if a.Fixed {
		return
	}
	if !a.seen {
		if a.Log {
			a.Min, a.Max = 1, 10
		} else {
			a.Min, a.Max = 0, 1
		}
		return
	}
	if a.Log {
		if a.Max/a.Min < 10 {
			c := math.Sqrt(a.Max * a.Min)
			a.Min, a.Max = c/math.Sqrt(10), c*math.Sqrt(10)
		}
		a.Min = math.Pow(10, math.Floor(math.Log10(a.Min)*4)/4)
		a.Max = math.Pow(10, math.Ceil(math.Log10(a.Max)*4)/4)
		return
	}
	if a.Max == a.Min {
		d := math.Max(math.Abs(a.Max)*0.1, 1)
		a.Min, a.Max = a.Min-d, a.Max+d
		return
	}
	pad := (a.Max - a.Min) * 0.05
	if a.Min >= 0 && a.Min-pad < 0 {
		a.Min = 0
	} else {
		a.Min -= pad
	}
	a.Max += pad
}

// Map returns the pixel position of v; NaN when v cannot be shown.
func (a *Axis) Map(v float64) float64 {
	if a.Log {
		if v <= 0 {
			return math.NaN()
		}
		return a.lo + (math.Log10(v)-math.Log10(a.Min))/(math.Log10(a.Max)-math.Log10(a.Min))*(a.hi-a.lo)
	}
	return a.lo + (v-a.Min)/(a.Max-a.Min)*(a.hi-a.lo)
}

// Tick is one labelled mark on an axis.
type Tick struct {
	Value float64
	Label string
	Minor bool
}

// Ticks returns the axis marks: decades (with 2 and 5 between when the
// range is short) on a log axis, round steps on a linear one, months or
// years on a time axis.
func (a *Axis) Ticks() []Tick {
	if a.Names != nil {
		var t []Tick
		for i, n := range a.Names {
			t = append(t, Tick{Value: float64(i), Label: n})
		}
		return t
	}
	if a.Time {
		return timeTicks(a.Min, a.Max)
	}
	if a.Log {
		var t []Tick
		lo, hi := math.Floor(math.Log10(a.Min)), math.Ceil(math.Log10(a.Max))
		few := hi-lo <= 2
		for e := lo; e <= hi; e++ {
			d := math.Pow(10, e)
			for _, m := range []float64{1, 2, 3, 4, 5, 6, 7, 8, 9} {
				v := m * d
				if v < a.Min*(1-1e-9) || v > a.Max*(1+1e-9) {
					continue
				}
				lab := m == 1 || (few && (m == 2 || m == 5))
				t = append(t, Tick{Value: v, Minor: !lab})
			}
		}
		return labelTicks(t)
	}
	step := niceStep((a.Max - a.Min) / 5)
	var t []Tick
	for v := math.Ceil(a.Min/step) * step; v <= a.Max+step*1e-9; v += step {
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		t = append(t, Tick{Value: v})
	}
	return labelTicks(t)
}

// labelTicks writes the labels of the major ticks in one notation.
func labelTicks(t []Tick) []Tick {
	var vs []float64
	for _, tk := range t {
		if !tk.Minor {
			vs = append(vs, tk.Value)
		}
	}
	labels := TickLabels(vs)
	k := 0
	for i := range t {
		if !t[i].Minor {
			t[i].Label = labels[k]
			k++
		}
	}
	return t
}

// niceStep rounds x to 1, 2 or 5 times a power of ten.
func niceStep(x float64) float64 {
	if x <= 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return 1
	}
	p := math.Pow(10, math.Floor(math.Log10(x)))
	switch f := x / p; {
	case f < 1.5:
		return p
	case f < 3.5:
		return 2 * p
	case f < 7.5:
		return 5 * p
	}
	return 10 * p
}
