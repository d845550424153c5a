package web

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"lixiv/engine/chem"
	"lixiv/engine/notebook"
	"lixiv/web/plot"
)

// ChartCache keeps drawn charts until the results they are drawn from
// change, so that a render of the page (every event renders the whole page)
// does not redraw them, and a recompute redraws only the charts whose
// inputs it replaced.
type ChartCache struct {
	Millis float64 // time spent drawing, for the timing harness
	saved  map[string]cachedCharts
}

type cachedCharts struct {
	key   string
	views []ChartView
}

// chartInputs lists the kinds of the other cells whose outputs the charts
// of a cell of kind k read.
var chartInputs = map[notebook.Kind][]notebook.Kind{
	notebook.KindDischarge: {notebook.KindSamples},
	notebook.KindSources:   {notebook.KindSamples, notebook.KindAtmosphere, notebook.KindApportionment},
}

// For returns the charts of cell c, drawing them when needed.
func (cc *ChartCache) For(d *notebook.Document, c *notebook.Cell, o *notebook.Output) []ChartView {
	if cc.saved == nil {
		cc.saved = map[string]cachedCharts{}
	}
	key := fmt.Sprintf("%p|%s", o, c.Title)
	if c.Kind == notebook.KindChart {
		key += fmt.Sprintf("|%v", c.Settings)
	}
	for _, k := range chartInputs[c.Kind] {
		for _, other := range d.Cells {
			if other.Kind == k {
				key += fmt.Sprintf("|%p", d.Output(other.ID))
			}
		}
	}
	if s, ok := cc.saved[c.ID]; ok && s.key == key {
		return s.views
	}
	t0 := nowMillis()
	var views []ChartView
	for _, ch := range Charts(d, c, o) {
		svg := ch.SVG()
		views = append(views, ChartView{ID: ch.ID, Title: ch.Title, SVG: svg, Key: htmlKey(svg), Wide: ch.Wide()})
	}
	cc.Millis += nowMillis() - t0
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
		add(chargeBalanceChart(id, c, o))
	case notebook.KindDischarge:
		add(hydrograph(id, d, o))
	case notebook.KindSources:
		add(mixingChart(id+"-mg", d, c, o, "Mg/Na"))
		add(mixingChart(id+"-hco3", d, c, o, "HCO3/Na"))
	case notebook.KindApportionment:
		add(sharesChart(id+"-ca", o, "Ca"))
		add(sharesChart(id+"-na", o, "Na"))
	case notebook.KindFluxes:
		add(cqChart(id+"-cq", o))
		add(sourceYieldChart(id+"-cations", o))
		add(figureBars(id+"-bars", "Mean annual cation yield by source", o, "mol/km²/yr", "cations yield"))
	case notebook.KindCO2:
		add(figureBars(id+"-bars", "CO2 consumption by source", o, "mol/km²/yr", "CO2 consumption per km²"))
	case notebook.KindCarbonate:
		add(saturationChart(id+"-si", c, o))
		add(pco2Chart(id+"-pco2", c, o))
	case notebook.KindMinerals:
		add(mineralBars(id+"-bars", o))
		add(mineralCO2Chart(id+"-co2", o))
	case notebook.KindCompare:
		for _, ch := range compareCharts(id, c, o) {
			add(ch)
		}
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
	return plot.Column(c.Num)
}

func nums(c *notebook.Column) []float64 {
	if c == nil {
		return nil
	}
	return c.Num
}

