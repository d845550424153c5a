package flux

import (
	"errors"
	"hash/fnv"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// withDraws returns the synthetic catchment's series with nd Monte Carlo
// draws per sample: a shared multiplier per draw index (as from end-member
// ratios shared across samples) times a small per-sample scatter.
func withDraws(s Series, nd int) Series {
	s.Draws = make([][]float64, len(s.C))
	for i, c := range s.C {
		s.Draws[i] = make([]float64, nd)
		for d := range nd {
			shared := 0.8 + 0.4*float64(d)/float64(nd-1)
			own := 1 + 0.02*math.Sin(float64(7*i+3*d))
			s.Draws[i][d] = c * shared * own
		}
	}
	return s
}

// TestBootstrapChecksum pins the exact bits of a full bootstrap (seasonal
// rating curve, per-sample draws, discharge and area errors). The constant was
// computed natively on amd64; under WebAssembly in Node the same test must
// give the same value (make wasmtest runs it).
func TestBootstrapChecksum(t *testing.T) {
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	want := map[Method]uint64{FlowWeighted: 0x6ef2dc5d1bb2f2d6, PeriodWeighted: 0xc80c14435588c0aa, Rating: 0xc268d0b52b62af43, Beale: 0xd51737e5e42b5f94}
	for m := Method(0); m < NMethods; m++ {
		opt := Options{Method: m, AreaKm2: cv.area, Seasonal: true}
		u, err := Bootstrap(cv.gauge, s, opt, BootstrapOptions{Replicates: 300, Seed: 7, DischargeError: 0.1, AreaError: 0.03})
		if err != nil {
			t.Fatal(err)
		}
		h := fnv.New64a()
		put := func(v float64) {
			b := math.Float64bits(v)
			h.Write([]byte{byte(b), byte(b >> 8), byte(b >> 16), byte(b >> 24), byte(b >> 32), byte(b >> 40), byte(b >> 48), byte(b >> 56)})
		}
		for _, li := range append([]LoadInterval{u.Mean}, func() []LoadInterval {
			var v []LoadInterval
			for _, y := range u.Years {
				v = append(v, y.LoadInterval)
			}
			return v
		}()...) {
			for _, iv := range []Interval{li.Mol, li.Tonnes, li.MolPerKm2, li.TonnesPerKm2, li.RunoffMM} {
				put(iv.Median)
				put(iv.Lo)
				put(iv.Hi)
			}
		}
		for _, v := range u.MeanMol {
			put(v)
		}
		if got := h.Sum64(); got != want[m] {
			t.Errorf("%v: checksum %#x, want %#x", m, got, want[m])
		}
	}
}

func TestBootstrapDeterministic(t *testing.T) {
	cv := newCorrieVale()
	opt := Options{Method: Rating, AreaKm2: cv.area}
	b := BootstrapOptions{Replicates: 200, Seed: 99, DischargeError: 0.1}
	u1, _ := Bootstrap(cv.gauge, cv.series, opt, b)
	ticks := 0
	b.Tick = func() { ticks++ }
	u2, _ := Bootstrap(cv.gauge, cv.series, opt, b)
	if u1.Mean != u2.Mean {
		t.Errorf("same seed, different results (the second with a progress tick): %+v vs %+v", u1.Mean, u2.Mean)
	}
	if ticks < b.Replicates {
		t.Errorf("%d progress ticks for %d replicates, want one per replicate at least", ticks, b.Replicates)
	}
	b.Tick = nil
	b.Seed = 100
	u3, _ := Bootstrap(cv.gauge, cv.series, opt, b)
	if u1.Mean.Mol == u3.Mean.Mol {
		t.Error("different seeds gave identical intervals")
	}
	// The same seed resamples the same samples for another series, so the
	// replicates of two series pair up: a series of twice the
	// concentration has exactly twice each replicate's load.
	s2 := cv.series
	s2.C = make([]float64, len(cv.series.C))
	for i, c := range cv.series.C {
		s2.C[i] = 2 * c
	}
	opt.Method = FlowWeighted
	b.Seed = 99
	ua, _ := Bootstrap(cv.gauge, cv.series, opt, b)
	ub, _ := Bootstrap(cv.gauge, s2, opt, b)
	for r := range ua.MeanMol {
		if relErr(ub.MeanMol[r], 2*ua.MeanMol[r]) > 1e-12 {
			t.Fatalf("replicate %d: %g vs 2 × %g", r, ub.MeanMol[r], ua.MeanMol[r])
		}
	}
	// Each replicate's area is the same in both series, and with a 5 %
	// area error it spreads about the catchment's area (common practice:
	// a normal error of that size stays within ±25 % in 200 draws).
	b.AreaError = 0.05
	ua, _ = Bootstrap(cv.gauge, cv.series, opt, b)
	ub, _ = Bootstrap(cv.gauge, s2, opt, b)
	spread := false
	for r, a := range ua.Area {
		if a != ub.Area[r] || relErr(a, cv.area) > 0.25 {
			t.Fatalf("replicate %d: areas %g and %g, catchment %g", r, a, ub.Area[r], cv.area)
		}
		spread = spread || a != cv.area
	}
	if len(ua.Area) != b.Replicates || !spread {
		t.Errorf("%d replicate areas (want %d), spread %v", len(ua.Area), b.Replicates, spread)
	}
	// Summary of the per-replicate yields agrees with the bootstrap's own.
	y := make([]float64, len(ua.MeanMol))
	for r := range y {
		y[r] = ua.MeanMol[r] / ua.Area[r]
	}
	if got := Summary(y); relErr(got.Median, ua.Mean.MolPerKm2.Median) > 1e-12 || relErr(got.Lo, ua.Mean.MolPerKm2.Lo) > 1e-12 {
		t.Errorf("yield from replicates %+v, bootstrap %+v", got, ua.Mean.MolPerKm2)
	}
}

// TestBootstrapDraws checks how draws enter: with a constant concentration
// and no discharge error, only the draws vary the load. Joint draws carry
// the full spread of the shared multiplier; per-sample draws average out.
func TestBootstrapDraws(t *testing.T) {
	rec := constantRecord(1, 365)
	days := sampleDays(rec, 5, 14)
	const nd = 101
	s := ForSpecies(chem.Ca, days, fill(len(days), 100))
	s.Draws = make([][]float64, len(days))
	for i := range days {
		s.Draws[i] = make([]float64, nd)
		for d := range nd {
			s.Draws[i][d] = 100 * (0.5 + float64(d)/float64(nd-1)) // multiplier 0.5 to 1.5
		}
	}
	base := 86.4 * 100 * 365.0
	opt := Options{AreaKm2: 100}
	t.Run("joint", func(t *testing.T) {
		u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 2000, Seed: 3, Draws: JointDraw})
		if err != nil {
			t.Fatal(err)
		}
		// The 2.5 % and 97.5 % points of a uniform multiplier on [0.5, 1.5]
		// are 0.525 and 1.475 (tolerance 0.03 for 2000 replicates).
		if lo, hi := u.Mean.Mol.Lo/base, u.Mean.Mol.Hi/base; math.Abs(lo-0.525) > 0.03 || math.Abs(hi-1.475) > 0.03 {
			t.Errorf("interval %.3f to %.3f of the base load, want about 0.525 to 1.475", lo, hi)
		}
	})
	t.Run("per sample", func(t *testing.T) {
		u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 2000, Seed: 3, Draws: PerSampleDraw})
		if err != nil {
			t.Fatal(err)
		}
		// Independent draws over n = 26 resampled samples: the sd of the
		// mean multiplier is 0.289 × sqrt((2n−1)/n²) = 0.079 (bootstrap
		// counts add the factor (2n−1)/n over 1/n; common practice), so the
		// interval is about ±1.96 × 0.079 = ±0.156.
		if w := (u.Mean.Mol.Hi - u.Mean.Mol.Lo) / base; w > 0.37 || w < 0.25 {
			t.Errorf("interval width %.3f of the base load, want about 0.31", w)
		}
	})
	t.Run("weights pick one draw", func(t *testing.T) {
		s := s
		s.Weights = make([][]float64, len(days))
		for i := range days {
			s.Weights[i] = make([]float64, nd)
			s.Weights[i][70] = 3
		}
		for _, mode := range []DrawMode{JointDraw, PerSampleDraw} {
			u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 50, Seed: 3, Draws: mode})
			if err != nil {
				t.Fatal(err)
			}
			want := 86.4 * (120 * 365.0)
			if relErr(u.Mean.Mol.Lo, want) > 1e-12 || relErr(u.Mean.Mol.Hi, want) > 1e-12 {
				t.Errorf("mode %d: interval %g to %g, want exactly the weighted draw's %g", mode, u.Mean.Mol.Lo, u.Mean.Mol.Hi, want)
			}
		}
	})
	t.Run("errors", func(t *testing.T) {
		bad := s
		bad.Draws = append([][]float64{{1, 2}}, s.Draws[1:]...)
		_, err := Bootstrap(rec, bad, opt, BootstrapOptions{Replicates: 10, Draws: JointDraw})
		if !errors.Is(err, ErrDraws) || err.Error() != "Ca: unusable Monte Carlo draws: joint draws need the same number of draws for every sample (sample 2 has 101, others 2)" {
			t.Errorf("unequal draws: got %v", err)
		}
		bad.Draws = append([][]float64{append([]float64{math.NaN()}, s.Draws[0][1:]...)}, s.Draws[1:]...)
		if _, err := Bootstrap(rec, bad, opt, BootstrapOptions{Replicates: 10}); !errors.Is(err, ErrDraws) {
			t.Errorf("NaN draw: got %v", err)
		}
	})
}

