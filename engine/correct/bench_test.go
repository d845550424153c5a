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

// benchmarkVary times one draw of a measured-rain correction through f.
func benchmarkVary(b *testing.B, f func(r *Result, k *Scale)) {
	c := sample(map[chem.Species]float64{chem.Na: 180, chem.K: 15, chem.Ca: 120, chem.Mg: 60,
		chem.Cl: 140, chem.SO4: 20, chem.Sr: 0.4, chem.Alk: 420, chem.SiO2: 160})
	rain := sample(map[chem.Species]float64{chem.Cl: 20, chem.Na: 17, chem.K: 0.5, chem.Ca: 1, chem.Mg: 2,
		chem.SO4: 3, chem.Sr: 0, chem.Br: 0})
	r, err := Apply(c, &Options{Rain: &Rain{Composition: rain, P: 1000, ET: 600}})
	if err != nil {
		b.Fatal(err)
	}
	k := partScales()[1]
	b.ReportAllocs()
	for b.Loop() {
		f(&r, &k)
	}
}

var sinkResult Result
var sinkComp chem.Composition
var sinkFloat float64

func BenchmarkVaryReference(b *testing.B) {
	benchmarkVary(b, func(r *Result, k *Scale) { sinkResult = varyRef(r, k) })
}

func BenchmarkVary(b *testing.B) {
	benchmarkVary(b, func(r *Result, k *Scale) { sinkResult = r.Vary(k) })
}

func BenchmarkVaryInto(b *testing.B) {
	benchmarkVary(b, func(r *Result, k *Scale) { r.VaryInto(&sinkResult, k) })
}

func BenchmarkVaryResidual(b *testing.B) {
	benchmarkVary(b, func(r *Result, k *Scale) { r.VaryResidual(k, &sinkComp) })
}

func BenchmarkVaryRemoved(b *testing.B) {
	var atm chem.Composition
	benchmarkVary(b, func(r *Result, k *Scale) { r.VaryRemoved(k, &atm, &sinkComp) })
}

func BenchmarkVarySO4Sulf(b *testing.B) {
	benchmarkVary(b, func(r *Result, k *Scale) { sinkFloat = r.VarySO4Sulf(k) })
}
