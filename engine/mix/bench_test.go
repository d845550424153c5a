package mix

import (
	"context"
	"testing"
)

// benchmarkInvert inverts ns waters of the fictional Marlow Fen catchment
// with draws Monte Carlo draws and reports the time per sample-draw.
func benchmarkInvert(b *testing.B, ns, draws, workers int, tracers []Tracer) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, ns, 0.02, 1)
	p := Problem{EndMembers: prior, Tracers: tracers, Waters: ws}
	o := &Options{Draws: draws, Seed: 1, Workers: workers}
	for b.Loop() {
		if _, err := Invert(context.Background(), p, o); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(ns*draws), "ns/sample-draw")
}

// The benchmark: 100 samples x 10,000 draws, four end-members and
// all seven tracers. Run with -cpu 1 for one core.
func BenchmarkInvert100x10000(b *testing.B) { benchmarkInvert(b, 100, 10000, 0, allTracers) }

// Four ratio tracers, no isotopes.
func BenchmarkInvert100x10000FourTracers(b *testing.B) {
	benchmarkInvert(b, 100, 10000, 0, []Tracer{CaNa, MgNa, HCO3Na, ClNa})
}

// BenchmarkStep measures the browser path: one Run stepped in chunks of
// 2,000 sample-draws on one goroutine.
func BenchmarkStep20x2000(b *testing.B) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 20, 0.02, 1)
	p := Problem{EndMembers: prior, Tracers: allTracers, Waters: ws}
	for b.Loop() {
		r, err := NewRun(p, &Options{Draws: 2000, Seed: 1})
		if err != nil {
			b.Fatal(err)
		}
		for !r.Step(context.Background(), 2000) {
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(20*2000), "ns/sample-draw")
}

// The notebook's default inversion: corrected waters, evaporite, silicate
// and carbonate end-members, Ca/Na, Mg/Na and HCO3/Na.
func BenchmarkInvert100x10000Default(b *testing.B) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth[1:], 100, 0.02, 1)
	p := Problem{EndMembers: prior[1:], Tracers: []Tracer{CaNa, MgNa, HCO3Na}, Waters: ws}
	o := &Options{Draws: 10000, Seed: 1}
	for b.Loop() {
		if _, err := Invert(context.Background(), p, o); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(100*10000), "ns/sample-draw")
}

// Five end-members (granitic and basaltic silicate side by side) take the
// general face-enumerating solver.
func BenchmarkInvert100x10000FiveEndMembers(b *testing.B) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 100, 0.02, 1)
	p := Problem{EndMembers: append(prior, PresetBasaltic()), Tracers: allTracers, Waters: ws}
	o := &Options{Draws: 10000, Seed: 1}
	for b.Loop() {
		if _, err := Invert(context.Background(), p, o); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(100*10000), "ns/sample-draw")
}
