package mix

import (
	"math"
	"math/rand/v2"
	"slices"
)

// sampleStream and errorStream are the second PCG words of a sample's own
// streams: refinement draws, and the errors of its data.
const (
	sampleStream = 0x6c8e9cf570932bd5
	errorStream  = 0x6572726f72732d7a // "errors-z"
)

var debugStages = false

// fitDraws is the effective sample a proposal is fitted to, at least
// (tempering the likelihood when the draws so far give fewer).
const fitDraws = 300

// exploreStage is the size of a stage fitted to a tempered likelihood.
const exploreStage = 300

// minStage is the smallest refinement stage, in draws.
const minStage = 200

// sampleWork is one sample in progress: its draws so far, stage by stage.
type sampleWork struct {
	s        int
	st       *setup
	rng      *rand.Rand // end-member ratios, faces and amounts
	zrng     *rand.Rand // errors of the data
	d, k     int        // latent dimensions and end-members taking part
	stride   int        // floats per draw record
	props    []proposal
	size     int // draws planned for the current stage
	planned  int // draws planned so far, over all stages (for progress)
	n        int // draws so far
	eff      float64
	essStart float64    // ESS of all draws when the current stage began
	own      [3]float64 // the current stage's own weights: log scale, sum, sum of squares
	stop     Stop
	finished bool

	theta [NTracers][MaxEndMembers]float64
	fits  [1 << MaxEndMembers]faceFit // slabDraw's working space

	workBufs
}

// workBufs are a sample's growing records and working space. A Run hands
// them from a finished sample to the next (Run.begin, Run.release), so that
// a run allocates them once per goroutine rather than once per sample;
// every element is written before it is read.
type workBufs struct {
	rec     []float64
	stageOf []int8
	ell     [][]float64 // ell[s-1][draw]: log of stage s's Gaussian over the prior density
	nStage  []int       // draws taken in each stage
	lq      []float64   // log mixture density over the prior density, per draw

	z, eta, u []float64

	ellFree      [][]float64 // ell rows of earlier samples, for reuse
	wt, lw, lc   []float64   // endStage's, mixture's and finish's working space
	kw, col, shr []float64
	keep         []int
	splits       []Split
	idx          []wpair
}

// Offsets in a draw record (after the d latents).
const (
	oLogL = iota // log likelihood of the draw's ratios
	oFace        // the set of end-members present in the draw, as a bit mask
	oD           // misfit of the data at the draw's (perturbed) solution, for the predictive check
	oFrac        // the k amounts of Na, then the split, the sulfide sulfate and the predicted data
)

// amounts returns the µmol/L of Na from each end-member taking part in
// draw k.
func (w *sampleWork) amounts(k int) []float64 {
	o := k*w.stride + w.d + oFrac
	return w.rec[o : o+w.k]
}

// frac returns the Na fraction of the jj-th end-member taking part in draw
// k (0 when the draw has no rock-derived Na).
func (w *sampleWork) frac(k, jj int) float64 {
	n := w.amounts(k)
	t := 0.0
	for _, v := range n {
		t += v
	}
	if t > 0 {
		return n[jj] / t
	}
	return 0
}

func (w *sampleWork) split(k int) (sp Split) {
	o := k*w.stride + w.d + oFrac + w.k
	for src := range NSources {
		copy(sp[src][:], w.rec[o+int(src)*NCations:o+int(src+1)*NCations])
	}
	return sp
}

func (w *sampleWork) setSplit(k int, sp *Split) {
	o := k*w.stride + w.d + oFrac + w.k
	for src := range NSources {
		copy(w.rec[o+int(src)*NCations:o+int(src+1)*NCations], sp[src][:])
	}
}

func (w *sampleWork) so4(k int) float64 {
	return w.rec[k*w.stride+w.d+oFrac+w.k+int(NSources)*NCations]
}

func (w *sampleWork) pred(k int) []float64 {
	o := k*w.stride + w.d + oFrac + w.k + int(NSources)*NCations + 1
	return w.rec[o : o+w.st.r]
}

func (w *sampleWork) latents(k int) []float64 { return w.rec[k*w.stride : k*w.stride+w.d] }

func (w *sampleWork) at(k, off int) float64 { return w.rec[k*w.stride+w.d+off] }

