package flux

import (
	"errors"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// rejecting returns a series of 26 fortnightly samples at a constant 100
// µmol/L whose 50 draws each multiply the concentration by 0.9 to 1.1,
// except that sample i rejects its own 10 draws (weight 0), starting at
// draw 7i mod 50, and those rejected draws hold poison: the zero that a
// rejected draw once stood for.
func rejecting(rec *discharge.Record) Series {
	days := sampleDays(rec, 5, 14)
	const nd = 50
	s := ForSpecies(chem.Ca, days, fill(len(days), 100))
	s.Draws, s.Weights = make([][]float64, len(days)), make([][]float64, len(days))
	for i := range days {
		s.Draws[i], s.Weights[i] = make([]float64, nd), make([]float64, nd)
		for d := range nd {
			s.Draws[i][d] = 100 * (0.9 + 0.2*float64(d)/float64(nd-1))
			s.Weights[i][d] = 1
		}
		for r := range 10 {
			d := (7*i + r) % nd
			s.Draws[i][d], s.Weights[i][d] = 0, 0
		}
	}
	return s
}

// TestRejectedDrawsNeverTaken: samples that reject different draws. Every
// replicate takes, for each sample, one of that sample's kept draws, so
// with a constant discharge and only the draws varied, each replicate's
// load lies within 0.9 to 1.1 of 100 µmol/L × Σ Q_d × 86.4, whatever the
// rejected draws hold; with the poison zero taken anywhere, some load would
// fall below 0.9 × 25/26 of it.
func TestRejectedDrawsNeverTaken(t *testing.T) {
	rec := constantRecord(1, 365)
	s := rejecting(rec)
	base := 86.4 * 100 * 365.0
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: 100}
		u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 500, Seed: 2, Hold: AllSources &^ Apportionment})
		if err != nil {
			t.Fatal(err)
		}
		if u.Failed != 0 {
			t.Errorf("%v: %d replicates failed", m, u.Failed)
		}
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, v := range u.MeanMol {
			lo, hi = math.Min(lo, v/base), math.Max(hi, v/base)
		}
		// The rating curve's smearing and the interpolation and Beale
		// weights move a replicate a little inside the range of its draws
		// (1e-9 for rounding).
		if lo < 0.9-1e-9 || hi > 1.1+1e-9 {
			t.Errorf("%v: replicate loads %.4f to %.4f of the base load, want within 0.9 to 1.1 (a rejected draw was taken)", m, lo, hi)
		}
		// Independent draws, uniform on [0.9, 1.1] (sd 0.0577), averaged
		// over 26 samples: the median load is the base load within 1 %.
		if relErr(u.Mean.Mol.Median, base) > 0.01 {
			t.Errorf("%v: median %.6g, want about %.6g", m, u.Mean.Mol.Median, base)
		}
	}
}

// TestJointDrawsRespectEverySample: a joint draw is one draw number for
// every sample, weighted by the product of the samples' weights. With
// every draw rejected by some sample there is none to take; with draws 3
// and 40 kept by all (weights 1 and 3 in one sample), the replicates take
// only those two, draw 40 three times as often.
func TestJointDrawsRespectEverySample(t *testing.T) {
	rec := constantRecord(1, 365)
	s := rejecting(rec)
	opt := Options{AreaKm2: 100}
	b := BootstrapOptions{Replicates: 4000, Seed: 9, Draws: JointDraw, Hold: AllSources &^ Apportionment}
	if _, err := Bootstrap(rec, s, opt, b); !errors.Is(err, ErrDraws) {
		t.Fatalf("every draw rejected by some sample: got %v, want ErrDraws", err)
	}
	for i := range s.Weights {
		for d := range s.Weights[i] {
			keep := d == 3 || d == 40
			s.Weights[i][d], s.Draws[i][d] = 0, 0
			if keep {
				s.Weights[i][d], s.Draws[i][d] = 1, 100*(0.9+0.2*float64(d)/49)
			}
		}
	}
	s.Weights[4][40] = 3
	u, err := Bootstrap(rec, s, opt, b)
	if err != nil {
		t.Fatal(err)
	}
	base := 86.4 * 365.0 * 100
	l3, l40 := base*(0.9+0.2*3/49.0), base*(0.9+0.2*40/49.0)
	n40 := 0
	for r, v := range u.MeanMol {
		switch {
		case relErr(v, l40) < 1e-12:
			n40++
		case relErr(v, l3) < 1e-12:
		default:
			t.Fatalf("replicate %d: load %g is neither joint draw's (%g, %g)", r, v, l3, l40)
		}
	}
	// Binomial(4000, 3/4): sd 27, so 3000 ± 110 (4 sd).
	if n40 < 2890 || n40 > 3110 {
		t.Errorf("draw 40 taken %d times in 4000, want about 3000 (weight 3 against 1)", n40)
	}
}

