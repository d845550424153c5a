package mix

import (
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"runtime"
	"sync"
	"sync/atomic"
)

// MaxDraws is the largest number of draws one sample may take over all
// stages (its draws are held in memory while it is worked).
const MaxDraws = 1_000_000

// dim is a random end-member ratio that enters the likelihood: one latent
// dimension of the refinement proposals.
type dim struct {
	t  Tracer
	em int
}

// Run is an inversion in progress. Natively Invert drives it on all cores;
// in the browser the caller drives it in chunks with Step, so that a
// progress bar can update between them. Either way, a seed gives the same
// bits: the first-stage draws come from one PCG stream in a fixed order and
// are shared by all samples, every later draw of a sample comes from that
// sample's own PCG stream, and each sample is worked through its draws in
// order by one goroutine, so neither the number of cores nor the chunking
// of Step changes a bit.
type Run struct {
	prob  Problem
	opt   Options
	n     int
	smp   [NTracers][MaxEndMembers]sampler
	useTr [NTracers]bool // tracers that are data rows
	lik   [NTracers]bool // ratios the likelihood reads
	need  [NTracers]bool // ratios a draw reads (the likelihood's, and K, Ca, Mg for the amounts)
	dims  []dim
	table []float64 // first-stage ratios, [draw][tracer][end-member]
	eta   []float64 // first-stage latents, [draw][dim]
	res   *Result

	cur      int         // Step: next sample
	work     *sampleWork // Step: the sample being worked on
	finished atomic.Int64
	kept     atomic.Int64 // draws kept by the finished samples
	over     atomic.Int64 // 1 + the sample whose draws passed Options.MaxKept, or 0
	shown    float64      // Progress: the largest fraction reported so far
	mu       sync.Mutex   // serialises Options.Progress

	spare   []*sampleWork // finished samples' buffers, for the next ones begun
	spareMu sync.Mutex

	reused []bool // samples taken over from an earlier run (Reuse); nil for none
}

// NewRun checks the problem, draws the first-stage end-member ratios and
// sets up every water. It returns an error for a problem that cannot be run
// at all (no end-members, an invalid prior); problems of single samples
// become warnings on their results.
func NewRun(p Problem, o *Options) (*Run, error) { return newRun(p, o, true) }

// newRun is NewRun; without table it draws no first-stage table (a run
// that only gathers samples worked elsewhere, NewGather).
func newRun(p Problem, o *Options, table bool) (*Run, error) {
	opt := o.withDefaults()
	if err := p.validate(&opt); err != nil {
		return nil, err
	}
	if opt.MaxDraws > MaxDraws {
		return nil, fmt.Errorf("mix: %d draws per sample; at most %d", opt.MaxDraws, MaxDraws)
	}
	r := &Run{prob: p, opt: opt, n: len(p.EndMembers)}
	for j := range p.EndMembers {
		for t := range NTracers {
			r.smp[t][j] = newSampler(p.EndMembers[j].Ratio[t])
		}
	}
	for _, t := range p.Tracers {
		r.useTr[t] = true
		r.lik[t] = true
	}
	if r.useTr[Sr87Sr86] {
		r.lik[SrNa] = true
	}
	r.need = r.lik
	r.need[KNa], r.need[CaNa], r.need[MgNa] = true, true, true
	for t := range NTracers {
		if !r.lik[t] {
			continue
		}
		for j := 0; j < r.n; j++ {
			if !r.smp[t][j].constant {
				r.dims = append(r.dims, dim{Tracer(t), j})
			}
		}
	}
	if table {
		r.drawTable()
	}
	r.res = &Result{
		Seed:       opt.Seed,
		Options:    opt,
		EndMembers: append([]EndMember(nil), p.EndMembers...),
		Tracers:    append([]Tracer(nil), p.Tracers...),
		Samples:    make([]SampleResult, len(p.Waters)),
	}
	r.res.Confusions = p.confusions(r)
	for s := range p.Waters {
		sr := &r.res.Samples[s]
		sr.Name = p.Waters[s].Name
		sr.setup = r.prepare(&p.Waters[s])
		sr.Warnings = append(sr.Warnings, sr.setup.warnings...)
	}
	return r, nil
}

