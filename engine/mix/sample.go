package mix

import (
	"math"
	"math/rand/v2"
	"slices"

	"lixiv/engine/internal/portable"
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
	src      *stream    // rng's source, for pcgUniform and normals
	zsrc     *stream    // zrng's
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
	srcOf [MaxEndMembers]Source // the source of each end-member taking part

	prepared bool                        // prepare has run
	lanes    bool                        // linearAt may use zg (lanes.go)
	z0, zl   [nLanes]float64             // the lanes' values at z = 0 and at the draw's errors
	fits     [1 << MaxEndMembers]faceFit // slabDraw's working space
	slab     slabScratch

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
	ex        []float64 // drawOne's
	fixed     []ratioAt // the constant ratios a draw reads, in drawOne's order
	drawn     []ratioAt // those drawn from their priors alone (not the likelihood's)
	dx        []float64 // drawOne's working space for them
	zg        []float64 // the gradients of the lanes (lanes.go), error source by source

	ellFree      [][]float64 // ell rows of earlier samples, for reuse
	wt, lw, lc   []float64   // endStage's, mixture's and finish's working space
	msum, mterm  []float64   // mixture's
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
	rec := w.rec[o : o+int(NSources)*NCations]
	// Source by source, as array assignments rather than copy calls.
	sp[0] = *(*[NCations]float64)(rec[0*NCations:])
	sp[1] = *(*[NCations]float64)(rec[1*NCations:])
	sp[2] = *(*[NCations]float64)(rec[2*NCations:])
	sp[3] = *(*[NCations]float64)(rec[3*NCations:])
	return sp
}

