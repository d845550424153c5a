package flux

import (
	"math"

	"lixiv/engine/discharge"
)

// engine holds a discharge record and a matched set of samples laid out for
// repeated load computations (the point estimate and every bootstrap
// replicate). Everything on this path is plain Go arithmetic, pexp and plog,
// so it gives the same bits natively and under WebAssembly.
type engine struct {
	opt   Options
	years []discharge.Year
	q     []float64 // daily discharge, m³/s; NaN for gaps
	lnq   []float64 // plog(q)
	sn    []float64 // sin(2π t) per day, seasonal option
	cs    []float64 // cos(2π t) per day
	year  []int     // reporting year index per day
	sumQ  []float64 // per year: Σ Q_d over days with a value (m³/s × days)
	// flow lists, in order, the days with a discharge other than 0: the
	// only days whose concentration enters a load. The daily loops of every
	// replicate walk these, so a long record that is mostly gaps (a date
	// typed a century out) costs what its days with data cost.
	flow []int

	smp []sample
	lnQ []float64 // per sample: plog(q)
	sS  []float64 // per sample seasonal terms
	cS  []float64

	cd []float64 // scratch: daily concentration
	ly []float64 // scratch: per-sample ln C − ln Cref

	// replicate marks bootstrap use: the rating curve may then sum its
	// days through mom (moments.go), prepared at the first replicate.
	replicate bool
	mom       *moments
	slope     float64 // the slope of the last flow-adjusted interpolation
	summed    bool    // the last rating call already added its sums to out
}

func newEngine(rec *discharge.Record, smp []sample, years []discharge.Year, opt Options) *engine {
	n := rec.Len()
	opt.Seasonal = opt.Seasonal && opt.Method == Rating // only the rating curve uses the season
	e := &engine{opt: opt, years: years, q: rec.Q, smp: smp,
		lnq: make([]float64, n), year: make([]int, n), sumQ: make([]float64, len(years)), cd: make([]float64, n)}
	if opt.Seasonal {
		e.sn, e.cs = make([]float64, n), make([]float64, n)
	}
	e.flow = make([]int, 0, n)
	var yf yearFractions
	y := 0
	for k, d := range rec.Days {
		for y < len(years)-1 && d > years[y].End {
			y++
		}
		e.year[k] = y
		q := rec.Q[k]
		if opt.Method == Rating || opt.Method == PeriodWeighted {
			e.lnq[k] = plog(q)
		}
		if !math.IsNaN(q) {
			e.sumQ[y] += q
			if q != 0 {
				e.flow = append(e.flow, k)
			}
		}
		if opt.Seasonal {
			e.sn[k], e.cs[k] = seasonal(yf.of(d))
		}
	}
	e.lnQ = make([]float64, len(smp))
	e.sS, e.cS = make([]float64, len(smp)), make([]float64, len(smp))
	for i, s := range smp {
		if opt.Method == Rating || opt.Method == PeriodWeighted {
			e.lnQ[i] = plog(s.q)
		}
		if opt.Seasonal {
			e.sS[i], e.cS[i] = seasonal(s.t)
		}
	}
	return e
}

// yearFractions gives discharge.Day.YearFraction for days in any order,
// finding the calendar year anew only when a day leaves the last one: a
// record of many years asks for it every day.
type yearFractions struct {
	year        int
	start, next discharge.Day
}

// of returns d.YearFraction(), to the bit.
func (f *yearFractions) of(d discharge.Day) float64 {
	if d < f.start || d >= f.next || f.next == f.start {
		f.year, _, _ = d.Civil()
		f.start, f.next = discharge.Date(f.year, 1, 1), discharge.Date(f.year+1, 1, 1)
	}
	return float64(f.year) + (float64(d-f.start)+0.5)/float64(f.next-f.start)
}

// seasonal returns sin(2πt) and cos(2πt) of the fractional part of the
// decimal year t. math.Sin and math.Cos are plain Go on amd64 and wasm.
func seasonal(t float64) (float64, float64) {
	f := t - math.Floor(t)
	a := 2 * math.Pi * f
	return math.Sin(a), math.Cos(a)
}

