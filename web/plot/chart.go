package plot

import (
	"fmt"
	"html"
	"math"
	"strings"
)

// Chart is one figure: two axes and what is drawn on them.
type Chart struct {
	ID     string // prefix for ids inside the SVG (patterns); unique on the page
	Title  string
	Width  float64 // pixels; 0 means 640
	Height float64 // pixels; 0 means 380
	X, Y   Axis
	Note   string // a line under the chart, such as a fit equation
	// StaggerLabels lets the labels of a category axis alternate between
	// two rows when one row would thin them and two give every label
	// room; the plot then gives up a row of height to the second row, and
	// the axis title moves below it.
	StaggerLabels bool
	// MinStep is the least room, in pixels, for each category of a
	// category axis: with many categories the chart grows wider than
	// Width (and is marked "wide", for the page to scroll it sideways)
	// rather than thin its bars to hairlines. 0 means no least room.
	MinStep float64

	items  []item
	legend []legendEntry
}

type item interface {
	extend(c *Chart)
	draw(b *strings.Builder, c *Chart)
}

type legendEntry struct {
	name  string
	style Style
	kind  string // "marker", "line", "box"
}

// New returns an empty chart with the given title and axis labels.
func New(id, title, xLabel, yLabel string) *Chart {
	return &Chart{ID: id, Title: title, X: Axis{Label: xLabel}, Y: Axis{Label: yLabel}}
}

// Empty reports whether nothing has been added.
func (c *Chart) Empty() bool { return len(c.items) == 0 }

const (
	marginLeft   = 86.0
	marginRight  = 16.0
	marginTop    = 34.0
	marginBottom = 52.0
	legendRow    = 18.0
)

func (c *Chart) size() (w, h float64, wide bool) {
	w, h = c.Width, c.Height
	if w <= 0 {
		w = 640
	}
	if h <= 0 {
		h = 380
	}
	if need := marginLeft + marginRight + c.MinStep*float64(len(c.X.Names)); c.X.Names != nil && need > w {
		w, wide = math.Ceil(need), true
	}
	return w, h, wide
}

// Wide reports whether the chart grows beyond its Width to give each
// category MinStep pixels (call after the series are added).
func (c *Chart) Wide() bool {
	_, _, wide := c.size()
	return wide
}

// SVG returns the drawing as an SVG document fragment.
func (c *Chart) SVG() string {
	for _, it := range c.items {
		it.extend(c)
	}
	c.X.finish()
	c.Y.finish()
	w, h, wide := c.size()
	class := "chart"
	if wide {
		class = "chart wide"
	}
	rows := c.legendRows(w)
	plotBottom := h - marginBottom - float64(rows)*legendRow - 4
	if c.Note != "" {
		plotBottom -= legendRow
	}
	c.X.lo, c.X.hi = marginLeft, w-marginRight
	stagger := c.staggered()
	if stagger {
		plotBottom -= staggerRow // the second row of labels
	}
	c.Y.lo, c.Y.hi = plotBottom, marginTop

	var b strings.Builder
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" class="%s" viewBox="0 0 %g %g" width="%g" height="%g" role="img" aria-label="%s" font-family="Helvetica, Arial, sans-serif" font-size="12">`,
		class, w, h, w, h, esc(c.Title))
	b.WriteString(`<title>` + esc(c.Title) + `</title>`)
	c.defs(&b)
	fmt.Fprintf(&b, `<rect x="0" y="0" width="%g" height="%g" fill="#ffffff"/>`, w, h)
	fmt.Fprintf(&b, `<text x="%g" y="20" font-size="14" font-weight="bold" fill="#111">%s</text>`, marginLeft, esc(c.Title))
	c.drawAxes(&b, plotBottom, stagger)
	fmt.Fprintf(&b, `<clipPath id="%s-clip"><rect x="%g" y="%g" width="%g" height="%g"/></clipPath>`,
		c.ID, c.X.lo, c.Y.hi, c.X.hi-c.X.lo, c.Y.lo-c.Y.hi)
	fmt.Fprintf(&b, `<g clip-path="url(#%s-clip)">`, c.ID)
	for _, it := range c.items {
		it.draw(&b, c)
	}
	b.WriteString(`</g>`)
	legendTop := plotBottom + marginBottom + 6
	if stagger {
		legendTop += staggerRow
	}
	c.drawLegend(&b, legendTop, w)
	if c.Note != "" {
		fmt.Fprintf(&b, `<text x="%g" y="%g" fill="#333">%s</text>`, marginLeft, h-8, esc(c.Note))
	}
	b.WriteString(`</svg>`)
	return b.String()
}

