package mix

import (
	"context"
	"fmt"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"
)

// MaxDraws is the largest number of draws a run takes (the drawn ratios of
// every draw are held in memory).
const MaxDraws = 1_000_000

// Run is an inversion in progress. Natively Invert drives it on all cores;
// in the browser the caller drives it in chunks with Step, so that a
// progress bar can update between them. Either way, a seed gives the same
// bits: draws are taken in a fixed order from one PCG stream, shared by all
// samples (draw d is the same rocks for every sample of the catchment), and
// each sample is worked through its draws in order by one goroutine.
type Run struct {
	prob  Problem
	opt   Options
	n     int       // end-members
	src   []Source  // source of each end-member
	table []float64 // drawn ratios, layout [draw][tracer][end-member]
	rtab  []float64 // the same reduced for the kernels (kernel.go)
	res   *Result

	sc      scratch // Step: summary working space, kept between calls
	cur     int     // Step: sample being worked on
	curDraw int     // Step: next draw of that sample
	done    atomic.Int64
	mu      sync.Mutex // serialises Options.Progress
}

// NewRun checks the problem, draws the end-member ratios for every draw and
// returns a run ready to Step. It returns an error for a problem that
// cannot be run at all (no end-members, an invalid prior); problems of
// single samples become warnings on their results.
func NewRun(p Problem, o *Options) (*Run, error) {
	if err := p.validate(); err != nil {
		return nil, err
	}
	opt := o.withDefaults()
	if opt.Draws > MaxDraws {
		return nil, fmt.Errorf("mix: %d draws; at most %d", opt.Draws, MaxDraws)
	}
	r := &Run{prob: p, opt: opt, n: len(p.EndMembers)}
	r.src = make([]Source, r.n)
	for j, e := range p.EndMembers {
		r.src[j] = e.Source
	}
	r.table = drawTable(p.EndMembers, opt.Draws, opt.Seed)
	if r.n >= 2 {
		r.rtab = reduceTable(r.table, r.n)
	}
	r.res = &Result{
		Seed:       opt.Seed,
		Draws:      opt.Draws,
		Scoring:    opt.Scoring,
		EndMembers: append([]EndMember(nil), p.EndMembers...),
		Samples:    make([]SampleResult, len(p.Waters)),
		table:      r.table,
		src:        r.src,
		vary:       opt.Vary,
	}

	for s := range p.Waters {
		sr := &r.res.Samples[s]
		sr.Name = p.Waters[s].Name
		sr.prep = p.prepare(&p.Waters[s], &opt)
		sr.Warnings = append(sr.Warnings, sr.prep.warnings...)
	}
	return r, nil
}

// drawTable samples every ratio of every end-member for every draw, in the
// order draw, tracer, end-member, one uniform number each (fixed priors
// too, so that editing one prior leaves the other draws unchanged).
func drawTable(em []EndMember, draws int, seed uint64) []float64 {
	n := len(em)
	var smp [NTracers][MaxEndMembers]sampler
	for j := range em {
		for t := range NTracers {
			smp[t][j] = newSampler(em[j].Ratio[t])
		}
	}
	rng := rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15))
	tab := make([]float64, draws*int(NTracers)*n)
	i := 0
	for range draws {
		for t := range NTracers {
			for j := 0; j < n; j++ {
				u := (float64(rng.Uint64()>>11) + 0.5) * 0x1p-53 // in (0, 1)
				tab[i] = smp[t][j].draw(u)
				i++
			}
		}
	}
	return tab
}

// Total returns the number of sample-draws in the run.
func (r *Run) Total() int { return len(r.prob.Waters) * r.opt.Draws }

// Progress returns the fraction of sample-draws done, in [0, 1].
func (r *Run) Progress() float64 {
	t := r.Total()
	if t == 0 {
		return 1
	}
	return float64(r.done.Load()) / float64(t)
}

// Done reports whether every sample has been worked through.
func (r *Run) Done() bool { return r.cur >= len(r.prob.Waters) }

// Step works through about n more sample-draws on the calling goroutine
// and reports whether the run is finished. Chunk sizes do not change the
// result. A cancelled context marks the unfinished samples Canceled and
// ends the run.
func (r *Run) Step(ctx context.Context, n int) (done bool) {
	for n > 0 && r.cur < len(r.prob.Waters) {
		if ctx.Err() != nil {
			r.cancel()
			return true
		}
		s := r.cur
		k := min(n, r.opt.Draws-r.curDraw)
		r.draws(s, r.curDraw, r.curDraw+k)
		r.curDraw += k
		n -= k
		r.advance(k)
		if r.curDraw == r.opt.Draws {
			r.finish(s, &r.sc)
			r.cur++
			r.curDraw = 0
		}
	}
	r.res.Status = r.res.worst()
	return r.Done()
}