// sourceSplit builds the four sources of a measured cation in the
// synthetic Corrie Vale catchment: each sample's measured concentration
// split by shares that shift with discharge (more silicate at high flow)
// and with each draw, including an atmospheric share of zero in some draws
// and weights that reject different draws in different samples.
func sourceSplit(cv *corrieVale, nd int) (measured []float64, parts [4][]float64, draws [4][][]float64, weights [][]float64) {
	s := cv.series
	n := len(s.C)
	measured = s.C
	for src := range parts {
		parts[src], draws[src] = make([]float64, n), make([][]float64, n)
	}
	weights = make([][]float64, n)
	shares := func(i, d int) [4]float64 {
		q := cv.gauge.Q[cv.gauge.Index(s.Days[i])]
		f := 0.25 + 0.2*math.Tanh(q-1) + 0.1*math.Sin(float64(3*i+d))
		atm := math.Max(0, 0.2+0.15*math.Cos(float64(i*d)))
		if d%7 == 0 {
			atm = 0
		}
		evap := 0.05
		return [4]float64{atm, evap, f * (1 - atm - evap), (1 - f) * (1 - atm - evap)}
	}
	for i := 0; i < n; i++ {
		weights[i] = make([]float64, nd)
		for src := range parts {
			draws[src][i] = make([]float64, nd)
		}
		for d := 0; d < nd; d++ {
			sh := shares(i, d)
			weights[i][d] = 1 + float64((i+d)%3)
			if (i+2*d)%5 == 0 {
				weights[i][d] = 0
			}
			for src := range parts {
				draws[src][i][d] = sh[src] * measured[i]
			}
		}
		sh := shares(i, nd) // the point value: another draw of the same shares
		for src := range parts {
			parts[src][i] = sh[src] * measured[i]
		}
	}
	return
}

// TestSourcesAddUpToTheMeasuredSpecies: for every estimator, the loads of
// a cation's four sources add up to the measured cation's load, for the
// point estimate and replicate by replicate, to 1e-9 of it (the sources of
// each sample and draw add up to what was measured; the rest is
// rounding).
func TestSourcesAddUpToTheMeasuredSpecies(t *testing.T) {
	cv := newCorrieVale()
	measured, parts, draws, weights := sourceSplit(cv, 40)
	const tol = 1e-9
	for m := Method(0); m < NMethods; m++ {
		t.Run(m.String(), func(t *testing.T) {
			opt := Options{Method: m, AreaKm2: cv.area, Seasonal: true}
			b := BootstrapOptions{Replicates: 300, Seed: 4, DischargeError: 0.07, AreaError: 0.02, Cache: &Cache{}}
			whole, err := Estimate(cv.gauge, cv.series, opt)
			if err != nil {
				t.Fatal(err)
			}
			wu, err := Bootstrap(cv.gauge, cv.series, opt, b)
			if err != nil {
				t.Fatal(err)
			}
			sum := 0.0
			sumRep := make([]float64, len(wu.MeanMol))
			for src := range parts {
				a := Apportioned{Name: "Na source", MolarMass: chem.Na.MolarMass(), Days: cv.series.Days, Weights: weights,
					Parts: []Share{{Of: "Na", Measured: measured, Amount: parts[src], Draws: draws[src]}}}
				r, err := EstimateApportioned(cv.gauge, a, opt)
				if err != nil {
					t.Fatal(err)
				}
				sum += r.Mean.Mol
				u, err := BootstrapApportioned(cv.gauge, a, opt, b)
				if err != nil {
					t.Fatal(err)
				}
				for k, v := range u.MeanMol {
					sumRep[k] += v
				}
			}
			if e := relErr(sum, whole.Mean.Mol); e > tol {
				t.Errorf("point: sources add up to %.12g mol/yr, measured %.12g (relative difference %.2g)", sum, whole.Mean.Mol, e)
			}
			for k, v := range sumRep {
				if e := relErr(v, wu.MeanMol[k]); e > tol {
					t.Fatalf("replicate %d: sources add up to %.12g, measured %.12g (relative difference %.2g)", k, v, wu.MeanMol[k], e)
				}
			}
		})
	}
}

