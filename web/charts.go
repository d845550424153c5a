package web

import (
	"fmt"
	"math"
	"strings"
	"time"

	"lixiv/engine/notebook"
	"lixiv/web/plot"
)

// ChartCache keeps drawn charts until the document or its results change,
// so that a render of the page does not redraw them.
type ChartCache struct {
	Gen   uint64 // bumped by the page whenever results change
	saved map[string]cachedCharts
}

type cachedCharts struct {
	key   string
	views []ChartView
}

// For returns the charts of cell c, drawing them when needed.
func (cc *ChartCache) For(d *notebook.Document, c *notebook.Cell, o *notebook.Output) []ChartView {
	if cc.saved == nil {
		cc.saved = map[string]cachedCharts{}
	}
	key := fmt.Sprintf("%d/%d/%p", d.Revision(), cc.Gen, o)
	if s, ok := cc.saved[c.ID]; ok && s.key == key {
		return s.views
	}
	var views []ChartView
	for _, ch := range Charts(d, c, o) {
		views = append(views, ChartView{ID: ch.ID, Title: ch.Title, SVG: ch.SVG()})
	}
	cc.saved[c.ID] = cachedCharts{key: key, views: views}
	return views
}

// Charts draws the figures of a computed cell from its outputs and those of
// the cells it reads. A chart whose data are missing is left out.
func Charts(d *notebook.Document, c *notebook.Cell, o *notebook.Output) []*plot.Chart {
	var out []*plot.Chart
	add := func(ch *plot.Chart) {
		if ch != nil && !ch.Empty() {
			out = append(out, ch)
		}
	}
	id := c.ID
	switch c.Kind {
	case notebook.KindSamples:
		add(chargeBalanceChart(id, o))
	case notebook.KindDischarge:
		add(hydrograph(id, d, o))
	case notebook.KindSources:
		add(mixingChart(id+"-mg", d, c, o, "Mg/Na"))
		add(mixingChart(id+"-hco3", d, c, o, "HCO3/Na"))
	case notebook.KindApportionment:
		add(sharesChart(id, o))
	case notebook.KindFluxes:
		add(cqChart(id, o))
		add(figureBars(id+"-bars", "Annual fluxes by source", o, "flux"))
	case notebook.KindCO2:
		add(figureBars(id+"-bars", "CO2 consumption by source", o, "co2"))
	case notebook.KindChart:
		add(userChart(id, d, c))
	}
	return out
}

// column finds a column of t by one of the names (case-insensitive), then
// by a name that starts with one of them.
func column(t *notebook.ResultTable, names ...string) *notebook.Column {
	if t == nil {
		return nil
	}
	for _, n := range names {
		for _, c := range t.Columns {
			if strings.EqualFold(c.Name, n) {
				return c
			}
		}
	}
	for _, n := range names {
		for _, c := range t.Columns {
			if strings.HasPrefix(strings.ToLower(c.Name), strings.ToLower(n)) {
				return c
			}
		}
	}
	return nil
}

// table finds an output table by one of its names, else the first table
// holding all the given columns.
func table(o *notebook.Output, names []string, cols ...string) *notebook.ResultTable {
	if o == nil {
		return nil
	}
	for _, n := range names {
		if t := o.Table(n); t != nil {
			return t
		}
	}
	for _, t := range o.Tables {
		ok := len(cols) > 0
		for _, c := range cols {
			if column(t, c) == nil {
				ok = false
			}
		}
		if ok {
			return t
		}
	}
	return nil
}

func labelWithUnit(name string, c *notebook.Column) string {
	if c != nil && c.Unit != "" {
		return name + " (" + c.Unit + ")"
	}
	return name
}

// days turns a text column of dates into time-axis values (NaN where a
// date does not read).
func days(c *notebook.Column) []float64 {
	if c == nil {
		return nil
	}
	out := make([]float64, c.Len())
	for i := range out {
		out[i] = math.NaN()
		if c.Text != nil {
			s := strings.TrimSpace(c.Text[i])
			if len(s) > 10 {
				s = s[:10]
			}
			if t, err := time.Parse("2006-01-02", s); err == nil {
				out[i] = plot.Day(t)
			}
		} else if c.Num != nil {
			out[i] = c.Num[i]
		}
	}
	return out
}

