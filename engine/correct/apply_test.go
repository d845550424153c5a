package correct

import (
	"errors"
	"math"
	"testing"

	"lixiv/engine/chem"
)

// sample builds a composition with the given species and every other
// species missing.
func sample(kv map[chem.Species]float64) chem.Composition {
	c := chem.NewComposition()
	for s, v := range kv {
		c[s] = v
	}
	return c
}

func near(got, want, tol float64) bool {
	if math.IsInf(want, 0) {
		return got == want
	}
	return math.Abs(got-want) <= tol
}

func hasWarning(ws []error, target error) bool {
	for _, w := range ws {
		if errors.Is(w, target) {
			return true
		}
	}
	return false
}

func TestSeaSaltRatios(t *testing.T) {
	// X/Cl column of the Reference Composition table, Millero, Feistel,
	// Wright & McDougall (2008), Deep-Sea Res. I 55, as given in docs/methods.md
	// §4.2.
	want := []struct {
		s chem.Species
		r float64
	}{
		{chem.Na, 0.859120},
		{chem.Mg, 0.0967577},
		{chem.Ca, 0.0188361},
		{chem.K, 0.0186998},
		{chem.Sr, 0.000166147},
		{chem.SO4, 0.0517252},
		{chem.Br, 0.00154269},
	}
	r := SeaSalt()
	for _, w := range want {
		t.Run(w.s.String(), func(t *testing.T) {
			if got := r[w.s]; math.Abs(got-w.r)/w.r > 5e-6 {
				t.Errorf("%s/Cl: got %.9g, want %.9g (tolerance 5e-6 relative, table rounding)", w.s, got, w.r)
			}
		})
	}
}

func TestDilutedSeawater(t *testing.T) {
	// docs/methods.md §13 item 2: Millero et al. (2008) molalities × 1000 as a
	// sample leave zero residual Na, Mg, Ca, K, Sr and SO4 (|x| < 1e-6) for
	// any dilution.
	sea := sample(map[chem.Species]float64{
		chem.Na: 486.0597, chem.Mg: 54.7421, chem.Ca: 10.6568, chem.K: 10.5797,
		chem.Sr: 0.0940, chem.Cl: 565.7647, chem.SO4: 29.2643,
	})
	for _, tc := range []struct {
		name    string
		f       float64
		sulfate Sulfate
	}{
		{"undiluted gypsum", 1, Gypsum},
		{"diluted 1:10 gypsum", 0.1, Gypsum},
		{"diluted 1:1000 sulfide", 1e-3, Sulfide},
		{"diluted 1:35000 gypsum", 1.0 / 35000, Gypsum},
		{"concentrated x3 sulfide", 3, Sulfide},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r, err := Apply(sea.Scale(tc.f), &Options{Sulfate: tc.sulfate})
			if err != nil {
				t.Fatal(err)
			}
			for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Sr, chem.SO4, chem.Cl} {
				if got := r.Residual[s]; math.Abs(got) >= 1e-6 {
					t.Errorf("%s*: got %g, want 0 (|x| < 1e-6)", s, got)
				}
			}
			if math.Abs(r.SO4Sulf) >= 1e-6 {
				t.Errorf("SO4_sulf: got %g, want 0", r.SO4Sulf)
			}
			if len(r.Negatives) != 0 {
				t.Errorf("negatives: got %v, want none", r.Negatives)
			}
			if !hasWarning(r.Warnings, ErrAllClAtmospheric) {
				t.Errorf("warnings %v: want ErrAllClAtmospheric (Cl* defaults to +Inf)", r.Warnings)
			}
		})
	}
}

