//go:build timing

package web

import (
	"fmt"

	"github.com/vugu/vugu/js"
)

// Probing says whether the page writes the timing harness's figures
// (make browser-timing builds the page with -tags timing; the page users
// get carries none of it).
const Probing = true

// Probe sets the global name on window to v, for the timing harness.
func Probe(name string, v any) { js.Global().Set(name, v) }

// probed reads back the figure a probe set.
func probed(name string) float64 { return js.Global().Get(name).Float() }

// Mark appends "name at time" (ms since navigation) to window.lixivMarks,
// for the timing harness's account of the first load.
func Mark(name string) {
	m := js.Global().Get("lixivMarks")
	s := ""
	if m.Truthy() {
		s = m.String() + ", "
	}
	js.Global().Set("lixivMarks", fmt.Sprintf("%s%s %.0f", s, name, js.Global().Get("performance").Call("now").Float()))
}
