package mix

import (
	"fmt"
	"math"
	"strings"

	"lixiv/engine/internal/portable"
)

// Thresholds of the verdict (docs/methods.md §7.7; the numbers are
// common practice or engineering choices, no source).
const (
	fitLevel      = 0.01 // posterior predictive probability below which a sample does not fit (the brief's)
	wellSampled   = 200  // effective sample size below which a posterior is poorly sampled (the brief's "say below 200")
	priorDecides  = 0.8  // posterior over prior 95 % width of a fraction from which the ranges decide
	wideSplit     = 0.1  // ... when that posterior width is at least this
	corrWarn      = 0.9  // |posterior correlation| of two fractions that draws a warning (the brief's)
	keepRelWeight = 1e-12
)

// finish turns the draws of a sample into its summary, verdict and stored
// posterior.
func (r *Run) finish(w *sampleWork) {
	sr := &r.res.Samples[w.s]
	st := w.st
	n := r.n
	nan := math.NaN()
	sr.Alpha = make([]Interval, n)
	sr.PriorWidth = make([]float64, n)
	sr.Active = make([]bool, n)
	for _, j := range st.act {
		sr.Active[j] = true
	}
	for j := range n {
		sr.PriorWidth[j] = nan
		if sr.Active[j] {
			sr.Alpha[j] = Interval{Lo: nan, Median: nan, Hi: nan}
		}
	}
	sr.ESS, sr.PPP = nan, nan
	switch {
	case st.skip:
		sr.Status, sr.Verdict = Skipped, "skipped: "+skipReason(sr.Warnings)
		sr.setQuantilesNaN()
		return
	}
	w.wt = sized(w.wt, w.n)
	wt := w.wt
	ess := w.weights(wt)
	sr.ESS, sr.Draws, sr.Stages, sr.Stop = ess, w.n, len(w.nStage), w.stop
	idx := &w.idx
	// Summaries over the draws that carry weight (lighter than 1e-12 of
	// the largest, a draw adds nothing measurable).
	keep := w.keep[:0]
	for i := range w.n {
		if wt[i] > keepRelWeight {
			keep = append(keep, i)
		}
	}
	w.keep = keep
	w.kw = sized(w.kw, len(keep))
	kw := w.kw
	for a, i := range keep {
		kw[a] = wt[i]
	}
	w.col = sized(w.col, max(len(keep), w.nStage[0]))
	col := w.col
	// Na fractions of the end-members taking part, their prior widths and
	// correlations.
	k := w.k
	n0 := w.nStage[0]
	for jj, j := range st.act {
		for a, i := range keep {
			col[a] = w.frac(i, jj)
		}
		iv := weightedInterval(col[:len(keep)], kw, idx)
		sr.Alpha[j] = iv
		for i := range n0 {
			col[i] = w.frac(i, jj)
		}
		prior := interval(col[:n0])
		if pw := prior.Hi - prior.Lo; pw > 0 {
			sr.PriorWidth[j] = (iv.Hi - iv.Lo) / pw
		} else if iv.Hi-iv.Lo == 0 {
			sr.PriorWidth[j] = 0
		}
		if sr.PriorWidth[j] >= priorDecides && iv.Hi-iv.Lo >= wideSplit {
			sr.PriorDecided = true
		}
	}
	// The chance that the draws give no rock-derived Na at all: where it is
	// high, the split of that nothing is no statement about the ranges.
	p0, sw0 := 0.0, 0.0
	for a, i := range keep {
		sw0 += kw[a]
		none := true
		for _, v := range w.amounts(i) {
			none = none && v == 0
		}
		if none {
			p0 += kw[a]
		}
	}
	sr.NoRock = p0 / sw0
	if sr.NoRock >= 0.5 {
		sr.PriorDecided = false
	}
	sr.Corr = make([][]float64, n)
	for i := range sr.Corr {
		sr.Corr[i] = make([]float64, n)
		for j := range sr.Corr[i] {
			sr.Corr[i][j] = nan
		}
	}
	var corr [MaxEndMembers][MaxEndMembers]float64
	w.corrs(keep, kw, &corr)
	for a := range k {
		for b := range k {
			sr.Corr[st.act[a]][st.act[b]] = corr[a][b]
		}
	}
	for a := range k {
		for b := a + 1; b < k; b++ {
			if rho := sr.Corr[st.act[a]][st.act[b]]; abs(rho) > corrWarn {
				sr.Warnings = append(sr.Warnings, fmt.Errorf("%w: the Na from %s and from %s in sample %q correlate (ρ = %.2f): the tracers cannot split them",
					ErrCorrelated, r.prob.EndMembers[st.act[a]].Name, r.prob.EndMembers[st.act[b]].Name, sr.Name, rho))
			}
		}
	}
	// Amounts and shares, source by source.
	var present [NSources]bool
	for _, j := range st.act {
		present[r.prob.EndMembers[j].Source] = true
	}
	for c := range NCations {
		present[Atmosphere] = present[Atmosphere] || st.atm[c].Value != 0 || st.atm[c].Grad != nil
		present[Evaporite] = present[Evaporite] || st.evap[c].Value != 0 || st.evap[c].Grad != nil
	}
	w.shr = sized(w.shr, len(keep))
	shr := w.shr
	w.splits = sized(w.splits, len(keep))
	splits := w.splits
	for a, i := range keep {
		splits[a] = w.split(i)
	}
	for src := range NSources {
		if !present[src] {
			continue
		}
		for c := range NCations {
			for a := range keep {
				sp := &splits[a]
				col[a] = sp[src][c]
				tot := sp[0][c] + sp[1][c] + sp[2][c] + sp[3][c]
				shr[a] = 0
				if tot > 0 {
					shr[a] = sp[src][c] / tot
				}
			}
			iv := weightedInterval(col[:len(keep)], kw, idx)
			sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
			iv = weightedInterval(shr, kw, idx)
			sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
			if c != 1 && (src == Silicate || src == Carbonate || src == Evaporite) && iv.Hi-iv.Lo >= wideSplit {
				// The same share under the prior draws alone, unweighted:
				// near as wide, and the end-member ranges decide it.
				for i := range n0 {
					sp := w.split(i)
					col[i] = 0
					if tot := sp[0][c] + sp[1][c] + sp[2][c] + sp[3][c]; tot > 0 {
						col[i] = sp[src][c] / tot
					}
				}
				if pr := interval(col[:n0]); pr.Hi-pr.Lo > 0 && (iv.Hi-iv.Lo)/(pr.Hi-pr.Lo) >= priorDecides {
					sr.PriorDecided = true
				}
			}
		}
	}
	// Fit: posterior predictive probability of the misfit.
	sw, sp := 0.0, 0.0
	for a, i := range keep {
		sw += kw[a]
		sp += kw[a] * chi2Survival(st.r, w.at(i, oD))
	}
	sr.PPP = sp / sw
	sr.Misfit = r.misfit(w, keep, kw, col, idx)
	sr.Bounds = r.bounds(w, keep, kw, col, idx)
	sr.Status = Fits
	if sr.PPP < fitLevel {
		sr.Status = NoFit
	}
	sr.WellSampled = ess >= min(wellSampled, float64(r.opt.TargetESS))
	sr.Verdict = r.verdict(sr)
	if st.naFree && sr.Status == NoFit {
		// No mix of the Na-normalised end-members fits a water without
		// Na: the Na-free rule answers instead.
		r.naFree(sr, w)
		return
	}
	if !sr.WellSampled {
		sr.Warnings = append(sr.Warnings, fmt.Errorf("%w: sample %q has an effective sample size of %.0f from %d draws", ErrPoorlySampled, sr.Name, ess, w.n))
	}
	// The stored posterior.
	sr.draws = make([]kept, len(keep))
	for a, i := range keep {
		sr.draws[a] = kept{split: splits[a], so4: w.so4(i), w: kw[a]}
	}
}

