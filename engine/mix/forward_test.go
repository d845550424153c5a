package mix

import (
	"errors"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// fwdSample builds a composition with the given species, others missing.
func fwdSample(kv map[chem.Species]float64) chem.Composition {
	c := chem.NewComposition()
	for s, v := range kv {
		c[s] = v
	}
	return c
}

// fwdCorrect runs the default correction (sea salt, all Cl atmospheric,
// gypsum) and fails the test on error.
func fwdCorrect(t testing.TB, c chem.Composition, opt *correct.Options) *correct.Result {
	t.Helper()
	r, err := correct.Apply(c, opt)
	if err != nil {
		t.Fatal(err)
	}
	return &r
}

func fwdHas(ws []error, target error) bool {
	for _, w := range ws {
		if errors.Is(w, target) {
			return true
		}
	}
	return false
}

// exact is a silicate end-member without uncertainty.
func exact(ca, mg float64) *SilicateRatios {
	return &SilicateRatios{CaNa: Exact(ca), MgNa: Exact(mg), KNa: SilicateRatio{Value: math.NaN()}}
}

func TestForwardMixedSample(t *testing.T) {
	// Methods brief §13 item 8: Cl 30 of sea salt (Millero et al. 2008) +
	// Na_sil 100, K_sil 20, Ca_sil 35, Mg_sil 24 + Ca_carb 400, Mg_carb 80;
	// with (Ca/Na)_sil 0.35 and (Mg/Na)_sil 0.24 the parts are recovered to
	// 1e-4.
	c := fwdSample(map[chem.Species]float64{
		chem.Na: 125.7736, chem.K: 20.56099, chem.Ca: 435.56508, chem.Mg: 106.90273, chem.Cl: 30, chem.SO4: 1.551756,
	})
	cr := fwdCorrect(t, c, nil)
	for _, tc := range []struct {
		name string
		opt  ForwardOptions
	}{
		{"first order", ForwardOptions{Silicate: exact(0.35, 0.24)}},
		{"Monte Carlo, exact ratios", ForwardOptions{Silicate: exact(0.35, 0.24), Draws: 50, Seed: 7}},
		{"default ratios, first order", ForwardOptions{}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Forward(cr, &tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			want := []struct {
				src  Source
				sp   chem.Species
				want float64
			}{
				{Silicate, chem.Na, 100}, {Silicate, chem.K, 20}, {Silicate, chem.Ca, 35}, {Silicate, chem.Mg, 24},
				{Carbonate, chem.Ca, 400}, {Carbonate, chem.Mg, 80}, {Carbonate, chem.Na, 0}, {Carbonate, chem.K, 0},
			}
			for _, w := range want {
				if got := res.Split.Of(w.src, w.sp); math.Abs(got-w.want) > 1e-4 {
					t.Errorf("%s %s: got %.6f, want %g (tolerance 1e-4)", w.src, w.sp, got, w.want)
				}
			}
			for i, m := range res.Misfit {
				if math.Abs(m) > 1e-9 {
					t.Errorf("misfit %s: got %g, want 0", Cations[i], m)
				}
			}
			if fwdHas(res.Warnings, ErrSilicateCapped) || fwdHas(res.Warnings, ErrMassBalance) {
				t.Errorf("unexpected warnings %v", res.Warnings)
			}
		})
	}
}

func TestForwardEndMemberWaters(t *testing.T) {
	// Methods brief §13 items 6 and 7 (corrected): water from calcite
	// dissolution is all carbonate; water from albite weathering to
	// kaolinite is all silicate, and with the default (Ca/Na)_sil 0.35
	// (Gaillardet et al. 1999) its silicate Ca and Mg are capped at the
	// measured Ca* = Mg* = 0 (never invented), with a warning.
	calcite := fwdSample(map[chem.Species]float64{chem.Ca: 1000, chem.Alk: 2000, chem.Na: 0, chem.K: 0, chem.Mg: 0, chem.Cl: 0, chem.SO4: 0})
	albite := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.Alk: 100, chem.SiO2: 200, chem.K: 0, chem.Ca: 0, chem.Mg: 0, chem.Cl: 0, chem.SO4: 0})
	tests := []struct {
		name        string
		c           chem.Composition
		rat         *SilicateRatios
		sil, carb   [NCations]float64
		deficit     [NCations]float64
		wantDeficit bool
	}{
		{"calcite", calcite, nil, [NCations]float64{}, [NCations]float64{0, 0, 1000, 0}, [NCations]float64{}, false},
		{"albite, zero silicate Ca/Na and Mg/Na", albite, exact(0, 0), [NCations]float64{100, 0, 0, 0}, [NCations]float64{}, [NCations]float64{}, false},
		{"albite, default ratios", albite, nil, [NCations]float64{100, 0, 0, 0}, [NCations]float64{}, [NCations]float64{0, 0, 35, 24}, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Forward(fwdCorrect(t, tc.c, nil), &ForwardOptions{Silicate: tc.rat})
			if err != nil {
				t.Fatal(err)
			}
			if res.Split[Silicate] != tc.sil || res.Split[Carbonate] != tc.carb || res.Deficit != tc.deficit {
				t.Errorf("silicate %v, carbonate %v, deficit %v; want %v, %v, %v",
					res.Split[Silicate], res.Split[Carbonate], res.Deficit, tc.sil, tc.carb, tc.deficit)
			}
			if got := fwdHas(res.Warnings, ErrSilicateCapped); got != tc.wantDeficit {
				t.Errorf("carbonate-deficit warning: got %v, want %v (%v)", got, tc.wantDeficit, res.Warnings)
			}
		})
	}
}