// TestUncertaintyComponents: with a constant concentration the sampling
// bootstrap adds nothing, so the discharge error alone sets the interval of
// the load: 1 ± 1.96 σ_Q; the area error alone sets that of the yield.
func TestUncertaintyComponents(t *testing.T) {
	rec := constantRecord(1, 365)
	days := sampleDays(rec, 5, 14)
	s := ForSpecies(chem.Ca, days, fill(len(days), 100))
	opt := Options{AreaKm2: 100}
	u, err := Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 4000, Seed: 11, DischargeError: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	base := 86.4 * 100 * 365.0
	// Normal quantiles ±1.96 (common practice); tolerance 0.015 for 4000 replicates.
	if lo, hi := u.Mean.Mol.Lo/base, u.Mean.Mol.Hi/base; math.Abs(lo-0.804) > 0.015 || math.Abs(hi-1.196) > 0.015 {
		t.Errorf("discharge error 10 %%: load interval %.3f to %.3f, want 0.804 to 1.196", lo, hi)
	}
	u, _ = Bootstrap(rec, s, opt, BootstrapOptions{Replicates: 4000, Seed: 11, AreaError: 0.05})
	if u.Mean.Mol.Lo != base || u.Mean.Mol.Hi != base {
		t.Errorf("area error moved the load: %+v", u.Mean.Mol)
	}
	y := base / 100
	// Y = L/(A(1+ε)): quantiles L/A / (1 ± 1.96 × 0.05) = 1/1.098 and 1/0.902.
	if lo, hi := u.Mean.MolPerKm2.Lo/y, u.Mean.MolPerKm2.Hi/y; math.Abs(lo-1/1.098) > 0.01 || math.Abs(hi-1/0.902) > 0.01 {
		t.Errorf("area error 5 %%: yield interval %.3f to %.3f, want %.3f to %.3f", lo, hi, 1/1.098, 1/0.902)
	}
}

