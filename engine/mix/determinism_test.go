package mix

import (
	"context"
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// wantChecksum is the Result.Checksum of determinismProblem, produced by
// the native amd64 run and asserted unchanged under WebAssembly (GOOS=js
// GOARCH=wasm, run in Node): bit-identical results on both targets.
// Regenerate only on a deliberate change of the algorithm, by running the
// test and copying the value it reports.
const wantChecksum uint64 = 0x9632882db416ba01

// determinismProblem is a small problem that takes every path of the
// sampler: corrected waters with rain spread, the isotope and Sr/Na
// tracers, the evaporite end-member with Cl/Na, refinement stages.
func determinismProblem() (Problem, *Options) {
	ws := benchWaters(5)
	for i := range ws {
		c := ws[i].Correction
		r, err := correct.Apply(withSr(c.Input, 0.8), nil)
		if err != nil {
			panic(err)
		}
		ws[i].Correction, ws[i].Sr87Sr86 = &r, 0.7125
	}
	ems := DefaultEndMembers(false)
	return Problem{EndMembers: ems, Tracers: []Tracer{CaNa, MgNa, HCO3Na, ClNa, SrNa, Sr87Sr86}, Waters: ws},
		&Options{Seed: 20261201, TargetESS: 200, Rain: correct.Uncertainty{Ratios: 0.05}}
}

func TestDeterminismChecksum(t *testing.T) {
	p, o := determinismProblem()
	ref, err := Invert(context.Background(), p, o)
	if err != nil {
		t.Fatal(err)
	}
	sum := ref.Checksum()
	t.Logf("checksum %#x", sum)
	for _, w := range []int{1, 3} {
		oo := *o
		oo.Workers = w
		again, _ := Invert(context.Background(), p, &oo)
		if again.Checksum() != sum {
			t.Errorf("%d workers: checksum %#x, want %#x", w, again.Checksum(), sum)
		}
	}
	if wantChecksum != 0 && sum != wantChecksum {
		t.Errorf("checksum %#x, want %#x (the native run's): results differ from the reference bits", sum, wantChecksum)
	}
	oo := *o
	oo.Seed++
	if other, _ := Invert(context.Background(), p, &oo); other.Checksum() == sum {
		t.Error("a different seed gave the same checksum")
	}
}

func TestPortableFunctions(t *testing.T) {
	// pexp and plog follow fdlibm, whose error is below 1 ulp; compare with
	// the math package (common practice: the same algorithm family).
	ulps := func(a, b float64) float64 {
		if a == b {
			return 0
		}
		return math.Abs(a-b) / (math.Nextafter(math.Abs(b), math.Inf(1)) - math.Abs(b))
	}
	for _, x := range []float64{-700, -300.5, -20, -1, -1e-3, -1e-9, 0, 1e-9, 0.5, 1, 2.302585092994046, 10, 88.7, 700} {
		if u := ulps(pexp(x), math.Exp(x)); u > 1 {
			t.Errorf("pexp(%g) = %.17g, math.Exp %.17g (%g ulp, want <= 1)", x, pexp(x), math.Exp(x), u)
		}
	}
	// Subnormal inputs: against log(x 2^52) - 52 ln 2 (the amd64 assembly
	// math.Log does not handle them).
	for _, x := range []float64{5e-324, 1e-310} {
		want := math.Log(x*0x1p52) - 52*math.Ln2
		if got := plog(x); math.Abs(got-want) > 1e-15*math.Abs(want) {
			t.Errorf("plog(%g) = %.17g want %.17g", x, got, want)
		}
	}
	for _, x := range []float64{1e-300, 1e-9, 0.0219, 0.5, 0.70710678, 1, 1.5, 2, 10, 0.709175, 1e6, 1e300} {
		if u := ulps(plog(x), math.Log(x)); u > 1 {
			t.Errorf("plog(%g) = %.17g, math.Log %.17g (%g ulp, want <= 1)", x, plog(x), math.Log(x), u)
		}
	}
	if got := pexp(-800); got != 0 {
		t.Errorf("pexp(-800) = %g, want 0 (flushed)", got)
	}
	if got := plog(0); !math.IsInf(got, -1) {
		t.Errorf("plog(0) = %g, want -Inf", got)
	}
	// Acklam's approximation: relative error below 1.15e-9 (Acklam 2003,
	// from memory); checked against gonum's normal quantile.
	for _, p := range []float64{1e-12, 1e-6, 0.001, 0.02425, 0.025, 0.2, 0.5, 0.7, 0.975, 0.99, 1 - 1e-9} {
		want := distuv.UnitNormal.Quantile(p)
		got := normQuantile(p)
		if math.Abs(got-want) > 2e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("normQuantile(%g) = %.12g want %.12g", p, got, want)
		}
	}
}

func TestChiSquareTable(t *testing.T) {
	for nu := 1; nu < len(chi2q95); nu++ {
		want := distuv.ChiSquared{K: float64(nu)}.Quantile(0.95) // gonum
		if math.Abs(chi2q95[nu]-want) > 1e-9 {
			t.Errorf("chi2 95 %% quantile, nu = %d: table %.12g, gonum %.12g", nu, chi2q95[nu], want)
		}
	}
	// Standard table value (common practice): 3.841 for one degree of freedom.
	if math.Abs(chi2q95[1]-3.841) > 5e-4 {
		t.Errorf("chi2q95[1] = %g want 3.841", chi2q95[1])
	}
}

// withSr returns c with Sr set (µmol/L).
func withSr(c chem.Composition, sr float64) chem.Composition {
	c[chem.Sr] = sr
	return c
}