// corrs sets corr[a][b] to the weighted correlation of the Na contributed
// by the a-th and b-th end-members taking part (NaN when one does not
// vary): near −1, the data fix their sum but not the split between them.
// Each pair's sums are those of a pass of its own over the draws, formed
// for all pairs in two passes.
func (w *sampleWork) corrs(keep []int, kw []float64, corr *[MaxEndMembers][MaxEndMembers]float64) {
	k := w.k
	var sw float64
	var m [MaxEndMembers]float64
	for x, i := range keep {
		f := w.amounts(i)
		sw += kw[x]
		for a := range k {
			m[a] += kw[x] * f[a]
		}
	}
	for a := range k {
		m[a] /= sw
	}
	var s [MaxEndMembers][MaxEndMembers]float64 // s[a][b]: the sum of kw·da·db, in that order
	for x, i := range keep {
		f := w.amounts(i)
		var d [MaxEndMembers]float64
		for a := range k {
			d[a] = f[a] - m[a]
		}
		for a := range k {
			for b := range k {
				s[a][b] += kw[x] * d[a] * d[b]
			}
		}
	}
	for a := range k {
		for b := range k {
			corr[a][b] = math.NaN()
			if s[a][a] > 0 && s[b][b] > 0 {
				corr[a][b] = s[a][b] / math.Sqrt(s[a][a]*s[b][b])
			}
		}
	}
}

