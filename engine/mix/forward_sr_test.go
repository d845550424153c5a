package mix

import (
	"errors"
	"math"
	"testing"

	"lixiv/engine/chem"
)

func TestSrRatio(t *testing.T) {
	// docs/methods.md §13 item 13: 1 µmol/L Sr at 0.7200 + 3 µmol/L at 0.7080
	// -> 0.711000 (Sr-weighted), tolerance 1e-6.
	tests := []struct {
		name      string
		sr, ratio [NSources]float64
		want      float64
	}{
		{"two sources", [NSources]float64{0, 0, 1, 3}, [NSources]float64{math.NaN(), math.NaN(), 0.7200, 0.7080}, 0.711000},
		// Seawater 0.709175 (McArthur, Howarth & Bailey 2001, from memory)
		// alone gives itself.
		{"one source", [NSources]float64{0.2, 0, 0, 0}, [NSources]float64{0.709175, 0, 0, 0}, 0.709175},
		{"no Sr", [NSources]float64{}, [NSources]float64{}, math.NaN()},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := SrRatio(tc.sr, tc.ratio)
			if math.IsNaN(tc.want) != math.IsNaN(got) || !math.IsNaN(got) && math.Abs(got-tc.want) > 1e-6 {
				t.Errorf("got %.7f, want %.7f (tolerance 1e-6)", got, tc.want)
			}
		})
	}
}

func TestForwardSr(t *testing.T) {
	// Sample of §13 item 8 with Sr: sea-salt Sr/Cl 0.000166147 (Millero et
	// al. 2008) × Cl 30 = 0.0049844, silicate Sr = Na_sil 100 × 0.003
	// (Gaillardet et al. 1999, from memory) = 0.3, carbonate Sr 1.2 (an
	// invented Corrie Vale value): measured Sr = 1.5049844.
	base := map[chem.Species]float64{
		chem.Na: 125.7736, chem.K: 20.56099, chem.Ca: 435.56508, chem.Mg: 106.90273, chem.Cl: 30, chem.SO4: 1.551756,
	}
	tests := []struct {
		name             string
		sr               float64
		sil, carb, defic float64
		warn             bool
	}{
		{"carbonate Sr 1.2", 1.5049844, 0.3, 1.2, 0, false},
		// Sr* = 0.2 below the silicate share 0.3: silicate capped at 0.2.
		{"Sr below silicate share", 0.2049844, 0.2, 0, 0.1, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			kv := map[chem.Species]float64{chem.Sr: tc.sr}
			for s, v := range base {
				kv[s] = v
			}
			cr := fwdCorrect(t, fwdSample(kv), nil)
			f, err := Forward(cr, &ForwardOptions{Silicate: exact(0.35, 0.24)})
			if err != nil {
				t.Fatal(err)
			}
			s, warn, err := ForwardSr(cr, &f, ForwardSrNa())
			if err != nil {
				t.Fatal(err)
			}
			const tol = 1e-6
			if math.Abs(s.Amount[Atmosphere]-0.0049844) > tol || math.Abs(s.Amount[Silicate]-tc.sil) > tol ||
				math.Abs(s.Amount[Carbonate]-tc.carb) > tol || math.Abs(s.Deficit-tc.defic) > tol {
				t.Errorf("got %+v; want atm 0.0049844, sil %g, carb %g, deficit %g", s, tc.sil, tc.carb, tc.defic)
			}
			// 1000 Sr/Na = 3 ± 1 read as a 95 % log-normal range.
			if want := 100 * 0.003 * math.Log(2) / (2 * z975); tc.defic == 0 && math.Abs(s.Sigma[Silicate]-want) > tol {
				t.Errorf("σ Sr_sil: got %g, want %g", s.Sigma[Silicate], want)
			}
			if got := len(warn) > 0 && errors.Is(warn[0], ErrSilicateCapped); got != tc.warn {
				t.Errorf("deficit warning: got %v, want %v", warn, tc.warn)
			}
		})
	}
	t.Run("Sr not measured", func(t *testing.T) {
		cr := fwdCorrect(t, fwdSample(base), nil)
		f, _ := Forward(cr, nil)
		if _, _, err := ForwardSr(cr, &f, ForwardSrNa()); !errors.Is(err, ErrForwardInput) {
			t.Errorf("got %v, want ErrForwardInput", err)
		}
		if _, _, err := ForwardSr(cr, &f, SilicateRatio{Value: -1}); !errors.Is(err, ErrForwardInput) {
			t.Errorf("negative ratio: got %v, want ErrForwardInput", err)
		}
	})
}
