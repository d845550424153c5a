//go:build !timing

package web

// Probing says whether the page writes the timing harness's figures
// (make browser-timing builds the page with -tags timing; the page users
// get carries none of it).
const Probing = false

// Probe does nothing without the timing build tag.
func Probe(string, any) {}

// probed reads nothing without the timing build tag.
func probed(string) float64 { return 0 }

// Mark does nothing without the timing probes.
func Mark(string) {}
