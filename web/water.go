package web

import (
	"math"
	"strconv"

	"lixiv/engine/notebook"
	"lixiv/web/plot"
)

// The carbonate and minerals cells on the page: their charts, which draw
// what the cells' output tables hold (the engine computes every number and
// labels the settings and columns, notebook.SettingLabel and
// notebook.ColumnLabel).

// numSetting reads a numeric setting of a cell (NaN when it has none).
func numSetting(c *notebook.Cell, key string) float64 {
	if c == nil || c.Settings == nil {
		return math.NaN()
	}
	for _, p := range notebook.Params(c.Settings) {
		if p.Key == key {
			if v, err := strconv.ParseFloat(p.Value, 64); err == nil {
				return v
			}
		}
	}
	return math.NaN()
}

// carbonateX returns the horizontal axis of the carbonate charts: the
// discharge at sampling on a log axis, or, when no sample has one, the
// sampling date.
func carbonateX(t *notebook.ResultTable) (xs []float64, label string, time bool) {
	q := t.Column("discharge")
	for _, v := range nums(q) {
		if v > 0 {
			return q.Num, labelWithUnit("discharge at sampling", q), false
		}
	}
	return days(t.Column("date")), "date (no discharge at sampling)", true
}

// hline is a horizontal line at y across the x range of xs.
func hline(ch *plot.Chart, name string, s plot.Style, xs []float64, y float64, time bool) {
	lo, hi := notebook.PositiveRange(xs)
	if time {
		lo, hi = math.Inf(1), math.Inf(-1)
		for _, x := range xs {
			if !math.IsNaN(x) {
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			}
		}
		if lo > hi {
			return
		}
	}
	ch.Line(name, s, []float64{lo, hi}, []float64{y, y})
}

// saturationChart draws each sample's saturation indices against discharge,
// with saturation (SI 0) and the cell's flag.
func saturationChart(id string, c *notebook.Cell, o *notebook.Output) *plot.Chart {
	t := o.Table("carbonate")
	if t == nil || t.Len() == 0 {
		return nil
	}
	xs, xl, time := carbonateX(t)
	ch := plot.New(id, "Saturation indices against discharge", xl, "saturation index (log10 IAP/K)")
	ch.X.Log, ch.X.Time = !time, time
	names := texts(t.Column("sample"))
	hline(ch, "saturation (SI 0)", plot.Style{Colour: "#6b6b6b"}, xs, 0, time)
	if f := numSetting(c, "si_calcite_flag"); !math.IsNaN(f) {
		hline(ch, "flag: SI of calcite "+plot.Number(f), plot.Style{Colour: "#a4262c", Dash: "6 3"}, xs, f, time)
	}
	for i, m := range []struct{ col, name string }{{"SI_calcite", "calcite"}, {"SI_aragonite", "aragonite"}, {"SI_dolomite", "dolomite"}} {
		if col := t.Column(m.col); col != nil {
			ch.Points(m.name, plot.StyleN(i), xs, col.Num, names)
		}
	}
	return ch
}

// pco2Chart draws each sample's pCO2 against discharge on log axes, with
// the air's pCO2 and the cell's flag.
func pco2Chart(id string, c *notebook.Cell, o *notebook.Output) *plot.Chart {
	t := o.Table("carbonate")
	p := t.Column("pCO2")
	if p == nil || t.Len() == 0 {
		return nil
	}
	xs, xl, time := carbonateX(t)
	ch := plot.New(id, "pCO2 against discharge", xl, labelWithUnit("pCO2", p))
	ch.X.Log, ch.X.Time, ch.Y.Log = !time, time, true
	air, f := numSetting(c, "atmospheric_pco2_uatm"), numSetting(c, "pco2_flag_factor")
	if !math.IsNaN(air) {
		hline(ch, "the air ("+plot.Number(air)+" µatm)", plot.Style{Colour: "#6b6b6b"}, xs, air, time)
		if !math.IsNaN(f) {
			hline(ch, "flag: "+plot.Number(f)+" × the air's", plot.Style{Colour: "#a4262c", Dash: "6 3"}, xs, air*f, time)
		}
	}
	ch.Points("samples", plot.StyleN(0), xs, p.Num, texts(t.Column("sample")))
	return ch
}

// mineralBars stacks each sample's minerals: dissolved above zero, formed
// below.
func mineralBars(id string, o *notebook.Output) *plot.Chart {
	mt, at := o.Table("minerals"), o.Table("amounts")
	keys := texts(mt.Column("mineral"))
	names := texts(at.Column("sample"))
	if len(keys) == 0 || len(names) == 0 {
		return nil
	}
	var segs []plot.Segment
	for i, k := range keys {
		if col := at.Column(k); col != nil && col.Num != nil {
			segs = append(segs, plot.Segment{Name: k, Style: plot.StyleN(i), Value: col.Num})
		}
	}
	ch := plot.New(id, "Minerals per sample: dissolved above zero, formed below", "sample", "amount (µmol/L)")
	ch.Height = 360
	ch.MinStep = 18
	ch.DivergingBars(names, segs)
	return ch
}

// mineralCO2Chart draws the CO2 each mineral consumed over the period,
// with its 95 % interval.
func mineralCO2Chart(id string, o *notebook.Output) *plot.Chart {
	t := o.Table("period")
	keys, v := texts(t.Column("mineral")), t.Column("CO2_consumed")
	if len(keys) == 0 || v == nil {
		return nil
	}
	ch := plot.New(id, "CO2 consumed by each mineral (mean annual)", "", labelWithUnit("CO2 consumed", v))
	ch.Height = 320
	ch.StaggerLabels = true // mineral names are long
	ch.DivergingBars(keys, []plot.Segment{{Name: "median with 95 % interval (below zero: released)", Style: plot.StyleN(1),
		Value: v.Num, Lo: nums(t.Column("CO2_consumed_low")), Hi: nums(t.Column("CO2_consumed_high"))}})
	return ch
}