func texts(c *notebook.Column) []string {
	if c == nil {
		return nil
	}
	if c.Text != nil {
		return c.Text
	}
	out := make([]string, len(c.Num))
	for i, v := range c.Num {
		out[i] = plot.Number(v)
	}
	return out
}

func nums(c *notebook.Column) []float64 {
	if c == nil {
		return nil
	}
	return c.Num
}

// chargeBalanceChart shows each sample's NICB.
func chargeBalanceChart(id string, o *notebook.Output) *plot.Chart {
	t := table(o, []string{"qc", "samples", "normalised"}, "nicb")
	nicb := column(t, "nicb", "nicb_percent")
	if nicb == nil || nicb.Num == nil {
		return nil
	}
	ch := plot.New(id, "Charge balance of each sample", "sample (table order)", labelWithUnit("NICB", nicb))
	xs := make([]float64, len(nicb.Num))
	for i := range xs {
		xs[i] = float64(i + 1)
	}
	ch.Points("samples", plot.StyleN(0), xs, nicb.Num, texts(column(t, "sample", "name", "id")))
	return ch
}

// hydrograph draws the daily discharge with the sample days marked.
func hydrograph(id string, d *notebook.Document, o *notebook.Output) *plot.Chart {
	t := table(o, []string{"daily"}, "date", "discharge")
	date, q := column(t, "date", "day"), column(t, "discharge", "q")
	if date == nil || q == nil || q.Num == nil {
		return nil
	}
	ch := plot.New(id, "Hydrograph", "date", labelWithUnit("discharge", q))
	ch.X.Time = true
	ch.Line("daily discharge", plot.StyleN(0), days(date), q.Num)
	for _, c := range d.Cells {
		if c.Kind != notebook.KindSamples {
			continue
		}
		st := table(d.Output(c.ID), []string{"samples", "normalised"}, "date")
		if sd := days(column(st, "date")); len(sd) > 0 {
			ch.Rug("sample days", plot.StyleN(2), sd)
			break
		}
	}
	return ch
}

// mixingChart draws Ca/Na against another ratio to Na on log axes: the
// samples as points and each end-member's prior range as a hatched box.
func mixingChart(id string, d *notebook.Document, c *notebook.Cell, o *notebook.Output, xRatio string) *plot.Chart {
	ch := plot.New(id, "Mixing diagram: Ca/Na against "+xRatio, xRatio+" (mol/mol)", "Ca/Na (mol/mol)")
	ch.X.Log, ch.Y.Log = true, true
	for i, b := range priorBoxes(table(o, []string{"priors"}, "end-member", "ratio"), xRatio) {
		ch.Box(b.name, plot.StyleN(i+1), b.x0, b.x1, b.y0, b.y1)
	}
	if x, y, names, label := sampleRatios(d, xRatio); x != nil {
		ch.Points(label, plot.StyleN(0), x, y, names)
	}
	if ch.Empty() {
		return nil
	}
	return ch
}

type priorBox struct {
	name           string
	x0, x1, y0, y1 float64
}

// priorBoxes reads the end-member table (one row per end-member and ratio,
// with low and high bounds) into boxes spanning the Ca/Na and xRatio ranges.
func priorBoxes(t *notebook.ResultTable, xRatio string) []priorBox {
	name, ratio := column(t, "end-member"), column(t, "ratio")
	lo, hi := column(t, "low"), column(t, "high")
	if name == nil || ratio == nil || lo == nil || hi == nil || name.Text == nil || ratio.Text == nil {
		return nil
	}
	var order []string
	got := map[string]*priorBox{}
	seen := map[string][2]bool{}
	for i := range name.Text {
		n, r := name.Text[i], ratio.Text[i]
		if got[n] == nil {
			got[n] = &priorBox{name: n}
			order = append(order, n)
		}
		b, s := got[n], seen[n]
		switch {
		case strings.EqualFold(r, xRatio):
			b.x0, b.x1, s[0] = lo.Num[i], hi.Num[i], true
		case strings.EqualFold(r, "Ca/Na"):
			b.y0, b.y1, s[1] = lo.Num[i], hi.Num[i], true
		}
		seen[n] = s
	}
	var out []priorBox
	for _, n := range order {
		if s := seen[n]; s[0] && s[1] {
			out = append(out, *got[n])
		}
	}
	return out
}

