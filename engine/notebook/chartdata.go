package notebook

import (
	"math"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/flux"
)

// The page draws what these functions give: the numbers of its charts
// that are not columns of a cell's output tables. They compute; the page
// only places.

// CQ is the concentration of one species against discharge at sampling,
// with the rating curve the flux engine fits to it, ready to draw.
type CQ struct {
	Species chem.Species
	Names   []string  // the samples
	Q       []float64 // discharge at sampling, m³/s: the sample's own, else the record's that day (NaN when neither)
	C       []float64 // concentration after the rain correction, µmol/L
	// Fit is the rating curve ln C = a + b ln Q over the samples (nil when
	// it cannot be fitted); CurveQ and CurveC are the curve at 41
	// discharges spaced evenly in log Q over the samples' range.
	Fit            *flux.RatingFit
	CurveQ, CurveC []float64
}

// CQ returns concentration against discharge at sampling for each species,
// with the rating curve the flux engine fits to it (the cell's own
// options, with the rating-curve estimator).
func (v *Fluxes) CQ(species ...chem.Species) []CQ {
	if v == nil || v.App == nil || v.Record == nil {
		return nil
	}
	a := v.App
	var out []CQ
	for _, sp := range species {
		cq := CQ{Species: sp, Names: a.Names, Q: make([]float64, len(a.Names)), C: make([]float64, len(a.Names))}
		for i := range a.Names {
			cq.C[i] = a.Corrected[i].Input[sp]
			cq.Q[i] = math.NaN()
			if i < len(a.Q) {
				cq.Q[i] = a.Q[i]
			}
			if math.IsNaN(cq.Q[i]) {
				if j := v.Record.Index(a.Days[i]); j >= 0 {
					cq.Q[i] = v.Record.Q[j]
				}
			}
		}
		opt := v.Options
		opt.Method = flux.Rating
		ser := flux.ForSpecies(sp, a.Days, cq.C)
		ser.Q = a.Q
		if r, err := flux.Estimate(v.Record, ser, opt); err == nil && r.Rating != nil {
			cq.Fit = r.Rating
			lo, hi := PositiveRange(cq.Q)
			cq.CurveQ, cq.CurveC = make([]float64, 41), make([]float64, 41)
			for j := range cq.CurveQ {
				cq.CurveQ[j] = lo * math.Pow(hi/lo, float64(j)/40)
				cq.CurveC[j] = cq.Fit.A * math.Pow(cq.CurveQ[j], cq.Fit.B)
			}
		}
		out = append(out, cq)
	}
	return out
}

// PositiveRange returns the smallest and largest finite values of v above
// zero, for a logarithmic axis: half and twice the one value when all are
// equal, 1 and 10 when there is none.
func PositiveRange(v []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, x := range v {
		if x > 0 && !math.IsInf(x, 0) {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
	}
	if lo > hi {
		return 1, 10
	}
	if lo == hi {
		return lo / 2, hi * 2
	}
	return lo, hi
}

// SampleRatios returns each sample's xRatio (such as "Mg/Na") and Ca/Na,
// for the mixing diagrams: from the first atmosphere cell's ratios table
// (X*/Na* after the rain and evaporite corrections), else the measured
// ratios of the first samples cell that gives them (HCO3 from alkalinity
// when the table has no HCO3), with a label saying which.
func SampleRatios(d *Document, xRatio string) (x, y []float64, names []string, label string) {
	for _, c := range d.Cells {
		if c.Kind != KindAtmosphere {
			continue
		}
		t := d.Output(c.ID).Table("ratios")
		xc, yc := t.Column(xRatio), t.Column("Ca/Na")
		if xc != nil && yc != nil && xc.Num != nil && yc.Num != nil {
			return xc.Num, yc.Num, textOf(t.Column("sample")), "samples after rain correction"
		}
	}
	for _, c := range d.Cells {
		if c.Kind != KindSamples {
			continue
		}
		t := d.Output(c.ID).Table("samples")
		na, ca := t.Column("Na"), t.Column("Ca")
		num := t.Column(strings.TrimSuffix(xRatio, "/Na"))
		if num == nil && xRatio == "HCO3/Na" {
			num = t.Column("Alk")
		}
		if na == nil || ca == nil || num == nil {
			continue
		}
		x, y = make([]float64, len(na.Num)), make([]float64, len(na.Num))
		for i := range na.Num {
			x[i], y[i] = num.Num[i]/na.Num[i], ca.Num[i]/na.Num[i]
		}
		return x, y, textOf(t.Column("sample")), "samples (measured, before rain correction)"
	}
	return nil, nil, nil, ""
}

// textOf returns the text of a column, nil for none.
func textOf(c *Column) []string {
	if c == nil {
		return nil
	}
	return c.Text
}

// FigureBar is one bar of a chart of a cell's headline figures: the
// figure and the short label its bar carries.
type FigureBar struct {
	Label  string
	Figure Figure
}

// FigureBars returns the headline figures of o in unit whose names hold
// words, each labelled by the rest of its name ("silicate" for "silicate
// CO2 consumption per km²"). A CO2 figure computed with another origin of
// the sulfate above the rain share is labelled with the origin's short
// name: "silicate, SO4 from sulfide".
func FigureBars(o *Output, unit, words string) []FigureBar {
	if o == nil {
		return nil
	}
	var bars []FigureBar
	for _, f := range o.Figures {
		if f.Unit != unit || !strings.Contains(f.Name, words) {
			continue
		}
		name := f.Name
		origin := ""
		if src, other, ok := strings.Cut(name, otherOriginWords); ok {
			name, origin = src, other
		}
		label := strings.Join(strings.Fields(strings.Replace(name, words, "", 1)), " ")
		if origin != "" {
			short, ok := shortOrigins[origin]
			if !ok {
				short = origin
			}
			label += ", SO4 from " + short
		}
		bars = append(bars, FigureBar{Label: label, Figure: f})
	}
	return bars
}
