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
	edges := []float64{0, math.Copysign(0, -1), 1, -1, math.NaN(), math.Inf(1), math.Inf(-1),
		7.09782712893383973096e+02, math.Nextafter(7.09782712893383973096e+02, 800), -7.08e+02,
		math.Nextafter(-7.08e+02, -800), 1.0 / (1 << 28), -1.0 / (1 << 28), 1e-300, 5e-324,
		0x1p-1022, math.Nextafter(0x1p-1022, 0), math.MaxFloat64, math.Sqrt2 / 2, 1e300, -1e300, 0.5, 2}
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
