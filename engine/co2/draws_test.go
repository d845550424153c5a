package co2

import (
	"errors"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

func TestOverDraws(t *testing.T) {
	// Sample of §13 item 8 with silicate ratios Ca/Na 0.35 ± 0.05 and Mg/Na
	// 0.24 ± 0.04 (narrow enough, 6σ and more from 0, that truncation at
	// zero and the Ca clamp do not matter): phi_sil = Na_sil + K_sil +
	// 2 Na_sil (Ca/Na + Mg/Na) is normal with mean 238 and σ = 2 × 100 ×
	// sqrt(0.05² + 0.04²) = 12.806, so its 95 % interval is 238 ± 25.10;
	// phi_carb = Ca* + Mg* − Na_sil (Ca/Na + Mg/Na) has mean 480 and half
	// that σ (normal quantiles, common practice). Tolerances are about 4
	// Monte Carlo standard errors for 20000 draws.
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 125.7736, 20.56099, 435.56508, 106.90273
	c[chem.Cl], c[chem.SO4] = 30, 1.551756
	cr, err := correct.Apply(c, nil)
	if err != nil {
		t.Fatal(err)
	}
	sil := &mix.SilicateRatios{
		CaNa: mix.SilicateRatio{Value: 0.35, Sigma: 0.05},
		MgNa: mix.SilicateRatio{Value: 0.24, Sigma: 0.04},
		KNa:  mix.SilicateRatio{Value: math.NaN()},
	}
	fr, err := mix.Forward(&cr, &mix.ForwardOptions{Silicate: sil, Draws: 20000, Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	iv, err := OverDraws(fr.Draws, cr.SO4Sulf, nil)
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		name           string
		got, want, tol float64
	}{
		{"phi_sil median", iv.PhiSil.Median, 238, 0.5},
		{"phi_sil 97.5 %", iv.PhiSil.Hi, 238 + 25.10, 1},
		{"phi_sil 2.5 %", iv.PhiSil.Lo, 238 - 25.10, 1},
		{"phi_carb median", iv.PhiCarb.Median, 480, 0.25},
		{"phi_carb 97.5 %", iv.PhiCarb.Hi, 480 + 12.55, 0.5},
		{"phi_carb 2.5 %", iv.PhiCarb.Lo, 480 - 12.55, 0.5},
	}
	for _, ch := range checks {
		if math.Abs(ch.got-ch.want) > ch.tol {
			t.Errorf("%s: got %.3f, want %.3f ± %g", ch.name, ch.got, ch.want, ch.tol)
		}
	}
	t.Logf("phi_sil %+v, phi_carb %+v", iv.PhiSil, iv.PhiCarb)
	if !(iv.PhiTotal.Lo <= iv.PhiTotal.Median && iv.PhiTotal.Median <= iv.PhiTotal.Hi) {
		t.Errorf("phi_total quantiles out of order: %+v", iv.PhiTotal)
	}
}

func TestOverDrawsExact(t *testing.T) {
	// Identical draws give Lo = Median = Hi = the point value (common
	// practice: quantiles of a constant).
	var s mix.Split
	s[mix.Silicate] = [mix.NCations]float64{100, 20, 35, 24}
	s[mix.Carbonate] = [mix.NCations]float64{0, 0, 400, 80}
	draws := []mix.Split{s, s, s}
	iv, err := OverDraws(draws, 0, nil)
	if err != nil {
		t.Fatal(err)
	}
	if iv.PhiSil != (Spread{238, 238, 238}) || iv.PhiCarb != (Spread{480, 480, 480}) {
		t.Errorf("got %+v, want phi_sil 238 and phi_carb 480 throughout", iv)
	}
	if _, err := OverDraws(nil, 0, nil); !errors.Is(err, ErrInput) {
		t.Errorf("no draws: got %v, want ErrInput", err)
	}
	if _, err := OverDraws(draws, -3, nil); !errors.Is(err, ErrInput) {
		t.Errorf("negative SO4_sulf: got %v, want ErrInput", err)
	}
}
