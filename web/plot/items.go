package plot

import (
	"fmt"
	"math"
	"strings"
)

// Points adds a scatter series: one marker per (x, y) pair that both axes
// can show. Hover titles name each point when names is given.
func (c *Chart) Points(name string, s Style, xs, ys []float64, names []string) {
	c.items = append(c.items, &points{s: s, xs: xs, ys: ys, names: names})
	c.legend = append(c.legend, legendEntry{name, s, "marker"})
}

// Line adds a polyline through the (x, y) pairs; a gap (NaN) breaks it.
func (c *Chart) Line(name string, s Style, xs, ys []float64) {
	c.items = append(c.items, &line{s: s, xs: xs, ys: ys})
	if name != "" {
		c.legend = append(c.legend, legendEntry{name, s, "line"})
	}
}

// Box adds a hatched rectangle spanning [x0, x1] × [y0, y1], such as an
// end-member's prior range, labelled inside its bottom left corner (sample
// clouds of a mixing diagram tend to lie above or to the right of a range).
func (c *Chart) Box(name string, s Style, x0, x1, y0, y1 float64) {
	c.items = append(c.items, &box{name: name, s: s, x0: x0, x1: x1, y0: y0, y1: y1})
	c.legend = append(c.legend, legendEntry{name, s, "box"})
}

// Interval adds vertical error bars: at each x, a whisker from lo to hi
// and a marker at mid.
func (c *Chart) Interval(name string, s Style, xs, mid, lo, hi []float64) {
	c.items = append(c.items, &interval{s: s, xs: xs, mid: mid, lo: lo, hi: hi})
	if name != "" {
		c.legend = append(c.legend, legendEntry{name, s, "marker"})
	}
}

// Rug adds short upward ticks at the bottom of the plot, one per x (such
// as the days a sample was taken), in the style's marker.
func (c *Chart) Rug(name string, s Style, xs []float64) {
	c.items = append(c.items, &rug{s: s, xs: xs})
	c.legend = append(c.legend, legendEntry{name, s, "marker"})
}

type points struct {
	s      Style
	xs, ys []float64
	names  []string
}

func (p *points) extend(c *Chart) { c.includeXY(p.xs, p.ys) }

// includeXY widens the axes to the finite pairs of xs and ys.
func (c *Chart) includeXY(xs, ys []float64) {
	for i := range xs {
		if i < len(ys) && finite(xs[i], ys[i]) {
			c.X.include(xs[i])
			c.Y.include(ys[i])
		}
	}
}

func (p *points) draw(b *strings.Builder, c *Chart) {
	for i := range p.xs {
		if i >= len(p.ys) {
			break
		}
		x, y := c.X.Map(p.xs[i]), c.Y.Map(p.ys[i])
		if !finite(x, y) {
			continue
		}
		if i < len(p.names) && p.names[i] != "" {
			b.WriteString(`<g><title>` + esc(p.names[i]) + `</title>`)
			marker(b, p.s, x, y, 4)
			b.WriteString(`</g>`)
		} else {
			marker(b, p.s, x, y, 4)
		}
	}
}

type line struct {
	s      Style
	xs, ys []float64
}

func (l *line) extend(c *Chart) { c.includeXY(l.xs, l.ys) }

func (l *line) draw(b *strings.Builder, c *Chart) {
	var d strings.Builder
	pen := false
	for i := range l.xs {
		if i >= len(l.ys) {
			break
		}
		x, y := c.X.Map(l.xs[i]), c.Y.Map(l.ys[i])
		if !finite(x, y) {
			pen = false
			continue
		}
		if pen {
			fmt.Fprintf(&d, "L%.1f,%.1f", x, y)
		} else {
			fmt.Fprintf(&d, "M%.1f,%.1f", x, y)
			pen = true
		}
	}
	if d.Len() == 0 {
		return
	}
	fmt.Fprintf(b, `<path d="%s" fill="none" stroke="%s" stroke-width="1.6" stroke-dasharray="%s" stroke-linejoin="round"/>`, d.String(), l.s.Colour, l.s.Dash)
}

type box struct {
	name           string
	s              Style
	x0, x1, y0, y1 float64
}

func (bx *box) extend(c *Chart) {
	c.X.include(bx.x0)
	c.X.include(bx.x1)
	c.Y.include(bx.y0)
	c.Y.include(bx.y1)
}

func (bx *box) draw(b *strings.Builder, c *Chart) {
	x0, x1 := c.X.Map(bx.x0), c.X.Map(bx.x1)
	y0, y1 := c.Y.Map(bx.y0), c.Y.Map(bx.y1)
	if !finite(x0, x1, y0, y1) {
		return
	}
	l, r := math.Min(x0, x1), math.Max(x0, x1)
	t, bt := math.Min(y0, y1), math.Max(y0, y1)
	fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s" fill-opacity="0.6" stroke="%s" stroke-width="1.2" stroke-dasharray="%s"/>`,
		l, t, math.Max(r-l, 1), math.Max(bt-t, 1), c.hatchURL(bx.s), bx.s.Colour, bx.s.Dash)
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" font-size="12" fill="#111" stroke="#fff" stroke-width="3" paint-order="stroke">%s</text>`, l+3, bt-4, esc(bx.name))
}

type interval struct {
	s               Style
	xs, mid, lo, hi []float64
}

func (iv *interval) extend(c *Chart) {
	for i, x := range iv.xs {
		c.X.include(x)
		for _, v := range []([]float64){iv.mid, iv.lo, iv.hi} {
			if i < len(v) {
				c.Y.include(v[i])
			}
		}
	}
}

func (iv *interval) draw(b *strings.Builder, c *Chart) {
	for i, xv := range iv.xs {
		x := c.X.Map(xv)
		if !finite(x) {
			continue
		}
		if i < len(iv.lo) && i < len(iv.hi) {
			lo, hi := c.Y.Map(iv.lo[i]), c.Y.Map(iv.hi[i])
			if finite(lo, hi) {
				fmt.Fprintf(b, `<path d="M%.1f,%.1fV%.1fM%.1f,%.1fh8M%.1f,%.1fh8" stroke="%s" stroke-width="1.3" fill="none"/>`,
					x, lo, hi, x-4, lo, x-4, hi, iv.s.Colour)
			}
		}
		if i < len(iv.mid) {
			if y := c.Y.Map(iv.mid[i]); finite(y) {
				marker(b, iv.s, x, y, 4)
			}
		}
	}
}

type rug struct {
	s  Style
	xs []float64
}

func (r *rug) extend(c *Chart) {
	for _, x := range r.xs {
		c.X.include(x)
	}
}

func (r *rug) draw(b *strings.Builder, c *Chart) {
	for _, xv := range r.xs {
		x := c.X.Map(xv)
		if !finite(x) {
			continue
		}
		marker(b, r.s, x, c.Y.lo-6, 4)
	}
}
