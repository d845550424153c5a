package web

import (
	"context"
	"fmt"
	"time"

	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
)

// ServeWorker makes this instance of the page's module a copy of the
// engine on a Web Worker (worker.js): it works one sample of an inversion
// (or one chain or sample of a round of the catchment-wide model) per
// request, in order, keeping the job's budget and inversion for its
// next samples, and posts back the sample's bytes (with the milliseconds
// it took, which the pool sums up for the timing harness), its progress
// every tenth of a second, or the error, never a silent stop. It does not
// return.
func ServeWorker() {
	queue := make(chan js.Value, 64)
	js.Global().Call("lixivServe", js.FuncOf(func(_ js.Value, a []js.Value) any {
		queue <- a[0]
		return nil
	}))
	var (
		work  *notebook.FarmWork
		doc   []byte
		state []byte // the catchment-wide model's round, nil for the per-sample model
		docOf int
	)
	post := js.Global().Get("lixivPost")
	for m := range queue {
		id, s := m.Get("id").Int(), m.Get("sample").Int()
		if d := m.Get("doc"); !d.IsUndefined() {
			doc = make([]byte, d.Length())
			js.CopyBytesToGo(doc, d)
			docOf = id
			state = nil
			if st := m.Get("state"); !st.IsUndefined() && !st.IsNull() {
				state = make([]byte, st.Length())
				js.CopyBytesToGo(state, st)
			}
		}
		if docOf != id {
			post.Invoke(id, s, js.Null(), fmt.Sprintf("no budget for job %d", id), 0)
			continue
		}
		job := notebook.FarmJob{Doc: doc, Cell: m.Get("cell").String(), Sulfate: m.Get("sulfate").String(), Rough: m.Get("rough").Bool(), State: state}
		start := time.Now()
		last := start
		b, err := func() (b []byte, err error) {
			defer func() {
				if r := recover(); r != nil {
					b, err = nil, fmt.Errorf("internal error: %v", r)
				}
			}()
			if work == nil || !work.Same(job) {
				prev := work
				work = nil
				if work, err = notebook.NewFarmWork(context.Background(), job, prev); err != nil {
					return nil, err
				}
			}
			return work.Unit(context.Background(), job.State, s, func(f float64) {
				if time.Since(last) > 100*time.Millisecond {
					last = time.Now()
					post.Invoke(id, s, js.Null(), "", f)
				}
			})
		}()
		if err != nil {
			what := "sample "
			if state != nil {
				what = "part " // a chain or a sample of the catchment-wide model's round
			}
			post.Invoke(id, s, js.Null(), what+fmt.Sprint(s+1)+": "+err.Error(), 0)
			continue
		}
		out := js.Global().Get("Uint8Array").New(len(b))
		js.CopyBytesToJS(out, b)
		post.Invoke(id, s, out, "", 1, float64(time.Since(start).Microseconds())/1000)
	}
}
