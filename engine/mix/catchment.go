package mix

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sync"
)

// The catchment-wide model (docs/methods.md §7.12) inverts every water of
// a Problem together: the end-member ratios the likelihood reads are
// shared by all samples (one value per end-member and ratio, with today's
// priors), each sample's own ratios scatter about them by a log-normal
// factor of spread τ_j per end-member (half-normal prior of scale
// CatchmentOptions.Scatter), and each sample has its own amounts.
//
// Given the shared ratios and scatters, a sample's amounts are solved
// exactly by the constrained least squares of the per-sample model, and
// its likelihood is the Gaussian integral over the amounts: the misfit at
// the optimum, the volume ½ log det ÃᵀÃ of the amounts, the chance that
// they are all non-negative from their joint Gaussian, and the scatter
// integrated out to first order as a variance added to each tracer row
// (Σ_j (τ_j X_j n_j)², with the amounts of the fit without scatter). The
// shared latents and scatter parameters are sampled by several Metropolis–Hastings
// chains from dispersed starts: each first climbs to a mode from its own
// draw of the priors (catchment_mode.go), the modes make a mixture of t
// distributions (catchment_proposal.go), refitted to the posterior during
// a short warm-up and then fixed, from which the chains propose
// independently, with random-walk steps between. Split R-hat and the
// effective sample size of each shared ratio say whether the chains agree,
// and the chains run until they do (or reach a cap).
//
// Every kept draw of the chains is one joint draw: for draw d, every
// sample's split comes from the same shared ratios (each sample's own
// ratios scattered about them, its data perturbed by their errors and
// solved again), so draw d of every sample belongs together
// (Result.Joint).

// CatchmentOptions tune the catchment-wide model. The zero value means the
// documented defaults.
type CatchmentOptions struct {
	// Chains is the number of Markov chains; 0 means 4.
	Chains int
	// Warmup is the steps of each chain, after its mode search, during
	// which the proposal is refitted (eight times, the last at its end), not
	// kept; 0 means warmupPer steps per parameter (shared latent or
	// scatter), at least 800.
	Warmup int
	// Batch is the fewest steps of each chain between two convergence
	// checks, and their unit (later checks are further apart, nextCheck); 0
	// means 100.
	Batch int
	// MaxSteps caps the kept steps of each chain; 0 means 20000.
	MaxSteps int
	// TargetESS is the effective sample size every shared ratio must
	// reach (with split R-hat below RHatLimit); 0 means 400.
	TargetESS int
	// Keep is the number of joint draws handed on (a multiple of Chains;
	// rounded up); 0 means 1000.
	Keep int
	// Scatter is the scale of the half-normal prior of the sample-to-sample
	// scatter of ln ratio per end-member; 0 means 0.1 (common practice, no
	// source; docs/methods.md §7.12).
	Scatter float64

	// Searches, when set, are the mode searches of an earlier run
	// (Catchment.Searches), taken over where everything they depend on is
	// the same: the page's full pass takes its quick pass's.
	Searches *Searches

	// thinAllowed lets the model run where most samples give fewer than
	// MinSpare equations beyond their own amounts (the simulation study
	// measures what it would do there).
	thinAllowed bool
}

// warmupPer sets the default warm-up of each chain: warmupPer np² steps
// for np parameters (shared latents and scatters), at least 800. The
// longer the warm-up, the better the proposal fits the posterior and the
// fewer kept steps the chains need, up to a point; the refits estimate a
// covariance of np(np+1)/2 entries, so the warm-up grows as np². In the
// benchmark of 100 samples and four end-members read by five tracers
// (np = 20; five seeds), 3,200 steps took 7,360 steps per chain in all on
// average, against 13,700 with 800 (one run not converged within the
// cap), 8,460 with 2,400 and 8,540 with 4,800; in three other catchments
// of each kind, two and three end-members and four read by four tracers
// took as many steps in all as with 800 (within 2 %), four read by five
// 21,400 against 53,800 (one not converged). An engineering choice, no
// source (docs/methods.md §7.12).
const warmupPer = 8

