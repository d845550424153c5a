package flux

import "testing"

func benchEstimate(b *testing.B, m Method) {
	cv := newCorrieVale()
	opt := Options{Method: m, AreaKm2: cv.area, Seasonal: true}
	b.ResetTimer()
	for b.Loop() {
		if _, err := Estimate(cv.gauge, cv.series, opt); err != nil {
			b.Fatal(err)
		}
	}
}

// One estimate over three years of daily discharge and 78 samples.
func BenchmarkEstimateFlowWeighted(b *testing.B)   { benchEstimate(b, FlowWeighted) }
func BenchmarkEstimatePeriodWeighted(b *testing.B) { benchEstimate(b, PeriodWeighted) }
func BenchmarkEstimateRating(b *testing.B)         { benchEstimate(b, Rating) }

func benchBootstrap(b *testing.B, m Method, draws bool) {
	cv := newCorrieVale()
	s := cv.series
	if draws {
		s = withDraws(s, 1000)
	}
	opt := Options{Method: m, AreaKm2: cv.area, Seasonal: true}
	bopt := BootstrapOptions{Replicates: 1000, Seed: 1, DischargeError: 0.07, AreaError: 0.02}
	b.ResetTimer()
	for b.Loop() {
		if _, err := Bootstrap(cv.gauge, s, opt, bopt); err != nil {
			b.Fatal(err)
		}
	}
}

// 1000 replicates, 78 samples, three years of daily discharge.
func BenchmarkBootstrapFlowWeighted(b *testing.B)   { benchBootstrap(b, FlowWeighted, false) }
func BenchmarkBootstrapPeriodWeighted(b *testing.B) { benchBootstrap(b, PeriodWeighted, false) }
func BenchmarkBootstrapRating(b *testing.B)         { benchBootstrap(b, Rating, false) }
func BenchmarkBootstrapRatingDraws(b *testing.B)    { benchBootstrap(b, Rating, true) }