func TestMeasuredRain(t *testing.T) {
	// docs/methods.md §13 item 5 (worked example): Cl_rain 20, Na_rain 17,
	// P 1000 mm, ET 600 mm -> F 2.5, Cl* 50, Na_atm 42.5; river Cl 80 ->
	// Cl_atm 50, Cl_excess 30 (halite), Na_evap 30. River Na 200 is
	// invented for the test (Corrie Vale), so Na* − Na_evap = 127.5.
	rain := &Rain{
		Composition: sample(map[chem.Species]float64{
			chem.Cl: 20, chem.Na: 17, chem.K: 1, chem.Ca: 2, chem.Mg: 3, chem.SO4: 4, chem.Sr: 0.01, chem.Br: 0.03,
		}),
		P: 1000, ET: 600,
	}
	river := sample(map[chem.Species]float64{chem.Cl: 80, chem.Na: 200, chem.K: 20, chem.Ca: 100, chem.Mg: 40, chem.SO4: 30})
	r, err := Apply(river, &Options{Rain: rain})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-12
	checks := []struct {
		name      string
		got, want float64
	}{
		{"F", r.F, 2.5},
		{"Cl*", r.ClCritical, 50},
		{"Cl_atm", r.Atm[chem.Cl], 50},
		{"Cl_excess", r.ClExcess, 30},
		{"Na_atm", r.Atm[chem.Na], 42.5},
		{"Na_evap", r.Evap[chem.Na], 30},
		{"Cl_evap", r.Evap[chem.Cl], 30},
		{"Na residual", r.Residual[chem.Na], 127.5},
		{"K_atm = 1 x 2.5", r.Atm[chem.K], 2.5},
		{"SO4_atm = 4 x 2.5", r.Atm[chem.SO4], 10},
		{"Ca_evap = SO4* (gypsum default)", r.Evap[chem.Ca], 20},
		{"Ca residual", r.Residual[chem.Ca], 100 - 5 - 20},
		{"Cl residual", r.Residual[chem.Cl], 0},
	}
	for _, c := range checks {
		if !near(c.got, c.want, tol) {
			t.Errorf("%s: got %.12g, want %.12g (tolerance %g)", c.name, c.got, c.want, tol)
		}
	}
	if hasWarning(r.Warnings, ErrAllClAtmospheric) || hasWarning(r.Warnings, ErrRainFallback) {
		t.Errorf("unexpected warnings: %v", r.Warnings)
	}
}

func TestRainBelowCritical(t *testing.T) {
	// docs/methods.md §4.3: river Cl below Cl* is all atmospheric, and
	// X_atm = Cl_riv × (X/Cl)_rain. Cl* = 20 × 2.5 × f_dry 1.2 = 60.
	rain := &Rain{Composition: sample(map[chem.Species]float64{chem.Cl: 20, chem.Na: 17}), P: 1000, ET: 600, DryFactor: 1.2}
	river := sample(map[chem.Species]float64{chem.Cl: 40, chem.Na: 100})
	r, err := Apply(river, &Options{Rain: rain})
	if err != nil {
		t.Fatal(err)
	}
	if !near(r.ClCritical, 60, 1e-12) || r.ClExcess != 0 || !near(r.Atm[chem.Na], 34, 1e-12) {
		t.Errorf("got Cl* %g, Cl_excess %g, Na_atm %g; want 60, 0, 34", r.ClCritical, r.ClExcess, r.Atm[chem.Na])
	}
	// K, Ca, Mg, SO4, Sr, Br are missing from this rain: sea-salt ratios.
	if !hasWarning(r.Warnings, ErrRainFallback) {
		t.Errorf("warnings %v: want ErrRainFallback", r.Warnings)
	}
	if want := 40 * SeaSalt()[chem.Mg]; !near(r.Atm[chem.Mg], want, 1e-12) {
		t.Errorf("Mg_atm: got %g, want %g (sea-salt fallback)", r.Atm[chem.Mg], want)
	}
}

func TestRainFactor(t *testing.T) {
	// F = P/(P−ET) = P/R (docs/methods.md §4.3); worked values computed by hand.
	tests := []struct {
		name string
		rain Rain
		want float64
		err  bool
	}{
		{"P and ET", Rain{P: 1000, ET: 600}, 2.5, false},
		{"P and R", Rain{P: 1200, R: 400}, 3, false},
		{"no ET, no R", Rain{P: 800}, 1, false},
		{"ET and R both: ET used", Rain{P: 1000, ET: 500, R: 250}, 2, false},
		{"ET equals P", Rain{P: 500, ET: 500}, 0, true},
		{"zero P", Rain{ET: 100}, 0, true},
		{"negative ET", Rain{P: 500, ET: -1}, 0, true},
		{"NaN P", Rain{P: math.NaN()}, 0, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := tc.rain.Factor()
			if (err != nil) != tc.err {
				t.Fatalf("error: got %v, want error %v", err, tc.err)
			}
			if err != nil {
				if !errors.Is(err, ErrOption) {
					t.Errorf("error %v does not wrap ErrOption", err)
				}
				return
			}
			if !near(got, tc.want, 1e-12) {
				t.Errorf("got F = %g, want %g", got, tc.want)
			}
		})
	}
}

