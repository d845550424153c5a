package web

import (
	"context"
	"fmt"
	"strings"

	"github.com/vugu/vugu"

	"lixiv/engine/notebook"
)

// runner computes the stale cells of the page's document off the event
// handlers: a quick pass of point values first, then the refinement, with
// the main thread handed back to the browser between slices. Root holds
// one; it knows the page only through env (the event lock and the
// repaint), save and fail.
type runner struct {
	env vugu.EventEnv
	// save writes an edit still waiting to browser storage and reports
	// whether there was one; fail shows why a run stopped. Both are
	// called with the event lock held.
	save func() bool
	fail func(error)

	running  string  // the cell computing
	progress float64 // how far it is, 0 to 1
	busy     bool
	gen      int // completed recomputes
	cancel   context.CancelFunc
	loopDone chan struct{}

	editStart  float64 // when the edit now computing was made (ms)
	painted    bool    // the page has repainted since that edit
	stepMillis float64 // time in Step (including yields) since the edit

	// The render loop holds the repaint after an edit until the quick pass
	// (notebook.Document.Quick) has point values, for at most HoldMillis,
	// so that a quick edit paints once, with its result.
	quickDone  chan struct{} // closed when the quick pass of the run is done
	holdDone   chan struct{} // closed when the render loop is to stop holding: the quick pass is done, or the run handed the thread back
	holding    bool          // the render loop waits on holdDone
	quickShown bool          // the quick pass's result has been painted

	marked     int  // the steps marked for the timing harness (Mark)
	paintFirst bool // the run lets the page render before it computes (a budget just opened)

	// renderedAt is when the last render ended (Rendered). The run's
	// repaints are spaced from it as well as from when they were asked
	// for, so that where a render takes long (a slow machine, a large
	// page) the run does not repaint after every step.
	renderedAt float64
}

// recompute cancels a run in progress and starts computing the stale
// cells of doc. Call it with the event lock held.
func (c *runner) recompute(doc *notebook.Document) {
	if c.cancel != nil {
		c.cancel()
	}
	ctx, cancel := context.WithCancel(context.Background())
	c.cancel = cancel
	prev, done := c.loopDone, make(chan struct{})
	c.loopDone = done
	c.busy = true
	doc.Quick = true
	c.quickDone, c.holdDone, c.holding, c.quickShown = make(chan struct{}), make(chan struct{}), false, false
	go c.run(ctx, doc, prev, done, c.quickDone)
}

// hold returns a channel the render loop waits on (Root.Hold), nil when
// the page is not ready or there is nothing to wait for.
func (c *runner) hold(ready bool) <-chan struct{} {
	if !ready || !c.busy || c.quickDone == nil || c.painted || c.editStart == 0 {
		return nil
	}
	select {
	case <-c.holdDone:
		return nil
	default:
	}
	c.holding = true
	return c.holdDone
}

// release ends the render loop's hold for the run whose quick pass is
// done: the quick pass has its point values, or it hands the thread back
// to the browser (a slice ran out, or it waits for the workers), so the
// page repaints now rather than when HoldMillis is up. Call it with the
// event lock held.
func (c *runner) release(done chan struct{}) {
	if done != c.quickDone {
		return
	}
	select {
	case <-c.holdDone:
	default:
		close(c.holdDone)
	}
}

// Unhold tells the runner the render loop stopped holding (the quick pass
// took longer than HoldMillis, or was done). Call it with the event lock held.
func (c *runner) Unhold() { c.holding = false }

// quickPassDone closes done once and repaints: through the render loop
// when it is holding for it, else by asking for a render. Call it with the
// event lock held; it releases it.
func (c *runner) quickPassDone(done chan struct{}) {
	if done != c.quickDone { // a run cancelled by a later edit: nothing to show
		c.env.UnlockOnly()
		return
	}
	select {
	case <-done:
		c.env.UnlockOnly()
		return
	default:
	}
	close(done)
	if c.editStart > 0 {
		Probe("lixivLastQuick", nowMillis()-c.editStart)
	}
	if c.holding {
		select {
		case <-c.holdDone: // released: the render loop has rendered, or renders as it wakes
		default:
			c.holding = false
			close(c.holdDone)
			c.env.UnlockOnly() // the render loop renders as it wakes
			return
		}
	}
	c.release(done)
	c.env.UnlockRender()
}

