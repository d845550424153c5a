package quantile

import (
	"math/rand/v2"
	"testing"
)

// BenchmarkLower95 times the weighted 95 % interval of 4,000 weighted
// values, as the inverse model's summaries take it.
func BenchmarkLower95(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	v, w := make([]float64, 4000), make([]float64, 4000)
	for i := range v {
		v[i], w[i] = rng.NormFloat64(), rng.Float64()
	}
	var buf []Pair
	for b.Loop() {
		Lower95(v, w, &buf)
	}
}

// BenchmarkMidpoints times the mid-point 2.5 %, 50 % and 97.5 % quantiles
// of 20,000 weighted values, a tenth of them equal (a source absent from
// some draws), as the apportionment's per-sample summaries take them.
func BenchmarkMidpoints(b *testing.B) {
	v, w := tiedValues(20000, 1)
	var qb Buf
	for b.Loop() {
		qb.Midpoints(v, w, 0.025, 0.5, 0.975)
	}
}
