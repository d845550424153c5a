package flux

import (
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/discharge"
	"lixiv/engine/internal/watchdog"
)

// FuzzEstimate drives every estimator and the bootstrap with random records
// (gaps, zero flow, short spans) and random samples (outside the record,
// missing, zero or negative concentrations, same-day repeats, draws): no
// panic, and loads are finite or NaN, never infinite.
func FuzzEstimate(f *testing.F) {
	f.Add(uint64(1), uint16(400), uint8(20), uint8(3))
	f.Add(uint64(2), uint16(3), uint8(2), uint8(0))
	f.Add(uint64(3), uint16(1200), uint8(90), uint8(255))
	f.Fuzz(func(t *testing.T, seed uint64, ndays uint16, nsmp uint8, flags uint8) {
		defer watchdog.Start([]any{seed, ndays, nsmp, flags})()
		rng := rand.New(rand.NewPCG(seed, 9))
		n := int(ndays%2000) + 1
		q := make([]float64, n)
		for i := range q {
			switch x := rng.Float64(); {
			case flags&1 != 0 && x < 0.05:
				q[i] = math.NaN()
			case flags&2 != 0 && x < 0.1:
				q[i] = 0
			default:
				q[i] = pexp(2 * normal(rng))
			}
		}
		first := discharge.Date(2020, 1+rng.IntN(12), 1+rng.IntN(28))
		rec := discharge.NewRecord("fuzz", first, q)
		m := int(nsmp)
		s := Series{Name: "X", MolarMass: 40, Days: make([]discharge.Day, m), C: make([]float64, m)}
		if flags&4 != 0 {
			s.Q = make([]float64, m)
		}
		if flags&8 != 0 {
			s.Draws = make([][]float64, m)
		}
		for i := range m {
			s.Days[i] = first + discharge.Day(rng.IntN(n+20)-10)
			switch x := rng.Float64(); {
			case x < 0.05:
				s.C[i] = math.NaN()
			case x < 0.08 && flags&16 != 0:
				s.C[i] = 0
			case x < 0.1 && flags&16 != 0:
				s.C[i] = -1
			default:
				s.C[i] = 10 + 100*rng.Float64()
			}
			if s.Q != nil {
				s.Q[i] = math.NaN()
				if rng.Float64() < 0.5 {
					s.Q[i] = rng.Float64() * 3
				}
			}
			if s.Draws != nil {
				s.Draws[i] = []float64{s.C[i] * 0.9, s.C[i] * 1.1}
				if math.IsNaN(s.C[i]) {
					s.Draws[i] = nil
				}
			}
		}
		for meth := Method(0); meth < NMethods; meth++ {
			opt := Options{Method: meth, AreaKm2: 10, FirstMonth: int(flags % 13), Seasonal: flags&32 != 0, Bias: Bias(flags % 3)}
			res, err := Estimate(rec, s, opt)
			if err == nil {
				for _, y := range res.Years {
					if math.IsInf(y.Mol, 0) {
						t.Fatalf("%v: infinite load in %s", meth, y.Year)
					}
				}
			}
			u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 20, Seed: seed, DischargeError: 0.1, AreaError: 0.05, Draws: DrawMode(flags >> 7)})
			if err == nil && math.IsInf(u.Mean.Mol.Hi, 0) {
				t.Fatalf("%v: infinite interval", meth)
			}
		}
	})
}