// drawTable samples every ratio of every end-member for every first-stage
// draw, in the order draw, tracer, end-member, one uniform number each
// (fixed priors and ratios no tracer reads too, so that editing one prior
// leaves the other draws unchanged). The latents of the likelihood's ratios
// are kept beside them.
func (r *Run) drawTable() {
	n, draws := r.n, r.opt.Draws
	var di [NTracers][MaxEndMembers]int
	for t := range di {
		for j := range di[t] {
			di[t][j] = -1
		}
	}
	for i, d := range r.dims {
		di[d.t][d.em] = i
	}
	rng := rand.New(rand.NewPCG(r.opt.Seed, r.opt.Seed^0x9e3779b97f4a7c15))
	r.table = make([]float64, draws*int(NTracers)*n)
	r.eta = make([]float64, draws*len(r.dims))
	i := 0
	for d := range draws {
		for t := range NTracers {
			for j := 0; j < n; j++ {
				u := uniform(rng)
				s := &r.smp[t][j]
				if k := di[t][j]; k >= 0 {
					eta, x := s.latent(u)
					r.eta[d*len(r.dims)+k] = eta
					r.table[i] = pexp(x)
				} else {
					r.table[i] = s.draw(u)
				}
				i++
			}
		}
	}
}

// uniform returns a uniform number in (0, 1) from the top 53 bits.
func uniform(rng *rand.Rand) float64 {
	return (float64(rng.Uint64()>>11) + 0.5) * 0x1p-53
}

// Total returns the nominal work of the run, in draws: the first-stage
// draws of every sample (refinement adds to it as it goes).
func (r *Run) Total() int { return len(r.prob.Waters) * r.opt.Draws }

// Progress returns the fraction of samples done, in [0, 1], counting the
// sample Step is working on by its share of its first stage.
func (r *Run) Progress() float64 {
	ns := len(r.prob.Waters)
	if ns == 0 {
		return 1
	}
	f := float64(r.finished.Load())
	if w := r.work; w != nil {
		f += 0.99 * min(1, float64(w.n)/float64(max(w.planned, 1)))
	}
	// A sample's planned draws grow as stages are added: never report
	// less than before.
	r.shown = max(r.shown, min(1, f/float64(ns)))
	return r.shown
}

// Done reports whether every sample has been worked through.
func (r *Run) Done() bool { return r.cur >= len(r.prob.Waters) }

// Step works through about n more draws on the calling goroutine and
// reports whether the run is finished. Chunk sizes do not change the
// result. A cancelled context marks the unfinished samples Canceled and
// ends the run.
func (r *Run) Step(ctx context.Context, n int) (done bool) {
	ns := len(r.prob.Waters)
	for n > 0 && r.cur < ns {
		if ctx.Err() != nil {
			r.cancel()
			return true
		}
		if r.work == nil && !r.Reused(r.cur) {
			r.work = r.begin(r.cur)
		}
		if w := r.work; w != nil {
			n -= w.advance(r, n)
			r.report()
			if !w.finished {
				continue
			}
			r.finish(w)
			r.release(w)
		}
		if r.keep(r.cur) {
			r.stopAt(r.cur)
			return true
		}
		r.work = nil
		r.cur++
		r.finished.Add(1)
		r.report()
	}
	r.res.Status = r.res.worst()
	if r.Done() {
		r.dropSpares()
	}
	return r.Done()
}

// stopAt ends the run at sample s, whose draws passed Options.MaxKept:
// s keeps its result, marked Canceled, and the samples after it are
// cancelled.
func (r *Run) stopAt(s int) {
	if r.reused != nil {
		r.reused[s] = false // it keeps its draws, as a sample worked does
	}
	r.cur = s
	r.cancel()
}

