//go:build timing

package web

import "github.com/vugu/vugu/js"

// Probing says whether the page writes the timing harness's figures
// (make browser-timing builds the page with -tags timing; the page users
// get carries none of it).
const Probing = true

// Probe sets the global name on window to v, for the timing harness.
func Probe(name string, v any) { js.Global().Set(name, v) }

// probed reads back the figure a probe set.
func probed(name string) float64 { return js.Global().Get(name).Float() }
