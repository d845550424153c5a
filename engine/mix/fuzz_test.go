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

// FuzzNNLS checks the non-negative least-squares solver on arbitrary small
// problems: it never panics, returns non-negative amounts, and never
// misfits more than the slow reference.
func FuzzNNLS(f *testing.F) {
	f.Add(uint8(3), uint8(4), []byte("a few bytes of ratios and data for the seed corpus, long enough"))
	f.Add(uint8(4), uint8(2), []byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20})
	f.Fuzz(func(t *testing.T, kb, rb uint8, data []byte) {
		defer watchdog.Start([]any{kb, rb, data})()
		k := 1 + int(kb)%MaxEndMembers
		r := 1 + int(rb)%maxRows
		if len(data) < 2*(r*k+r) {
			return
		}
		next := func() float64 { // a value over six decades, either sign for data
			v := binary.LittleEndian.Uint16(data)
			data = data[2:]
			return math.Pow(10, -3+6*float64(v)/65535)
		}
		a := make([][]float64, r)
		y := make([]float64, r)
		for i := range a {
			a[i] = make([]float64, k)
			for j := range a[i] {
				a[i][j] = next()
			}
			y[i] = next()
			if i%2 == 1 {
				y[i] = -y[i]
			}
		}
		checkNNLS(t, a, y)
	})
}