// cancel marks the samples from r.cur on Canceled; those taken over
// from an earlier run (Reuse) are left as a sample not begun is.
func (r *Run) cancel() {
	for s := r.cur; s < len(r.prob.Waters); s++ {
		if r.Reused(s) {
			r.unreuse(s)
		}
		r.res.Samples[s].Status = Canceled
		r.res.Samples[s].Verdict = Canceled.String()
	}
	r.work = nil
	r.cur = len(r.prob.Waters)
	r.res.Status = r.res.worst()
	r.dropSpares()
}

// report calls Options.Progress.
func (r *Run) report() {
	if r.opt.Progress == nil {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	r.opt.Progress(int(r.Progress()*float64(r.Total())), r.Total())
}

// Result returns the run's result. Samples not yet worked through have
// Status NotRun.
func (r *Run) Result() *Result { return r.res }

// Invert runs the inverse model on every water of p, using Options.Workers
// goroutines over samples (all cores by default). The result does not
// depend on the number of workers. Cancelling ctx stops the run early;
// unfinished samples are then Canceled. The error is non-nil only for a
// problem that cannot be run at all, or a run stopped at Options.MaxKept; how the inversion went is in
// Result.Status and each sample's Status, Verdict and Warnings.
func Invert(ctx context.Context, p Problem, o *Options) (*Result, error) {
	return InvertReusing(ctx, p, o, nil)
}

// InvertReusing is Invert that first takes over from prev, an earlier
// run's result, the samples whose results would not change (Run.Reuse).
func InvertReusing(ctx context.Context, p Problem, o *Options, prev *Result) (*Result, error) {
	r, err := NewRun(p, o)
	if err != nil {
		return nil, err
	}
	r.Reuse(prev)
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
			for {
				s := int(next.Add(1)) - 1
				if s >= ns {
					return
				}
				if r.Reused(s) && (ctx.Err() != nil || r.over.Load() != 0) {
					r.unreuse(s) // as a sample begun but not worked
				}
				if !r.Reused(s) {
					w := r.begin(s)
					for !w.finished && ctx.Err() == nil && r.over.Load() == 0 {
						w.advance(r, chunk)
					}
					if !w.finished {
						r.res.Samples[s].Status = Canceled
						r.res.Samples[s].Verdict = Canceled.String()
						r.release(w)
						continue
					}
					r.finish(w)
					r.release(w)
				}
				if r.keep(s) {
					r.res.Samples[s].Status = Canceled
					r.res.Samples[s].Verdict = Canceled.String()
					continue
				}
				r.finished.Add(1)
				r.report()
			}
		}()
	}
	wg.Wait()
	r.dropSpares()
	r.cur = ns
	r.res.Status = r.res.worst()
	return r.res, r.Err()
}

// keep counts the draws sample s keeps and reports whether they pass
// Options.MaxKept.
func (r *Run) keep(s int) bool {
	if r.opt.MaxKept <= 0 {
		return false
	}
	if r.kept.Add(int64(len(r.res.Samples[s].draws))) <= int64(r.opt.MaxKept) {
		return false
	}
	r.over.CompareAndSwap(0, int64(s)+1)
	return true
}

// Err reports a run stopped because its samples' draws passed
// Options.MaxKept (ErrTooManyKept), naming the sample; nil otherwise.
func (r *Run) Err() error {
	if s := r.over.Load(); s > 0 {
		return fmt.Errorf("%w: the draws kept reached the limit of %d at sample %q (%d of %d)",
			ErrTooManyKept, r.opt.MaxKept, r.prob.Waters[s-1].Name, s, len(r.prob.Waters))
	}
	return nil
}

// ErrTooManyKept says an inversion stopped because its samples' draws
// passed Options.MaxKept.
var ErrTooManyKept = errors.New("too many draws kept")