func (c *Chart) defs(b *strings.Builder) {
	b.WriteString(`<defs>`)
	for i, s := range Styles {
		id := fmt.Sprintf("%s-h%d", c.ID, i)
		fmt.Fprintf(b, `<pattern id="%s" patternUnits="userSpaceOnUse" width="8" height="8">`, id)
		fmt.Fprintf(b, `<rect width="8" height="8" fill="#ffffff"/>`)
		switch s.Hatch {
		case "solid":
			fmt.Fprintf(b, `<rect width="8" height="8" fill="%s" fill-opacity="0.55"/>`, s.Colour)
		case "diagonal":
			fmt.Fprintf(b, `<path d="M-2,2 l4,-4 M0,8 l8,-8 M6,10 l4,-4" stroke="%s" stroke-width="1.4"/>`, s.Colour)
		case "back":
			fmt.Fprintf(b, `<path d="M-2,6 l4,4 M0,0 l8,8 M6,-2 l4,4" stroke="%s" stroke-width="1.4"/>`, s.Colour)
		case "dots":
			fmt.Fprintf(b, `<circle cx="2" cy="2" r="1.5" fill="%s"/><circle cx="6" cy="6" r="1.5" fill="%s"/>`, s.Colour, s.Colour)
		case "cross":
			fmt.Fprintf(b, `<path d="M0,4 h8 M4,0 v8" stroke="%s" stroke-width="1.2"/>`, s.Colour)
		case "horizontal":
			fmt.Fprintf(b, `<path d="M0,2 h8 M0,6 h8" stroke="%s" stroke-width="1.2"/>`, s.Colour)
		}
		b.WriteString(`</pattern>`)
	}
	b.WriteString(`</defs>`)
}

// hatchURL returns the fill of style s.
func (c *Chart) hatchURL(s Style) string {
	for i, t := range Styles {
		if t == s {
			return fmt.Sprintf("url(#%s-h%d)", c.ID, i)
		}
	}
	return s.Colour
}

// staggerRow is the height of the second row of staggered labels.
const staggerRow = 15.0

// labelRoom is the width each category label of the x axis has.
func (c *Chart) labelRoom(xt []Tick) float64 {
	return (c.X.hi - c.X.lo) / float64(len(xt)+1)
}

// staggered reports whether the category labels of the x axis take two
// rows: one row would thin them and two give every label room
// (StaggerLabels). Call it once the x axis spans the plot.
func (c *Chart) staggered() bool {
	if c.X.Names == nil || !c.StaggerLabels {
		return false
	}
	xt := c.X.Ticks()
	room := c.labelRoom(xt)
	return thinned(xt, room) && !thinned(xt, 2*room)
}

// drawAxes draws the frame, ticks, labels and axis titles; stagger puts
// the category labels in two rows (staggered).
func (c *Chart) drawAxes(b *strings.Builder, bottom float64, stagger bool) {
	x0, x1, y0, y1 := c.X.lo, c.X.hi, c.Y.hi, c.Y.lo
	fmt.Fprintf(b, `<rect x="%g" y="%g" width="%g" height="%g" fill="none" stroke="#444" stroke-width="1"/>`, x0, y0, x1-x0, y1-y0)
	xt := c.X.Ticks()
	if c.X.Names != nil && !stagger {
		xt = thinLabels(xt, c.labelRoom(xt))
	}
	for i, t := range xt {
		px := c.X.Map(t.Value)
		if offSpan(px, x0, x1) {
			continue
		}
		if !t.Minor {
			fmt.Fprintf(b, `<line x1="%.1f" y1="%g" x2="%.1f" y2="%g" stroke="#ddd" stroke-width="0.6"/>`, px, y0, px, y1)
		}
		fmt.Fprintf(b, `<line x1="%.1f" y1="%g" x2="%.1f" y2="%g" stroke="#444"/>`, px, y1, px, y1+t.markLength())
		if t.Label != "" {
			y := y1 + 18
			if stagger && i%2 == 1 {
				y += staggerRow
			}
			fmt.Fprintf(b, `<text x="%.1f" y="%g" text-anchor="middle" fill="#222">%s</text>`, px, y, esc(t.Label))
		}
	}
	for _, t := range c.Y.Ticks() {
		py := c.Y.Map(t.Value)
		if offSpan(py, y0, y1) {
			continue
		}
		if !t.Minor {
			fmt.Fprintf(b, `<line x1="%g" y1="%.1f" x2="%g" y2="%.1f" stroke="#ddd" stroke-width="0.6"/>`, x0, py, x1, py)
		}
		fmt.Fprintf(b, `<line x1="%g" y1="%.1f" x2="%g" y2="%.1f" stroke="#444"/>`, x0-t.markLength(), py, x0, py)
		if t.Label != "" {
			fmt.Fprintf(b, `<text x="%g" y="%.1f" text-anchor="end" fill="#222">%s</text>`, x0-8, py+4, esc(t.Label))
		}
	}
	titleY := bottom + 38
	if stagger {
		titleY += staggerRow
	}
	fmt.Fprintf(b, `<text x="%g" y="%g" text-anchor="middle" fill="#111">%s</text>`, (x0+x1)/2, titleY, esc(c.X.Label))
	fmt.Fprintf(b, `<text transform="translate(14 %g) rotate(-90)" text-anchor="middle" fill="#111">%s</text>`, (y0+y1)/2, esc(c.Y.Label))
}