func TestExcessChloride(t *testing.T) {
	// docs/methods.md §4.3 and §5.1: Cl above Cl* goes to halite (Na_evap =
	// Cl_excess) or, on request, to human input, removed with its Na and
	// flagged. Sea-salt Na/Cl 0.859120 (Millero et al. 2008).
	river := sample(map[chem.Species]float64{chem.Cl: 300, chem.Na: 400})
	naAtm := 100 * SeaSalt()[chem.Na]
	tests := []struct {
		name               string
		excess             Excess
		evapNa, humanNa    float64
		wantHumanInputFlag bool
	}{
		{"halite", Halite, 200, 0, false},
		{"human input", HumanInput, 0, 200, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, err := Apply(river, &Options{ClCritical: 100, Excess: tc.excess})
			if err != nil {
				t.Fatal(err)
			}
			if r.Evap[chem.Na] != tc.evapNa || r.Human[chem.Na] != tc.humanNa {
				t.Errorf("Na_evap, Na_human: got %g, %g; want %g, %g", r.Evap[chem.Na], r.Human[chem.Na], tc.evapNa, tc.humanNa)
			}
			if want := 400 - naAtm - 200; !near(r.Residual[chem.Na], want, 1e-9) {
				t.Errorf("Na residual: got %g, want %g", r.Residual[chem.Na], want)
			}
			if got := hasWarning(r.Warnings, ErrHumanInput); got != tc.wantHumanInputFlag {
				t.Errorf("human-input flag: got %v, want %v", got, tc.wantHumanInputFlag)
			}
			if hasWarning(r.Warnings, ErrAllClAtmospheric) {
				t.Errorf("Cl* was set, yet warned %v", r.Warnings)
			}
		})
	}
}

func TestSulfateScenarios(t *testing.T) {
	// docs/methods.md §5.2 scenarios (a), (b), (c); ratios invented so that
	// SO4_atm = 5 and SO4* = 100. δ34S: (5 − 20)/(−10 − 20) = 0.5.
	ratios := &Ratios{chem.Na: 0.86, chem.SO4: 0.05}
	river := sample(map[chem.Species]float64{chem.Cl: 100, chem.Na: 200, chem.Ca: 500, chem.SO4: 105})
	tests := []struct {
		name          string
		opt           Options
		caEvap, sulf  float64
		residualSO4   float64
		fSulf         float64
		wantClampWarn bool
	}{
		{"all gypsum", Options{Sulfate: Gypsum}, 100, 0, 0, 0, false},
		{"all sulfide", Options{Sulfate: Sulfide}, 0, 100, 100, 1, false},
		{"δ34S half", Options{Sulfate: Isotope, Delta34S: Delta34S{River: 5, Evaporite: 20, Sulfide: -10}}, 50, 50, 50, 0.5, false},
		{"δ34S above evaporite", Options{Sulfate: Isotope, Delta34S: Delta34S{River: 25, Evaporite: 20, Sulfide: -10}}, 100, 0, 0, 0, true},
		{"δ34S below sulfide", Options{Sulfate: Isotope, Delta34S: Delta34S{River: -15, Evaporite: 20, Sulfide: -10}}, 0, 100, 100, 1, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			opt := tc.opt
			opt.Ratios = ratios
			opt.ClCritical = math.Inf(1)
			r, err := Apply(river, &opt)
			if err != nil {
				t.Fatal(err)
			}
			const tol = 1e-9
			if !near(r.SO4Star, 100, tol) || !near(r.Evap[chem.Ca], tc.caEvap, tol) || !near(r.Evap[chem.SO4], tc.caEvap, tol) ||
				!near(r.SO4Sulf, tc.sulf, tol) || !near(r.Residual[chem.SO4], tc.residualSO4, tol) || !near(r.FSulf, tc.fSulf, tol) {
				t.Errorf("got SO4* %g, Ca_evap %g, SO4_evap %g, SO4_sulf %g, SO4 residual %g, f_sulf %g; want 100, %g, %g, %g, %g, %g",
					r.SO4Star, r.Evap[chem.Ca], r.Evap[chem.SO4], r.SO4Sulf, r.Residual[chem.SO4], r.FSulf,
					tc.caEvap, tc.caEvap, tc.sulf, tc.residualSO4, tc.fSulf)
			}
			if !near(r.Residual[chem.Ca], 500-tc.caEvap, tol) {
				t.Errorf("Ca residual: got %g, want %g", r.Residual[chem.Ca], 500-tc.caEvap)
			}
			if got := hasWarning(r.Warnings, ErrSulfideFraction); got != tc.wantClampWarn {
				t.Errorf("fraction warning: got %v, want %v (%v)", got, tc.wantClampWarn, r.Warnings)
			}
			if len(r.Warnings) > 0 && !tc.wantClampWarn {
				t.Errorf("unexpected warnings %v", r.Warnings)
			}
		})
	}
}