// begin starts sample s, on the buffers of a finished sample when the run
// has one spare.
func (r *Run) begin(s int) *sampleWork {
	sr := &r.res.Samples[s]
	st := &sr.setup
	w := r.spareWork()
	bufs := w.workBufs
	*w = sampleWork{s: s, st: st, d: len(st.dims), k: st.k, eff: 0.3, workBufs: bufs}
	if st.skip {
		w.finished = true
		return w
	}
	w.rng = rand.New(rand.NewPCG(r.opt.Seed^sampleStream, uint64(s)))
	// The data perturbations come from a stream of their own, so that an
	// error source of no effect (a spread of 0 against one too small to
	// move a value) leaves the other draws unchanged.
	w.zrng = rand.New(rand.NewPCG(r.opt.Seed^errorStream, uint64(s)))
	w.stride = w.d + oFrac + w.k + int(NSources)*NCations + 1 + st.r
	w.size = min(r.opt.Draws, r.opt.MaxDraws)
	w.planned = w.size
	w.nStage = append(w.nStage[:0], 0)
	w.rec = slices.Grow(w.rec[:0], w.size*w.stride)
	w.stageOf = w.stageOf[:0]
	w.z = zeroed(w.z, st.q)
	w.eta = zeroed(w.eta, w.d)
	w.u = zeroed(w.u, w.d)
	return w
}

// spareWork returns the sample work a finished sample left, or a new one.
func (r *Run) spareWork() *sampleWork {
	r.spareMu.Lock()
	defer r.spareMu.Unlock()
	if n := len(r.spare); n > 0 {
		w := r.spare[n-1]
		r.spare = r.spare[:n-1]
		return w
	}
	return new(sampleWork)
}

// release hands a finished sample's buffers to the next sample begun.
func (r *Run) release(w *sampleWork) {
	w.ellFree = append(w.ellFree, w.ell...)
	clear(w.ell)
	w.ell = w.ell[:0]
	clear(w.props)
	w.props = w.props[:0]
	r.spareMu.Lock()
	defer r.spareMu.Unlock()
	r.spare = append(r.spare, w)
}

// dropSpares lets the buffers of a finished run go.
func (r *Run) dropSpares() {
	r.spareMu.Lock()
	defer r.spareMu.Unlock()
	clear(r.spare)
	r.spare = nil
}

// zeroed returns buf resized to n, every element 0.
func zeroed(buf []float64, n int) []float64 {
	buf = slices.Grow(buf[:0], n)[:n]
	clear(buf)
	return buf
}

// sized returns buf resized to n; its elements are left as they were.
func sized[T any](buf []T, n int) []T { return slices.Grow(buf[:0], n)[:n] }

// advance takes up to budget more draws of the sample, ending stages and
// starting new ones as it goes, and returns the draws taken.
func (w *sampleWork) advance(r *Run, budget int) int {
	done := 0
	for done < budget && !w.finished {
		s := len(w.nStage) - 1
		if w.nStage[s] >= w.size {
			w.endStage(r)
			continue
		}
		r.drawOne(w, s)
		w.nStage[s]++
		w.n++
		done++
		// A refinement stage ends early once its own effective draws
		// with those before it reach the target (checked now and then;
		// the sample's ESS is then computed over all draws).
		if s > 0 && w.nStage[s]%128 == 0 {
			if o := &w.own; o[2] > 0 && w.essStart+o[1]*o[1]/o[2] >= float64(r.opt.TargetESS) {
				w.size = w.nStage[s]
			}
		}
	}
	return done
}

// drawOne takes one draw of stage s.
func (r *Run) drawOne(w *sampleWork, s int) {
	st := w.st
	n := r.n
	if s == 0 {
		i := w.nStage[0]
		tab := r.table[i*int(NTracers)*n : (i+1)*int(NTracers)*n]
		for t := range NTracers {
			if !r.need[t] {
				continue
			}
			for _, j := range st.act {
				w.theta[t][j] = tab[int(t)*n+j]
			}
		}
		for a, k := range st.dims {
			w.eta[a] = r.eta[i*len(r.dims)+k]
		}
	} else {
		prior := uniform(w.rng) < defensive
		uc := uniform(w.rng)
		for a := range w.eta {
			w.u[a] = normQuantile(uniform(w.rng))
		}
		if prior {
			copy(w.eta, w.u)
		} else {
			w.props[s-1].draw(uc, w.u, w.eta)
		}
		for a, k := range st.dims {
			d := r.dims[k]
			w.theta[d.t][d.em] = pexp(r.smp[d.t][d.em].fromLatent(w.eta[a]))
		}
		for t := range NTracers {
			if !r.need[t] {
				continue
			}
			for _, j := range st.act {
				sm := &r.smp[t][j]
				switch {
				case sm.constant:
					w.theta[t][j] = sm.v
				case !r.lik[t]:
					w.theta[t][j] = sm.draw(uniform(w.rng))
				}
			}
		}
	}
	for i := range w.z {
		w.z[i] = normQuantile(uniform(w.zrng))
	}
	k := len(w.stageOf)
	w.stageOf = append(w.stageOf, int8(min(s, 127)))
	if len(w.rec)+w.stride > cap(w.rec) {
		w.rec = slices.Grow(w.rec, max(w.stride, len(w.rec)))
	}
	w.rec = w.rec[:len(w.rec)+w.stride]
	clear(w.rec[len(w.rec)-w.stride:])
	copy(w.latents(k), w.eta)
	for si := range w.props {
		w.ell[si] = append(w.ell[si], w.props[si].ell(w.eta, w.u))
	}
	r.eval(w, k)
	if s > 0 {
		e := w.ell[s-1][k]
		big := fmax(plog(defensive), plog(1-defensive)+e)
		lw := w.at(k, oLogL) - (big + plog(pexp(plog(defensive)-big)+pexp(plog(1-defensive)+e-big)))
		if o := &w.own; !math.IsInf(lw, -1) {
			if o[1] == 0 {
				o[0] = lw
			} else if lw > o[0] {
				f := pexp(o[0] - lw)
				o[0], o[1], o[2] = lw, o[1]*f, o[2]*f*f
			}
			v := pexp(lw - o[0])
			o[1] += v
			o[2] += v * v
		}
	}
}