func TestForwardFirstOrder(t *testing.T) {
	// First-order propagation (JCGM 100:2008 GUM): σ(Ca_sil) = Na_sil
	// σ(Ca/Na), with σ(Ca/Na) = 0.35 ln(0.50/0.20)/3.92 for the default
	// 0.35 ± 0.15 read as a 95 % log-normal range (docs/methods.md §7.3
	// revised), and likewise Mg; the carbonate shares carry the same σ.
	c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 10, chem.Ca: 500, chem.Mg: 200, chem.Cl: 0, chem.SO4: 0})
	res, err := Forward(fwdCorrect(t, c, nil), nil)
	if err != nil {
		t.Fatal(err)
	}
	want := Split{}
	sCa, sMg := 100*0.35*math.Log(0.5/0.2)/(2*z975), 100*0.24*math.Log(0.36/0.12)/(2*z975)
	want[Silicate][2], want[Carbonate][2] = sCa, sCa
	want[Silicate][3], want[Carbonate][3] = sMg, sMg
	for s := range want {
		for i := range want[s] {
			if math.Abs(res.Sigma[s][i]-want[s][i]) > 1e-12 {
				t.Errorf("σ %s %s: got %g, want %g", Source(s), Cations[i], res.Sigma[s][i], want[s][i])
			}
			if !math.IsNaN(res.Lo[s][i]) || !math.IsNaN(res.Hi[s][i]) {
				t.Errorf("Lo/Hi %s %s: got %g/%g, want NaN under first order", Source(s), Cations[i], res.Lo[s][i], res.Hi[s][i])
			}
		}
	}
	if res.Draws != nil {
		t.Errorf("Draws: got %d, want nil under first order", len(res.Draws))
	}
}

func TestForwardMonteCarlo(t *testing.T) {
	// With Ca and Mg far above the silicate share, nothing is capped and
	// the draws reproduce the log-normal ratio spread (median 0.35, σ of ln
	// s = ln(0.5/0.2)/3.92): sd of Ca_sil 35 sqrt((e^s² − 1) e^s²) = 8.525,
	// 97.5 % quantile 35 e^(1.96 s) = 55.34 (common practice, computed);
	// Mg likewise with s = ln 3/3.92: sd 7.136.
	c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 10, chem.Ca: 500, chem.Mg: 200, chem.Cl: 0, chem.SO4: 0})
	cr := fwdCorrect(t, c, nil)
	opt := &ForwardOptions{Draws: 20000, Seed: 42}
	res, err := Forward(cr, opt)
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"σ Ca_sil", res.Sigma[Silicate][2], 8.525, 0.03 * 8.525},
		{"σ Mg_carb", res.Sigma[Carbonate][3], 7.136, 0.03 * 7.136},
		{"Ca_sil 97.5 %", res.Hi[Silicate][2], 55.34, 1},
		{"Ca_carb 2.5 %", res.Lo[Carbonate][2], 500 - 55.34, 1},
		{"σ Na_sil (exact)", res.Sigma[Silicate][0], 0, 0},
		{"clamped Ca share", res.Clamped[2], 0, 0},
	}
	for _, ch := range checks {
		if math.Abs(ch.got-ch.want) > ch.tol {
			t.Errorf("%s: got %g, want %g ± %g", ch.name, ch.got, ch.want, ch.tol)
		}
	}
	if len(res.Draws) != opt.Draws {
		t.Fatalf("draws: got %d, want %d", len(res.Draws), opt.Draws)
	}
	for k, d := range res.Draws {
		if tot := d[Silicate][2] + d[Carbonate][2] + d[Atmosphere][2] + d[Evaporite][2]; math.Abs(tot-500) > 1e-9 {
			t.Fatalf("draw %d: Ca parts add to %g, want 500", k, tot)
		}
	}
	t.Run("same seed, same draws", func(t *testing.T) {
		again, _ := Forward(cr, opt)
		if again.Sigma != res.Sigma || again.Lo != res.Lo || again.Draws[123] != res.Draws[123] {
			t.Error("two runs with seed 42 differ")
		}
		other, _ := Forward(cr, &ForwardOptions{Draws: 20000, Seed: 43})
		if other.Draws[0] == res.Draws[0] {
			t.Error("seeds 42 and 43 gave the same first draw")
		}
	})
	t.Run("clamp share", func(t *testing.T) {
		// Ca* equal to the central Ca_sil 35: about half of the draws need
		// the cap (0.35 is the median of the ratio).
		c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 0, chem.Ca: 35, chem.Mg: 500, chem.Cl: 0, chem.SO4: 0})
		res, err := Forward(fwdCorrect(t, c, nil), &ForwardOptions{Draws: 4000, Seed: 1})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(res.Clamped[2]-0.5) > 0.05 {
			t.Errorf("clamped Ca share: got %g, want 0.5 ± 0.05", res.Clamped[2])
		}
		if !fwdHas(res.Warnings, ErrSilicateCapped) {
			t.Errorf("warnings %v: want ErrSilicateCapped for the clamped draws", res.Warnings)
		}
	})
}