func TestBracket(t *testing.T) {
	// docs/methods.md §5.2: the all-gypsum and all-sulfide scenarios bracket
	// the result; both are run whatever opt.Sulfate says.
	river := sample(map[chem.Species]float64{chem.Cl: 0, chem.Na: 50, chem.Ca: 800, chem.SO4: 300})
	g, s, err := Bracket(river, &Options{Sulfate: Isotope, ClCritical: math.Inf(1)})
	if err != nil {
		t.Fatal(err)
	}
	if g.SO4Sulf != 0 || g.Evap[chem.Ca] != 300 || s.SO4Sulf != 300 || s.Evap[chem.Ca] != 0 {
		t.Errorf("gypsum: SO4_sulf %g, Ca_evap %g; sulfide: SO4_sulf %g, Ca_evap %g; want 0, 300, 300, 0",
			g.SO4Sulf, g.Evap[chem.Ca], s.SO4Sulf, s.Evap[chem.Ca])
	}
	if _, _, err := Bracket(river, &Options{Negative: Reject, ClCritical: -1}); !errors.Is(err, ErrOption) {
		t.Errorf("bad option: got %v, want ErrOption", err)
	}
}

func TestNegativePolicy(t *testing.T) {
	// A residual below zero is reported with its amount and handled by the
	// policy, never clipped silently (issue 3; docs/methods.md §5.1).
	// K 0.5 with sea-salt K/Cl 0.0186998 × Cl 100 gives K* = −1.36998;
	// Cl 200 with Cl* 100 makes Na_evap 100, so Na* = 100 − 85.912 − 100.
	river := sample(map[chem.Species]float64{chem.Cl: 200, chem.Na: 100, chem.K: 0.5, chem.Ca: 50, chem.Mg: 30})
	sea := SeaSalt()
	wantK := 0.5 - 100*sea[chem.K]
	wantNa := 100 - 100*sea[chem.Na] - 100
	tests := []struct {
		policy       Negative
		residualK    float64
		residualNa   float64
		wantErr      bool
		wantRejected bool
	}{
		{Zero, 0, 0, false, false},
		{Keep, wantK, wantNa, false, false},
		{Reject, wantK, wantNa, true, true},
	}
	for _, tc := range tests {
		t.Run(tc.policy.String(), func(t *testing.T) {
			r, err := Apply(river, &Options{ClCritical: 100, Negative: tc.policy})
			if (err != nil) != tc.wantErr {
				t.Fatalf("error: got %v, want error %v", err, tc.wantErr)
			}
			if err != nil {
				var ne *NegativeError
				if !errors.As(err, &ne) || !errors.Is(err, ErrNegativeResidual) || len(ne.Deficits) != 2 {
					t.Errorf("error %v: want *NegativeError with 2 deficits wrapping ErrNegativeResidual", err)
				}
			}
			if r.Rejected != tc.wantRejected {
				t.Errorf("Rejected: got %v, want %v", r.Rejected, tc.wantRejected)
			}
			if len(r.Negatives) != 2 {
				t.Fatalf("negatives: got %v, want Na and K", r.Negatives)
			}
			for _, d := range r.Negatives {
				want := map[chem.Species]float64{chem.Na: wantNa, chem.K: wantK}[d.Species]
				if !near(d.Amount, want, 1e-9) {
					t.Errorf("deficit %s: got %g, want %g", d.Species, d.Amount, want)
				}
			}
			if !near(r.Residual[chem.K], tc.residualK, 1e-9) || !near(r.Residual[chem.Na], tc.residualNa, 1e-9) {
				t.Errorf("residual K, Na: got %g, %g; want %g, %g", r.Residual[chem.K], r.Residual[chem.Na], tc.residualK, tc.residualNa)
			}
			n := 0
			for _, w := range r.Warnings {
				if errors.Is(w, ErrNegativeResidual) {
					n++
				}
			}
			if n != 2 {
				t.Errorf("negative-residual warnings: got %d, want 2 (%v)", n, r.Warnings)
			}
		})
	}
}

