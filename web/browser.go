package web

import (
	"errors"
	"time"

	"github.com/vugu/vugu/js"
)

// This file is the page's glue to the browser: storage, files, downloads
// and handing the main thread back to the browser during long runs. It uses
// vugu's js package, so the package builds natively (where these calls are
// never made). vugu's Value.Set passes its argument to syscall/js as is,
// so only Go strings, numbers and booleans are ever Set; JavaScript values
// and functions go through Call, which converts them.

// yieldToBrowser lets the browser run (paint, handle input) before the
// calling goroutine continues. time.Sleep does not do this in Go's
// WebAssembly; waiting on a JavaScript timer does.
func yieldToBrowser() { waitFor("setTimeout", 0) }

// afterPaint returns once the browser has painted (the next animation
// frame) and then handed its thread back to the caller in a task of its own.
func afterPaint() {
	waitFor("requestAnimationFrame")
	yieldToBrowser()
}

// waitFor calls the global function fn with a callback, and the args
// after it, and returns once the callback has run.
func waitFor(fn string, args ...any) {
	ch := make(chan struct{})
	var f js.Func
	f = js.FuncOf(func(js.Value, []js.Value) any {
		close(ch)
		f.Release()
		return nil
	})
	js.Global().Call(fn, append([]any{f}, args...)...)
	<-ch
}

// showProgress moves the progress bar of a running cell to v (0..1),
// without a repaint of the page; nothing when the bar is not on the page.
func showProgress(cell string, v float64) {
	el := js.Global().Get("document").Call("getElementById", "cell-"+cell)
	if el.IsNull() || el.IsUndefined() {
		return
	}
	if bar := el.Call("querySelector", "progress"); !bar.IsNull() && !bar.IsUndefined() {
		bar.Set("value", v)
	}
}

// await waits for a JavaScript promise. Call it from a goroutine, never
// from an event handler.
func await(p js.Value) (js.Value, error) {
	type result struct {
		v   js.Value
		err error
	}
	ch := make(chan result, 1)
	var ok, fail js.Func
	ok = js.FuncOf(func(_ js.Value, args []js.Value) any {
		v := js.Undefined()
		if len(args) > 0 {
			v = args[0]
		}
		ch <- result{v: v}
		return nil
	})
	fail = js.FuncOf(func(_ js.Value, args []js.Value) any {
		msg := "failed"
		if len(args) > 0 {
			msg = args[0].Call("toString").String()
		}
		ch <- result{err: errors.New(msg)}
		return nil
	})
	p.Call("then", ok, fail)
	r := <-ch
	ok.Release()
	fail.Release()
	return r.v, r.err
}

// storageKey is where the page autosaves the open budget, and originKey
// where it came from (Origin, as JSON).
const (
	storageKey = "lixiv.budget"
	originKey  = "lixiv.budget.origin"
)

// storageGet returns the value stored under key, or "" and false.
func storageGet(key string) (string, bool) {
	ls := js.Global().Get("localStorage")
	if !ls.Truthy() {
		return "", false
	}
	v := ls.Call("getItem", key)
	if v.IsNull() || v.IsUndefined() {
		return "", false
	}
	return v.String(), true
}

// storageSet stores value under key; a full storage gives an error.
func storageSet(key, value string) (err error) {
	defer func() {
		if r := recover(); r != nil {
			err = errors.New("browser storage refused the budget (full or disabled)")
		}
	}()
	ls := js.Global().Get("localStorage")
	if !ls.Truthy() {
		return errors.New("this browser has no local storage")
	}
	ls.Call("setItem", key, value)
	return nil
}

// fetchText fetches a file of the page's own origin.
func fetchText(url string) (string, error) {
	resp, err := await(js.Global().Call("fetch", url))
	if err != nil {
		return "", err
	}
	if !resp.Get("ok").Bool() {
		return "", errors.New(url + ": " + resp.Get("statusText").String())
	}
	t, err := await(resp.Call("text"))
	if err != nil {
		return "", err
	}
	return t.String(), nil
}