func TestForwardPotassium(t *testing.T) {
	// K all silicate by default (Galy & France-Lanord 1999, method outline
	// from memory); with KFromRatio, K_sil = Na_sil × (K/Na)_sil and the
	// rest of K* is reported as unassigned.
	c := fwdSample(map[chem.Species]float64{chem.Na: 100, chem.K: 30, chem.Ca: 500, chem.Mg: 200, chem.Cl: 0, chem.SO4: 0})
	cr := fwdCorrect(t, c, nil)
	rat := ForwardSilicate()
	rat.KNa = SilicateRatio{Value: 0.1, Lo: 0.07, Hi: 0.14} // σ 0.1 ln 2/3.92
	tests := []struct {
		name                string
		opt                 ForwardOptions
		kSil, unassigned, σ float64
		warn                bool
	}{
		{"all silicate", ForwardOptions{}, 30, 0, 0, false},
		{"from K/Na", ForwardOptions{Silicate: &rat, KFromRatio: true}, 10, 20, 100 * 0.1 * math.Log(2) / (2 * z975), true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res, err := Forward(cr, &tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(res.Split[Silicate][1]-tc.kSil) > 1e-12 || math.Abs(res.Unassigned[1]-tc.unassigned) > 1e-12 ||
				math.Abs(res.Sigma[Silicate][1]-tc.σ) > 1e-12 {
				t.Errorf("K_sil %g, unassigned %g, σ %g; want %g, %g, %g", res.Split[Silicate][1], res.Unassigned[1], res.Sigma[Silicate][1], tc.kSil, tc.unassigned, tc.σ)
			}
			if math.Abs(res.Misfit[1]) > 1e-12 {
				t.Errorf("K misfit: got %g, want 0", res.Misfit[1])
			}
			if fwdHas(res.Warnings, ErrMassBalance) {
				t.Errorf("unexpected mass-balance warning %v", res.Warnings)
			}
			if got := fwdHas(res.Warnings, ErrUnassigned); got != tc.warn {
				t.Errorf("unassigned-K warning: got %v, want %v", got, tc.warn)
			}
		})
	}
}

func TestForwardMassBalance(t *testing.T) {
	// The sources plus Unassigned add up to the measured value;
	// where the correction set a negative residual to zero, the difference
	// shows as Misfit with a warning (never silently).
	t.Run("human input", func(t *testing.T) {
		c := fwdSample(map[chem.Species]float64{chem.Na: 300, chem.K: 10, chem.Ca: 400, chem.Mg: 100, chem.Cl: 200, chem.SO4: 10})
		cr := fwdCorrect(t, c, &correct.Options{ClCritical: 100, Excess: correct.HumanInput})
		res, err := Forward(cr, nil)
		if err != nil {
			t.Fatal(err)
		}
		if res.Unassigned[0] != 100 || math.Abs(res.Misfit[0]) > 1e-9 {
			t.Errorf("Na unassigned %g, misfit %g; want 100, 0", res.Unassigned[0], res.Misfit[0])
		}
	})
	t.Run("gypsum above Ca", func(t *testing.T) {
		// SO4* 300 as gypsum exceeds Ca 200: Ca* = −100 − Ca_atm is set to 0
		// by the correction, and the forward model reports the misfit.
		c := fwdSample(map[chem.Species]float64{chem.Na: 50, chem.K: 5, chem.Ca: 200, chem.Mg: 40, chem.Cl: 0, chem.SO4: 300})
		cr := fwdCorrect(t, c, nil)
		res, err := Forward(cr, &ForwardOptions{Silicate: exact(0, 0)})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(res.Misfit[2]-(-100)) > 1e-9 || !fwdHas(res.Warnings, ErrMassBalance) {
			t.Errorf("Ca misfit %g, warnings %v; want −100 and ErrMassBalance", res.Misfit[2], res.Warnings)
		}
	})
}