func TestApplyErrors(t *testing.T) {
	good := sample(map[chem.Species]float64{chem.Cl: 10, chem.Na: 20, chem.Ca: 30, chem.SO4: 40})
	noCa := sample(map[chem.Species]float64{chem.Cl: 10, chem.Na: 20, chem.SO4: 40})
	neg := good
	neg[chem.Mg] = -1
	tests := []struct {
		name string
		c    chem.Composition
		opt  *Options
		want error
	}{
		{"no Cl", sample(map[chem.Species]float64{chem.Na: 1}), nil, ErrMissing},
		{"negative Mg", neg, nil, ErrNegativeInput},
		{"gypsum without Ca", noCa, nil, ErrMissing},
		{"negative Cl*", good, &Options{ClCritical: -5}, ErrOption},
		{"NaN Cl*", good, &Options{ClCritical: math.NaN()}, ErrOption},
		{"unknown sulfate scenario", good, &Options{Sulfate: 7}, ErrOption},
		{"unknown excess", good, &Options{Excess: -1}, ErrOption},
		{"unknown policy", good, &Options{Negative: 9}, ErrOption},
		{"negative ratio", good, &Options{Ratios: &Ratios{chem.Na: -0.1}}, ErrOption},
		{"rain without Cl", good, &Options{Rain: &Rain{Composition: sample(nil), P: 1000}}, ErrOption},
		{"dry factor below 1", good, &Options{Rain: &Rain{Composition: sample(map[chem.Species]float64{chem.Cl: 5}), P: 1000, DryFactor: 0.5}}, ErrOption},
		{"equal δ34S end-members", good, &Options{Sulfate: Isotope, Delta34S: Delta34S{River: 3, Evaporite: 2, Sulfide: 2}}, ErrOption},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Apply(tc.c, tc.opt)
			if !errors.Is(err, tc.want) {
				t.Errorf("got %v, want %v", err, tc.want)
			}
		})
	}
	t.Run("sulfide without Ca is fine", func(t *testing.T) {
		if _, err := Apply(noCa, &Options{Sulfate: Sulfide}); err != nil {
			t.Errorf("got %v, want nil", err)
		}
	})
	t.Run("missing SO4 is warned", func(t *testing.T) {
		r, err := Apply(sample(map[chem.Species]float64{chem.Cl: 10, chem.Na: 20}), nil)
		if err != nil || !hasWarning(r.Warnings, ErrMissing) || !math.IsNaN(r.SO4Star) {
			t.Errorf("got err %v, warnings %v, SO4* %g; want nil, ErrMissing, NaN", err, r.Warnings, r.SO4Star)
		}
	})
}

func TestMassBalance(t *testing.T) {
	// Under the Keep policy every species closes: Input = Atm + Evap +
	// Human + Residual (common practice: the correction only moves amounts).
	river := sample(map[chem.Species]float64{chem.Cl: 150, chem.Na: 180, chem.K: 12, chem.Ca: 400, chem.Mg: 90,
		chem.SO4: 120, chem.Sr: 0.8, chem.Br: 0.1, chem.Alk: 900, chem.SiO2: 150})
	for _, excess := range []Excess{Halite, HumanInput} {
		for _, sulf := range []Sulfate{Gypsum, Sulfide} {
			t.Run(excess.String()+" "+sulf.String(), func(t *testing.T) {
				r, err := Apply(river, &Options{ClCritical: 120, Excess: excess, Sulfate: sulf, Negative: Keep})
				if err != nil {
					t.Fatal(err)
				}
				for s := range river {
					if math.IsNaN(river[s]) {
						continue
					}
					sum := r.Atm[s] + r.Evap[s] + r.Human[s] + r.Residual[s]
					if !near(sum, river[s], 1e-9*river[s]) {
						t.Errorf("%s: parts add to %.12g, want %.12g", chem.Species(s), sum, river[s])
					}
				}
			})
		}
	}
}