func TestSampleProblems(t *testing.T) {
	rec := constantRecord(1, 365)
	rec.Q[40] = math.NaN()
	days := []discharge.Day{discharge.Date(2020, 12, 31), discharge.Date(2021, 1, 10), rec.Days[40], discharge.Date(2021, 3, 1), discharge.Date(2022, 1, 1)}
	c := []float64{100, 100, 100, 0, 100}
	res, err := Estimate(rec, ForSpecies(chem.Na, days, c), Options{Method: Rating})
	if err == nil {
		t.Fatalf("rating curve with one usable sample gave %+v", res)
	}
	want := []string{
		"Na: sample 1 (2020-12-31): date outside the discharge record (2021-01-01 to 2021-12-31); left out",
		"Na: sample 3 (2021-02-10): no discharge on that day (gap); left out",
		"Na: sample 5 (2022-01-01): date outside the discharge record (2021-01-01 to 2021-12-31); left out",
		"Na: sample 4 (2021-03-01): rating curve needs positive concentration and discharge; left out",
	}
	if len(res.Warnings) != len(want) {
		t.Fatalf("got %d warnings %v, want %d", len(res.Warnings), res.Warnings, len(want))
	}
	for i, w := range want {
		if got := res.Warnings[i].Error(); got != w {
			t.Errorf("warning %d:\n got  %s\n want %s", i, got, w)
		}
	}
	if !errors.Is(res.Warnings[0], discharge.ErrOutside) || !errors.Is(res.Warnings[1], discharge.ErrGap) {
		t.Error("warnings do not unwrap to the discharge errors")
	}
	// The flow-weighted estimator still works with the two usable samples.
	res, err = Estimate(rec, ForSpecies(chem.Na, days, c), Options{})
	if err != nil || res.Samples != 2 {
		t.Errorf("flow-weighted: %v, %d samples", err, res.Samples)
	}
}

