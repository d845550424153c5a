package co2

import (
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

// benchmarkChain times the per-sample chain correct.Apply → mix.Forward →
// Consumption on the mixed sample of the docs/methods.md §13 item 8.
func benchmarkChain(b *testing.B, copt *correct.Options, fopt *mix.ForwardOptions) {
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 125.7736, 20.56099, 435.56508, 106.90273
	c[chem.Cl], c[chem.SO4], c[chem.Alk] = 30, 80, 1200
	b.ReportAllocs()
	for b.Loop() {
		cr, err := correct.Apply(c, copt)
		if err != nil {
			b.Fatal(err)
		}
		fr, err := mix.Forward(&cr, fopt)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Consumption(&fr.Split, cr.SO4Sulf, nil); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkChainSeaSalt(b *testing.B) {
	benchmarkChain(b, &correct.Options{ClCritical: 25, Sulfate: correct.Sulfide}, nil)
}

func BenchmarkChainMeasuredRain(b *testing.B) {
	rain := chem.NewComposition()
	rain[chem.Cl], rain[chem.Na], rain[chem.K], rain[chem.Ca], rain[chem.Mg] = 20, 17, 0.5, 1, 2
	rain[chem.SO4], rain[chem.Sr], rain[chem.Br] = 3, 0, 0
	benchmarkChain(b, &correct.Options{Rain: &correct.Rain{Composition: rain, P: 1000, ET: 600}}, nil)
}

func BenchmarkChainDraws1000(b *testing.B) {
	benchmarkChain(b, &correct.Options{ClCritical: 25}, &mix.ForwardOptions{Draws: 1000, Seed: 1})
}
