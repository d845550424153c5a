package flux

import (
	"math"
	"math/rand/v2"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// corrieVale is a synthetic catchment of our own (the fictional Corrie Vale
// granite burn, 42 km²): three calendar years of daily discharge with a
// winter-high baseflow and storm events, a sodium concentration that dilutes
// with flow (C = 180 Q^-0.2 µmol/L with a seasonal swing and day-to-day
// noise), fortnightly samples with 3 % analytical noise, and a gauge that
// reads 3 % high (a rating error inside the 7 % the bootstrap allows for).
// It uses the portable pexp, plog and normal, so it is the same catchment
// natively and under WebAssembly.
type corrieVale struct {
	area     float64
	trueQ    []float64 // true daily discharge, m³/s
	gauge    *discharge.Record
	trueC    []float64 // true daily concentration, µmol/L
	trueLoad []float64 // true load per calendar year, mol
	series   Series    // the fortnightly samples
}

func newCorrieVale() *corrieVale {
	const (
		area       = 42.0
		gaugeError = 1.03
	)
	rng := rand.New(rand.NewPCG(2021, 42))
	first := discharge.Date(2021, 1, 1)
	n := int(discharge.Date(2024, 1, 1) - first)
	cv := &corrieVale{area: area, trueQ: make([]float64, n), trueC: make([]float64, n)}
	storm := 0.0
	eta := 0.0
	for k := 0; k < n; k++ {
		d := first + discharge.Day(k)
		t := d.YearFraction()
		season := math.Cos(2 * math.Pi * (t - math.Floor(t) - 0.05)) // high in January
		base := 0.9 + 0.5*season
		storm *= 0.72 // recession
		if rng.Float64() < 0.06+0.03*season {
			storm += 1 - 3*plog(1-rng.Float64()) // exponential, mean 3
		}
		q := base + storm
		cv.trueQ[k] = q
		eta = 0.6*eta + 0.05*normal(rng)
		cv.trueC[k] = 180 * pexp(-0.2*plog(q)) * (1 + 0.06*season) * pexp(eta)
	}
	gq := make([]float64, n)
	for k, q := range cv.trueQ {
		gq[k] = q * gaugeError
	}
	cv.gauge = discharge.NewRecord("Corrie Vale gauge", first, gq)
	for y := 0; y < 3; y++ {
		s, e := discharge.YearBounds(2021+y, 1)
		l := 0.0
		for d := s; d <= e; d++ {
			k := int(d - first)
			l += cv.trueC[k] * cv.trueQ[k] * 86.4
		}
		cv.trueLoad = append(cv.trueLoad, l)
	}
	var days []discharge.Day
	var c []float64
	for k := 6; k < n; k += 14 {
		days = append(days, first+discharge.Day(k))
		c = append(c, cv.trueC[k]*(1+0.03*normal(rng)))
	}
	cv.series = ForSpecies(chem.Na, days, c)
	return cv
}

func (cv *corrieVale) trueMean() float64 {
	return (cv.trueLoad[0] + cv.trueLoad[1] + cv.trueLoad[2]) / 3
}
