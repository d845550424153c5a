package portable

import (
	"hash/fnv"
	"math"
	"math/rand/v2"
	"testing"
)

// ulps returns the distance between a and b in units in the last place.
func ulps(a, b float64) uint64 {
	x, y := math.Float64bits(a), math.Float64bits(b)
	if x > y {
		return x - y
	}
	return y - x
}

func TestExpLog(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 200000; i++ {
		x := (rng.Float64() - 0.5) * 1400
		if d := ulps(Exp(x), math.Exp(x)); d > 2 {
			t.Fatalf("Exp(%g) = %g, math.Exp %g: %d ulps apart (want <= 2: each may be 1 off)", x, Exp(x), math.Exp(x), d)
		}
		y := math.Ldexp(rng.Float64()+0.5, rng.IntN(2000)-1000)
		if d := ulps(Log(y), math.Log(y)); d > 1 {
			t.Fatalf("Log(%g) = %g, math.Log %g: %d ulps apart (want <= 1)", y, Log(y), math.Log(y), d)
		}
	}
	special := []struct {
		name      string
		got, want float64
	}{
		{"exp(0)", Exp(0), 1},
		{"log(1)", Log(1), 0},
		{"exp(-1000)", Exp(-1000), 0},
		{"exp(1000)", Exp(1000), math.Inf(1)},
		{"log(0)", Log(0), math.Inf(-1)},
	}
	for _, s := range special {
		if s.got != s.want {
			t.Errorf("%s = %g, want %g", s.name, s.got, s.want)
		}
	}
	if !math.IsNaN(Log(-1)) || !math.IsNaN(Exp(math.NaN())) {
		t.Error("NaN cases")
	}
}

// TestChecksum pins the exact bits of Exp, Log and the normal
// draws. The constant was computed natively on amd64; the same test under
// WebAssembly in Node must give the same value.
func TestChecksum(t *testing.T) {
	h := fnv.New64a()
	var buf [8]byte
	put := func(v float64) {
		b := math.Float64bits(v)
		for i := range buf {
			buf[i] = byte(b >> (8 * i))
		}
		h.Write(buf[:])
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for i := 0; i < 20000; i++ {
		x := (rng.Float64() - 0.5) * 60
		put(Exp(x))
		put(Log(math.Abs(x) + 1e-3))
		put(Normal(rng))
		put(math.Sin(x))
		put(math.Cos(x))
	}
	const want = uint64(0xdc7260c8d6ff1c65)
	if got := h.Sum64(); got != want {
		t.Errorf("checksum %#x, want %#x", got, want)
	}
}

// TestMaxMin checks Max and Min against the built-ins bit for bit,
// infinities and signed zeros included; a NaN only as NaN (the built-ins'
// NaN payload differs between targets).
func TestMaxMin(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	vals := []float64{nan, -inf, -1e300, -1, -5e-324, math.Copysign(0, -1), 0, 5e-324, 1, 2, 1e300, inf}
	for _, x := range vals {
		for _, y := range vals {
			if got, want := Max(x, y), max(x, y); !same(got, want) {
				t.Errorf("Max(%v, %v) = %v (bits %x), the built-in gives %v (bits %x)", x, y, got, math.Float64bits(got), want, math.Float64bits(want))
			}
			if got, want := Min(x, y), min(x, y); !same(got, want) {
				t.Errorf("Min(%v, %v) = %v (bits %x), the built-in gives %v (bits %x)", x, y, got, math.Float64bits(got), want, math.Float64bits(want))
			}
		}
	}
}

// same reports whether a and b have the same bits, or are both NaN.
func same(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || a != a && b != b
}