// chargeBalanceChart shows each sample's NICB, with the flag and reject
// thresholds of the samples cell as dashed lines, and the flagged and
// left-out samples in their own marker shapes.
func chargeBalanceChart(id string, c *notebook.Cell, o *notebook.Output) *plot.Chart {
	t := table(o, []string{"qc", "samples", "normalised"}, "nicb")
	nicb := column(t, "nicb", "nicb_percent")
	if nicb == nil || nicb.Num == nil {
		return nil
	}
	ch := plot.New(id, "Charge balance of each sample", "sample (table order)", labelWithUnit("NICB", nicb))
	names, flags := texts(column(t, "sample", "name", "id")), texts(t.Column("flag"))
	n := len(nicb.Num)
	groups := []struct {
		name  string
		style plot.Style
		xs    []float64
		ys    []float64
		names []string
	}{
		{name: "samples", style: plot.StyleN(0)},
		{name: "flagged", style: plot.Style{Colour: "#b5651d", Marker: "triangle"}},
		{name: "left out", style: plot.Style{Colour: "#a4262c", Marker: "cross"}},
	}
	for i, v := range nicb.Num {
		g := 0
		if i < len(flags) && strings.HasPrefix(flags[i], "left out") {
			g = 2
		} else if i < len(flags) && flags[i] != "" {
			g = 1
		}
		groups[g].xs, groups[g].ys = append(groups[g].xs, float64(i+1)), append(groups[g].ys, v)
		name := ""
		if i < len(names) {
			name = names[i]
		}
		if i < len(flags) && flags[i] != "" {
			name += ": " + flags[i]
		}
		groups[g].names = append(groups[g].names, name)
	}
	for _, th := range nicbThresholds(c) {
		if th.value > 0 {
			x0, x1 := 0.5, float64(n)+0.5
			ch.Line(th.name, th.style, []float64{x0, x1, math.NaN(), x0, x1}, []float64{th.value, th.value, math.NaN(), -th.value, -th.value})
		}
	}
	for _, g := range groups {
		if len(g.xs) > 0 {
			ch.Points(g.name, g.style, g.xs, g.ys, g.names)
		}
	}
	return ch
}

type threshold struct {
	name  string
	value float64
	style plot.Style
}

