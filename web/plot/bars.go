package plot

import (
	"fmt"
	"math"
	"strings"
)

// Segment is one part of a stacked bar chart: a value per category, with an
// optional interval per category (NaN or nil for none).
type Segment struct {
	Name          string
	Style         Style
	Value, Lo, Hi []float64
}

// Bars adds bars over categorical x positions, one bar per category,
// its segments stacked in order. A segment's interval is drawn as a whisker
// on the segment's top edge, shifted with it, so the bar reads "median
// share, and the 95 % range of this source alone".
func (c *Chart) Bars(categories []string, segs []Segment) {
	c.X.Names = categories
	c.X.Fixed = true
	c.X.Min, c.X.Max = -0.6, float64(len(categories))-0.4
	c.items = append(c.items, &bars{cats: categories, segs: segs})
	for _, s := range segs {
		c.legend = append(c.legend, legendEntry{s.Name, s.Style, "box"})
	}
}

type bars struct {
	cats []string
	segs []Segment
	// below stacks the values under zero downwards from zero (Diverging);
	// otherwise they are left out.
	below bool
}

// DivergingBars is Bars for segments that may fall below zero, such as
// amounts dissolved (above) and formed (below): each category's values
// above zero stack upwards from zero and those below zero downwards.
func (c *Chart) DivergingBars(categories []string, segs []Segment) {
	c.Bars(categories, segs)
	c.items[len(c.items)-1].(*bars).below = true
}

// base returns where segment value v of a category starts, given the
// running tops of its stacks above and below zero, and moves them.
func (br *bars) base(v float64, up, down *float64) float64 {
	if v < 0 && br.below {
		b := *down
		*down += v
		return b
	}
	b := *up
	*up += v
	return b
}

// stacked calls f for each segment of category i that is drawn, with its
// value and the base it stands on: positive values stack up from zero,
// negative ones down from it where the bars allow them (others are left
// out). zeros says whether segments of value zero are passed too.
func (br *bars) stacked(i int, zeros bool, f func(s *Segment, v, base float64)) {
	up, down := 0.0, 0.0
	for k := range br.segs {
		s := &br.segs[k]
		v := at(s.Value, i)
		if !finite(v) || v == 0 && !zeros || v < 0 && !br.below {
			continue
		}
		f(s, v, br.base(v, &up, &down))
	}
}

func at(v []float64, i int) float64 {
	if i < len(v) {
		return v[i]
	}
	return nan
}

var nan = func() float64 { var z float64; return z / z }()

// wideInterval is how far above the tallest bar an interval may reach
// before it is cut at the top of the plot (and marked so): one runaway
// bound must not flatten every bar.
const wideInterval = 3.0

func (br *bars) extend(c *Chart) {
	c.Y.include(0)
	top, bottom := 0.0, 0.0
	for i := range br.cats {
		br.stacked(i, true, func(_ *Segment, v, base float64) {
			top, bottom = max(top, base+v), min(bottom, base+v)
		})
	}
	c.Y.include(top)
	c.Y.include(bottom)
	span := top - bottom
	for i := range br.cats {
		br.stacked(i, true, func(s *Segment, _, b float64) {
			if hi := at(s.Hi, i); finite(hi) && (span <= 0 || b+hi <= bottom+wideInterval*span) {
				c.Y.include(b + hi)
			}
			if lo := at(s.Lo, i); br.below && finite(lo) && (span <= 0 || b+lo >= top-wideInterval*span) {
				c.Y.include(b + lo)
			}
		})
	}
}

func (br *bars) draw(b *strings.Builder, c *Chart) {
	n := len(br.cats)
	if n == 0 {
		return
	}
	step := (c.X.hi - c.X.lo) / (c.X.Max - c.X.Min)
	bw := step * 0.6
	if bw > 60 {
		bw = 60
	}
	for i := range br.cats {
		x := c.X.Map(float64(i))
		br.stacked(i, false, func(s *Segment, v, base float64) {
			y0, y1 := c.Y.Map(base), c.Y.Map(base+v)
			if finite(y0, y1) {
				fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s" stroke="%s" stroke-width="1"><title>%s: %s</title></rect>`,
					x-bw/2, math.Min(y0, y1), bw, math.Abs(y0-y1), c.hatchURL(s.Style), s.Style.Colour, esc(br.cats[i]+" "+s.Name), Number(v))
			}
		})
		br.stacked(i, false, func(s *Segment, _, base float64) {
			lo, hi := at(s.Lo, i), at(s.Hi, i)
			if finite(lo, hi) {
				ylo, yhi := c.Y.Map(base+lo), c.Y.Map(base+hi)
				if yhi > ylo { // a bar below zero: its whisker runs downwards
					ylo, yhi = yhi, ylo
				}
				xw := x + bw/2 - 6
				if bw < 10 { // narrow bars: a plain line, clipped at the plot's edge
					fmt.Fprintf(b, `<path d="M%.1f,%.1fV%.1f" stroke="#111" stroke-width="0.8" fill="none"/>`, x, math.Min(ylo, c.Y.lo), math.Max(yhi, c.Y.hi))
				} else if yhi < c.Y.hi { // cut at the top: an open arrow says the bound is off the plot
					yhi = c.Y.hi
					fmt.Fprintf(b, `<path d="M%.1f,%.1fV%.1fM%.1f,%.1fh8M%.1f,%.1fl4,-7l4,7" stroke="#111" stroke-width="1.2" fill="none"><title>upper bound %s, off the plot</title></path>`,
						xw, ylo, yhi+1, xw-4, ylo, xw-4, yhi+8, esc(Number(base+hi)))
				} else {
					fmt.Fprintf(b, `<path d="M%.1f,%.1fV%.1fM%.1f,%.1fh8M%.1f,%.1fh8" stroke="#111" stroke-width="1.2" fill="none"/>`,
						xw, ylo, yhi, xw-4, ylo, xw-4, yhi)
				}
			}
		})
	}
}