func TestForwardErrors(t *testing.T) {
	ok := fwdSample(map[chem.Species]float64{chem.Na: 50, chem.K: 5, chem.Ca: 200, chem.Mg: 40, chem.Cl: 10, chem.SO4: 3})
	noNa := fwdSample(map[chem.Species]float64{chem.K: 5, chem.Ca: 200, chem.Mg: 40, chem.Cl: 10, chem.SO4: 3})
	rejected, err := correct.Apply(fwdSample(map[chem.Species]float64{chem.Na: 1, chem.K: 0, chem.Cl: 100}), &correct.Options{Negative: correct.Reject})
	if err == nil {
		t.Fatal("setup: want a rejected sample")
	}
	neg := ForwardSilicate()
	neg.CaNa.Value = -0.1
	nanSigma := ForwardSilicate()
	nanSigma.MgNa.Lo = math.NaN()
	tests := []struct {
		name string
		c    *correct.Result
		opt  *ForwardOptions
	}{
		{"nil sample", nil, nil},
		{"rejected sample", &rejected, nil},
		{"no Na", fwdCorrect(t, noNa, nil), nil},
		{"K from ratio without K/Na", fwdCorrect(t, ok, nil), &ForwardOptions{KFromRatio: true}},
		{"negative Ca/Na", fwdCorrect(t, ok, nil), &ForwardOptions{Silicate: &neg}},
		{"NaN σ", fwdCorrect(t, ok, nil), &ForwardOptions{Silicate: &nanSigma}},
		{"negative draws", fwdCorrect(t, ok, nil), &ForwardOptions{Draws: -1}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := Forward(tc.c, tc.opt); !errors.Is(err, ErrForwardInput) {
				t.Errorf("got %v, want ErrForwardInput", err)
			}
		})
	}
}

func benchmarkForward(b *testing.B, opt *ForwardOptions) {
	c := fwdSample(map[chem.Species]float64{
		chem.Na: 125.7736, chem.K: 20.56099, chem.Ca: 435.56508, chem.Mg: 106.90273, chem.Cl: 30, chem.SO4: 1.551756,
	})
	cr := fwdCorrect(b, c, nil)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Forward(cr, opt); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkForwardFirstOrder(b *testing.B) { benchmarkForward(b, nil) }

func BenchmarkForwardDraws1000(b *testing.B) {
	benchmarkForward(b, &ForwardOptions{Draws: 1000, Seed: 1})
}

func TestForwardNegativeNaKept(t *testing.T) {
	// Under correct.Keep a negative Na* stays visible as negative silicate
	// Na, with a warning; silicate Ca and Mg are 0, not negative (issue 3:
	// negative residuals are reported, never hidden).
	c := fwdSample(map[chem.Species]float64{chem.Na: 50, chem.K: 5, chem.Ca: 300, chem.Mg: 60, chem.Cl: 100, chem.SO4: 5.17252})
	cr := fwdCorrect(t, c, &correct.Options{Negative: correct.Keep})
	res, err := Forward(cr, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Na* = 50 − 100 × 0.859120 (Millero et al. 2008 sea salt) = −35.912.
	if got := res.Split[Silicate][0]; math.Abs(got-(-35.912)) > 1e-3 {
		t.Errorf("Na_sil: got %g, want −35.912", got)
	}
	if res.Split[Silicate][2] != 0 || res.Split[Silicate][3] != 0 || res.Sigma[Silicate][2] != 0 {
		t.Errorf("silicate Ca, Mg, σ Ca: got %g, %g, %g; want 0", res.Split[Silicate][2], res.Split[Silicate][3], res.Sigma[Silicate][2])
	}
	if !fwdHas(res.Warnings, ErrNoSilicateNa) {
		t.Errorf("warnings %v: want ErrNoSilicateNa", res.Warnings)
	}
}