// readFile reads a File (from a picker or a drop) as text.
func readFile(f js.Value) (string, error) {
	t, err := await(f.Call("text"))
	if err != nil {
		return "", err
	}
	return t.String(), nil
}

// readFileBytes reads a File (from a picker or a drop) as bytes.
func readFileBytes(f js.Value) ([]byte, error) {
	buf, err := await(f.Call("arrayBuffer"))
	if err != nil {
		return nil, err
	}
	u8 := js.Global().Get("Uint8Array").New(buf)
	b := make([]byte, u8.Length())
	js.CopyBytesToGo(b, u8)
	return b, nil
}

// download offers data to the user as a file.
func download(name, mime string, data []byte) {
	g := js.Global()
	u8 := g.Get("Uint8Array").New(len(data))
	js.CopyBytesToJS(u8, data)
	downloadBlob(name, newBlob(u8, mime))
}

// newBlob wraps one part (a typed array or a string) in a Blob. The parts
// list is built in JavaScript: vugu's js values cannot sit inside a Go slice
// handed to ValueOf.
func newBlob(part js.Value, mime string) js.Value {
	g := js.Global()
	parts := g.Get("Array").New()
	parts.Call("push", part)
	opts := g.Get("Object").New()
	opts.Set("type", mime)
	return g.Get("Blob").New(parts, opts)
}

func downloadBlob(name string, blob js.Value) {
	g := js.Global()
	url := g.Get("URL").Call("createObjectURL", blob)
	a := g.Get("document").Call("createElement", "a")
	a.Set("href", url.String())
	a.Set("download", name)
	g.Get("document").Get("body").Call("appendChild", a)
	a.Call("click")
	a.Call("remove")
	var f js.Func
	f = js.FuncOf(func(js.Value, []js.Value) any {
		g.Get("URL").Call("revokeObjectURL", url)
		f.Release()
		return nil
	})
	g.Call("setTimeout", f, 10000)
}

// downloadPNG draws an SVG chart on a canvas at twice its size and offers
// the picture as a PNG file. Run it from a goroutine.
func downloadPNG(name, svg string, width, height float64) error {
	g := js.Global()
	url := g.Get("URL").Call("createObjectURL", newBlob(js.ValueOf(svg), "image/svg+xml"))
	defer g.Get("URL").Call("revokeObjectURL", url)
	img := g.Get("Image").New()
	loaded := make(chan error, 1)
	var onload, onerr js.Func
	onload = js.FuncOf(func(js.Value, []js.Value) any { loaded <- nil; return nil })
	onerr = js.FuncOf(func(js.Value, []js.Value) any {
		loaded <- errors.New("the chart could not be drawn as a picture")
		return nil
	})
	img.Call("addEventListener", "load", onload)
	img.Call("addEventListener", "error", onerr)
	img.Set("src", url.String())
	err := <-loaded
	onload.Release()
	onerr.Release()
	if err != nil {
		return err
	}
	canvas := g.Get("document").Call("createElement", "canvas")
	canvas.Set("width", int(width*2))
	canvas.Set("height", int(height*2))
	ctx := canvas.Call("getContext", "2d")
	ctx.Set("fillStyle", "#ffffff")
	ctx.Call("fillRect", 0, 0, int(width*2), int(height*2))
	ctx.Call("drawImage", img, 0, 0, int(width*2), int(height*2))
	got := make(chan js.Value, 1)
	var cb js.Func
	cb = js.FuncOf(func(_ js.Value, args []js.Value) any { got <- args[0]; return nil })
	canvas.Call("toBlob", cb, "image/png")
	png := <-got
	cb.Release()
	if png.IsNull() {
		return errors.New("the browser could not make a PNG")
	}
	downloadBlob(name, png)
	return nil
}

// nowMillis is the browser's high-resolution clock in milliseconds.
func nowMillis() float64 {
	p := js.Global().Get("performance")
	if !p.Truthy() {
		return float64(time.Now().UnixNano()) / 1e6
	}
	return p.Call("now").Float()
}
