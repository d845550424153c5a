package flux

import (
	"testing"

	"lixiv/engine/chem"
)

// TestHoldNoneIsToday: Hold's zero value varies every source, and naming
// every source as varied (Alone(AllSources)) is the same: both give the
// bits of a bootstrap without the field (TestBootstrapChecksum pins those).
func TestHoldNoneIsToday(t *testing.T) {
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	b := BootstrapOptions{Replicates: 200, Seed: 7, DischargeError: 0.1, AreaError: 0.03}
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area, Seasonal: true}
		u0, err := Bootstrap(cv.gauge, s, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		u1, err := Bootstrap(cv.gauge, s, opt, b.Alone(AllSources))
		if err != nil {
			t.Fatal(err)
		}
		if u0.Mean != u1.Mean {
			t.Errorf("%v: Alone(AllSources) %+v, zero Hold %+v", m, u1.Mean, u0.Mean)
		}
		for r := range u0.MeanMol {
			if u0.MeanMol[r] != u1.MeanMol[r] || u0.Area[r] != u1.Area[r] {
				t.Fatalf("%v replicate %d differs", m, r)
			}
		}
	}
}

// TestHoldAll: with every source held, every replicate is the point
// estimate, so the interval has zero width at Estimate's value (to 1e-12,
// the rating curve's replicates summing their days through moments).
func TestHoldAll(t *testing.T) {
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	b := BootstrapOptions{Replicates: 100, Seed: 7, DischargeError: 0.1, AreaError: 0.03, Hold: AllSources}
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area}
		r, err := Estimate(cv.gauge, s, opt)
		if err != nil {
			t.Fatal(err)
		}
		u, err := Bootstrap(cv.gauge, s, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			name  string
			iv    Interval
			point float64
		}{{"load", u.Mean.Mol, r.Mean.Mol}, {"yield", u.Mean.MolPerKm2, r.Mean.MolPerKm2}, {"runoff", u.Mean.RunoffMM, r.Mean.RunoffMM}} {
			if c.iv.Lo != c.iv.Hi || c.iv.Median != c.iv.Lo {
				t.Errorf("%v %s: every source held gave %+v, want zero width", m, c.name, c.iv)
			}
			if relErr(c.iv.Median, c.point) > 1e-12 {
				t.Errorf("%v %s: every source held gave %.15g, point estimate %.15g", m, c.name, c.iv.Median, c.point)
			}
		}
		if u.Failed != 0 {
			t.Errorf("%v: %d replicates failed", m, u.Failed)
		}
	}
}

// TestOneSourceAlone: the interval with one source varied alone is no
// wider than with all of them. In this synthetic catchment the yield is,
// replicate by replicate, the sampling estimate times a shared end-member
// multiplier (0.8 to 1.2, joint draws), times the discharge factor, over the area
// factor: independent factors, so in log terms a sum of independent
// spreads, each of which widens the central interval of the others
// (Anderson 1955, Proc. Am. Math. Soc. 6, for symmetric unimodal terms; from
// memory). The widths of all four sources are of the same order, so the
// margin is well beyond the Monte Carlo noise of 2000 replicates.
func TestOneSourceAlone(t *testing.T) {
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	b := BootstrapOptions{Replicates: 2000, Seed: 5, DischargeError: 0.07, AreaError: 0.05, Draws: JointDraw}
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area}
		all, err := Bootstrap(cv.gauge, s, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		width := func(iv Interval) float64 { return (iv.Hi - iv.Lo) / iv.Median }
		wAll := width(all.Mean.MolPerKm2)
		for _, src := range []Sources{Sampling, Apportionment, Discharge, Area} {
			u, err := Bootstrap(cv.gauge, s, opt, b.Alone(src))
			if err != nil {
				t.Fatal(err)
			}
			w := width(u.Mean.MolPerKm2)
			if !(w > 0) || w > wAll {
				t.Errorf("%v: %v alone: relative width %.4f, all sources %.4f; want above 0 and no wider", m, src, w, wAll)
			}
			// The discharge error alone: 1 ± 1.96 σ_Q, a width of 3.92 × 0.07
			// (normal quantiles, common practice; 3 % for 2000 replicates).
			if src == Discharge && relErr(w, 3.92*0.07) > 0.03 {
				t.Errorf("%v: discharge alone: relative width %.4f, want about %.4f", m, w, 3.92*0.07)
			}
		}
	}
}

// TestAloneSharesTheStreams: a source varied alone takes the same values,
// replicate by replicate, as in the bootstrap of every source. With a
// constant concentration and no draws only the discharge error moves the
// load, so the discharge alone gives each replicate's load exactly, and the
// area alone each replicate's area.
func TestAloneSharesTheStreams(t *testing.T) {
	rec := constantRecord(1, 365)
	days := sampleDays(rec, 5, 14)
	s := ForSpecies(chem.Ca, days, fill(len(days), 100))
	opt := Options{AreaKm2: 100}
	b := BootstrapOptions{Replicates: 300, Seed: 11, DischargeError: 0.1, AreaError: 0.05}
	all, err := Bootstrap(rec, s, opt, b)
	if err != nil {
		t.Fatal(err)
	}
	q, err := Bootstrap(rec, s, opt, b.Alone(Discharge))
	if err != nil {
		t.Fatal(err)
	}
	a, err := Bootstrap(rec, s, opt, b.Alone(Area))
	if err != nil {
		t.Fatal(err)
	}
	base := 86.4 * 100 * 365.0
	for r := range all.MeanMol {
		if q.MeanMol[r] != all.MeanMol[r] || q.Area[r] != 100 {
			t.Fatalf("replicate %d: discharge alone %g mol on %g km², all sources %g mol", r, q.MeanMol[r], q.Area[r], all.MeanMol[r])
		}
		if a.Area[r] != all.Area[r] || a.MeanMol[r] != base {
			t.Fatalf("replicate %d: area alone %g km² and %g mol, all sources %g km²", r, a.Area[r], a.MeanMol[r], all.Area[r])
		}
	}
}
