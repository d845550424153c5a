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
	// Sample of §13 item 8 with silicate ratios Ca/Na 0.35 in [0.30, 0.40]
	// and Mg/Na 0.24 in [0.20, 0.28], each range read as the 95 % interval
	// of a log-normal (docs/methods.md §7.3; narrow enough that the
	// Ca cap does not matter): phi_sil = Na_sil + K_sil + 2 Na_sil (Ca/Na +
	// Mg/Na) has quantiles 225.92, 238.18 and 251.85 (computed by a Monte
	// Carlo of 10^6 draws with python3's random.gauss); phi_carb = Ca* +
	// Mg* − Na_sil (Ca/Na + Mg/Na) = 599 − phi_sil/2 then has 473.08,
	// 478.91 and 485.04. Tolerances are about 4
	// Monte Carlo standard errors for 20000 draws.
	// The concentrations are the invented sample of science brief §13 item 8
	// (project test data, no published source).
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 125.7736, 20.56099, 435.56508, 106.90273
	c[chem.Cl], c[chem.SO4] = 30, 1.551756
	cr, err := correct.Apply(c, nil)
	if err != nil {
		t.Fatal(err)
	}
	sil := &mix.SilicateRatios{
		CaNa: mix.SilicateRatio{Value: 0.35, Lo: 0.30, Hi: 0.40},
		MgNa: mix.SilicateRatio{Value: 0.24, Lo: 0.20, Hi: 0.28},
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
		{"phi_sil median", iv.PhiSil.Median, 238.18, 0.25},
		{"phi_sil 97.5 %", iv.PhiSil.Hi, 251.85, 0.5},
		{"phi_sil 2.5 %", iv.PhiSil.Lo, 225.92, 0.5},
		{"phi_carb median", iv.PhiCarb.Median, 599 - 238.18/2, 0.15},
		{"phi_carb 97.5 %", iv.PhiCarb.Hi, 599 - 225.92/2, 0.25},
		{"phi_carb 2.5 %", iv.PhiCarb.Lo, 599 - 251.85/2, 0.25},
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
	if iv.PhiSil != (Spread{Lo: 238, Median: 238, Hi: 238}) || iv.PhiCarb != (Spread{Lo: 480, Median: 480, Hi: 480}) {
		t.Errorf("got %+v, want phi_sil 238 and phi_carb 480 throughout", iv)
	}
	if _, err := OverDraws(nil, 0, nil); !errors.Is(err, ErrInput) {
		t.Errorf("no draws: got %v, want ErrInput", err)
	}
	if _, err := OverDraws(draws, -3, nil); !errors.Is(err, ErrInput) {
		t.Errorf("negative SO4_sulf: got %v, want ErrInput", err)
	}
}