// TestApportionedFlowWeightedIsDirect: with the discharge-weighted
// estimator, the load of an apportioned quantity is that of its amounts
// fluxed directly: L_x × C_fw(a)/C_fw(x) = C_fw(a) Σ Q_d.
func TestApportionedFlowWeightedIsDirect(t *testing.T) {
	cv := newCorrieVale()
	measured, parts, _, _ := sourceSplit(cv, 10)
	opt := Options{AreaKm2: cv.area}
	a := Apportioned{Name: "Na silicate", Days: cv.series.Days, Parts: []Share{{Of: "Na", Measured: measured, Amount: parts[2]}}}
	r, err := EstimateApportioned(cv.gauge, a, opt)
	if err != nil {
		t.Fatal(err)
	}
	direct, err := Estimate(cv.gauge, Series{Name: "direct", Days: cv.series.Days, C: parts[2]}, opt)
	if err != nil {
		t.Fatal(err)
	}
	if relErr(r.Mean.Mol, direct.Mean.Mol) > 1e-12 {
		t.Errorf("apportioned %.15g, direct %.15g", r.Mean.Mol, direct.Mean.Mol)
	}
}

// TestApportionedHeldIsPoint: with every source held, each replicate of an
// apportioned quantity is its point estimate (1e-12; the rating curve sums
// its days through moments in replicates).
func TestApportionedHeldIsPoint(t *testing.T) {
	cv := newCorrieVale()
	measured, parts, draws, weights := sourceSplit(cv, 20)
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area}
		a := Apportioned{Name: "Na carbonate", Days: cv.series.Days, Weights: weights,
			Parts: []Share{{Of: "Na", Measured: measured, Amount: parts[3], Draws: draws[3]}}}
		r, err := EstimateApportioned(cv.gauge, a, opt)
		if err != nil {
			t.Fatal(err)
		}
		u, err := BootstrapApportioned(cv.gauge, a, opt, BootstrapOptions{Replicates: 20, Seed: 1, DischargeError: 0.1, Hold: AllSources})
		if err != nil {
			t.Fatal(err)
		}
		if relErr(u.Mean.Mol.Lo, r.Mean.Mol) > 1e-12 || u.Mean.Mol.Lo != u.Mean.Mol.Hi {
			t.Errorf("%v: held %+v, point %.15g", m, u.Mean.Mol, r.Mean.Mol)
		}
	}
}

