//go:build js && wasm

// Command worker is the engine-only WebAssembly that web/static/worker.js
// runs in a Web Worker: it recomputes budget documents off the page's main
// thread and posts progress and results back.
package main

import "syscall/js"

func main() {
	js.Global().Call("lixivReady")
	select {}
}
