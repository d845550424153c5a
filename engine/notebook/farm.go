package notebook

import (
	"bytes"
	"context"
	"errors"
	"fmt"

	"lixiv/engine/mix"
)

// Farm works the samples of the per-sample inverse model apart from the
// document that asks for them: in the page, on Web Workers, each holding
// a copy of the engine. Document.Farm sets one; without it the samples
// are worked in-process (on Document.Workers goroutines, or in chunks on
// one in the browser).
//
// Results do not depend on it: every sample draws from its own random
// streams, and every copy of the engine draws the seed's first-stage
// table alike (mix.Run.WorkSample), so a sample worked anywhere gives the
// same bits. The catchment-wide model goes through it too, round by round
// (mix.CatchmentRun.Round): its chains between two points at which they
// wait for each other, then its samples' summaries, each job's units
// being chains or samples and FarmJob.State what every copy needs; what
// lies between rounds (the proposal, its refits, the convergence checks)
// the document does itself. The forward model and the bootstraps of
// fluxes and CO2 (whose replicates take their draws from one stream in
// turn) stay in-process.
type Farm interface {
	// Work works the given samples of job (their numbers, in order),
	// each through FarmWork.Sample in a copy of the engine, and hands
	// each sample's bytes to put (never concurrently), calling progress
	// with the fraction done. It returns put's first error, the context's
	// error when cancelled, or an error that names the copy of the engine
	// that failed.
	Work(ctx context.Context, job FarmJob, samples []int, put func(s int, b []byte) error, progress func(done float64)) error
}

// FarmJob says which inversion a copy of the engine is to work: the
// budget (Document.Marshal, without stored results), the apportionment
// cell, the sulfate origin when another than the cell's (the CO2 cell's
// comparison of origins) and whether it is the quick pass. For a round of
// the catchment-wide model, State is the round's state (what
// mix.CatchmentRun.Round returned) and the units are its chains or
// samples; it is nil for the per-sample model's samples (and for the
// catchment-wide model's when its counting check sent it to them).
type FarmJob struct {
	Doc     []byte
	Cell    string
	Sulfate string
	Rough   bool
	State   []byte
}

// inverter is how a cell runs the inverse model: on how many goroutines,
// or through a Farm, and which job it is.
type inverter struct {
	workers int
	farm    Farm
	job     FarmJob
	doc     *Document    // marshalled into job.Doc when the farm first needs it
	capture *mix.Options // FarmWork: set to the options instead of running
	problem *mix.Problem
	// catchment is set to the catchment-wide model's options with capture.
	catchment *mix.CatchmentOptions
	// reuse is an earlier run of the per-sample model whose samples are
	// taken over where they would not change (mix.Run.Reuse): the
	// apportionment's own run, when the CO2 cell runs it again with
	// another sulfate origin.
	reuse *mix.Result
}

// inverter returns how this cell runs the inverse model.
func (e *Env) inverter() inverter {
	return inverter{workers: e.Workers(), farm: e.doc.Farm, job: FarmJob{Cell: e.Cell.ID, Rough: e.rough}, doc: e.doc}
}

// errCaptured stops an apportionment whose problem WorkSamples took.
var errCaptured = errors.New("notebook: inversion problem captured")

// farmed runs the per-sample inverse model of p through the farm.
func (iv *inverter) farmed(ctx context.Context, report func(done, total int), p mix.Problem, mo *mix.Options) (*mix.Result, error) {
	g, err := mix.NewGather(p, mo)
	if err != nil {
		return nil, err
	}
	job := iv.job
	if job.Doc == nil {
		job.Doc = budgetOnly(iv.doc)
	}
	todo := g.Reuse(iv.reuse)
	err = iv.farm.Work(ctx, job, todo, g.PutSample, func(f float64) { report(int(f*1000), 1000) })
	if ctx.Err() != nil {
		return nil, ctx.Err()
	}
	if err != nil {
		return nil, err
	}
	g.Gather(ctx)
	report(1000, 1000)
	if err := g.Err(); err != nil {
		return nil, keptErr(err)
	}
	return g.Result(), nil
}

// farmedCatchment runs the catchment-wide model of p with its chains and
// samples worked through the farm, round by round; after a failed
// counting check, the per-sample model's samples.
func (iv *inverter) farmedCatchment(ctx context.Context, report func(done, total int), p mix.Problem, mo *mix.Options, co *mix.CatchmentOptions) (*mix.Result, error) {
	run, err := mix.NewCatchmentRun(p, mo, co)
	if err != nil {
		return nil, err
	}
	if cat := run.Result().Catchment; cat.Fallback != "" {
		res, err := iv.farmed(ctx, report, p, mo)
		if res != nil {
			res.Catchment = cat
		}
		return res, err
	}
	job := iv.job
	if job.Doc == nil {
		job.Doc = budgetOnly(iv.doc)
	}
	for {
		state, units := run.Round()
		if units == nil {
			break
		}
		job.State = state
		err := iv.farm.Work(ctx, job, units, run.PutUnit, func(f float64) { report(int(run.RoundProgress(f)*1000), 1000) })
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		if err != nil {
			return nil, err
		}
	}
	report(1000, 1000)
	return run.Result(), nil
}

