package mix

import (
	"context"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

func TestForwardInverseAgree(t *testing.T) {
	exactData := correct.UniformPrecision(0, 1e-9, 1e-12)
	// Issue 3 "must show": the forward and inverse models agree when the
	// inverse priors collapse to the forward model's fixed ratios. The
	// forward model takes all Na* as silicate, so the carbonate end-member
	// is given a Na content that tends to zero: Ca/Na 1e5, Mg/Na 2e4
	// (Ca/Mg 5, as the carbonate part of the sample). The data are taken
	// as exact (a precision of 1e-9 µmol/L), as the forward model takes
	// them. The water is the
	// corrected mixture of docs/methods.md §13 item 8 (Na_sil 100, K_sil 20,
	// Ca_sil 35, Mg_sil 24, Ca_carb 400, Mg_carb 80) plus the 0.004 µmol/L
	// of Na the carbonate end-member then carries; the two models must agree
	// to 1e-4 of each measured cation (the size of that Na relative to Na).
	sil := EndMember{Name: "silicate", Source: Silicate}
	sil.Ratio[CaNa], sil.Ratio[MgNa], sil.Ratio[KNa] = FixedRatio(0.35), FixedRatio(0.24), FixedRatio(0.2)
	carb := EndMember{Name: "carbonate", Source: Carbonate}
	carb.Ratio[CaNa], carb.Ratio[MgNa] = FixedRatio(1e5), FixedRatio(2e4)

	c := fwdSample(map[chem.Species]float64{chem.Na: 100.004, chem.K: 20, chem.Ca: 435, chem.Mg: 104, chem.Cl: 0, chem.SO4: 0})
	cr := fwdCorrect(t, c, nil)
	fw, err := Forward(cr, &ForwardOptions{Silicate: exact(0.35, 0.24)})
	if err != nil {
		t.Fatal(err)
	}
	inv, err := Invert(context.Background(), Problem{
		EndMembers: []EndMember{sil, carb},
		Tracers:    []Tracer{CaNa, MgNa, KNa},
		Waters:     []Water{{Name: "item 8, corrected", Conc: cr.Residual, Sr87Sr86: math.NaN()}},
	}, &Options{Draws: 200, Seed: 1, Workers: 1, Precision: &exactData})
	if err != nil {
		t.Fatal(err)
	}
	s := inv.Samples[0]
	if err := s.Err(); err != nil {
		t.Fatalf("inversion: %v (warnings %v)", err, s.Warnings)
	}
	for _, src := range []Source{Silicate, Carbonate} {
		for i, sp := range Cations {
			f, m := fw.Split[src][i], s.Amount.Median[src][i]
			if tol := 1e-4 * c[sp]; math.Abs(f-m) > tol {
				t.Errorf("%s %s: forward %.6f, inverse median %.6f (tolerance %g)", src, sp, f, m, tol)
			}
			if lo, hi := s.Amount.Lo[src][i], s.Amount.Hi[src][i]; hi-lo > 1e-9*math.Max(m, 1) {
				t.Errorf("%s %s: fixed priors give an interval [%g, %g], want a point", src, sp, lo, hi)
			}
		}
	}
}