// RHatLimit is the split R-hat below which the chains agree (Vehtari et al.
// 2021, Bayesian Analysis 16, from memory).
const RHatLimit = 1.01

// MaxChainSteps is the most steps a chain may take, warm-up included (the
// kept steps are held in memory).
const MaxChainSteps = 200_000

func (c *CatchmentOptions) withDefaults() CatchmentOptions {
	var d CatchmentOptions
	if c != nil {
		d = *c
	}
	if d.Chains <= 0 {
		d.Chains = 4
	}
	if d.Batch <= 0 {
		d.Batch = 100
	}
	if d.MaxSteps <= 0 {
		d.MaxSteps = 20000
	}
	d.MaxSteps = max(d.MaxSteps, d.Batch)
	if d.TargetESS <= 0 {
		d.TargetESS = 400
	}
	if d.Keep <= 0 {
		d.Keep = 1000
	}
	d.Keep = (d.Keep + d.Chains - 1) / d.Chains * d.Chains
	if !(d.Scatter > 0) {
		d.Scatter = 0.1
	}
	return d
}

// Catchment is what the catchment-wide model learned about the shared
// end-members (Result.Catchment).
type Catchment struct {
	// Check is the counting check made before the run.
	Check Identifiability
	// Fallback, when not empty, says why the per-sample model ran instead
	// (the counting check failed); the rest is then empty.
	Fallback string
	// Ratios holds the prior and posterior of every shared ratio the
	// likelihood reads and the data could move, with its convergence.
	Ratios []SharedRatio
	// Scatter holds the posterior of each end-member's sample-to-sample
	// scatter (σ of ln ratio).
	Scatter []Scatter
	// Samples is the number of samples in the joint likelihood.
	Samples int
	// Chains, Warmup and Steps are the chains, the adaptation steps and the
	// kept steps of each chain.
	Chains, Warmup, Steps int
	// Search is the log posterior evaluations of the chains' mode searches
	// and of the curvature at the modes, all chains together.
	Search int
	// Modes is the number of distinct modes the searches reached (the
	// components of the chains' proposal).
	Modes int

	// Acceptance is the share of proposals accepted after warm-up.
	Acceptance float64
	// MaxRHat and MinESS are the worst split R-hat and effective sample
	// size over the shared ratios.
	MaxRHat, MinESS float64
	// Converged is true when every shared ratio has R-hat below RHatLimit
	// and an ESS of at least CatchmentOptions.TargetESS.
	Converged bool
	// Message says in plain words what is wrong when the chains have not
	// converged ("" when they have).
	Message string

	searches *Searches // what the mode searches reached (Searches)
	taken    bool      // the searches were an earlier run's (SearchesTaken)
}

// SharedRatio is one shared end-member ratio: its prior and posterior
// 95 % intervals and medians, and the chains' agreement.
type SharedRatio struct {
	EndMember        int
	Tracer           Tracer
	Prior, Posterior Interval
	RHat, ESS        float64
}

// Scatter is the posterior of one end-member's scatter τ (σ of ln ratio
// from sample to sample).
type Scatter struct {
	EndMember int
	Posterior Interval
	RHat, ESS float64
}

