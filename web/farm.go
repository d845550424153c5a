package web

import (
	"context"
	"errors"

	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
)

// workers is the page's Web Workers (boot.js's lixivPool) as the
// document's notebook.Farm: the samples of each per-sample inversion, and
// the chains and samples of each round of the catchment-wide model, are
// worked there, so the page's own thread only draws while they compute.
// waited is called after each wait for them: waiting hands the page's
// thread back to the browser, which the page's runner counts as a yield.
type workers struct {
	pool   js.Value
	waited func()
}

// pageFarm returns the page's workers, calling waited after each wait for
// them, or nil when the page computes on its own thread (workers=0, or a
// browser without Web Workers; boot.js says so in the page).
func pageFarm(waited func()) notebook.Farm {
	p := js.Global().Get("lixivPool")
	if p.IsUndefined() || p.IsNull() || p.Get("size").Int() < 1 {
		return nil
	}
	return workers{pool: p, waited: waited}
}

// farmNote is one message from the pool: a sample's bytes, the progress,
// or why the job failed.
type farmNote struct {
	sample   int
	bytes    []byte
	progress float64
	err      string
}

// Work hands the job to the pool and waits, handing each sample to put.
// Waiting on a channel hands the page's thread back to the browser.
func (w workers) Work(ctx context.Context, job notebook.FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	n := len(samples)
	if n == 0 {
		return nil
	}
	ch := make(chan farmNote, n+64)
	send := func(m farmNote) {
		select {
		case ch <- m:
		default: // progress that nobody reads in time is dropped
		}
	}
	onSample := js.FuncOf(func(_ js.Value, a []js.Value) any {
		b := make([]byte, a[1].Length())
		js.CopyBytesToGo(b, a[1])
		ch <- farmNote{sample: a[0].Int(), bytes: b, progress: -1}
		return nil
	})
	onProgress := js.FuncOf(func(_ js.Value, a []js.Value) any {
		send(farmNote{sample: -1, progress: a[0].Float()})
		return nil
	})
	onError := js.FuncOf(func(_ js.Value, a []js.Value) any {
		send(farmNote{sample: -1, progress: -1, err: a[0].String()})
		return nil
	})
	defer onSample.Release()
	defer onProgress.Release()
	defer onError.Release()
	doc := js.Global().Get("Uint8Array").New(len(job.Doc))
	js.CopyBytesToJS(doc, job.Doc)
	list := make([]any, n)
	for i, s := range samples {
		list[i] = s
	}
	state := js.Null()
	if job.State != nil {
		state = js.Global().Get("Uint8Array").New(len(job.State))
		js.CopyBytesToJS(state, job.State)
	}
	cancel := w.pool.Call("run", doc, job.Cell, job.Sulfate, job.Rough, list, onSample, onProgress, onError, state)
	for got := 0; got < n; {
		select {
		case <-ctx.Done():
			cancel.Invoke()
			return ctx.Err()
		case m := <-ch:
			if w.waited != nil {
				w.waited()
			}
			switch {
			case m.err != "":
				return errors.New(m.err)
			case m.bytes != nil:
				if err := put(m.sample, m.bytes); err != nil {
					cancel.Invoke()
					return err
				}
				got++
			default:
				progress(m.progress)
			}
		}
	}
	return nil
}