func (r *Run) cancel() {
	for s := r.cur; s < len(r.prob.Waters); s++ {
		r.res.Samples[s].Status = Canceled
	}
	r.cur = len(r.prob.Waters)
	r.res.Status = r.res.worst()
}

func (r *Run) advance(k int) {
	d := r.done.Add(int64(k))
	if r.opt.Progress != nil {
		r.mu.Lock()
		r.opt.Progress(int(d), r.Total())
		r.mu.Unlock()
	}
}

// Result returns the run's result. Samples not yet worked through have
// Status NotRun.
func (r *Run) Result() *Result { return r.res }

// Invert runs the inverse Monte Carlo model on every water of p, using
// Options.Workers goroutines over samples (all cores by default). The result
// does not depend on the number of workers. Cancelling ctx stops the run
// early; unfinished samples are then Canceled. The error is non-nil only for
// a problem that cannot be run at all; how the inversion went is in
// Result.Status and each sample's Status and Warnings.
func Invert(ctx context.Context, p Problem, o *Options) (*Result, error) {
	r, err := NewRun(p, o)
	if err != nil {
		return nil, err
	}
	ns := len(p.Waters)
	workers := r.opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, ns))
	var next atomic.Int64
	var wg sync.WaitGroup
	const chunk = 512 // draws between looks at ctx
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var sc scratch
			for {
				s := int(next.Add(1)) - 1
				if s >= ns {
					return
				}
				for from := 0; from < r.opt.Draws; from += chunk {
					if ctx.Err() != nil {
						r.res.Samples[s].Status = Canceled
						break
					}
					to := min(from+chunk, r.opt.Draws)
					r.draws(s, from, to)
					r.advance(to - from)
				}
				if r.res.Samples[s].Status != Canceled {
					r.finish(s, &sc)
				}
			}
		}()
	}
	wg.Wait()
	r.cur = ns
	r.res.Status = r.res.worst()
	return r.res, nil
}

// maxWeightChi2 is the largest misfit kept under Weight scoring: beyond it
// exp(-chi2/2) is below the smallest normal float64.
const maxWeightChi2 = 1400

// draws works sample s through draws [from, to): for each draw it solves
// the simplex-constrained least squares with the drawn end-member ratios,
// scores chi-square and keeps or drops the draw. Two to six end-members
// take the kernels of kernel.go; a single end-member takes the general
// solver.
func (r *Run) draws(s, from, to int) {
	sr := &r.res.Samples[s]
	if sr.prep.skip {
		return
	}
	if cap(sr.kept) == 0 {
		c := max(16, (to-from)/8)
		sr.kept = make([]int32, 0, c)
		sr.chi2 = make([]float64, 0, c)
		sr.alpha = make([]float64, 0, c*r.n)
	}
	bound := sr.prep.thresh
	if r.opt.Scoring == Weight {
		bound = maxWeightChi2
	}
	if r.opt.Perturb || r.opt.Vary != nil {
		r.perDraw(s, from, to, bound)
		return
	}
	r.span(sr, &sr.prep, from, to, bound)
}

// span works draws [from, to) of sr against the data in pr.
func (r *Run) span(sr *SampleResult, pr *prep, from, to int, bound float64) {
	switch r.n {
	case 4:
		r.draws4(sr, pr, from, to, bound)
	case 3:
		r.draws3(sr, pr, from, to, bound)
	case 2:
		r.draws2(sr, pr, from, to, bound)
	case 5:
		r.draws5(sr, pr, from, to, bound)
	case 6:
		r.drawsN(sr, pr, from, to, bound)
	default:
		var a [MaxEndMembers]float64
		for d := from; d < to; d++ {
			if chi2, ok := r.general(pr, d, bound, &a); ok {
				sr.keep(d, chi2, a[:r.n])
			}
		}
	}
}

