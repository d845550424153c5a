package mix

import (
	"context"
	"math"
	"testing"
)

// benchmarkCatchment runs the catchment-wide model on a synthetic
// catchment of n samples mixed from k sources, on one goroutine (as the
// page does without workers) or, with workers, on as many, and reports the chains' outcome: kept steps per
// chain, the largest split R-hat and the smallest ESS of the shared ratios
// (the goal: R-hat below 1.01 and ESS of at least 400 for every
// shared ratio).
func benchmarkCatchment(b *testing.B, n, k int, extra []Tracer, co *CatchmentOptions, workers ...int) {
	w := 1
	if len(workers) > 0 {
		w = workers[0]
	}
	sc := makeCatchment(n, k, 7)
	sc.prob.Tracers = append(sc.prob.Tracers, extra...)
	var c *Catchment
	for b.Loop() {
		res, err := InvertCatchment(context.Background(), sc.prob, &Options{Seed: 1, Workers: w}, co)
		if err != nil {
			b.Fatal(err)
		}
		c = res.Catchment
	}
	if c.Fallback != "" {
		b.Fatal(c.Fallback)
	}
	b.ReportMetric(float64(c.Steps), "steps/chain")
	b.ReportMetric(float64(c.Search), "search-evals")
	b.ReportMetric(float64(c.Modes), "modes")
	b.ReportMetric(c.Acceptance, "acceptance")
	b.ReportMetric(c.MaxRHat, "max-R-hat")
	b.ReportMetric(c.MinESS, "min-ESS")
	conv := 0.0
	if c.Converged {
		conv = 1
	}
	b.ReportMetric(conv, "converged")
}

// BenchmarkCatchment100x4 is the goal of the catchment-wide model: 100
// samples and four end-members (two silicates, carbonate, evaporite), read
// by five tracers (K/Na added: with four, each sample gives one equation
// beyond its amounts and the counting check sends the catchment to the
// per-sample model, MinSpare).
func BenchmarkCatchment100x4(b *testing.B) { benchmarkCatchment(b, 100, 4, []Tracer{KNa}, nil) }

// BenchmarkCatchment100x4Two is BenchmarkCatchment100x4 on two goroutines
// (the chains, then the samples, shared among them; the same result).
func BenchmarkCatchment100x4Two(b *testing.B) { benchmarkCatchment(b, 100, 4, []Tracer{KNa}, nil, 2) }

// BenchmarkCatchment100x4Thin is four end-members read by four tracers,
// run past the counting check, as the simulation study does.
func BenchmarkCatchment100x4Thin(b *testing.B) {
	benchmarkCatchment(b, 100, 4, nil, &CatchmentOptions{thinAllowed: true})
}

// BenchmarkCatchment100x4ThinTwo is BenchmarkCatchment100x4Thin on two
// goroutines.
func BenchmarkCatchment100x4ThinTwo(b *testing.B) {
	benchmarkCatchment(b, 100, 4, nil, &CatchmentOptions{thinAllowed: true}, 2)
}

// BenchmarkCatchment100x3 is 100 samples of silicate, carbonate and
// evaporite.
func BenchmarkCatchment100x3(b *testing.B) { benchmarkCatchment(b, 100, 3, nil, nil) }

// BenchmarkCatchment100x2 is 100 samples of silicate and carbonate.
func BenchmarkCatchment100x2(b *testing.B) { benchmarkCatchment(b, 100, 2, nil, nil) }

// BenchmarkSampleLogL is the catchment-wide likelihood of one sample (the
// chains' inner loop), over the samples of BenchmarkCatchment100x4's
// catchment at the priors' central ratios.
func BenchmarkSampleLogL(b *testing.B) { benchmarkSampleLogL(b, false) }

// BenchmarkSampleLogLCorrected is BenchmarkSampleLogL with covariances
// that have terms beside the diagonal, as waters corrected for rain have
// (the whitening is then the general one).
func BenchmarkSampleLogLCorrected(b *testing.B) { benchmarkSampleLogL(b, true) }

func benchmarkSampleLogL(b *testing.B, corrected bool) {
	sc := makeCatchment(100, 4, 7)
	sc.prob.Tracers = append(sc.prob.Tracers, KNa)
	c, err := NewCatchmentRun(sc.prob, &Options{Seed: 1}, nil)
	if err != nil {
		b.Fatal(err)
	}
	r := c.base
	var th [NTracers][MaxEndMembers]float64
	var tau [MaxEndMembers]float64
	for t := range NTracers {
		for j := range r.n {
			th[t][j] = r.smp[t][j].v
		}
	}
	for j := range r.n {
		tau[j] = 0.05
	}
	sts := make([]setup, len(c.used))
	for i, s := range c.used {
		sts[i] = r.res.Samples[s].setup
		if corrected {
			st := &sts[i]
			for i := 1; i < st.r; i++ {
				for j := range i {
					st.cov[i][j] = 0.1 * math.Sqrt(st.cov[i][i]*st.cov[j][j])
				}
			}
		}
	}
	var A [maxRows][MaxEndMembers]float64
	design(&sts[0], &th, &A)
	i := 0
	for b.Loop() {
		k := i % len(sts)
		if !c.sameA[k] {
			A = [maxRows][MaxEndMembers]float64{}
			design(&sts[k], &th, &A)
		}
		c.sampleLogL(&sts[k], &A, &th, &tau, c.diagCov[k] && !corrected)
		i++
	}
}