// eval solves draw k: the whitened design Ã = L⁻¹A of the draw's ratios,
// the normal equations, the exact non-negative least squares for the data
// (its χ² is the draw's likelihood) and for the data perturbed by the
// draw's errors (its solution is the draw's split), and the amounts.
func (r *Run) eval(w *sampleWork, k int) {
	st := w.st
	R, K := st.r, st.k
	th := &w.theta
	var A, At [maxRows][MaxEndMembers]float64
	design(st, th, &A)
	var H mat6
	var b0, b1, n0, n1 vec6
	whiten(R, K, &st.linv, &A, &At)
	gram(R, K, &At, &st.yt, &H, &b0)
	// Perturbation of the whitened data: ε̃ = L⁻¹ G z.
	var eps [maxRows]float64
	q := st.q
	for i := 0; i < R; i++ {
		s := 0.0
		mi := st.m[i*q : (i+1)*q]
		for c, zc := range w.z {
			s += float64(mi[c] * zc)
		}
		eps[i] = s
	}
	for i := 0; i < K; i++ {
		s1 := 0.0
		for p := 0; p < R; p++ {
			s1 += float64(At[p][i] * eps[p])
		}
		b1[i] = b0[i] + s1
	}
	var dd, logL float64
	if r.opt.perturb {
		nnls(K, &H, &b0, &n0)
		nnls(K, &H, &b1, &n1)
		chi2 := fmax(0, st.yy-2*dot(K, &b0, &n0)+quad(K, &H, &n0))
		dd = fmax(0, st.yy-2*dot(K, &b0, &n1)+quad(K, &H, &n1))
		logL = -0.5 * chi2
		if !r.opt.noVolume && R >= K {
			hd, ok := logDetChol(K, &H)
			if !ok {
				hd = 0.5 * float64(K) * plog(1e-13*fmax(H[0][0], 1e-300))
			}
			logL -= hd
		}
	} else {
		var c vec6
		for jj, j := range st.act {
			c[jj] = 1 + th[KNa][j] + 2*th[CaNa][j] + 2*th[MgNa][j]
		}
		logL = r.slabDraw(w, K, &H, &b0, st.yy, &c, &n1)
		if logL != logL {
			logL = math.Inf(-1)
		}
		dd = fmax(0, st.yy-2*dot(K, &b0, &n1)+quad(K, &H, &n1))
		n0 = n1
	}
	o := k*w.stride + w.d
	rec := w.rec
	face := 0
	for jj := 0; jj < K; jj++ {
		if n1[jj] > 0 {
			face |= 1 << jj
		}
	}
	rec[o+oLogL], rec[o+oFace], rec[o+oD] = logL, float64(face), dd
	copy(w.amounts(k), n1[:K])
	pr := w.pred(k)
	for i := 0; i < R; i++ {
		s := 0.0
		for jj := 0; jj < K; jj++ {
			s += float64(A[i][jj] * n0[jj])
		}
		pr[i] = s
	}
	var sp Split
	r.splitOf(w, &n1, &sp)
	w.setSplit(k, &sp)
	w.rec[o+oFrac+K+int(NSources)*NCations] = fmax(0, st.so4.At(w.z))
}