// loads fills out (one entry per reporting year) with the load in mol over
// the year's days with discharge, from sample weights w (bootstrap counts,
// 1 for the point estimate) and concentrations c (µmol/L, one per sample).
// Every estimator writes its load as 86.4 × (Cref ΣQ_d + Σ (C_d − Cref) Q_d)
// with Cref the first sample's concentration, so that a constant
// concentration gives exactly 86.4 × (C × ΣQ_d). ok is false when the
// estimator cannot be applied (no samples; a singular rating fit).
func (e *engine) loads(method Method, w, c, out []float64, fit *RatingFit) bool {
	cref := math.NaN()
	for i := range c {
		if w[i] > 0 && !math.IsNaN(c[i]) {
			cref = c[i]
			break
		}
	}
	if math.IsNaN(cref) {
		return false
	}
	for y := range out {
		out[y] = 0
	}
	switch method {
	case FlowWeighted:
		e.flowWeighted(w, c, cref, out)
	case Beale:
		e.beale(w, c, cref, out)
	case PeriodWeighted:
		if !e.periodWeighted(w, c, cref) {
			return false
		}
		e.sumDaily(cref, out)
	case Rating:
		e.summed = false
		if !e.rating(w, c, cref, fit, out) {
			return false
		}
		if !e.summed {
			e.sumDaily(cref, out)
		}
	}
	for y := range out {
		out[y] = 86.4 * (cref*e.sumQ[y] + out[y])
		if math.IsInf(out[y], 0) {
			return false // a fit extrapolated beyond floating point
		}
	}
	return true
}

// flowWeighted puts Σ_d (C_fw,y − Cref) Q_d into out[y], with C_fw,y the
// discharge-weighted mean of the year's samples (NaN without samples).
func (e *engine) flowWeighted(w, c []float64, cref float64, out []float64) {
	num := make([]float64, len(out))
	den := make([]float64, len(out))
	for i, s := range e.smp {
		if w[i] == 0 || math.IsNaN(c[i]) || s.year < 0 {
			continue
		}
		wq := w[i] * s.q
		num[s.year] += wq * (c[i] - cref)
		den[s.year] += wq
	}
	for y := range out {
		if den[y] == 0 {
			out[y] = math.NaN()
			continue
		}
		out[y] = (num[y] / den[y]) * e.sumQ[y]
	}
}

// beale puts each year's Beale ratio estimate of Σ_d (C_d − Cref) Q_d into
// out[y]. With daily sample loads l_i = C_i Q_i, the estimator
//
//	L = N μ_q (l̄/q̄) [1 + S_lq/(n l̄ q̄)] / [1 + S_qq/(n q̄²)]
//
// equals N μ_q [l̄/q̄ + S_lq/(n q̄²)] / [1 + S_qq/(n q̄²)], which is linear in
// l, so it is applied to the excess loads (C_i − Cref) Q_i and the Cref part
// is exactly Cref Σ Q_d. Bootstrap counts w weight the sums; n is Σ w.
func (e *engine) beale(w, c []float64, cref float64, out []float64) {
	ny := len(out)
	n, sl, sq := make([]float64, ny), make([]float64, ny), make([]float64, ny)
	slq, sqq := make([]float64, ny), make([]float64, ny)
	for i, s := range e.smp {
		if w[i] == 0 || math.IsNaN(c[i]) {
			continue
		}
		y := s.year
		n[y] += w[i]
		sl[y] += w[i] * (c[i] - cref) * s.q
		sq[y] += w[i] * s.q
	}
	for y := 0; y < ny; y++ {
		if n[y] > 0 {
			sl[y] /= n[y] // means
			sq[y] /= n[y]
		}
	}
	for i, s := range e.smp {
		if w[i] == 0 || math.IsNaN(c[i]) {
			continue
		}
		y := s.year
		dl := (c[i]-cref)*s.q - sl[y]
		dq := s.q - sq[y]
		slq[y] += w[i] * dl * dq
		sqq[y] += w[i] * dq * dq
	}
	for y := 0; y < ny; y++ {
		if n[y] < 2 || sq[y] == 0 {
			out[y] = math.NaN()
			continue
		}
		nn := n[y]
		slq[y] /= nn - 1
		sqq[y] /= nn - 1
		qb2 := nn * sq[y] * sq[y]
		out[y] = e.sumQ[y] * (sl[y]/sq[y] + slq[y]/qb2) / (1 + sqq[y]/qb2)
	}
}