// TestApportionedMissingSamples: samples without an amount take no part in
// the shares. Leaving their measured values out too (NaN) fluxes the
// quantity from the apportioned samples alone; keeping them fluxes the
// measured species from every sample and the shares from the apportioned
// ones, which fills the others with those shares.
func TestApportionedMissingSamples(t *testing.T) {
	cv := newCorrieVale()
	measured, parts, _, _ := sourceSplit(cv, 10)
	amount := append([]float64(nil), parts[2]...)
	left := append([]float64(nil), measured...)
	for i := 0; i < len(amount); i += 3 {
		amount[i], left[i] = math.NaN(), math.NaN()
	}
	opt := Options{Method: Rating, AreaKm2: cv.area}
	fillA := Apportioned{Name: "filled", Days: cv.series.Days, Parts: []Share{{Of: "Na", Measured: measured, Amount: amount}}}
	leftA := Apportioned{Name: "left out", Days: cv.series.Days, Parts: []Share{{Of: "Na (apportioned)", Measured: left, Amount: amount}}}
	rf, err := EstimateApportioned(cv.gauge, fillA, opt)
	if err != nil {
		t.Fatal(err)
	}
	rl, err := EstimateApportioned(cv.gauge, leftA, opt)
	if err != nil {
		t.Fatal(err)
	}
	all, _ := Estimate(cv.gauge, cv.series, opt)
	some, _ := Estimate(cv.gauge, Series{Name: "Na", Days: cv.series.Days, C: left}, opt)
	// Both take each year's shares from the same samples, so their ratio in
	// each year is that of the measured loads.
	for y := range rf.Years {
		if relErr(rf.Years[y].Mol/rl.Years[y].Mol, all.Years[y].Mol/some.Years[y].Mol) > 1e-12 {
			t.Errorf("year %d: filled %g, left out %g; measured loads %g and %g", y, rf.Years[y].Mol, rl.Years[y].Mol, all.Years[y].Mol, some.Years[y].Mol)
		}
	}
	if (rf.Mean.Mol > rl.Mean.Mol) != (all.Mean.Mol > some.Mean.Mol) || rf.Mean.Mol == rl.Mean.Mol {
		t.Errorf("filling moves the load as it moves the measured load: %g against %g, measured %g against %g", rf.Mean.Mol, rl.Mean.Mol, all.Mean.Mol, some.Mean.Mol)
	}
	if rf.Samples != len(amount)-(len(amount)+2)/3 || rl.Samples != rf.Samples {
		t.Errorf("samples with an amount: %d and %d, want %d", rf.Samples, rl.Samples, len(amount)-(len(amount)+2)/3)
	}
}

// TestRunoffIsTheRecords: the runoff of Estimate is the discharge record's
// own, Σ Q_d × 86.4 / A over each year's days with discharge (docs/methods.md
// §8.5), exactly; the bootstrap's runoff interval comes from the discharge
// and area errors alone: R (1 + σ_Q ε) / (1 + σ_A ε′).
func TestRunoffIsTheRecords(t *testing.T) {
	cv := newCorrieVale()
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area}
		r, err := Estimate(cv.gauge, cv.series, opt)
		if err != nil {
			t.Fatal(err)
		}
		sum := 0.0
		for _, y := range cv.gauge.Years(1) {
			s, e := cv.gauge.Index(y.Start), cv.gauge.Index(y.End)
			q := 0.0
			for k := s; k <= e; k++ {
				q += cv.gauge.Q[k]
			}
			sum += q
		}
		if want := discharge.RunoffMM(sum/3, cv.area); r.Mean.RunoffMM != want {
			t.Errorf("%v: runoff %.15g mm/yr, the record's %.15g", m, r.Mean.RunoffMM, want)
		}
		b := BootstrapOptions{Replicates: 400, Seed: 3, DischargeError: 0.07, AreaError: 0.02}
		u, err := Bootstrap(cv.gauge, cv.series, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		only, err := Bootstrap(cv.gauge, cv.series, opt, b.Alone(Discharge|Area))
		if err != nil {
			t.Fatal(err)
		}
		if u.Mean.RunoffMM != only.Mean.RunoffMM {
			t.Errorf("%v: runoff interval %+v moves with sampling or draws (%+v with discharge and area alone)", m, u.Mean.RunoffMM, only.Mean.RunoffMM)
		}
	}
}
