package mix

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// benchWaters returns n stream waters of a fictional catchment mixed from
// sea salt, silicate and carbonate (the ratios of the preset priors'
// centres, amounts varying with flow), measured at 3 % and corrected for
// rain.
func benchWaters(n int) []Water {
	rng := rand.New(rand.NewPCG(5, 6))
	sea := correct.SeaSalt()
	out := make([]Water, n)
	for i := range out {
		f := math.Exp(0.5 * rng.NormFloat64())
		cl, naSil, caCarb := 100*math.Pow(f, -0.1), 80*math.Pow(f, -0.2), 200*math.Pow(f, -0.3)
		c := chem.NewComposition()
		c[chem.Cl] = cl
		c[chem.Na] = cl*sea[chem.Na] + naSil + caCarb/50
		c[chem.K] = cl*sea[chem.K] + 0.15*naSil + 0.3*caCarb/50
		c[chem.Ca] = cl*sea[chem.Ca] + 0.35*naSil + caCarb
		c[chem.Mg] = cl*sea[chem.Mg] + 0.24*naSil + 0.3*caCarb
		c[chem.Alk] = 2.33*naSil + 2.6*caCarb
		for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.Alk} {
			c[sp] *= 1 + 0.03*rng.NormFloat64()
		}
		r, err := correct.Apply(c, nil)
		if err != nil {
			panic(err)
		}
		out[i] = Water{Name: "bench", Correction: &r, Sr87Sr86: math.NaN()}
	}
	return out
}

// benchmarkInvert inverts n waters on one core at the default settings and
// reports the draws and effective draws per sample and the time of each.
func benchmarkInvert(b *testing.B, n int, o Options) {
	p := Problem{EndMembers: DefaultEndMembers(false), Tracers: []Tracer{CaNa, MgNa, HCO3Na}, Waters: benchWaters(n)}
	o.Workers = 1
	var draws, ess float64
	for b.Loop() {
		res, err := Invert(context.Background(), p, &o)
		if err != nil {
			b.Fatal(err)
		}
		draws, ess = 0, 0
		for _, s := range res.Samples {
			draws += float64(s.Draws)
			ess += s.ESS
		}
	}
	per := float64(b.Elapsed().Nanoseconds()) / float64(b.N)
	b.ReportMetric(draws/float64(n), "draws/sample")
	b.ReportMetric(ess/float64(n), "ESS/sample")
	b.ReportMetric(per/draws, "ns/draw")
	b.ReportMetric(per/ess, "ns/effective-draw")
}

// BenchmarkInvert100 is the project's speed goal (docs/methods.md §7.5): 100 samples at an
// ESS of 1,000 each, on one core.
func BenchmarkInvert100(b *testing.B) { benchmarkInvert(b, 100, Options{Seed: 1}) }

// BenchmarkInvert100Rough is the page's quick pass (ESS 100).
func BenchmarkInvert100Rough(b *testing.B) {
	benchmarkInvert(b, 100, Options{Seed: 1, Draws: 300, TargetESS: 100, MaxDraws: 3000})
}

// BenchmarkStep20 drives 20 samples with Run.Step in the page's chunks.
func BenchmarkStep20(b *testing.B) {
	p := Problem{EndMembers: DefaultEndMembers(false), Tracers: []Tracer{CaNa, MgNa, HCO3Na}, Waters: benchWaters(20)}
	for b.Loop() {
		r, err := NewRun(p, &Options{Seed: 1})
		if err != nil {
			b.Fatal(err)
		}
		for !r.Step(context.Background(), 4000) {
		}
	}
}