// offSpan reports whether the position p falls outside the plotted span
// [lo, hi] (half a pixel of slack) or is not a number.
func offSpan(p, lo, hi float64) bool { return math.IsNaN(p) || p < lo-0.5 || p > hi+0.5 }

// markLength is the length of t's mark on the axis: shorter for a minor tick.
func (t Tick) markLength() float64 {
	if t.Minor {
		return 3
	}
	return 5
}

func (c *Chart) legendRows(w float64) int {
	if len(c.legend) == 0 {
		return 0
	}
	rows, x := 1, marginLeft
	for _, e := range c.legend {
		ew := legendWidth(e.name)
		if x+ew > w-marginRight && x > marginLeft {
			rows++
			x = marginLeft
		}
		x += ew
	}
	return rows
}

func legendWidth(name string) float64 { return 34 + 6.6*float64(len([]rune(name))) }

func (c *Chart) drawLegend(b *strings.Builder, y, w float64) {
	x := marginLeft
	for _, e := range c.legend {
		ew := legendWidth(e.name)
		if x+ew > w-marginRight && x > marginLeft {
			y += legendRow
			x = marginLeft
		}
		switch e.kind {
		case "box":
			fmt.Fprintf(b, `<rect x="%g" y="%g" width="20" height="11" fill="%s" stroke="%s"/>`, x, y-9, c.hatchURL(e.style), e.style.Colour)
		case "line":
			fmt.Fprintf(b, `<line x1="%g" y1="%g" x2="%g" y2="%g" stroke="%s" stroke-width="2" stroke-dasharray="%s"/>`, x, y-4, x+20, y-4, e.style.Colour, e.style.Dash)
		default:
			marker(b, e.style, x+10, y-4, 4.5)
		}
		fmt.Fprintf(b, `<text x="%g" y="%g" fill="#222">%s</text>`, x+26, y, esc(e.name))
		x += ew
	}
}

// marker draws the marker of style s centred at (x, y).
func marker(b *strings.Builder, s Style, x, y, r float64) {
	fill := s.Colour
	if s.Open {
		fill = "#ffffff"
	}
	att := fmt.Sprintf(`fill="%s" stroke="%s" stroke-width="1.3"`, fill, s.Colour)
	switch s.Marker {
	case "square":
		fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" %s/>`, x-r, y-r, 2*r, 2*r, att)
	case "triangle":
		fmt.Fprintf(b, `<path d="M%.1f,%.1f L%.1f,%.1f L%.1f,%.1f Z" %s/>`, x, y-r*1.2, x+r*1.1, y+r*0.8, x-r*1.1, y+r*0.8, att)
	case "diamond":
		fmt.Fprintf(b, `<path d="M%.1f,%.1f L%.1f,%.1f L%.1f,%.1f L%.1f,%.1f Z" %s/>`, x, y-r*1.3, x+r, y, x, y+r*1.3, x-r, y, att)
	case "cross":
		fmt.Fprintf(b, `<path d="M%.1f,%.1f L%.1f,%.1f M%.1f,%.1f L%.1f,%.1f" stroke="%s" stroke-width="1.6"/>`, x-r, y-r, x+r, y+r, x-r, y+r, x+r, y-r, s.Colour)
	case "plus":
		fmt.Fprintf(b, `<path d="M%.1f,%.1f L%.1f,%.1f M%.1f,%.1f L%.1f,%.1f" stroke="%s" stroke-width="1.6"/>`, x-r, y, x+r, y, x, y-r, x, y+r, s.Colour)
	case "":
	default:
		fmt.Fprintf(b, `<circle cx="%.1f" cy="%.1f" r="%.1f" %s/>`, x, y, r, att)
	}
}

// esc escapes text for SVG: names from files are shown as text, never markup.
func esc(s string) string { return html.EscapeString(s) }

func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// thinLabels keeps every k-th label of a category axis so that labels
// about 7 px a character do not overlap when each has room px.
// thinned reports whether thinLabels would drop a label of t at room.
func thinned(t []Tick, room float64) bool {
	for i, tk := range thinLabels(t, room) {
		if tk.Label != t[i].Label {
			return true
		}
	}
	return false
}

func thinLabels(t []Tick, room float64) []Tick {
	longest := 1
	for _, tk := range t {
		if n := len([]rune(tk.Label)); n > longest {
			longest = n
		}
	}
	k := int(math.Ceil(float64(longest)*7/room + 1e-9))
	if k <= 1 {
		return t
	}
	out := make([]Tick, len(t))
	for i, tk := range t {
		out[i] = Tick{Value: tk.Value, Minor: i%k != 0}
		if i%k == 0 {
			out[i].Label = tk.Label
		}
	}
	return out
}