// budgetOnly is the budget file of d without its stored results.
func budgetOnly(d *Document) []byte {
	b := &Document{Title: d.Title, Cells: d.Cells, Extra: d.Extra}
	return b.Marshal()
}

// FarmWork is one copy of the engine's share of a FarmJob: the problem
// of the job's inversion, built from the budget as the document that
// asked built it, ready to work samples (or the catchment-wide model's
// chains and samples). A copy keeps it for the next samples of the same
// job, and for the next rounds of the same catchment-wide run.
type FarmWork struct {
	job     FarmJob
	doc     *Document
	problem mix.Problem
	opt     mix.Options
	co      *mix.CatchmentOptions // the catchment-wide model's, nil for the per-sample model
	run     *mix.Run              // made when first needed
	cat     *mix.CatchmentRun     // made when first needed
}

// NewFarmWork reads the job's budget, computes the cells the
// apportionment cell reads and sets up its inversion. With prev, the
// FarmWork of an earlier job, it reuses prev's budget and computed cells
// when the job's budget is the same.
func NewFarmWork(ctx context.Context, job FarmJob, prev *FarmWork) (*FarmWork, error) {
	var d *Document
	if prev != nil && bytes.Equal(prev.job.Doc, job.Doc) {
		d = prev.doc
	} else {
		var err error
		if d, err = Parse(job.Doc, "budget"); err != nil {
			return nil, err
		}
	}
	d.Workers = 1
	c := d.Cell(job.Cell)
	if c == nil || c.Kind != KindApportionment {
		return nil, fmt.Errorf("no apportionment cell %q in the budget", job.Cell)
	}
	for {
		pending := d.Pending()
		if len(pending) == 0 || pending[0] == job.Cell {
			break
		}
		if _, err := d.Step(ctx, nil); err != nil {
			return nil, err
		}
	}
	s := *c.Settings.(*ApportionmentSettings)
	if job.Sulfate != "" {
		s.Sulfate = job.Sulfate
	}
	e := &Env{Ctx: ctx, Cell: c, doc: d, rough: job.Rough}
	atm, ems, err := apportionInputs(e)
	if err != nil {
		return nil, err
	}
	iv := inverter{workers: 1, capture: &mix.Options{}, problem: &mix.Problem{}, catchment: &mix.CatchmentOptions{}}
	if _, _, err := apportion(ctx, iv, func(int, int) {}, &s, atm, ems, false, job.Rough); !errors.Is(err, errCaptured) {
		if err == nil {
			err = errors.New("the apportionment runs no inverse model")
		}
		return nil, err
	}
	w := &FarmWork{job: job, doc: d, problem: *iv.problem, opt: *iv.capture}
	if s.Model == "catchment" {
		w.co = iv.catchment
	}
	return w, nil
}

// Same reports whether w is set up for job (whatever the round of a
// catchment-wide run).
func (w *FarmWork) Same(job FarmJob) bool {
	return w.job.Cell == job.Cell && w.job.Sulfate == job.Sulfate && w.job.Rough == job.Rough && bytes.Equal(w.job.Doc, job.Doc)
}

// Unit works unit s of a job whose State is state and returns its bytes
// for the Farm's put, calling progress with the fraction of it done: with
// a state, chain or sample s of a round of the catchment-wide model
// (mix.CatchmentRun.WorkUnit); with none, the per-sample model's sample s.
func (w *FarmWork) Unit(ctx context.Context, state []byte, s int, progress func(float64)) ([]byte, error) {
	if state != nil {
		if w.co == nil {
			return nil, errors.New("the apportionment runs no catchment-wide model")
		}
		if w.cat == nil {
			c, err := mix.NewCatchmentRun(w.problem, &w.opt, w.co)
			if err != nil {
				return nil, err
			}
			w.cat = c
		}
		return w.cat.WorkUnit(ctx, state, s, progress)
	}
	if w.run == nil {
		r, err := mix.NewRun(w.problem, &w.opt)
		if err != nil {
			return nil, err
		}
		w.run = r
	}
	if s < 0 || s >= w.run.Samples() {
		return nil, fmt.Errorf("no sample %d in the inversion (%d samples)", s, w.run.Samples())
	}
	return w.run.WorkSample(ctx, s, progress)
}
