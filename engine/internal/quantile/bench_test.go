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

// BenchmarkMidpointsWeighted times three mid-point quantiles of 4,000
// weighted values, as a sample's draws are summarised.
func BenchmarkMidpointsWeighted(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	v, w := make([]float64, 4000), make([]float64, 4000)
	for i := range v {
		v[i], w[i] = rng.NormFloat64(), rng.Float64()
	}
	var buf Buf
	for b.Loop() {
		buf.Midpoints(v, w, 0.025, 0.5, 0.975)
	}
}
