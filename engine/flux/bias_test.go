package flux

import (
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// TestRetransformationBias: with lognormal scatter about a power law,
// ln C = ln a + b ln Q + σε, the mean concentration at a given Q is
// a Q^b exp(σ²/2). Over many simulated sample sets the smearing-corrected
// rating-curve load is unbiased within its Monte Carlo error (Duan 1983),
// as is Ferguson's correction for normal log residuals, while the
// uncorrected load is low by the factor exp(−σ²/2) (Ferguson 1986).
func TestRetransformationBias(t *testing.T) {
	const (
		a, b  = 150.0, -0.3
		sigma = 0.5
		nSets = 400
		nSmp  = 40
		nDays = 365
	)
	rng := rand.New(rand.NewPCG(1983, 1986))
	q := make([]float64, nDays)
	for i := range q {
		q[i] = pexp(0.8 * normal(rng)) // lognormal daily discharge, median 1 m³/s
	}
	rec := discharge.NewRecord("lognormal", discharge.Date(2021, 1, 1), q)
	truth := 0.0
	for _, v := range q {
		truth += a * pexp(b*plog(v)) * pexp(sigma*sigma/2) * v * 86.4
	}
	ratios := map[Bias][]float64{}
	for set := 0; set < nSets; set++ {
		days := make([]discharge.Day, nSmp)
		c := make([]float64, nSmp)
		for i := range days {
			k := rng.IntN(nDays)
			days[i] = rec.Days[k]
			c[i] = a * pexp(b*plog(q[k])) * pexp(sigma*normal(rng))
		}
		s := ForSpecies(chem.Na, days, c)
		for _, bias := range []Bias{Duan, Ferguson, NoBias} {
			res, err := Estimate(rec, s, Options{Method: Rating, Bias: bias})
			if err != nil {
				t.Fatal(err)
			}
			ratios[bias] = append(ratios[bias], res.Years[0].Mol/truth)
		}
	}
	tests := []struct {
		bias Bias
		want float64
	}{
		{Duan, 1},                              // unbiased (Duan 1983)
		{Ferguson, 1},                          // unbiased for normal residuals (Ferguson 1986)
		{NoBias, math.Exp(-sigma * sigma / 2)}, // low by exp(−σ²/2) = 0.8825 (Ferguson 1986)
	}
	for _, tt := range tests {
		r := ratios[tt.bias]
		mean, sd := meanSD(r)
		se := sd / math.Sqrt(float64(len(r)))
		// Tolerance: 3 standard errors of the Monte Carlo mean. The
		// finite-sample effect of estimating the coefficients, about
		// σ²p/(2n) = 0.6 %, lies within it.
		if math.Abs(mean-tt.want) > 3*se {
			t.Errorf("%v: mean load ratio %.4f ± %.4f (SE), want %.4f within 3 SE", tt.bias, mean, se, tt.want)
		}
		t.Logf("%v: mean ratio %.4f, SE %.4f, want %.4f", tt.bias, mean, se, tt.want)
	}
}

func meanSD(v []float64) (float64, float64) {
	m := 0.0
	for _, x := range v {
		m += x
	}
	m /= float64(len(v))
	ss := 0.0
	for _, x := range v {
		ss += (x - m) * (x - m)
	}
	return m, math.Sqrt(ss / float64(len(v)-1))
}