// misfit finds the datum with the largest weighted mean standardised
// residual and describes it, as a ratio to Na where it has one.
func (r *Run) misfit(w *sampleWork, keep []int, kw, col []float64, idx *[]wpair) *Misfit {
	st := w.st
	worst, wz := 0, -1.0
	var zbar [maxRows]float64
	sw := 0.0
	for a, i := range keep {
		sw += kw[a]
		pr := w.pred(i)
		for row := 0; row < st.r; row++ {
			zbar[row] += kw[a] * (st.y[row] - pr[row]) / st.sd[row]
		}
	}
	for row := 0; row < st.r; row++ {
		zbar[row] /= sw
		if a := abs(zbar[row]); a > wz {
			worst, wz = row, a
		}
	}
	m := &Misfit{Tracer: st.tr[worst], Z: zbar[worst]}
	// The value of row `worst`, as a ratio to Na (to Sr for the isotope
	// when Sr/Na is a row of its own), from data or from a draw's fit.
	den := 0
	if m.Tracer == Sr87Sr86 {
		den = -1
		for row := 1; row < st.r; row++ {
			if st.tr[row] == SrNa {
				den = row
			}
		}
	}
	ratio := func(v []float64) float64 {
		switch {
		case worst == 0:
			return v[0]
		case den < 0 || !(v[den] > 0):
			return math.NaN()
		}
		return v[worst] / v[den]
	}
	m.Measured = ratio(st.y[:st.r])
	m.Lo, m.Hi = math.Inf(1), math.Inf(-1)
	for i := range w.n {
		if v := ratio(w.pred(i)); !math.IsNaN(v) {
			m.Lo, m.Hi = portable.Min(m.Lo, v), fmax(m.Hi, v) // the built-ins, without their calls in WebAssembly
		}
	}
	for a, i := range keep {
		col[a] = ratio(w.pred(i))
	}
	name := "Na*"
	if worst > 0 {
		name = m.Tracer.String()
	}
	if math.IsNaN(m.Measured) || math.IsInf(m.Lo, 0) {
		m.Fitted = math.NaN()
		m.Text = fmt.Sprintf("%s is %.1f standard errors from the fit", name, abs(m.Z))
		return m
	}
	ws := make([]float64, len(keep))
	for a := range keep {
		if !math.IsNaN(col[a]) {
			ws[a] = kw[a]
		} else {
			col[a] = 0
		}
	}
	m.Fitted = weightedInterval(col[:len(keep)], ws, idx).Median
	unit := ""
	if worst == 0 {
		unit = " µmol/L"
	}
	switch {
	case m.Measured > m.Hi*(1+1e-9) && m.Hi > 0:
		m.Text = fmt.Sprintf("%s (%.3g) is %.2g times the largest any draw gives (%.3g)", name, m.Measured, m.Measured/m.Hi, m.Hi)
	case m.Measured < m.Lo*(1-1e-9):
		m.Text = fmt.Sprintf("%s (%.3g) is %.2g times the smallest any draw gives (%.3g)", name, m.Measured, m.Measured/m.Lo, m.Lo)
	default:
		m.Text = fmt.Sprintf("%s measured %.3g%s, fitted %.3g", name, m.Measured, unit, m.Fitted)
	}
	return m
}