// design fills A with the design of st's rows for the ratios th: 1 in the
// Na row, each end-member's ratio in a tracer's row, and Sr/Na × 87Sr/86Sr
// in the isotope's.
func design(st *setup, th *[NTracers][MaxEndMembers]float64, A *[maxRows][MaxEndMembers]float64) {
	tr := &st.tr
	t1, t2, t3, t4, t5, t6, t7 := tr[1], tr[2], tr[3], tr[4], tr[5], tr[6], tr[7]
	for jj, j := range st.act {
		// Every row of the data (rows past them are left as they are), then
		// the isotope's.
		switch st.r {
		case 8:
			A[7][jj] = th[t7][j]
			fallthrough
		case 7:
			A[6][jj] = th[t6][j]
			fallthrough
		case 6:
			A[5][jj] = th[t5][j]
			fallthrough
		case 5:
			A[4][jj] = th[t4][j]
			fallthrough
		case 4:
			A[3][jj] = th[t3][j]
			fallthrough
		case 3:
			A[2][jj] = th[t2][j]
			fallthrough
		case 2:
			A[1][jj] = th[t1][j]
			fallthrough
		default:
			A[0][jj] = 1
		}
		if st.iso > 0 {
			A[st.iso][jj] = float64(th[SrNa][j] * th[Sr87Sr86][j])
		}
	}
}

// splitOf fills sp with the draw's amount of each cation from each source:
// the correction's atmospheric and evaporite amounts (drawn with the
// errors of the correction's inputs), and each end-member's share of the
// model amounts (n_j times its ratio) of what is left of the measured
// cation, so that the sources add up to the measured amount, draw by draw,
// and no end-member gets more than the corrected amount; a cation not
// measured keeps the model amounts.
func (r *Run) splitOf(w *sampleWork, n *vec6, sp *Split) {
	st := w.st
	var m Split
	for jj, j := range st.act {
		src := r.prob.EndMembers[j].Source
		m[src][0] += n[jj]
		m[src][1] += float64(w.theta[KNa][j] * n[jj])
		m[src][2] += float64(w.theta[CaNa][j] * n[jj])
		m[src][3] += float64(w.theta[MgNa][j] * n[jj])
	}
	for c := range NCations {
		atm, evap := fmax(0, st.atm[c].At(w.z)), fmax(0, st.evap[c].At(w.z))
		tot := m[0][c] + m[1][c] + m[2][c] + m[3][c]
		x := fmax(0, st.in[c]-atm-evap)
		for src := range NSources {
			v := m[src][c]
			if st.has[c] {
				v = 0
				if tot > 0 {
					v = m[src][c] / tot * x
				}
			}
			sp[src][c] = v
		}
		sp[Atmosphere][c] += atm
		sp[Evaporite][c] += evap
	}
}

func dot(k int, a, b *vec6) float64 {
	s := 0.0
	for i := 0; i < k; i++ {
		s += float64(a[i] * b[i])
	}
	return s
}

func quad(k int, H *mat6, n *vec6) float64 {
	s := 0.0
	for i := 0; i < k; i++ {
		v := 0.0
		for j := 0; j < k; j++ {
			v += float64(H[i][j] * n[j])
		}
		s += float64(n[i] * v)
	}
	return s
}

// weights fills wt with the balance-heuristic weights of all draws so far,
// scaled to a largest weight of 1, and returns their effective sample size
// (sum w)² / sum w².
func (w *sampleWork) weights(wt []float64) float64 {
	w.mixture()
	return w.tempered(wt, 1)
}

// mixture sets w.lq[k] to the log of the mixture of the stage proposals
// over the prior density at draw k, log(c0 + sum_s c_s e^ell_s), with c0
// the share of prior draws (stage 0 and the defensive part of every later
// stage) and c_s the share of the Gaussian part of stage s.
func (w *sampleWork) mixture() {
	nTot := float64(w.n)
	c0 := float64(w.nStage[0])
	for s := 1; s < len(w.nStage); s++ {
		c0 += defensive * float64(w.nStage[s])
	}
	lc0 := plog(c0 / nTot)
	w.lc = sized(w.lc, len(w.props))
	lc := w.lc
	for s := range w.props {
		lc[s] = plog((1 - defensive) * float64(w.nStage[s+1]) / nTot)
	}
	w.lq = slices.Grow(w.lq[:0], w.n)[:w.n]
	for k := 0; k < w.n; k++ {
		big := lc0
		for s := range w.props {
			big = fmax(big, lc[s]+w.ell[s][k])
		}
		sum := pexp(lc0 - big)
		for s := range w.props {
			sum += pexp(lc[s] + w.ell[s][k] - big)
		}
		w.lq[k] = big + plog(sum)
	}
}

