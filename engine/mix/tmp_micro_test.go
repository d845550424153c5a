package mix

import (
	"math/rand/v2"
	"testing"
)

func tmpProp(d, nc int) proposal {
	rng := rand.New(rand.NewPCG(1, 2))
	p := proposal{d: d}
	for range nc {
		g := gaussian{mu: make([]float64, d), cov: make([]float64, d*d)}
		for i := range d {
			g.mu[i] = rng.NormFloat64()
			for j := 0; j <= i; j++ {
				g.cov[i*d+j] = 0.1 * rng.NormFloat64()
			}
			g.cov[i*d+i] = 1 + rng.Float64()
		}
		p.add(1/float64(nc), g)
	}
	acc := 0.0
	for i := range p.comp {
		acc += p.comp[i].pi
		p.cum = append(p.cum, acc)
		p.lpi = append(p.lpi, plog(p.comp[i].pi))
	}
	return p
}

var tmpSink float64

func BenchmarkTmpEll(b *testing.B) {
	p := tmpProp(6, 3)
	eta := make([]float64, 6)
	u := make([]float64, 6)
	for i := range eta {
		eta[i] = 0.1 * float64(i)
	}
	s := 0.0
	for b.Loop() {
		for range 1000 {
			s += p.ell(eta, u)
		}
	}
	tmpSink = s
}

func BenchmarkTmpEllLoop(b *testing.B) {
	p := tmpProp(6, 3)
	eta := make([]float64, 6)
	u := make([]float64, 6)
	for i := range eta {
		eta[i] = 0.1 * float64(i)
	}
	s := 0.0
	for b.Loop() {
		for range 1000 {
			s += p.ellLoop(eta, u)
		}
	}
	tmpSink = s
}

func BenchmarkTmpExp(b *testing.B) {
	s := 0.0
	for b.Loop() {
		for i := range 1000 {
			s += pexp(-0.001 * float64(i))
		}
	}
	tmpSink = s
}