// CatchmentRun is a catchment-wide inversion in progress, driven like Run:
// natively by InvertCatchment on several cores, in the browser in chunks
// with Step. A seed gives the same bits either way: each chain has its own
// PCG stream and the convergence checks come at fixed step counts; each
// sample's joint draws have streams of their own.
type CatchmentRun struct {
	base *Run // the per-sample set-up (or, after a failed check, the per-sample run)
	co   CatchmentOptions
	cat  *Catchment

	used    []int               // samples in the joint likelihood
	diagCov []bool              // whether each used sample's covariance is diagonal (diagonal)
	sameA   []bool              // whether each used sample's design has the rows and end-members of the one before it (sameLayout)
	seen    [MaxEndMembers]bool // end-members that take part in some used sample
	ems     []int               // end-members with a scatter (some ratio of theirs is random)
	nd, np  int                 // shared latents; all parameters (latents and scatter parameters)
	chains  []*chain
	keep    [][]float64 // the kept states, one per joint draw
	extra   []float64   // ratios drawn from the prior per joint draw, [draw][tracer][end-member]

	prop     *chainProposal // the chains' independence proposal, once the searches are done
	heavy    int            // the proposal's heaviest component, for the random-walk steps
	full     float64        // the share of independence steps
	block    float64        // the share of block steps
	blocks   []block        // the end-members' blocks
	refitted int            // the last warm-up step at which the proposal was refitted
	// ahead is the kept steps a round of the farmed chains runs past their
	// next check (Round), and checkAt that check; 0 in-process.
	ahead, checkAt int
	phase          int // 0: chains; 1: samples; 2: done
	next           int // phase 1: next sample
	shown          float64
	mu             sync.Mutex

	// Rounds shared out (catchment_farm.go): the round's kind and state as
	// last set by WorkUnit, the driving run's progress at the round's start
	// and its planned work, and the samples put in the summaries' round.
	kind                 int
	applied              []byte
	roundDone, roundWork float64
	putSeen              []bool

	// The convergence figures of the kept steps so far (diags).
	diagAt int
	diagOf map[int][2]float64
}

// catchmentStream, drawStream and scatterStream are the second PCG words of
// the chains, of the ratios drawn from the prior per joint draw and of the
// samples' own scatter.
const (
	chainStream   = 0x63686169_6e73_2d31
	jointStream   = 0x6a6f696e_742d_6472
	scatterStream = 0x73636174_7465_7273
)

// NewCatchmentRun checks the problem, sets up every water and makes the
// counting check (docs/methods.md §7.12). When the samples cannot identify
// the shared ratios, the run is the per-sample model's, and
// Result().Catchment.Fallback says why.
func NewCatchmentRun(p Problem, o *Options, co *CatchmentOptions) (*CatchmentRun, error) {
	base, err := NewRun(p, o)
	if err != nil {
		return nil, err
	}
	c := &CatchmentRun{base: base, co: co.withDefaults(), cat: &Catchment{}}
	base.res.Catchment = c.cat
	c.cat.Check = c.check()
	if !c.cat.Check.OK {
		c.cat.Fallback = c.cat.Check.Text + "; the per-sample model was run instead"
		c.phase = 3
		return c, nil
	}
	base.opt.perturb = true
	base.opt.TargetESS = c.co.Keep // the Na-free rule's draws: as many as the joint draws
	base.res.Joint = true
	c.nd = len(base.dims)
	for j := range base.n {
		if !c.seen[j] {
			continue
		}
		for _, d := range base.dims {
			if d.em == j {
				c.ems = append(c.ems, j)
				break
			}
		}
	}
	c.np = c.nd + len(c.ems)
	if c.co.Warmup <= 0 {
		c.co.Warmup = max(800, warmupPer*c.np*c.np)
	}
	if c.co.Warmup+c.co.MaxSteps > MaxChainSteps {
		return nil, fmt.Errorf("mix: %d warm-up and %d kept steps per chain; at most %d in all", c.co.Warmup, c.co.MaxSteps, MaxChainSteps)
	}
	c.cat.Samples, c.cat.Chains, c.cat.Warmup = len(c.used), c.co.Chains, c.co.Warmup
	c.full, c.block = warmFull, warmBlock
	for k := range c.co.Chains {
		c.chains = append(c.chains, c.newChain(k))
	}
	c.takeSearches(c.co.Searches)
	return c, nil
}

// Result returns the run's result. Samples not yet summarised have Status
// NotRun.
func (c *CatchmentRun) Result() *Result { return c.base.res }