// perDraw works draws [from, to) of sample s, each against data of its
// own: the concentrations Options.Vary gives for the draw (a draw it drops,
// or whose data lose Na or a tracer the sample has, is not kept), and with
// Options.Perturb the measured ratios drawn from N(d, σ²) (docs/methods.md §7.3
// step 1). The normal deviates come from a PCG stream of the sample's own,
// m per draw in row order, so chunking does not change them.
func (r *Run) perDraw(s, from, to int, bound float64) {
	sr := &r.res.Samples[s]
	if r.opt.Perturb && sr.rng == nil {
		sr.rng = rand.NewPCG(r.opt.Seed^0x6c8e9cf570932bd5, uint64(s))
	}
	w := &r.prob.Waters[s]
	var p prep
	rows := make([]rowSpec, 0, len(sr.prep.rows))
	for d := from; d < to; d++ {
		p = sr.prep // copy; the data rows are arrays
		if r.opt.Vary != nil {
			c, ok := r.opt.Vary(s, d)
			if ok {
				ok, _ = r.prob.fill(&p, &c, w.Sr87Sr86, &r.opt, rows)
				rows = p.rows
			}
			if !ok || p.m != sr.prep.m || p.iso != sr.prep.iso {
				r.skipNormals(sr, sr.prep.m)
				continue
			}
			p.thresh = sr.prep.thresh
		}
		if r.opt.Perturb {
			p.c = 0
			for k := 0; k < p.m; k++ {
				u := (float64(sr.rng.Uint64()>>11) + 0.5) * 0x1p-53
				z := normQuantile(u)
				if k == p.iso {
					p.riso += z * r.opt.IsoErr
				} else {
					p.d[k] += z / sqrt(p.w[k])
				}
				p.c += p.w[k] * p.d[k] * p.d[k]
			}
			rows = rows[:0]
			for k := 0; k < p.m; k++ {
				if k != p.iso {
					rows = append(rows, rowSpec{off: p.par[k] * r.n, w: p.w[k], d: p.d[k]})
				}
			}
			p.rows = rows
		}
		r.span(sr, &p, d, d+1, bound)
	}
}

// skipNormals draws and drops the m normal deviates of a draw that is not
// fitted, so that the perturbations of later draws stay the same.
func (r *Run) skipNormals(sr *SampleResult, m int) {
	if !r.opt.Perturb {
		return
	}
	for range m {
		sr.rng.Uint64()
	}
}

// keep records a kept draw.
func (sr *SampleResult) keep(d int, chi2 float64, a []float64) {
	sr.kept = append(sr.kept, int32(d))
	sr.chi2 = append(sr.chi2, chi2)
	sr.alpha = append(sr.alpha, a...)
}

// row fills e with row k of the mixing matrix E of draw d: the drawn ratios
// of the row's tracer, or for the isotope row (Sr/Na)_j (R_j - R_measured).
func (r *Run) row(pr *prep, d, k int, e *[MaxEndMembers]float64) {
	n := r.n
	tab := r.table[d*int(NTracers)*n : (d+1)*int(NTracers)*n]
	row := tab[pr.par[k]*n : pr.par[k]*n+n]
	if k == pr.iso {
		sr := tab[int(SrNa)*n : int(SrNa)*n+n]
		for j := 0; j < n; j++ {
			e[j] = sr[j] * (row[j] - pr.riso)
		}
		return
	}
	copy(e[:n], row)
}

// misfit returns chi2 = sum_k w_k (E_k a - d_k)² for draw d, from the
// residuals themselves.
func (r *Run) misfit(pr *prep, d int, a *[MaxEndMembers]float64) float64 {
	var e [MaxEndMembers]float64
	chi2 := 0.0
	for k := 0; k < pr.m; k++ {
		r.row(pr, d, k, &e)
		v := -pr.d[k]
		for j := 0; j < r.n; j++ {
			v += e[j] * a[j]
		}
		chi2 += pr.w[k] * v * v
	}
	return chi2
}

// general solves draw d with the face-enumerating solver and reports the
// misfit and whether the draw is kept (chi2 <= bound).
func (r *Run) general(pr *prep, d int, bound float64, a *[MaxEndMembers]float64) (float64, bool) {
	n := r.n
	q := simplexLS{n: n}
	var e [MaxEndMembers]float64
	for k := 0; k < pr.m; k++ {
		r.row(pr, d, k, &e)
		w, dk := pr.w[k], pr.d[k]
		for i := 0; i < n; i++ {
			wi := w * e[i]
			q.g[i] += wi * dk
			Gi := &q.G[i]
			for j := 0; j <= i; j++ {
				Gi[j] += wi * e[j]
			}
		}
	}
	q.sym()
	if ok, pruned := q.solve(a, pr.c, bound); !ok || pruned {
		return 0, false
	}
	chi2 := r.misfit(pr, d, a)
	return chi2, chi2 <= bound
}