// TestWaterYearFlux: a record from 2020-10-01 to 2022-09-30 holds two complete
// water years (Oct-Sep) that each cross a calendar year, but only one
// complete calendar year.
func TestWaterYearFlux(t *testing.T) {
	n := int(discharge.Date(2022, 10, 1) - discharge.Date(2020, 10, 1))
	rec := discharge.NewRecord("wy", discharge.Date(2020, 10, 1), fill(n, 1))
	days := sampleDays(rec, 10, 14)
	s := ForSpecies(chem.Ca, days, fill(len(days), 100))
	res, err := Estimate(rec, s, Options{AreaKm2: 100, FirstMonth: 10})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Years) != 2 || res.MeanYears != 2 {
		t.Fatalf("got %d water years, %d in the mean; want 2, 2", len(res.Years), res.MeanYears)
	}
	if y := res.Years[0]; y.String() != "2020-10/2021-09" || y.Samples != 26 || y.Mol != 86.4*(100*365) {
		t.Errorf("water year 2021: %s, %d samples, %g mol", y, y.Samples, y.Mol)
	}
	if relErr(res.Mean.Mol, 3.1536e6) > 1e-12 { // docs/methods.md §13 item 10
		t.Errorf("mean %g mol/yr, want 3.1536e6", res.Mean.Mol)
	}
	cal, _ := Estimate(rec, s, Options{AreaKm2: 100})
	if len(cal.Years) != 3 || cal.MeanYears != 1 || len(cal.Warnings) != 2 {
		t.Errorf("calendar years: %d years, %d complete, warnings %v", len(cal.Years), cal.MeanYears, cal.Warnings)
	}
}

func TestWeatheringRate(t *testing.T) {
	// docs/methods.md §13 items 8-9: Na_sil 100, K_sil 20, Ca_sil 35, Mg_sil 24
	// µmol/L at 2 m³/s for 365 days (63072 m³/s·day × 86.4/86.4 → × 63072
	// mol per µmol/L) over 250 km².
	const perUM = 2 * 365 * 86.4
	got := WeatheringRate(250,
		Part{chem.Na, 100 * perUM}, Part{chem.K, 20 * perUM}, Part{chem.Ca, 35 * perUM}, Part{chem.Mg, 24 * perUM})
	// Σ µmol/L × M = 100×22.98977 + 20×39.0983 + 35×40.078 + 24×24.305 =
	// 5064.887 µg/L; × 63072 mol/µM × 1e-6 / 250 (python3 check).
	want := (100*22.98976928 + 20*39.0983 + 35*40.078 + 24*24.305) * perUM * 1e-6 / 250
	if relErr(got, want) > 1e-12 || relErr(got, 1.278342) > 1e-6 {
		t.Errorf("silicate cation rate %.7g t/km2/yr, want %.7g", got, want)
	}
}

// TestDrawsWithoutValues: a series given only as draws takes the median draw
// of each sample for the point estimate.
func TestDrawsWithoutValues(t *testing.T) {
	rec := constantRecord(1, 365)
	days := sampleDays(rec, 5, 30)
	s := Series{Name: "Na sil", MolarMass: chem.Na.MolarMass(), Days: days, Draws: make([][]float64, len(days))}
	for i := range days {
		s.Draws[i] = []float64{30, 10, 20} // median 20
	}
	res, err := Estimate(rec, s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if want := 86.4 * (20 * 365.0); res.Mean.Mol != want {
		t.Errorf("load %g, want %g", res.Mean.Mol, want)
	}
}
