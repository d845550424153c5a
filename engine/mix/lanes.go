package mix

// The quantities of a draw that are linear in its errors z: the whitened
// data errors ε̃ = L⁻¹ G z of each row, and the correction's atmospheric and
// evaporite amounts of each cation and the sulfide sulfate (Affine.At).
// linearAt computes them all in one pass over z, each as the sum its own
// loop makes (the same terms in the same order), so that WebAssembly goes
// through one short loop per draw instead of eighteen.
const (
	laneEps  = 0                   // the whitened data error of each row
	laneAtm  = laneEps + maxRows   // the atmospheric amount of each cation
	laneEvap = laneAtm + NCations  // the evaporite amount of each cation
	laneSO4  = laneEvap + NCations // the sulfide sulfate
	nLanes   = laneSO4 + 1
)

// setLanes lays out the sample's gradients by error source (w.zg) and the
// lanes' starting values (w.z0), or notes that linearAt must use the loops
// (a gradient not of length q).
func (w *sampleWork) setLanes() {
	st := w.st
	q := st.q
	w.lanes = len(st.m) == st.r*q && len(st.so4.Grad) == q
	for c := range NCations {
		w.lanes = w.lanes && len(st.atm[c].Grad) == q && len(st.evap[c].Grad) == q
	}
	if !w.lanes {
		return
	}
	w.zg = zeroed(w.zg, q*nLanes)
	for s := range q {
		g := w.zg[s*nLanes : (s+1)*nLanes]
		for i := range st.r {
			g[laneEps+i] = st.m[i*q+s]
		}
		for c := range NCations {
			g[laneAtm+c], g[laneEvap+c] = st.atm[c].Grad[s], st.evap[c].Grad[s]
		}
		g[laneSO4] = st.so4.Grad[s]
	}
	w.z0 = [nLanes]float64{}
	for c := range NCations {
		w.z0[laneAtm+c], w.z0[laneEvap+c] = st.atm[c].Value, st.evap[c].Value
	}
	w.z0[laneSO4] = st.so4.Value
}

// linearAt sets w.zl to the lanes at the draw's errors w.z.
func (w *sampleWork) linearAt() {
	st := w.st
	if !w.lanes {
		q := st.q
		for i := range st.r {
			s := 0.0
			mi := st.m[i*q : (i+1)*q]
			for c, zc := range w.z {
				s += float64(mi[c] * zc)
			}
			w.zl[laneEps+i] = s
		}
		for c := range NCations {
			w.zl[laneAtm+c], w.zl[laneEvap+c] = st.atm[c].At(w.z), st.evap[c].At(w.z)
		}
		w.zl[laneSO4] = st.so4.At(w.z)
		return
	}
	acc := w.z0
	for c, zc := range w.z {
		g := (*[nLanes]float64)(w.zg[c*nLanes:])
		acc[0] += float64(g[0] * zc)
		acc[1] += float64(g[1] * zc)
		acc[2] += float64(g[2] * zc)
		acc[3] += float64(g[3] * zc)
		acc[4] += float64(g[4] * zc)
		acc[5] += float64(g[5] * zc)
		acc[6] += float64(g[6] * zc)
		acc[7] += float64(g[7] * zc)
		acc[8] += float64(g[8] * zc)
		acc[9] += float64(g[9] * zc)
		acc[10] += float64(g[10] * zc)
		acc[11] += float64(g[11] * zc)
		acc[12] += float64(g[12] * zc)
		acc[13] += float64(g[13] * zc)
		acc[14] += float64(g[14] * zc)
		acc[15] += float64(g[15] * zc)
		acc[16] += float64(g[16] * zc)
	}
	w.zl = acc
}

// splitOf and setSplit write the sources out one by one: there are four.
var _ = [1]struct{}{}[NSources-4]
