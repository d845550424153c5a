package flux

import (
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// constantRecord returns n days of discharge q from 2021-01-01.
func constantRecord(q float64, n int) *discharge.Record {
	v := make([]float64, n)
	for i := range v {
		v[i] = q
	}
	return discharge.NewRecord("test", discharge.Date(2021, 1, 1), v)
}

// sampleDays returns every step-th day of rec, starting at offset.
func sampleDays(rec *discharge.Record, offset, step int) []discharge.Day {
	var out []discharge.Day
	for k := offset; k < rec.Len(); k += step {
		out = append(out, rec.Days[k])
	}
	return out
}

func fill(n int, v float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = v
	}
	return out
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// TestConstantConcentration: docs/methods.md §13 item 10. A constant
// concentration gives L = C × Σ Q_d × 86.4 exactly for every estimator, for a
// constant and for a varying discharge record.
func TestConstantConcentration(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	varying := make([]float64, 365)
	for i := range varying {
		varying[i] = 0.2 + 3*rng.Float64()*rng.Float64()
	}
	records := map[string]*discharge.Record{
		"Q = 1 m3/s": constantRecord(1, 365),
		"Q varies":   discharge.NewRecord("v", discharge.Date(2021, 1, 1), varying),
	}
	for rname, rec := range records {
		days := sampleDays(rec, 3, 14)
		s := ForSpecies(chem.Ca, days, fill(len(days), 100))
		sumQ := 0.0
		for _, q := range rec.Q {
			sumQ += q
		}
		want := 86.4 * (100 * sumQ)
		for m := Method(0); m < NMethods; m++ {
			for _, b := range []Bias{Duan, Ferguson, NoBias} {
				t.Run(rname+"/"+m.String()+"/"+b.String(), func(t *testing.T) {
					res, err := Estimate(rec, s, Options{Method: m, AreaKm2: 100, Bias: b})
					if err != nil {
						t.Fatal(err)
					}
					if got := res.Years[0].Mol; got != want {
						t.Errorf("load %.17g mol, want exactly %.17g", got, want)
					}
					if rname == "Q = 1 m3/s" {
						// Worked values, docs/methods.md §13 item 10 (tolerance 1e-12 relative).
						checks := []struct {
							name      string
							got, want float64
						}{
							{"L mol/yr", res.Mean.Mol, 3.1536e6},
							{"R mm/yr", res.Mean.RunoffMM, 315.36},
							{"Y mol/km2/yr", res.Mean.MolPerKm2, 31536},
							{"Ca t/km2/yr", res.Mean.TonnesPerKm2, 1.26390}, // 31536 × 40.078e-6 = 1.2639 (docs/methods.md §13 item 10)
						}
						for _, c := range checks {
							tol := 1e-12
							if c.name == "Ca t/km2/yr" {
								tol = 1e-5 // docs/methods.md §13 gives 6 figures
							}
							if relErr(c.got, c.want) > tol {
								t.Errorf("%s = %.10g, want %.10g (tolerance %g relative)", c.name, c.got, c.want, tol)
							}
						}
					}
				})
			}
		}
	}
}

// TestCO2Yields: docs/methods.md §13 item 9, silicate CO2 consumption phi_sil
// 238 and carbonate phi_carb 480 µmol/L at Q = 2 m³/s for 365 days over
// 250 km².
func TestCO2Yields(t *testing.T) {
	rec := constantRecord(2, 365)
	days := sampleDays(rec, 0, 14)
	tests := []struct {
		name            string
		phi             float64
		mol, molKm2, tC float64
		tCO2            float64
	}{
		{"silicate", 238, 1.50111e7, 6.00445e4, 0.721195, 2.64250},         // docs/methods.md §13 item 9
		{"carbonate", 480, 3.027456e7, 1.210982e5, math.NaN(), math.NaN()}, // docs/methods.md §13 item 9 (carbonate yield)
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := Series{Name: "phi " + tt.name, MolarMass: chem.MassC, Days: days, C: fill(len(days), tt.phi)}
			res, err := Estimate(rec, s, Options{AreaKm2: 250})
			if err != nil {
				t.Fatal(err)
			}
			if relErr(res.Mean.RunoffMM, 252.288) > 1e-9 { // docs/methods.md §13 item 9
				t.Errorf("runoff %.8g mm/yr, want 252.288", res.Mean.RunoffMM)
			}
			if relErr(res.Mean.Mol, tt.mol) > 1e-5 || relErr(res.Mean.MolPerKm2, tt.molKm2) > 1e-5 {
				t.Errorf("got %.7g mol/yr, %.7g mol/km2/yr; want %.7g, %.7g (1e-5 relative)", res.Mean.Mol, res.Mean.MolPerKm2, tt.mol, tt.molKm2)
			}
			if !math.IsNaN(tt.tC) {
				if got := res.Mean.TonnesPerKm2; relErr(got, tt.tC) > 1e-5 {
					t.Errorf("t C/km2/yr = %.7g, want %.7g", got, tt.tC)
				}
				if got := CO2Mass(res.Mean.MolPerKm2); relErr(got, tt.tCO2) > 1e-5 {
					t.Errorf("t CO2/km2/yr = %.7g, want %.7g", got, tt.tCO2)
				}
				if got := CarbonMass(res.Mean.MolPerKm2); relErr(got, tt.tC) > 1e-5 {
					t.Errorf("CarbonMass = %.7g t C/km2/yr, want %.7g", got, tt.tC)
				}
			}
		})
	}
}