// run computes the stale cells of doc one at a time, handing the main
// thread back to the browser every few tens of milliseconds (also from
// inside a long cell, through its progress reports) so that the page
// scrolls and takes typing. The page repaints at most every paintEvery ms
// while computing (each repaint rebuilds the page), and once at the end.
func (c *runner) run(ctx context.Context, doc *notebook.Document, prev, done, quick chan struct{}) {
	defer close(done)
	defer func() { // cancelled or failed before the quick pass was over
		c.env.Lock()
		c.quickPassDone(quick)
	}()
	if prev != nil {
		<-prev
	}
	c.env.Lock()
	first := c.paintFirst
	c.paintFirst = false
	c.env.UnlockOnly()
	if first { // let the page draw the budget just opened before computing it
		yieldToBrowser()
	}
	// The edit is saved to browser storage at the first yield: after the
	// quick pass has painted, or at the first hand-back of a long one.
	saveIfPending := func() {
		c.env.Lock()
		c.save()
		c.env.UnlockOnly()
	}
	defer func() { // a run without a yield saves at its end, and shows it
		c.env.Lock()
		if c.save() {
			c.env.UnlockRender()
			return
		}
		c.env.UnlockOnly()
	}()
	var stepped []string                                   // for the timing harness: when each step began
	const slice, paintEvery, progressEvery = 30, 250, 1000 // ms
	lastYield, lastPaint := nowMillis(), nowMillis()       // the edit's handler has just painted
	longest, longestCell := 0.0, ""
	// The inversions' samples go to the page's workers, if any. Waiting
	// for them hands the thread back to the browser: the engine's slice
	// starts again after each wait.
	// A quick pass that waits for them is not done within the render
	// loop's hold, so the page repaints as the wait begins.
	doc.Farm = nil
	if f := pageFarm(func() { lastYield = nowMillis() }); f != nil {
		doc.Farm = releasing{Farm: f, release: func() {
			c.env.Lock()
			c.release(quick)
			c.env.UnlockOnly()
		}}
	}
	// The render loop holds the edit's first repaint for the quick pass
	// at most HoldMillis; the first hand-back after that lets it paint,
	// so the run hands back then rather than at the end of its slice.
	c.env.Lock()
	holdDue := 0.0
	if c.editStart > 0 && !c.painted {
		holdDue = c.editStart + HoldMillis
	}
	c.env.UnlockOnly()
	due := func() bool {
		now := nowMillis()
		return now-lastYield > slice || (holdDue > 0 && now >= holdDue)
	}
	handBack := func() {
		holdDue = 0
		if d := nowMillis() - lastYield; d > longest {
			longest, longestCell = d, c.running
		}
		// Save at this hand-back once the quick pass has painted, or
		// when it runs long; a short quick pass saves after its paint.
		// A quick pass that hands back is not done within the hold.
		select {
		case <-quick:
			saveIfPending()
		default:
			c.env.Lock()
			c.release(quick)
			c.env.UnlockOnly()
			if nowMillis()-c.editStart > 250 {
				saveIfPending()
			}
		}
		yieldToBrowser()
		lastYield = nowMillis()
	}
	breathe := func() {
		if due() {
			handBack()
		}
	}
	// shown is the running cell the last repaint from here showed, whose
	// progress bar is therefore on the page. A repaint rebuilds the whole
	// page, so between repaints the progress of that cell moves its bar
	// only, and the page repaints at most every progressEvery ms for it.
	shown := ""
	publish := func(final bool) { // call with the lock held; it releases it
		if final || nowMillis()-max(lastPaint, c.renderedAt) > paintEvery {
			lastPaint = nowMillis()
			shown = c.running
			if final {
				c.env.UnlockRender()
				return
			}
			// The repaint takes a task of its own, so that the browser's
			// thread is never held for a slice and a render together: the
			// engine's slice ends, the page renders, the engine goes on.
			c.env.UnlockOnly()
			handBack()
			c.env.Lock()
			c.env.UnlockRender()
			yieldToBrowser()
			lastYield = nowMillis()
			return
		}
		c.env.UnlockOnly()
	}
	progress := func(p notebook.Progress) {
		if !due() {
			return
		}
		if ctx.Err() != nil { // cancelled: keep the page live until the cell gives up
			breathe()
			return
		}
		c.env.Lock()
		c.running = p.Cell
		if p.Total > 0 {
			c.progress = float64(p.Done) / float64(p.Total)
		}
		if p.Cell == shown && nowMillis()-lastPaint <= progressEvery {
			at := c.progress
			c.env.UnlockOnly()
			showProgress(p.Cell, at)
		} else {
			publish(false)
		}
		breathe()
	}
	for {
		if ctx.Err() != nil {
			return
		}
		if pending := doc.Pending(); len(pending) > 0 {
			c.env.Lock()
			c.running, c.progress = pending[0], 0
			c.env.UnlockOnly()
		}
		t0 := nowMillis()
		if Probing {
			stepped = append(stepped, fmt.Sprintf("%s %.0f", doc.Pending()[0], t0-c.editStart))
			if c.marked < 24 { // the first load's steps, quick and refining
				Mark("step " + doc.Pending()[0])
				c.marked++
			}
		}
		more, err := func() (more bool, err error) {
			defer func() {
				if r := recover(); r != nil {
					more, err = false, fmt.Errorf("internal error: %v", r)
				}
			}()
			return doc.Step(ctx, progress)
		}()
		c.stepMillis += nowMillis() - t0
		if ctx.Err() != nil {
			return
		}
		c.env.Lock()
		if err == nil && more && doc.QuickPassDone() {
			select {
			case <-quick:
			default:
				// The point values are in: paint them, then refine.
				if Probing {
					Probe("lixivQuickSteps", strings.Join(stepped, ", ")+fmt.Sprintf(", done %.0f", nowMillis()-c.editStart))
				}
				lastPaint = nowMillis()
				c.quickPassDone(quick)
				yieldToBrowser()
				saveIfPending()
				lastYield = nowMillis()
				continue
			}
		}
		if err != nil || !more {
			// For the timing harness: the longest stretch without a yield.
			if Probing {
				Probe("lixivLongestSlice", fmt.Sprintf("%.0f ms in %s", longest, longestCell))
				if c.marked < 25 { // the end of the first load's run
					Mark("all computed")
					c.marked = 25
				}
			}
			c.running, c.busy = "", false
			c.gen++
			if err != nil {
				c.fail(err)
			}
			select {
			case <-quick:
				publish(true)
			default: // no refining: the quick pass was the whole run
				c.quickPassDone(quick)
			}
			return
		}
		publish(false)
		breathe()
	}
}

// releasing is the page's farm for one run: it ends the render loop's
// hold (release) before each wait for the workers.
type releasing struct {
	notebook.Farm
	release func()
}

// Work releases the hold, then hands the job to the workers.
func (r releasing) Work(ctx context.Context, job notebook.FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	r.release()
	return r.Farm.Work(ctx, job, samples, put, progress)
}