// nicbThresholds reads the flag and reject thresholds (%) of a samples cell.
func nicbThresholds(c *notebook.Cell) []threshold {
	var out []threshold
	if c == nil || c.Settings == nil {
		return nil
	}
	for _, p := range notebook.Params(c.Settings) {
		v, err := strconv.ParseFloat(p.Value, 64)
		if err != nil {
			continue
		}
		switch p.Key {
		case "nicb_flag_percent":
			out = append(out, threshold{"±" + plot.Number(v) + " % (flag)", v, plot.Style{Colour: "#6b6b6b", Dash: "6 3"}})
		case "nicb_reject_percent":
			out = append(out, threshold{"±" + plot.Number(v) + " % (left out)", v, plot.Style{Colour: "#a4262c", Dash: "2 3"}})
		}
	}
	return out
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
// Where an apportionment has run, the samples it could not fit are marked,
// the edges of the boxes that samples' posteriors press against are
// drawn, and, for the catchment-wide model, the shared ratios' posterior
// as a solid box inside the prior's; which ones, the apportionment decides
// (notebook.Marks).
func mixingChart(id string, d *notebook.Document, c *notebook.Cell, o *notebook.Output, xRatio string) *plot.Chart {
	ch := plot.New(id, "Mixing diagram: Ca/Na against "+xRatio, xRatio+" (mol/mol)", "Ca/Na (mol/mol)")
	ch.X.Log, ch.Y.Log = true, true
	boxes := priorBoxes(table(o, []string{"priors"}, "end-member", "ratio"), xRatio)
	for i, b := range boxes {
		ch.Box(b.name, plot.StyleN(i+1), b.x0, b.x1, b.y0, b.y1)
	}
	x, y, names, label := notebook.SampleRatios(d, xRatio)
	if x != nil {
		st := plot.StyleN(0)
		st.Open = true // rings: a dense cloud of samples still shows each one
		ch.Points(label, st, x, y, names)
	}
	if m := apportionmentMarks(d); m != nil {
		markMisfits(ch, m, x, y, names)
		for i, b := range boxes {
			if sb, ok := sharedBox(m, b.name, xRatio); ok {
				st := plot.StyleN(i + 1)
				st.Hatch, st.Dash = "solid", ""
				ch.Box(b.name+": shared ratios the samples taught (95 %)", st, sb.x0, sb.x1, sb.y0, sb.y1)
			}
		}
		for i, b := range boxes {
			for _, e := range m.Edges {
				if e.EndMember != b.name {
					continue
				}
				st := plot.StyleN(i + 1)
				st.Dash, st.Marker = "", ""
				side := "lower"
				if e.Upper {
					side = "upper"
				}
				name := fmt.Sprintf("%s %s: %s edge the fit presses against (%s)", e.EndMember, e.Ratio, side, plural(len(e.Samples), "sample"))
				switch e.Ratio {
				case "Ca/Na":
					ch.Line(name, st, []float64{b.x0, b.x1}, []float64{e.Value, e.Value})
				case xRatio:
					ch.Line(name, st, []float64{e.Value, e.Value}, []float64{b.y0, b.y1})
				}
			}
		}
	}
	if ch.Empty() {
		return nil
	}
	return ch
}

// sharedBox returns the box of the catchment-wide model's posterior of
// the end-member's Ca/Na and xRatio, drawn inside its prior box; false
// when the model did not learn both (another model, or a fixed ratio).
func sharedBox(m *notebook.Marks, em, xRatio string) (priorBox, bool) {
	var b priorBox
	got := 0
	for _, s := range m.Shared {
		if s.EndMember != em {
			continue
		}
		switch s.Ratio {
		case "Ca/Na":
			b.y0, b.y1 = s.Lo, s.Hi
			got |= 1
		case xRatio:
			b.x0, b.x1 = s.Lo, s.Hi
			got |= 2
		}
	}
	b.name = em
	return b, got == 3
}

// apportionmentMarks returns the marks of the first computed
// apportionment, or nil.
func apportionmentMarks(d *notebook.Document) *notebook.Marks {
	for _, c := range d.Cells {
		if c.Kind != notebook.KindApportionment {
			continue
		}
		if o := d.Output(c.ID); o != nil {
			if a, ok := o.Value.(*notebook.Apportioned); ok {
				return &a.Diagram
			}
		}
	}
	return nil
}

// markMisfits draws, over the samples, those the apportionment could not
// fit, each named with the tracer it could not match.
func markMisfits(ch *plot.Chart, m *notebook.Marks, x, y []float64, names []string) {
	bad := map[string]string{}
	for i, t := range m.Misfit {
		if t != "" && i < len(m.Names) {
			bad[m.Names[i]] = t
		}
	}
	var mx, my []float64
	var mn []string
	for i, n := range names {
		if t, ok := bad[n]; ok && i < len(x) {
			mx, my, mn = append(mx, x[i]), append(my, y[i]), append(mn, n+": does not fit "+t)
		}
	}
	if len(mx) > 0 {
		st := plot.StyleN(4)
		st.Open = false
		ch.Points("samples the apportionment cannot fit", st, mx, my, mn)
	}
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

// sharesChart stacks each sample's source shares of one cation with their
// 95 % intervals.
func sharesChart(id string, o *notebook.Output, cation string) *plot.Chart {
	t := table(o, []string{"shares"}, "sample")
	if t == nil {
		return nil
	}
	names := texts(t.Column("sample"))
	if len(names) == 0 {
		return nil
	}
	ch := plot.New(id, "Sources of "+cation+", per sample (median and 95 % interval)", "sample", "share of "+cation+" (fraction)")
	ch.Height = 340
	ch.MinStep = 18                             // bars wide enough for their hatching and interval whiskers; the page scrolls the rest
	ch.Y.Min, ch.Y.Max, ch.Y.Fixed = 0, 1, true // shares
	var segs []plot.Segment
	for i, src := range notebook.SourceNames() { // stacked in report order
		v := t.Column(cation + "_" + src)
		if v == nil || v.Num == nil {
			continue
		}
		segs = append(segs, plot.Segment{Name: src, Style: plot.StyleN(i + 1), Value: v.Num,
			Lo: nums(t.Column(cation + "_" + src + "_low")), Hi: nums(t.Column(cation + "_" + src + "_high"))})
	}
	if len(segs) == 0 {
		return nil
	}
	ch.Bars(names, segs)
	return ch
}

// cqChart draws concentration against discharge at sampling on log axes,
// for Na and Ca, with the rating curve the flux engine fits to each
// (notebook.Fluxes.CQ).
func cqChart(id string, o *notebook.Output) *plot.Chart {
	v, ok := o.Value.(*notebook.Fluxes)
	if !ok {
		return nil
	}
	ch := plot.New(id, "Concentration against discharge at sampling", "discharge Q (m³/s)", "concentration C (µmol/L)")
	ch.X.Log, ch.Y.Log = true, true
	var note []string
	for k, cq := range v.CQ(chem.Na, chem.Ca) {
		st := plot.StyleN(2 * k)
		ch.Points(cq.Species.Symbol()+" samples", st, cq.Q, cq.C, cq.Names)
		if cq.Fit == nil {
			continue
		}
		ls := st
		ls.Dash = plot.StyleN(2*k + 1).Dash
		ch.Line(cq.Species.Symbol()+" rating curve", ls, cq.CurveQ, cq.CurveC)
		note = append(note, fmt.Sprintf("%s: C = %s·Q^%.3f, R² %.2f", cq.Species.Symbol(), plot.Number(cq.Fit.A), cq.Fit.B, cq.Fit.R2))
	}
	ch.Note = strings.Join(note, ";  ")
	if ch.Empty() {
		return nil
	}
	return ch
}

// sourceYieldChart stacks the mean annual yield of each cation by rock
// source, from the fluxes' "mean" table.
func sourceYieldChart(id string, o *notebook.Output) *plot.Chart {
	t := o.Table("mean")
	series, yield := t.Column("series"), t.Column("yield")
	if series == nil || yield == nil || series.Text == nil {
		return nil
	}
	cations := []string{"Na", "K", "Ca", "Mg"}
	var segs []plot.Segment
	for k, src := range []string{"silicate", "carbonate"} {
		vals := make([]float64, len(cations))
		found := false
		for j, cat := range cations {
			vals[j] = math.NaN()
			for i, n := range series.Text {
				if n == cat+"_"+src {
					vals[j], found = yield.Num[i], true
				}
			}
		}
		if found {
			segs = append(segs, plot.Segment{Name: src, Style: plot.StyleN(k + 3), Value: vals})
		}
	}
	if len(segs) == 0 {
		return nil
	}
	ch := plot.New(id, "Mean annual yield of each cation by rock source", "cation", "yield (mol/km²/yr)")
	ch.Height = 320
	ch.Bars(cations, segs)
	return ch
}

// figureBars draws the cell's headline figures in the given unit whose
// names hold the given words, as bars with their 95 % intervals.
func figureBars(id, title string, o *notebook.Output, unit, words string) *plot.Chart {
	var cats []string
	var mid, lo, hi []float64
	for _, b := range notebook.FigureBars(o, unit, words) {
		f := b.Figure
		cats = append(cats, b.Label)
		mid, lo, hi = append(mid, f.Median), append(lo, f.Low), append(hi, f.High)
	}
	if len(cats) == 0 {
		return nil
	}
	ch := plot.New(id, title, "source", words+" ("+unit+")")
	ch.StaggerLabels = true // the other sulfate origin's labels are long
	ch.Height = 300
	ch.Bars(cats, []plot.Segment{{Name: "median with 95 % interval", Style: plot.StyleN(1), Value: mid, Lo: lo, Hi: hi}})
	return ch
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

// lookupRef finds the column named by "cell.table.column" and its label.
func lookupRef(d *notebook.Document, ref string) (*notebook.Column, string) {
	parts := strings.SplitN(ref, ".", 3)
	if len(parts) != 3 {
		return nil, ref
	}
	t := d.Output(parts[0]).Table(parts[1])
	kind := notebook.KindBroken
	if c := d.Cell(parts[0]); c != nil {
		kind = c.Kind
	}
	return t.Column(parts[2]), notebook.ColumnLabel(kind, parts[1], parts[2])
}