// bounds lists the likelihood's ratios whose weighted posterior median
// latent lies beyond the prior's 95 % range.
func (r *Run) bounds(w *sampleWork, keep []int, kw, col []float64, idx *[]wpair) []Bound {
	var out []Bound
	for a, k := range w.st.dims {
		for x, i := range keep {
			col[x] = w.latents(i)[a]
		}
		med := weightedInterval(col[:len(keep)], kw, idx).Median
		if abs(med) <= z975 {
			continue
		}
		d := r.dims[k]
		s := &r.smp[d.t][d.em]
		edge := z975
		if med < 0 {
			edge = -z975
		}
		out = append(out, Bound{EndMember: d.em, Tracer: d.t, Upper: med > 0,
			Limit: pexp(s.fromLatent(edge)), Median: pexp(s.fromLatent(med))})
	}
	return out
}

// verdict writes the sample's status in words.
func (r *Run) verdict(sr *SampleResult) string {
	var parts []string
	if sr.Status == NoFit {
		t := "does not fit"
		if sr.Misfit != nil {
			t += ": " + sr.Misfit.Text
		}
		parts = append(parts, t)
	} else if len(sr.Bounds) > 0 {
		parts = append(parts, "fits only with end-member ratios beyond their ranges")
	} else {
		parts = append(parts, "fits")
	}
	if sr.NoRock >= 0.5 {
		parts = append(parts, fmt.Sprintf("no rock-derived Na detected (%.0f %% of the posterior has none)", 100*sr.NoRock))
	}
	if sr.PriorDecided {
		parts = append(parts, "the end-member ranges decide the split")
	}
	for i, b := range sr.Bounds {
		if i == 2 {
			parts = append(parts, fmt.Sprintf("%d more ratios at the edge of their range", len(sr.Bounds)-2))
			break
		}
		edge := "lower"
		if b.Upper {
			edge = "upper"
		}
		parts = append(parts, fmt.Sprintf("%s %s %.3g, beyond the %s edge of its range (%.3g)", r.prob.EndMembers[b.EndMember].Name, b.Tracer, b.Median, edge, b.Limit))
	}
	if !sr.WellSampled {
		parts = append(parts, fmt.Sprintf("poorly sampled (ESS %.0f from %d draws)", sr.ESS, sr.Draws))
	}
	return strings.Join(parts, "; ")
}

