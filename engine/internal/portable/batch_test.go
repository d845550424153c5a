package portable

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBatchSameBits: ExpAll and LogAll give Exp's and Log's bits, for
// batches of every length up to 40 over arguments from all of the range,
// the special values and the edges of each branch.
func TestBatchSameBits(t *testing.T) {
	// Exp's branch edges and Log's (the subnormal range, √2/2), the special
	// values and the ends of the float64 range: no reference values, only
	// arguments; the check is Exp's and Log's own bits.
	edges := []float64{0, math.Copysign(0, -1), 1, -1, math.NaN(), math.Inf(1), math.Inf(-1),
		expOverflow, math.Nextafter(expOverflow, math.Inf(1)), expFlush, math.Nextafter(expFlush, math.Inf(-1)),
		expTiny, -expTiny, math.SmallestNonzeroFloat64, 0x1p-1022, math.Nextafter(0x1p-1022, 0),
		math.MaxFloat64, -math.MaxFloat64, math.Sqrt2 / 2, 0.5, 2, 1e-300, 1e300, -1e300}
	rng := rand.New(rand.NewPCG(3, 4))
	arg := func() float64 {
		switch rng.IntN(4) {
		case 0:
			return edges[rng.IntN(len(edges))]
		case 1:
			return (rng.Float64() - 0.5) * 1500
		case 2:
			return math.Ldexp(rng.Float64()+0.5, rng.IntN(2100)-1075)
		}
		return rng.NormFloat64()
	}
	for n := range 41 {
		for range 200 {
			x := make([]float64, n)
			for i := range x {
				x[i] = arg()
			}
			e, l := append([]float64(nil), x...), append([]float64(nil), x...)
			ExpAll(e)
			LogAll(l)
			for i, v := range x {
				if math.Float64bits(e[i]) != math.Float64bits(Exp(v)) {
					t.Fatalf("ExpAll at %v: %v, Exp %v", v, e[i], Exp(v))
				}
				if math.Float64bits(l[i]) != math.Float64bits(Log(v)) {
					t.Fatalf("LogAll at %v: %v, Log %v", v, l[i], Log(v))
				}
			}
		}
	}
}