func (w *sampleWork) setSplit(k int, sp *Split) {
	o := k*w.stride + w.d + oFrac + w.k
	rec := w.rec[o : o+int(NSources)*NCations]
	// Source by source, as array assignments rather than copy calls.
	*(*[NCations]float64)(rec[0*NCations:]) = sp[0]
	*(*[NCations]float64)(rec[1*NCations:]) = sp[1]
	*(*[NCations]float64)(rec[2*NCations:]) = sp[2]
	*(*[NCations]float64)(rec[3*NCations:]) = sp[3]
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
	w.src = newStream(r.opt.Seed^sampleStream, uint64(s))
	w.rng = rand.New(w.src)
	// The data perturbations come from a stream of their own, so that an
	// error source of no effect (a spread of 0 against one too small to
	// move a value) leaves the other draws unchanged.
	w.zsrc = newStream(r.opt.Seed^errorStream, uint64(s))
	w.zrng = rand.New(w.zsrc)
	w.stride = w.d + oFrac + w.k + int(NSources)*NCations + 1 + st.r
	w.size = min(r.opt.Draws, r.opt.MaxDraws)
	w.planned = w.size
	w.nStage = append(w.nStage[:0], 0)
	w.rec = slices.Grow(w.rec[:0], w.size*w.stride)
	w.stageOf = w.stageOf[:0]
	w.z = zeroed(w.z, st.q)
	w.eta = zeroed(w.eta, max(w.d, smallDim))[:w.d]
	w.u = zeroed(w.u, max(w.d, smallDim))[:w.d] // room for ell to read smallDim lanes
	w.ex = zeroed(w.ex, w.d)
	w.prepare(r)
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

// ratioAt names the ratio of tracer t and end-member j.
type ratioAt struct {
	t Tracer
	j int
}

// prepare sets what drawOne and eval read of the sample besides its setup:
// the ratios a draw fixes or draws from their priors alone, the lanes
// (lanes.go) and the end-members' sources. begin calls it; eval calls it
// for sample work made otherwise (the catchment-wide model's summaries).
func (w *sampleWork) prepare(r *Run) {
	w.fixed, w.drawn = w.fixed[:0], w.drawn[:0]
	for t := range NTracers {
		if !r.need[t] {
			continue
		}
		for _, j := range w.st.act {
			switch {
			case r.smp[t][j].constant:
				w.fixed = append(w.fixed, ratioAt{t, j})
			case !r.lik[t]:
				w.drawn = append(w.drawn, ratioAt{t, j})
			}
		}
	}
	w.dx = sized(w.dx, 2*len(w.drawn))
	w.setLanes()
	for jj, j := range w.st.act {
		w.srcOf[jj] = r.prob.EndMembers[j].Source
	}
	w.prepared = true
}

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
		var pu [2]float64
		uniforms(pu[:], w.src)
		prior, uc := pu[0] < defensive, pu[1]
		normals(w.u[:len(w.eta)], w.src)
		if prior {
			copy(w.eta, w.u)
		} else {
			w.props[s-1].draw(uc, w.u, w.eta)
		}
		x := w.ex[:len(st.dims)]
		for a, k := range st.dims {
			d := r.dims[k]
			x[a] = r.smp[d.t][d.em].fromLatent(w.eta[a])
		}
		portable.ExpAll(x) // the ratios' exponentials in one call
		for a, k := range st.dims {
			d := r.dims[k]
			w.theta[d.t][d.em] = x[a]
		}
		// The ratios the likelihood does not read, from their priors
		// (sampler.draw, the uniforms in the same order, the logs'
		// quantiles and exponentials in batches), and the constant ones.
		for _, f := range w.fixed {
			w.theta[f.t][f.j] = r.smp[f.t][f.j].v
		}
		if nd := len(w.drawn); nd > 0 {
			u, zq := w.dx[:nd], w.dx[nd:2*nd]
			uniforms(u, w.src)
			copy(zq, u)
			quantiles(zq)
			for i, f := range w.drawn {
				sm := &r.smp[f.t][f.j]
				if sm.dist == LogUniform {
					u[i] = sm.a + float64(u[i]*sm.b)
				} else {
					u[i] = sm.a + float64(sm.b*zq[i])
				}
			}
			portable.ExpAll(u)
			for i, f := range w.drawn {
				w.theta[f.t][f.j] = u[i]
			}
		}
	}
	normals(w.z, w.zsrc)
	k := len(w.stageOf)
	w.stageOf = append(w.stageOf, int8(min(s, 127)))
	if len(w.rec)+w.stride > cap(w.rec) {
		w.rec = slices.Grow(w.rec, max(w.stride, len(w.rec)))
	}
	w.rec = w.rec[:len(w.rec)+w.stride] // every field is written below: the latents here, the rest by eval
	copy(w.latents(k), w.eta)
	for si := range w.props {
		w.ell[si] = append(w.ell[si], w.props[si].ell(w.eta, w.u))
	}
	r.eval(w, k)
	if s > 0 {
		lw := ownWeight(w.at(k, oLogL), w.ell[s-1][k])
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

// logDefensive and logFitted are the logs of a refinement stage's shares
// of prior and fitted draws.
var logDefensive, logFitted = plog(defensive), plog(1 - defensive)

// ownWeight returns the log weight of a draw of log likelihood logL against
// its own stage's proposal alone, e its ell there.
func ownWeight(logL, e float64) float64 {
	big := fmax(logDefensive, logFitted+e)
	x := [2]float64{logDefensive - big, logFitted + e - big}
	portable.ExpAll(x[:]) // both in one call
	return logL - (big + plog(x[0]+x[1]))
}

// eval solves draw k: the whitened design Ã = L⁻¹A of the draw's ratios,
// the normal equations, the exact non-negative least squares for the data
// (its χ² is the draw's likelihood) and for the data perturbed by the
// draw's errors (its solution is the draw's split), and the amounts.
func (r *Run) eval(w *sampleWork, k int) {
	if !w.prepared {
		w.prepare(r)
	}
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
	w.linearAt()
	eps := (*[maxRows]float64)(w.zl[laneEps : laneEps+maxRows])
	perturbed(K, &At, eps, &b0, &b1)
	var dd, logL float64
	if r.opt.perturb {
		nnls(K, &H, &b0, &n0)
		nnls(K, &H, &b1, &n1)
		chi2 := pos(residual(K, st.yy, &b0, &H, &n0))
		dd = pos(residual(K, st.yy, &b0, &H, &n1))
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
		dd = pos(residual(K, st.yy, &b0, &H, &n1))
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
	am := w.amounts(k)
	for jj := range am { // rather than a copy call
		am[jj] = n1[jj]
	}
	predicted(w.pred(k), &A, &n0)
	var sp Split
	r.splitOf(w, &n1, &sp)
	w.setSplit(k, &sp)
	w.rec[o+oFrac+K+int(NSources)*NCations] = pos(w.zl[laneSO4])
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
		src := w.srcOf[jj]
		m[src][0] += n[jj]
		m[src][1] += float64(w.theta[KNa][j] * n[jj])
		m[src][2] += float64(w.theta[CaNa][j] * n[jj])
		m[src][3] += float64(w.theta[MgNa][j] * n[jj])
	}
	for c := range NCations {
		atm, evap := pos(w.zl[laneAtm+c]), pos(w.zl[laneEvap+c])
		tot := m[0][c] + m[1][c] + m[2][c] + m[3][c]
		x := pos(st.in[c] - atm - evap)
		// The four sources written out (NSources is 4).
		switch {
		case !st.has[c]:
			sp[0][c], sp[1][c], sp[2][c], sp[3][c] = m[0][c], m[1][c], m[2][c], m[3][c]
		case tot > 0:
			sp[0][c], sp[1][c], sp[2][c], sp[3][c] = m[0][c]/tot*x, m[1][c]/tot*x, m[2][c]/tot*x, m[3][c]/tot*x
		default:
			sp[0][c], sp[1][c], sp[2][c], sp[3][c] = 0, 0, 0, 0
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
	// Stage by stage over all draws rather than draw by draw, so that the
	// exponentials go in batches (portable.ExpAll); each draw's largest
	// term and sum are formed in the same order as draw by draw.
	n, S := w.n, len(w.props)
	w.lq = sized(w.lq, n)
	big := w.lq // the largest term of each draw, until the end
	w.msum, w.mterm = sized(w.msum, n), sized(w.mterm, n)
	sum, term := w.msum, w.mterm
	if S == 0 {
		for k := range big {
			big[k], sum[k] = lc0, lc0-lc0
		}
		portable.ExpAll(sum)
	} else {
		e := w.ell[0][:n]
		for k, v := range e {
			big[k] = fmax(lc0, lc[0]+v)
		}
		for s := 1; s < S; s++ {
			e, ls := w.ell[s][:n], lc[s]
			k := 0
			for ; k+4 <= n; k += 4 { // four draws a turn (see tempered)
				b, v := (*[4]float64)(big[k:]), (*[4]float64)(e[k:])
				b[0], b[1], b[2], b[3] = fmax(b[0], ls+v[0]), fmax(b[1], ls+v[1]), fmax(b[2], ls+v[2]), fmax(b[3], ls+v[3])
			}
			for ; k < n; k++ {
				big[k] = fmax(big[k], ls+e[k])
			}
		}
		// The prior's term and the first stage's, then each stage's
		// added as the next one's argument takes its place.
		e = w.ell[0][:n]
		for k, b := range big {
			sum[k], term[k] = lc0-b, lc[0]+e[k]-b
		}
		portable.ExpAll(sum)
		portable.ExpAll(term)
		for s := 1; s < S; s++ {
			e, ls := w.ell[s][:n], lc[s]
			k := 0
			for ; k+4 <= n; k += 4 {
				b, v := (*[4]float64)(big[k:]), (*[4]float64)(e[k:])
				u, t := (*[4]float64)(sum[k:]), (*[4]float64)(term[k:])
				u[0], u[1], u[2], u[3] = u[0]+t[0], u[1]+t[1], u[2]+t[2], u[3]+t[3]
				t[0], t[1], t[2], t[3] = ls+v[0]-b[0], ls+v[1]-b[1], ls+v[2]-b[2], ls+v[3]-b[3]
			}
			for ; k < n; k++ {
				sum[k] += term[k]
				term[k] = ls + e[k] - big[k]
			}
			portable.ExpAll(term)
		}
		for k, v := range term {
			sum[k] += v
		}
	}
	portable.LogAll(sum)
	for k, v := range sum {
		big[k] += v
	}
}

// tempered fills wt with the weights of the likelihood raised to the power
// beta (after mixture), scaled to a largest weight of 1, and returns their
// effective sample size.
//
// The bisection of endStage calls it a dozen times over all the draws, so
// its loops take four draws a turn (fewer turns through WebAssembly's
// dispatch), each draw's arithmetic and the running largest value and sums
// in draw order as one draw a turn.
func (w *sampleWork) tempered(wt []float64, beta float64) float64 {
	n := w.n
	wt, lq := wt[:n], w.lq[:n]
	rec, stride, off := w.rec, w.stride, w.d+oLogL
	top := math.Inf(-1)
	k := 0
	for ; k+4 <= n; k += 4 {
		x, q := (*[4]float64)(wt[k:]), (*[4]float64)(lq[k:])
		o := k*stride + off
		x[0] = beta*rec[o] - q[0]
		x[1] = beta*rec[o+stride] - q[1]
		x[2] = beta*rec[o+2*stride] - q[2]
		x[3] = beta*rec[o+3*stride] - q[3]
		top = fmax(fmax(fmax(fmax(top, x[0]), x[1]), x[2]), x[3])
	}
	for ; k < n; k++ {
		wt[k] = beta*rec[k*stride+off] - lq[k]
		top = fmax(top, wt[k])
	}
	if math.IsInf(top, -1) || top != top {
		clear(wt) // no draw has a finite weight
		return 0
	}
	for k = 0; k+4 <= n; k += 4 {
		x := (*[4]float64)(wt[k:])
		x[0], x[1], x[2], x[3] = x[0]-top, x[1]-top, x[2]-top, x[3]-top
	}
	for ; k < n; k++ {
		wt[k] -= top
	}
	portable.ExpAll(wt) // the exponentials in one call (see mixture)
	sw, sw2 := 0.0, 0.0
	for k = 0; k+4 <= n; k += 4 {
		x := (*[4]float64)(wt[k:])
		sw = sw + x[0] + x[1] + x[2] + x[3]
		sw2 = sw2 + x[0]*x[0] + x[1]*x[1] + x[2]*x[2] + x[3]*x[3]
	}
	for ; k < n; k++ {
		sw += wt[k]
		sw2 += wt[k] * wt[k]
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
			v := ownWeight(w.at(k, oLogL), w.ell[last-1][k])
			lw = append(lw, v)
			top = fmax(top, v)
		}
		w.lw = lw
		for i := range lw {
			lw[i] -= top
		}
		portable.ExpAll(lw) // in one call
		for _, x := range lw {
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
