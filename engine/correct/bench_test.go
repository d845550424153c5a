package correct

import (
	"testing"

	"lixiv/engine/chem"
)

func benchmarkApply(b *testing.B, opt *Options) {
	c := sample(map[chem.Species]float64{chem.Na: 180, chem.K: 15, chem.Ca: 120, chem.Mg: 60,
		chem.Cl: 140, chem.SO4: 20, chem.Sr: 0.4, chem.Alk: 420, chem.SiO2: 160})
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Apply(c, opt); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkApplySeaSalt(b *testing.B) { benchmarkApply(b, &Options{ClCritical: 100}) }

func BenchmarkApplyMeasuredRain(b *testing.B) {
	rain := sample(map[chem.Species]float64{chem.Cl: 20, chem.Na: 17, chem.K: 0.5, chem.Ca: 1, chem.Mg: 2,
		chem.SO4: 3, chem.Sr: 0, chem.Br: 0})
	benchmarkApply(b, &Options{Rain: &Rain{Composition: rain, P: 1000, ET: 600}})
}