// tempered fills wt with the weights of the likelihood raised to the power
// beta (after mixture), scaled to a largest weight of 1, and returns their
// effective sample size.
func (w *sampleWork) tempered(wt []float64, beta float64) float64 {
	top := math.Inf(-1)
	for k := 0; k < w.n; k++ {
		wt[k] = beta*w.at(k, oLogL) - w.lq[k]
		top = fmax(top, wt[k])
	}
	if math.IsInf(top, -1) || top != top {
		clear(wt[:w.n]) // no draw has a finite weight
		return 0
	}
	sw, sw2 := 0.0, 0.0
	for k := 0; k < w.n; k++ {
		v := pexp(wt[k] - top)
		wt[k] = v
		sw += v
		sw2 += v * v
	}
	if sw2 == 0 {
		return 0
	}
	return sw * sw / sw2
}

// endStage ends the current stage: the sample is finished when its ESS
// reaches the target or its draws the cap; otherwise a new stage is fitted
// to the weighted draws so far.
func (w *sampleWork) endStage(r *Run) {
	w.wt = sized(w.wt, w.n)
	wt := w.wt
	ess := w.weights(wt)
	last := len(w.nStage) - 1
	if last >= 1 {
		// Efficiency of the last stage on its own: its draws weighted
		// against its own proposal only.
		var sw, sw2 float64
		lw := w.lw[:0]
		top := math.Inf(-1)
		for k := 0; k < w.n; k++ {
			if int(w.stageOf[k]) != min(last, 127) {
				continue
			}
			e := w.ell[last-1][k]
			big := fmax(plog(defensive), plog(1-defensive)+e)
			v := w.at(k, oLogL) - (big + plog(pexp(plog(defensive)-big)+pexp(plog(1-defensive)+e-big)))
			lw = append(lw, v)
			top = fmax(top, v)
		}
		w.lw = lw
		for _, v := range lw {
			x := pexp(v - top)
			sw += x
			sw2 += x * x
		}
		if sw2 > 0 {
			w.eff = max(0.02, sw*sw/sw2/float64(len(lw)))
		}
	}
	if debugStages {
		println("sample", w.s, "stage", last, "n", w.n, "ess", int(ess), "eff", w.eff)
	}
	switch {
	case ess >= float64(r.opt.TargetESS):
		w.stop, w.finished = TargetReached, true
	case w.n >= r.opt.MaxDraws:
		w.stop, w.finished = Capped, true
	case len(w.nStage) >= 127:
		w.stop, w.finished = Capped, true
	}
	if w.finished {
		return
	}
	// With few effective draws the weighted moments are poor. Fit the
	// proposal to the likelihood tempered by the largest power beta that
	// leaves fitDraws effective draws: a wider proposal, well estimated,
	// which the next fit narrows (annealing, as in sequential Monte Carlo;
	// an engineering choice).
	fitESS, beta := ess, 1.0
	if goal := min(fitDraws, 0.3*float64(w.n)); ess < goal {
		lo, hi := 0.0, 1.0
		for range 14 {
			mid := 0.5 * (lo + hi)
			if w.tempered(wt, mid) >= goal {
				lo = mid
			} else {
				hi = mid
			}
		}
		beta = lo
		fitESS = w.tempered(wt, beta)
	}
	p := fitProposal(w.d, &draws{rec: w.rec, stride: w.stride, face: w.d + oFace, n: w.n}, wt, fitESS)
	if debugStages {
		println("   beta", beta, "fitESS", int(fitESS))
	}
	var ell []float64
	if n := len(w.ellFree); n > 0 {
		ell = w.ellFree[n-1]
		w.ellFree = w.ellFree[:n-1]
	}
	ell = slices.Grow(ell[:0], w.n+w.size)[:w.n]
	for k := 0; k < w.n; k++ {
		ell[k] = p.ell(w.latents(k), w.u)
	}
	w.props = append(w.props, p)
	w.ell = append(w.ell, ell)
	// While the likelihood is still tempered, short stages, so that the
	// proposal is refitted often on the way to the posterior; then draws
	// for the target at the last stage's efficiency, but at most twice the
	// draws so far.
	need := (float64(r.opt.TargetESS) - ess) / w.eff * 1.1
	need = min(need, 2*float64(w.n))
	if beta < 1 {
		need = exploreStage
	}
	w.size = min(r.opt.MaxDraws-w.n, max(minStage, int(need)+1))
	w.planned += w.size
	w.nStage = append(w.nStage, 0)
	w.essStart, w.own = ess, [3]float64{}
}