// TestBiasFactors: docs/methods.md §13 item 11.
func TestBiasFactors(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
	}{
		{"Duan {-0.1, 0, 0.1}", DuanFactor([]float64{-0.1, 0, 0.1}), 1.0033361}, // docs/methods.md §13 item 11
		{"Ferguson s = 0.1 ln", FergusonFactor(0.1), 1.0050125},                 // exp(0.005), docs/methods.md §13 item 11
		{"Ferguson s = 0.1 log10", FergusonFactor(0.1 * math.Ln10), 1.0268640},  // exp(2.65095 × 0.01), docs/methods.md §13 item 11
	}
	for _, tt := range tests {
		if math.Abs(tt.got-tt.want) > 1e-7 {
			t.Errorf("%s = %.9f, want %.7f (tolerance 1e-7)", tt.name, tt.got, tt.want)
		}
	}
}

// TestPowerLaw: an exact power law C = a Q^b is recovered exactly by the
// rating curve (to rounding), with zero residuals and a unit bias factor.
func TestPowerLaw(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	q := make([]float64, 3*365)
	for i := range q {
		q[i] = 0.05 + 4*rng.Float64()*rng.Float64()
	}
	rec := discharge.NewRecord("p", discharge.Date(2020, 1, 1), q)
	tests := []struct{ a, b float64 }{{120, -0.35}, {40, 0.2}, {300, -1}, {55, 0}}
	for _, tt := range tests {
		days := sampleDays(rec, 2, 14)
		c := make([]float64, len(days))
		for i, d := range days {
			qq, _ := rec.At(d)
			c[i] = tt.a * math.Pow(qq, tt.b)
		}
		for _, seasonal := range []bool{false, true} {
			res, err := Estimate(rec, ForSpecies(chem.Na, days, c), Options{Method: Rating, Seasonal: seasonal})
			if err != nil {
				t.Fatal(err)
			}
			f := res.Rating
			if relErr(f.A, tt.a) > 1e-10 || math.Abs(f.B-tt.b) > 1e-10 || f.S > 1e-10 || math.Abs(f.Factor-1) > 1e-12 {
				t.Errorf("a=%g b=%g seasonal=%v: fitted A=%.12g B=%.12g S=%g factor=%.15g", tt.a, tt.b, seasonal, f.A, f.B, f.S, f.Factor)
			}
			if seasonal && (math.Abs(f.Sin) > 1e-10 || math.Abs(f.Cos) > 1e-10) {
				t.Errorf("seasonal terms %g %g, want 0", f.Sin, f.Cos)
			}
			for y, yl := range res.Years {
				want := 0.0
				for k, d := range rec.Days {
					if d >= yl.Start && d <= yl.End {
						want += tt.a * math.Pow(q[k], tt.b) * q[k] * 86.4
					}
				}
				if relErr(yl.Mol, want) > 1e-10 {
					t.Errorf("a=%g b=%g year %d: load %.12g, want %.12g (1e-10 relative)", tt.a, tt.b, y, yl.Mol, want)
				}
			}
		}
	}
}

func TestYearSD(t *testing.T) {
	// Three calendar years at 1, 2 and 3 m³/s with C = 100: loads
	// 86.4 × 100 × 365 × {1, 2, 3}; sample sd of {1, 2, 3} is 1 (common practice).
	q := make([]float64, 0, 1095)
	for y, v := range []float64{1, 2, 3} {
		n := int(discharge.Date(2022+y, 1, 1) - discharge.Date(2021+y, 1, 1))
		q = append(q, fill(n, v)...)
	}
	rec := discharge.NewRecord("sd", discharge.Date(2021, 1, 1), q)
	days := sampleDays(rec, 3, 14)
	res, err := Estimate(rec, ForSpecies(chem.Ca, days, fill(len(days), 100)), Options{Method: PeriodWeighted})
	if err != nil {
		t.Fatal(err)
	}
	if want := 86.4 * 100 * 365; relErr(res.YearSD, want) > 1e-12 {
		t.Errorf("interannual sd %g, want %g", res.YearSD, want)
	}
}