// Err reports a run stopped because its samples' draws passed
// Options.MaxKept (only the per-sample model's, after a fall back: the
// joint draws are CatchmentOptions.Keep per sample); nil otherwise.
func (c *CatchmentRun) Err() error {
	if c.phase == 3 {
		return c.base.Err()
	}
	return nil
}

// Done reports whether the run is finished.
func (c *CatchmentRun) Done() bool {
	if c.phase == 3 {
		return c.base.Done()
	}
	return c.phase == 2
}

// work returns the work done and planned, in sample evaluations.
func (c *CatchmentRun) work() (done, total float64) {
	s := float64(max(len(c.used), 1))
	for _, ch := range c.chains {
		found := float64(c.cat.Search) / float64(len(c.chains))
		if ch.search != nil {
			found = float64(ch.search.evals)
		}
		done += (found + float64(ch.t)) * s
		total += (max(found, plannedSearch*float64(c.np)) + float64(c.co.Warmup+max(ch.goal, c.co.Batch))) * s
	}
	// Summarising a sample costs about its prior and joint draws.
	per := float64(c.base.opt.Draws + c.co.Keep)
	ns := float64(len(c.base.prob.Waters))
	total += ns * per
	if c.phase >= 1 {
		done = total - (ns-float64(c.next))*per
	}
	return done, total
}

// Progress returns the fraction of the work done, in [0, 1], never less
// than before.
func (c *CatchmentRun) Progress() float64 {
	if c.phase == 3 {
		return c.base.Progress()
	}
	if c.phase == 2 {
		return 1
	}
	d, t := c.work()
	c.shown = max(c.shown, min(0.999, d/t))
	return c.shown
}

