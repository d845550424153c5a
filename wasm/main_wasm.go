//go:build js && wasm

// Command wasm is the browser entry of the Lixiv notebook page: it mounts the
// Root component of package web and runs vugu's render loop. The same
// module runs on the page's Web Workers (worker.js), where there is no
// document: there it serves the page as a copy of the engine.
package main

import (
	"log"
	"runtime/debug"
	"syscall/js"
	"time"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/domrender"

	"lixiv/web"
)

// memoryLimit is the page's soft limit on the Go heap. Compiled to
// WebAssembly the heap never gives memory back, and without a limit the
// runtime let it grow to about 16 times the live heap while the examples
// were computed one after another (3.9 GB for 240 MB live, measured in
// Node), close to the 4 GB a 32-bit WebAssembly memory can hold; with the
// limit the same work stayed at about 0.5 GB.
const memoryLimit = 1 << 30

// workerGCPercent is the garbage collector's target on the Web Workers: a
// worker's live heap is one sample's work, small and short-lived, and
// collecting it less often took the per-sample benchmark from 4,349 to
// 4,199 ns per draw in Node (BenchmarkInvert100, GOGC 100 against 400,
// means of three; the catchment-wide benchmark did not change). The heap
// limit above still holds.
const workerGCPercent = 400

func main() {
	web.Mark("main")
	debug.SetMemoryLimit(memoryLimit)
	if js.Global().Get("document").IsUndefined() {
		debug.SetGCPercent(workerGCPercent)
		web.ServeWorker()
		return
	}
	renderer, err := domrender.New("#lixiv")
	if err != nil {
		log.Fatal(err)
	}
	defer renderer.Release()
	env, err := vugu.NewBuildEnv(renderer.EventEnv())
	if err != nil {
		log.Fatal(err)
	}
	root := &web.Root{}
	ee := renderer.EventEnv()
	renders := 0 // the first few renders are marked for the timing harness
	for ok := true; ok; ok = renderer.EventWait() {
		// After an edit, give the recompute a moment to have its point
		// values, so that the page paints once, with the result.
		ee.Lock()
		hold := root.Hold()
		ee.UnlockOnly()
		if hold != nil {
			select {
			case <-hold:
			case <-time.After(web.HoldMillis * time.Millisecond):
			}
			ee.Lock()
			root.Unhold()
			ee.UnlockOnly()
		}
		t0 := now()
		if renders < 3 {
			web.Mark("build")
		}
		built := env.RunBuild(root)
		t1 := now()
		if err := renderer.Render(built); err != nil {
			log.Print("render: ", err)
		}
		if renders < 3 {
			web.Mark("rendered")
			renders++
		}
		// For the timing harness: building the page and syncing it to the DOM.
		web.Probe("lixivLastBuild", t1-t0)
		web.Probe("lixivLastSync", now()-t1)
		root.Rendered()
	}
}

func now() float64 { return js.Global().Get("performance").Call("now").Float() }
