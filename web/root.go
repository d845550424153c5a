package web

import "github.com/vugu/vugu/js"

// Root is the page's top component.
type Root struct {
	ready bool
}

// Title is the budget name shown in the header.
func (c *Root) Title() string { return "Lixiv" }

// Rendered runs after each render of the page (called by the render loop in
// wasm/, because vugu does not call it on the root). The first call marks
// the body ready for tests and records the time to first render.
func (c *Root) Rendered() {
	if c.ready {
		return
	}
	c.ready = true
	body := js.Global().Get("document").Get("body")
	if body.Truthy() {
		body.Get("dataset").Set("ready", "1")
	}
}