// sampleRatios finds per-sample Ca/Na and xRatio: from an output table that
// holds both (the apportionment's, after correction), else the measured
// ratios of the samples table, labelled as such.
func sampleRatios(d *notebook.Document, xRatio string) (x, y []float64, names []string, label string) {
	for _, k := range []notebook.Kind{notebook.KindApportionment, notebook.KindAtmosphere} {
		for _, c := range d.Cells {
			if c.Kind != k {
				continue
			}
			o := d.Output(c.ID)
			if o == nil {
				continue
			}
			for _, t := range o.Tables {
				xc, yc := exact(t, xRatio), exact(t, "Ca/Na")
				if xc != nil && yc != nil && xc.Num != nil && yc.Num != nil {
					return xc.Num, yc.Num, texts(column(t, "sample")), "samples (corrected)"
				}
			}
		}
	}
	for _, c := range d.Cells {
		if c.Kind != notebook.KindSamples {
			continue
		}
		t := d.Output(c.ID).Table("samples")
		na, ca := exact(t, "Na"), exact(t, "Ca")
		num := exact(t, strings.TrimSuffix(xRatio, "/Na"))
		if num == nil && xRatio == "HCO3/Na" {
			num = exact(t, "Alk")
		}
		if na == nil || ca == nil || num == nil {
			continue
		}
		x, y = make([]float64, len(na.Num)), make([]float64, len(na.Num))
		for i := range na.Num {
			x[i], y[i] = num.Num[i]/na.Num[i], ca.Num[i]/na.Num[i]
		}
		return x, y, texts(column(t, "sample")), "samples (measured, before rain correction)"
	}
	return nil, nil, nil, ""
}

