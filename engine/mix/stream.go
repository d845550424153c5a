package mix

import "math/bits"

// stream is math/rand/v2's PCG: the same 128-bit linear congruential
// generator with the same DXSM output (pcg.go of the Go distribution, BSD
// licence; M. E. O'Neill 2014, "PCG: a family of simple fast space-efficient
// statistically good algorithms for random number generation", from
// memory), so the same seeds give the same numbers (TestStreamIsPCG). Its
// numbers come in batches (fill): compiled to WebAssembly, rand.PCG takes
// two calls per number, neither inlined, and a sample takes a dozen or more
// uniforms per draw.
type stream struct{ hi, lo uint64 }

// newStream is rand.NewPCG.
func newStream(seed1, seed2 uint64) *stream { return &stream{seed1, seed2} }

// fill sets u to the stream's next len(u) numbers, in order.
func (p *stream) fill(u []uint64) {
	const (
		mulHi    = 2549297995355413924
		mulLo    = 4865540595714422341
		incHi    = 6364136223846793005
		incLo    = 1442695040888963407
		cheapMul = 0xda942042e4dd58b5
	)
	shi, slo := p.hi, p.lo
	for i := range u {
		hi, lo := bits.Mul64(slo, mulLo)
		hi += shi*mulLo + slo*mulHi
		lo, c := bits.Add64(lo, incLo, 0)
		hi, _ = bits.Add64(hi, incHi, c)
		shi, slo = hi, lo
		hi ^= hi >> 32
		hi *= cheapMul
		hi ^= hi >> 48
		u[i] = hi * (lo | 1)
	}
	p.hi, p.lo = shi, slo
}

// Uint64 is rand.PCG.Uint64, for a rand.Rand over the stream.
func (p *stream) Uint64() uint64 {
	var u [1]uint64
	p.fill(u[:])
	return u[0]
}

// toUniform maps a number of the stream to a uniform in (0, 1), from its
// top 53 bits (as uniform does).
func toUniform(x uint64) float64 { return (float64(x>>11) + 0.5) * 0x1p-53 }

// pcgUniform is uniform on a stream itself: one call where rand.Rand makes
// three.
func pcgUniform(p *stream) float64 { return toUniform(p.Uint64()) }

// uniforms sets u to uniforms of the stream, in order.
func uniforms(u []float64, p *stream) {
	var buf [16]uint64
	for len(u) > 0 {
		b := buf[:min(len(u), len(buf))]
		p.fill(b)
		for i, x := range b {
			u[i] = toUniform(x)
		}
		u = u[len(b):]
	}
}

// normals sets z to normQuantile of uniforms of the stream, in order.
func normals(z []float64, p *stream) {
	uniforms(z, p)
	quantiles(z)
}

// quantiles sets each p[i] in (0, 1) to normQuantile(p[i]), with no call
// for most of them.
func quantiles(p []float64) {
	for i, u := range p {
		if u < pLow || u > 1-pLow {
			p[i] = normQuantile(u)
			continue
		}
		// normQuantile's central part, written out.
		q := u - 0.5
		r := q * q
		p[i] = horner6(r, qa1, qa2, qa3, qa4, qa5, qa6) * q / horner6(r, qb1, qb2, qb3, qb4, qb5, 1)
	}
}