func (c *CatchmentRun) report() {
	o := c.base.opt.Progress
	if o == nil {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	const scale = 1000
	o(int(c.Progress()*scale), scale)
}

// Step works through about n more sample evaluations on the calling
// goroutine and reports whether the run is finished. Chunk sizes do not
// change the result. A cancelled context marks the samples not yet
// summarised Canceled and ends the run.
func (c *CatchmentRun) Step(ctx context.Context, n int) (done bool) {
	if c.phase == 3 {
		return c.base.Step(ctx, n)
	}
	per := max(len(c.used), 1)
	for n > 0 && c.phase < 2 {
		if ctx.Err() != nil {
			c.cancel()
			return true
		}
		if c.phase == 0 && c.prop == nil {
			// The mode searches, an iteration at a time, chain by chain;
			// then the proposal.
			var ch *chain
			for _, x := range c.chains {
				if !x.search.done {
					ch = x
					break
				}
			}
			if ch != nil {
				n -= per * c.iterate(ch)
				c.report()
				continue
			}
			n -= per * c.propose()
			continue
		}
		if c.phase == 0 {
			// The chain with the fewest steps moves; at a check point
			// shared by all, the check.
			ch := c.chains[0]
			for _, x := range c.chains[1:] {
				if x.t < ch.t {
					ch = x
				}
			}
			if ch.t < c.stopAt(ch) {
				c.step(ch)
				n -= per
				if ch.t%64 == 0 {
					c.report()
				}
				continue
			}
			c.sync()
			continue
		}
		c.summarise(c.next)
		n -= c.base.opt.Draws + c.co.Keep
		c.next++
		c.report()
		if c.next == len(c.base.prob.Waters) {
			c.finishAll()
		}
	}
	return c.Done()
}

// plannedSearch is the log posterior evaluations a chain's mode search is
// expected to take per parameter, for the progress (its iterations take
// one gradient each).
const plannedSearch = 25

// propose makes the chains' proposal once every mode search is done and
// returns the evaluations made.
func (c *CatchmentRun) propose() int {
	c.record()
	for _, ch := range c.chains {
		c.cat.Search += ch.search.evals
	}
	ev := c.buildProposal()
	c.cat.Search += ev
	c.cat.Modes = len(c.prop.comps)
	c.heavy = c.prop.heaviest()
	c.makeBlocks()
	return ev
}

// sync is called when every chain has reached its stop: it refits the
// proposal during the warm-up, and after it checks convergence.
func (c *CatchmentRun) sync() {
	if t := c.chains[0].t; t <= c.co.Warmup && t > c.refitted {
		c.refit(t == c.co.Warmup)
		c.refitted = t
		return
	}
	c.checkpoint()
}

// checkpoint is called when every chain has reached its goal: it checks
// convergence and either sets a new goal or ends the chains.
//
// Chains worked in rounds (Round) may have run past the check: their steps
// after the warm-up do not depend on the checks, so the checks due within
// the steps taken are made one after the other on the steps up to each,
// and the chains are cut back to the check that ends them, as if they had
// stopped there.
func (c *CatchmentRun) checkpoint() {
	avail := c.chains[0].t - c.co.Warmup
	steps := avail
	if c.checkAt > 0 {
		steps = c.checkAt
	}
	for {
		ok, ess := c.diagnoseAt(steps)
		if ok || steps >= c.co.MaxSteps {
			c.cutTo(steps)
			c.endChains()
			return
		}
		goal := c.nextCheck(steps, ess)
		if c.checkAt > 0 {
			c.checkAt = goal
		}
		if c.checkAt == 0 || goal > avail {
			if c.checkAt > 0 {
				goal = min(c.co.MaxSteps, max(goal, avail+c.ahead))
			}
			for _, ch := range c.chains {
				ch.goal = goal
			}
			return
		}
		steps = goal
	}
}

// diagnoseAt is diagnose on each chain's first steps kept steps.
func (c *CatchmentRun) diagnoseAt(steps int) (bool, float64) {
	if steps == c.chains[0].t-c.co.Warmup {
		return c.diagnose()
	}
	type saved struct {
		t    int
		hist []float64
	}
	was := make([]saved, len(c.chains))
	for i, ch := range c.chains {
		was[i] = saved{ch.t, ch.hist}
		ch.t, ch.hist = c.co.Warmup+steps, ch.hist[:steps*c.np]
	}
	ok, ess := c.diagnose()
	for i, ch := range c.chains {
		ch.t, ch.hist = was[i].t, was[i].hist
	}
	return ok, ess
}

// cutTo cuts every chain back to its first steps kept steps.
func (c *CatchmentRun) cutTo(steps int) {
	for _, ch := range c.chains {
		if ch.t-c.co.Warmup == steps {
			continue
		}
		ch.t, ch.hist = c.co.Warmup+steps, ch.hist[:steps*c.np]
		ch.accepted = 0
		if steps > 0 {
			ch.accepted = int(ch.acc[steps-1])
		}
		ch.acc = ch.acc[:steps]
	}
}

// nextCheck returns the kept steps at which the chains are checked next,
// after a check at steps that found them not converged, the smallest ESS
// then being ess (0 when R-hat failed): a batch later, or, when the ESS
// says many more steps are needed, half way to the steps it asks for, or a
// tenth more steps, whichever is furthest, in whole batches, so that the
// checks (whose autocorrelations cost as much as many steps) are a few,
// and the chains stop within a few batches or a twentieth of their
// length of where they first could.
func (c *CatchmentRun) nextCheck(steps int, ess float64) int {
	b := c.co.Batch
	next := max(steps+b, steps+steps/20)
	if ess > 0 {
		need := float64(steps) * float64(c.co.TargetESS) / ess
		next = max(next, steps+int((need-float64(steps))/2))
	}
	next = (next + b - 1) / b * b
	return min(c.co.MaxSteps, next)
}

func (c *CatchmentRun) cancel() {
	res := c.base.res
	for s := c.next; s < len(res.Samples); s++ {
		res.Samples[s].Status = Canceled
		res.Samples[s].Verdict = Canceled.String()
	}
	c.phase = 2
	res.Status = res.worst()
}

// endChains ends the chains: the kept states are thinned evenly to Keep
// joint draws, and the ratios no tracer reads are drawn from their priors,
// once per joint draw.
func (c *CatchmentRun) endChains() {
	steps := c.chains[0].t - c.co.Warmup
	c.cat.Steps = steps
	per := c.co.Keep / c.co.Chains
	acc := 0
	for _, ch := range c.chains {
		acc += ch.accepted
		for q := range per {
			i := int((float64(q) + 0.5) * float64(steps) / float64(per))
			c.keep = append(c.keep, ch.hist[i*c.np:(i+1)*c.np])
		}
	}
	c.cat.Acceptance = float64(acc) / float64(steps*len(c.chains))
	r := c.base
	n := r.n
	rng := rand.New(rand.NewPCG(r.opt.Seed, jointStream))
	c.extra = make([]float64, c.co.Keep*int(NTracers)*n)
	for d := range c.co.Keep {
		for t := range NTracers {
			for j := range n {
				u := uniform(rng)
				s := &r.smp[t][j]
				if r.need[t] && !r.lik[t] {
					c.extra[(d*int(NTracers)+int(t))*n+j] = s.draw(u)
				}
			}
		}
	}
	c.summariseShared()
	c.phase = 1
	if len(c.base.prob.Waters) == 0 {
		c.finishAll()
	}
}

// finishAll ends the run.
func (c *CatchmentRun) finishAll() {
	c.phase = 2
	c.keep, c.extra = nil, nil
	for _, ch := range c.chains {
		ch.hist, ch.acc = nil, nil
	}
	c.base.cur = len(c.base.prob.Waters)
	c.base.res.Status = c.base.res.worst()
}

// InvertCatchment runs the catchment-wide model on every water of p, the
// chains (and then the samples) on Options.Workers goroutines (all cores by
// default). The result does not depend on the number of workers.
// Cancelling ctx stops the run early. After a failed counting check it runs
// the per-sample model, and Result.Catchment.Fallback says why.
func InvertCatchment(ctx context.Context, p Problem, o *Options, co *CatchmentOptions) (*Result, error) {
	c, err := NewCatchmentRun(p, o, co)
	if err != nil {
		return nil, err
	}
	if c.phase == 3 {
		res, err := Invert(ctx, p, o)
		if res != nil {
			res.Catchment = c.cat
		}
		return res, err
	}
	workers := c.base.opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	parallel := func(n int, f func(i int)) {
		var wg sync.WaitGroup
		var mu sync.Mutex
		next := 0
		for range max(1, min(workers, n)) {
			wg.Add(1)
			go func() {
				defer wg.Done()
				for {
					mu.Lock()
					i := next
					next++
					mu.Unlock()
					if i >= n || ctx.Err() != nil {
						return
					}
					f(i)
				}
			}()
		}
		wg.Wait()
	}
	parallel(len(c.chains), func(i int) {
		for ch := c.chains[i]; !ch.search.done && ctx.Err() == nil; {
			c.iterate(ch)
			c.report()
		}
	})
	if ctx.Err() != nil {
		c.cancel()
		return c.base.res, nil
	}
	c.propose()
	for c.phase == 0 {
		parallel(len(c.chains), func(i int) {
			ch := c.chains[i]
			for stop := c.stopAt(ch); ch.t < stop && ctx.Err() == nil; {
				c.step(ch)
				if ch.t%256 == 0 {
					c.report()
				}
			}
		})
		if ctx.Err() != nil {
			c.cancel()
			return c.base.res, nil
		}
		c.sync()
	}
	ns := len(p.Waters)
	done := make([]bool, ns)
	parallel(ns, func(s int) {
		c.summarise(s)
		done[s] = true
		c.mu.Lock()
		c.next++
		c.mu.Unlock()
		c.report()
	})
	if ctx.Err() != nil {
		for s := range ns {
			if !done[s] {
				c.base.res.Samples[s].Status = Canceled
				c.base.res.Samples[s].Verdict = Canceled.String()
			}
		}
		c.phase = 2
		c.base.res.Status = c.base.res.worst()
		return c.base.res, nil
	}
	c.finishAll()
	return c.base.res, nil
}

// summariseShared writes the shared ratios' and scatters' posteriors.
func (c *CatchmentRun) summariseShared() {
	r := c.base
	col := make([]float64, len(c.keep))
	cat := c.cat
	cat.MaxRHat, cat.MinESS = 0, math.Inf(1)
	var idx []int
	for i, d := range r.dims {
		if c.seen[d.em] {
			idx = append(idx, i)
		}
	}
	for e := range c.ems {
		idx = append(idx, c.nd+e)
	}
	figs := c.diags(idx)
	k := 0
	for i, d := range r.dims {
		if !c.seen[d.em] {
			continue // no sample sees it: its prior, untouched
		}
		s := &r.smp[d.t][d.em]
		for q, x := range c.keep {
			col[q] = pexp(s.fromLatent(x[i]))
		}
		rh, ess := figs[k][0], figs[k][1]
		k++
		lo, hi := pexp(s.fromLatent(-z975)), pexp(s.fromLatent(z975))
		sr := SharedRatio{EndMember: d.em, Tracer: d.t, Prior: Interval{Lo: lo, Median: pexp(s.fromLatent(0)), Hi: hi},
			Posterior: interval(col), RHat: rh, ESS: ess}
		cat.Ratios = append(cat.Ratios, sr)
		cat.MaxRHat, cat.MinESS = max(cat.MaxRHat, rh), min(cat.MinESS, ess)
	}
	for e, j := range c.ems {
		for q, x := range c.keep {
			col[q] = c.scatterOf(x[c.nd+e])
		}
		rh, ess := figs[k][0], figs[k][1]
		k++
		cat.Scatter = append(cat.Scatter, Scatter{EndMember: j, Posterior: interval(col), RHat: rh, ESS: ess})
	}
	if len(r.dims) == 0 {
		cat.MinESS = float64(c.co.Keep)
	}
	cat.Converged = cat.MaxRHat < RHatLimit && cat.MinESS >= float64(c.co.TargetESS)
	cat.Message = notConverged(cat, c.co.TargetESS)
}

// apartRHat is the split R-hat above which chains that found more than one
// peak are said to sit in different peaks rather than to mix slowly (an
// engineering choice, no source: chains that share a peak but mix slowly
// reach 1.02-1.1 at the cap in the simulation study, docs/methods.md
// §7.12).
const apartRHat = 1.2

// notConverged returns the plain message of chains that have not
// converged ("" when they have): that they sit in separate peaks, when the
// mode searches found more than one and R-hat is far above its limit, or
// that they have not converged within the cap.
func notConverged(cat *Catchment, target int) string {
	switch {
	case cat.Converged:
		return ""
	case cat.Modes > 1 && cat.MaxRHat > apartRHat:
		return fmt.Sprintf("the %d chains have not converged: they disagree, because the posterior of the shared end-member ratios has %d separate peaks and the chains, which seldom cross between them, give different answers (largest R-hat %.3f, want below %.2f, after %d steps each): the shared end-member ratios and every split that rests on them are doubtful; the data may fit more than one set of end-members (more samples, a further tracer or narrower priors can tell them apart)",
			cat.Chains, cat.Modes, cat.MaxRHat, RHatLimit, cat.Steps)
	}
	return fmt.Sprintf("the %d chains have not converged within the cap of %d steps each (largest R-hat %.3f, want below %.2f; smallest effective sample size %.0f, want %d): the shared end-member ratios and every split that rests on them are doubtful",
		cat.Chains, cat.Steps, cat.MaxRHat, RHatLimit, cat.MinESS, target)
}
