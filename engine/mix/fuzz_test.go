package mix

import (
	"encoding/binary"
	"math"
	"testing"

	"lixiv/engine/internal/watchdog"
)

func FuzzParseTracer(f *testing.F) {
	for _, s := range []string{"Ca/Na", "87Sr/86Sr", "alk/na", " K / Na ", "", "Na/Ca", "\x00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		defer watchdog.Start(s)()
		tr, err := ParseTracer(s)
		if err != nil {
			return
		}
		// Round trip: the canonical name parses back to the same tracer.
		back, err := ParseTracer(tr.String())
		if err != nil || back != tr {
			t.Fatalf("ParseTracer(%q) = %v, but its name %q parses to %v, %v", s, tr, tr.String(), back, err)
		}
	})
}

// FuzzSimplexLS checks the constrained solver on arbitrary small problems:
// it never panics, returns fractions on the simplex, and never misfits more
// than the slow reference.
func FuzzSimplexLS(f *testing.F) {
	f.Add(uint8(3), uint8(4), []byte("a few bytes of ratios and weights for the seed corpus"))
	f.Add(uint8(4), uint8(2), []byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16})
	f.Fuzz(func(t *testing.T, nb, mb uint8, data []byte) {
		defer watchdog.Start([]any{nb, mb, data})()
		n := 1 + int(nb)%MaxEndMembers
		m := 1 + int(mb)%int(NTracers)
		need := (m*n + 2*m) * 2
		if len(data) < need {
			return
		}
		next := func() float64 { // a positive value over six decades
			v := binary.LittleEndian.Uint16(data)
			data = data[2:]
			return math.Pow(10, -3+6*float64(v)/65535)
		}
		E := make([][]float64, m)
		w := make([]float64, m)
		d := make([]float64, m)
		for r := range E {
			E[r] = make([]float64, n)
			for j := range E[r] {
				E[r][j] = next()
			}
			w[r], d[r] = next(), next()
		}
		a, chi2 := fastSimplexLS(E, w, d)
		if a == nil {
			t.Fatal("solver failed on finite input")
		}
		sum := 0.0
		for _, v := range a {
			if v < 0 || math.IsNaN(v) {
				t.Fatalf("alpha %v off the simplex", a)
			}
			sum += v
		}
		if math.Abs(sum-1) > 1e-9 {
			t.Fatalf("sum alpha %g", sum)
		}
		// Rounding floor: the normal equations carry terms up to w (max E)²
		// per row; with nearly identical end-members the minimum is so flat that
		// faces differ by ~1e-13 of that sum, so allow 1e-12 of it.
		floor := 0.0
		for r := range d {
			big := d[r]
			for _, v := range E[r] {
				big = math.Max(big, v)
			}
			floor += 1e-12 * w[r] * big * big
		}
		if _, want := slowSimplexLS(E, w, d); chi2 > want*(1+1e-6)+floor {
			t.Fatalf("chi2 %g above the reference minimum %g", chi2, want)
		}
	})
}