// naFree answers a sample whose Na* is zero or below and which no mix of
// the end-members fits (a pure calcite water, say: every carbonate
// end-member carries some Na). The Na-normalised end-members are undefined
// there, so no silicate or evaporite Na is assigned, Ca* and Mg* go to the
// (first) carbonate end-member and K* to silicate, as the forward model
// takes it (docs/methods.md §7.8). Its draws carry the errors of the
// data: TargetESS draws of the corrected concentrations, equally weighted.
func (r *Run) naFree(sr *SampleResult, w *sampleWork) {
	st := &sr.setup
	sr.Alpha = make([]Interval, r.n)
	sr.Misfit, sr.Bounds, sr.Corr = nil, nil, nil
	sr.PriorDecided = false
	for j := range sr.PriorWidth {
		sr.PriorWidth[j] = math.NaN()
		if sr.Active[j] {
			sr.Alpha[j] = Interval{Lo: math.NaN(), Median: math.NaN(), Hi: math.NaN()}
		}
	}
	carb := -1
	for _, j := range st.act {
		if r.prob.EndMembers[j].Source == Carbonate {
			carb = j
			break
		}
	}
	sr.Warnings = append(sr.Warnings, fmt.Errorf("%w: sample %q, Na* = %.4g µmol/L", ErrNaFree, sr.Name, st.x[0].Value))
	if carb < 0 {
		sr.Status = Skipped
		sr.Verdict = "skipped: Na* ≤ 0 after the corrections and no carbonate end-member to take Ca* and Mg*"
		sr.setQuantilesNaN()
		return
	}
	nd := r.opt.TargetESS
	sr.draws = make([]kept, nd)
	for k := range sr.draws {
		for i := range w.z {
			w.z[i] = normQuantile(uniform(w.zrng))
		}
		var sp Split
		for c := range NCations {
			sp[Atmosphere][c] = max(0, st.atm[c].At(w.z))
			sp[Evaporite][c] = max(0, st.evap[c].At(w.z))
		}
		// What is left of the measured cation after the draw's atmospheric
		// and evaporite amounts, as in splitOf.
		x := func(c int) float64 { return max(0, st.in[c]-sp[Atmosphere][c]-sp[Evaporite][c]) }
		sp[Carbonate][2], sp[Carbonate][3] = x(2), x(3)
		sp[Silicate][1] = x(1)
		sr.draws[k] = kept{split: sp, so4: max(0, st.so4.At(w.z)), w: 1}
	}
	ones := make([]float64, nd)
	col, shr := make([]float64, nd), make([]float64, nd)
	for i := range ones {
		ones[i] = 1
	}
	var buf []wpair
	for src := range NSources {
		for c := range NCations {
			for k := range sr.draws {
				sp := &sr.draws[k].split
				col[k] = sp[src][c]
				shr[k] = 0
				if tot := sp[0][c] + sp[1][c] + sp[2][c] + sp[3][c]; tot > 0 {
					shr[k] = sp[src][c] / tot
				}
			}
			iv := weightedInterval(col, ones, &buf)
			sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
			iv = weightedInterval(shr, ones, &buf)
			sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
		}
	}
	sr.Status, sr.WellSampled = Rule, true
	sr.ESS, sr.Draws = float64(nd), w.n+nd
	x := func(c int) float64 { return max(0, st.x[c].Value) }
	switch {
	case x(1) == 0 && x(2) == 0 && x(3) == 0:
		sr.Verdict = "rain only: no rock-derived cations (Na*, K*, Ca* and Mg* ≤ 0 after the corrections)"
	case x(1) > 0:
		sr.Verdict = "Na* ≤ 0: no silicate or evaporite Na; all Ca* and Mg* to carbonate, K* to silicate"
	default:
		sr.Verdict = "Na* ≤ 0: no silicate or evaporite Na; all Ca* and Mg* to carbonate"
	}
}

func (sr *SampleResult) setQuantilesNaN() {
	nan := math.NaN()
	for src := range NSources {
		for c := range NCations {
			sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = nan, nan, nan
			sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c] = nan, nan, nan
		}
	}
}

// skipReason returns the text of the first skip warning.
func skipReason(ws []error) string {
	for _, w := range ws {
		if s := w.Error(); strings.HasPrefix(s, ErrSkipped.Error()+": ") {
			return strings.TrimPrefix(s, ErrSkipped.Error()+": ")
		}
	}
	return "no usable data"
}