// periodWeighted fills e.cd with the flow-adjusted interpolation of the
// samples: with b the slope of ln C on ln Q fitted to the samples (0 when
// it cannot be fitted), the flow-normalised concentrations C_i Q_i^−b are
// interpolated linearly in time between sample days and held at the ends,
// and multiplied by Q_d^b on each day. Same-day samples are averaged. With
// b = 0 this is linear interpolation of the concentrations; otherwise the
// days between samples follow discharge as the samples do (the composite
// method of Aulenbach & Hooper 2006, with the slope as its regression;
// from memory).
func (e *engine) periodWeighted(w, c []float64, cref float64) bool {
	type node struct {
		k int
		c float64
	}
	b := 0.0
	if flowAdjust {
		b = e.flowSlope(w, c)
	}
	e.slope = b
	var nodes []node
	for i := 0; i < len(e.smp); {
		k := e.smp[i].k
		var sw, sc float64
		j := i
		for ; j < len(e.smp) && e.smp[j].k == k; j++ {
			if w[j] > 0 && !math.IsNaN(c[j]) {
				sw += w[j]
				if b == 0 {
					sc += w[j] * (c[j] - cref)
				} else {
					sc += w[j] * c[j] * pexp(-b*e.lnQ[j])
				}
			}
		}
		if sw > 0 {
			if b == 0 {
				nodes = append(nodes, node{k, cref + sc/sw})
			} else {
				nodes = append(nodes, node{k, sc / sw})
			}
		}
		i = j
	}
	if len(nodes) == 0 {
		return false
	}
	// e.cd is needed on the days with flow only (sumDaily reads no other),
	// so a record that is mostly gap costs what its days with data cost.
	j := 0 // nodes[j-1].k < k <= nodes[j].k while interpolating
	first, last := nodes[0], nodes[len(nodes)-1]
	for _, k := range e.flow {
		switch {
		case k <= first.k:
			e.cd[k] = first.c
		case k >= last.k:
			e.cd[k] = last.c
		default:
			for nodes[j].k < k {
				j++
			}
			a, bn := nodes[j-1], nodes[j]
			e.cd[k] = a.c + (bn.c-a.c)*(float64(k-a.k)/float64(bn.k-a.k))
		}
		if b != 0 && e.q[k] > 0 {
			e.cd[k] *= pexp(b * e.lnq[k])
		}
	}
	return true
}

// flowAdjust switches the flow adjustment of the interpolation estimator
// on; the validation suite turns it off to show plain interpolation.
var flowAdjust = true

// flowSlope returns the slope b of ln C on ln Q fitted by weighted least
// squares to the samples with positive concentration and discharge, or 0
// when fewer than three such samples, or fewer than two discharges, take
// part.
func (e *engine) flowSlope(w, c []float64) float64 {
	var sw, sx, sy float64
	n := 0
	x0, varies := math.NaN(), false
	for i, s := range e.smp {
		if !(w[i] > 0 && c[i] > 0 && s.q > 0) {
			continue
		}
		n++
		sw += w[i]
		sx += w[i] * e.lnQ[i]
		sy += w[i] * plog(c[i])
		if math.IsNaN(x0) {
			x0 = e.lnQ[i]
		} else if e.lnQ[i] != x0 {
			varies = true
		}
	}
	if n < 3 || !varies {
		return 0
	}
	xb, yb := sx/sw, sy/sw
	var sxy, sxx float64
	for i, s := range e.smp {
		if !(w[i] > 0 && c[i] > 0 && s.q > 0) {
			continue
		}
		dx := e.lnQ[i] - xb
		sxy += w[i] * dx * (plog(c[i]) - yb)
		sxx += w[i] * dx * dx
	}
	if !(sxx > 0) {
		return 0
	}
	return sxy / sxx
}

// sumDaily adds Σ (C_d − Cref) Q_d per year into out.
func (e *engine) sumDaily(cref float64, out []float64) {
	for _, k := range e.flow {
		out[e.year[k]] += (e.cd[k] - cref) * e.q[k]
	}
}