// exact finds a numeric or text column by its exact name.
func exact(t *notebook.ResultTable, name string) *notebook.Column {
	if t == nil {
		return nil
	}
	for _, c := range t.Columns {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// sourceNames are the sources of the apportionment in stacking order.
var sourceNames = []string{"atmosphere", "evaporite", "silicate", "carbonate"}

// sharesChart stacks each sample's source shares of the cations with
// their 95 % intervals.
func sharesChart(id string, o *notebook.Output) *plot.Chart {
	t := table(o, []string{"shares", "apportionment"}, "sample")
	if t == nil {
		return nil
	}
	names := texts(column(t, "sample", "name"))
	if len(names) == 0 {
		return nil
	}
	ch := plot.New(id, "Source shares of the cations, per sample", "sample", "share of cation charge (fraction)")
	var segs []plot.Segment
	for i, src := range sourceNames {
		v := column(t, src)
		if v == nil || v.Num == nil {
			continue
		}
		segs = append(segs, plot.Segment{Name: src, Style: plot.StyleN(i + 1), Value: v.Num,
			Lo: nums(column(t, src+" low", src+"_low", src+"_lo")), Hi: nums(column(t, src+" high", src+"_high", src+"_hi"))})
	}
	if len(segs) == 0 {
		return nil
	}
	ch.Bars(names, segs)
	return ch
}

// cqChart draws concentration against discharge on log axes with the
// fitted rating curve.
func cqChart(id string, o *notebook.Output) *plot.Chart {
	t := table(o, []string{"cq", "rating"}, "discharge", "concentration")
	q, c := column(t, "discharge", "q"), column(t, "concentration", "c")
	if q == nil || c == nil || q.Num == nil || c.Num == nil {
		return nil
	}
	species := ""
	if sp := column(t, "species"); sp != nil && sp.Text != nil && len(sp.Text) > 0 {
		species = sp.Text[0] + " "
	}
	ch := plot.New(id, "Concentration against discharge", labelWithUnit("discharge Q", q), labelWithUnit(species+"concentration C", c))
	ch.X.Log, ch.Y.Log = true, true
	ch.Points("samples", plot.StyleN(0), q.Num, c.Num, texts(column(t, "sample", "name")))
	if ft := table(o, []string{"rating-fit", "fit"}, "discharge", "fitted"); ft != nil {
		fq, fc := column(ft, "discharge", "q"), column(ft, "fitted", "concentration")
		if fq != nil && fc != nil {
			ch.Line("fitted rating curve", plot.StyleN(1), fq.Num, fc.Num)
		}
	} else if fit := column(t, "fitted"); fit != nil && fit.Num != nil {
		xs, ys := sortedPairs(q.Num, fit.Num)
		ch.Line("fitted rating curve", plot.StyleN(1), xs, ys)
	}
	return ch
}

func sortedPairs(x, y []float64) ([]float64, []float64) {
	idx := make([]int, 0, len(x))
	for i := range x {
		if i < len(y) {
			idx = append(idx, i)
		}
	}
	for i := 1; i < len(idx); i++ {
		for j := i; j > 0 && x[idx[j]] < x[idx[j-1]]; j-- {
			idx[j], idx[j-1] = idx[j-1], idx[j]
		}
	}
	xs, ys := make([]float64, len(idx)), make([]float64, len(idx))
	for k, i := range idx {
		xs[k], ys[k] = x[i], y[i]
	}
	return xs, ys
}

// figureBars draws the cell's headline figures that name a source as bars
// with their 95 % intervals, one bar per figure sharing the most common unit.
func figureBars(id, title string, o *notebook.Output, word string) *plot.Chart {
	if o == nil || len(o.Figures) == 0 {
		return nil
	}
	count := map[string]int{}
	for _, f := range o.Figures {
		count[f.Unit]++
	}
	unit, best := "", 0
	for u, n := range count {
		if n > best || (n == best && u < unit) {
			unit, best = u, n
		}
	}
	var cats []string
	var mid, lo, hi []float64
	for _, f := range o.Figures {
		if f.Unit != unit {
			continue
		}
		cats = append(cats, f.Name)
		mid, lo, hi = append(mid, f.Median), append(lo, f.Low-f.Median), append(hi, f.High-f.Median)
	}
	if len(cats) == 0 {
		return nil
	}
	// Interval bounds relative to the bar top, as Bars expects of a one-segment stack.
	for i := range lo {
		lo[i] += mid[i]
		hi[i] += mid[i]
	}
	ch := plot.New(id, title, "", unit)
	ch.Width = 640
	ch.Bars(shortNames(cats), []plot.Segment{{Name: "median with 95 % interval", Style: plot.StyleN(1), Value: mid, Lo: loRel(lo, mid), Hi: loRel(hi, mid)}})
	_ = word
	return ch
}

// loRel returns bounds as Bars wants them: the bound itself, since a
// single-segment stack has its base at zero.
func loRel(b, _ []float64) []float64 { return b }

// shortNames trims long figure names for the category axis.
func shortNames(names []string) []string {
	out := make([]string, len(names))
	for i, n := range names {
		if r := []rune(n); len(r) > 26 {
			n = string(r[:25]) + "…"
		}
		out[i] = n
	}
	return out
}

// userChart draws a chart cell: one output column against another.
func userChart(id string, d *notebook.Document, c *notebook.Cell) *plot.Chart {
	s, ok := c.Settings.(*notebook.ChartSettings)
	if !ok || s.X == "" || s.Y == "" {
		return nil
	}
	xc, xn := lookupRef(d, s.X)
	yc, yn := lookupRef(d, s.Y)
	if xc == nil || yc == nil {
		return nil
	}
	title := c.Title
	if title == "" {
		title = yn + " against " + xn
	}
	ch := plot.New(id, title, labelWithUnit(xn, xc), labelWithUnit(yn, yc))
	ch.X.Log, ch.Y.Log = s.LogX, s.LogY
	xs := nums(xc)
	if xc.Text != nil {
		xs = days(xc)
		ch.X.Time = true
	}
	if s.Style == "line" {
		ch.Line(yn, plot.StyleN(0), xs, nums(yc))
	} else {
		ch.Points(yn, plot.StyleN(0), xs, nums(yc), nil)
	}
	return ch
}

// lookupRef finds the column named by "cell.table.column".
func lookupRef(d *notebook.Document, ref string) (*notebook.Column, string) {
	parts := strings.SplitN(ref, ".", 3)
	if len(parts) != 3 {
		return nil, ref
	}
	t := d.Output(parts[0]).Table(parts[1])
	return t.Column(parts[2]), parts[2]
}
