package mix

import (
	"context"
	"math"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat"
	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// wantVaryChecksum is the Result.Checksum of determinismProblem with its
// waters' Na drawn by RainScales (Options.Vary), from the native amd64 run;
// the same test asserts it under WebAssembly in Node. Regenerate only on a
// deliberate change of the algorithm.
const wantVaryChecksum uint64 = 0xe06979a41ab78d16

// naVary multiplies each water's Na by the draw's Na/Cl multiplier, a
// stand-in for a rain correction drawn with its uncertainty.
func naVary(p Problem, sc []correct.Scale) func(s, d int) (chem.Composition, bool) {
	return func(s, d int) (chem.Composition, bool) {
		c := p.Waters[s].Conc
		c[chem.Na] *= sc[d].Ratios[chem.Na]
		return c, true
	}
}

func TestRainScales(t *testing.T) {
	t.Run("zero uncertainty is exactly 1", func(t *testing.T) {
		for d, k := range RainScales(50, 7, correct.Uncertainty{}, true) {
			if k != correct.Unit() {
				t.Fatalf("draw %d: %+v, want every multiplier exactly 1", d, k)
			}
		}
	})
	t.Run("log-normal with the stated sigma", func(t *testing.T) {
		// exp(σ z) with z standard normal: ln has mean 0 and sd σ (common
		// practice); 20,000 draws give a standard error of the sd near σ/200.
		const n, sigma = 20000, 0.1
		sc := RainScales(n, 3, correct.Uncertainty{Ratios: sigma, Factor: 0.2}, false)
		for _, sp := range []chem.Species{chem.Na, chem.Ca, chem.SO4} {
			ln := make([]float64, n)
			for d := range sc {
				ln[d] = math.Log(sc[d].Ratios[sp])
			}
			m, sd := stat.Mean(ln, nil), fwdStdDev(ln)
			if math.Abs(m) > 0.003 || math.Abs(sd-sigma) > 0.003 {
				t.Errorf("%s: ln multiplier mean %.4g sd %.4g, want 0 and %g", sp, m, sd, sigma)
			}
			sort.Float64s(ln)
			if med := ln[n/2]; math.Abs(med) > 0.003 {
				t.Errorf("%s: median multiplier exp(%.4g), want 1", sp, med)
			}
		}
		if sc[0].ClCritical != 1 || sc[0].Ratios[chem.Cl] != 1 {
			t.Errorf("Cl* multiplier %g without scaleCl, Cl/Cl %g; want 1", sc[0].ClCritical, sc[0].Ratios[chem.Cl])
		}
		if a, b := sc[0].Ratios[chem.Na], sc[0].Ratios[chem.K]; a == b {
			t.Error("species share a multiplier; want one each")
		}
	})
}

// TestVaryIdentity checks that per-draw data equal to the water's own give
// the same fit as the plain run: the same kept draws, misfits, Na fractions
// and shares bit for bit, and the same amounts to rounding (their
// quantiles are taken from the amounts rather than scaled from the shares).
func TestVaryIdentity(t *testing.T) {
	p, o := determinismProblem(Accept)
	ref, err := Invert(context.Background(), p, o)
	if err != nil {
		t.Fatal(err)
	}
	o2 := *o
	o2.Vary = func(s, _ int) (chem.Composition, bool) { return p.Waters[s].Conc, true }
	got, err := Invert(context.Background(), p, &o2)
	if err != nil {
		t.Fatal(err)
	}
	for s := range ref.Samples {
		a, b := &ref.Samples[s], &got.Samples[s]
		if a.Kept != b.Kept || a.Status != b.Status {
			t.Fatalf("sample %d: kept %d/%d, status %v/%v", s, a.Kept, b.Kept, a.Status, b.Status)
		}
		for k := range a.chi2 {
			if a.chi2[k] != b.chi2[k] || a.kept[k] != b.kept[k] {
				t.Fatalf("sample %d draw %d differs", s, k)
			}
		}
		if a.Share != b.Share {
			t.Errorf("sample %d: shares differ", s)
		}
		for src := range NSources {
			for c := range NCations {
				x, y := a.Amount.Median[src][c], b.Amount.Median[src][c]
				if math.Abs(x-y) > 1e-12*math.Max(1, math.Abs(x)) {
					t.Errorf("sample %d amount %d/%d: %g vs %g", s, src, c, x, y)
				}
			}
		}
	}
}

// TestVaryDeterminism checks that a run whose data change from draw to
// draw is bit-identical however it is driven, and on both targets.
func TestVaryDeterminism(t *testing.T) {
	p, o := determinismProblem(Accept)
	o.Vary = naVary(p, RainScales(o.Draws, o.Seed, correct.Uncertainty{Ratios: 0.1}, false))
	ref, err := Invert(context.Background(), p, o)
	if err != nil {
		t.Fatal(err)
	}
	sum := ref.Checksum()
	t.Logf("checksum %#x", sum)
	if sum != wantVaryChecksum {
		t.Errorf("checksum got %#x want %#x: results are not bit-identical to the native reference", sum, wantVaryChecksum)
	}
	o1 := *o
	o1.Workers = 1
	one, _ := Invert(context.Background(), p, &o1)
	r, _ := NewRun(p, o)
	for !r.Step(context.Background(), 97) {
	}
	for name, res := range map[string]*Result{"one worker": one, "steps of 97": r.Result()} {
		if res.Checksum() != sum {
			t.Errorf("%s: checksum %#x want %#x", name, res.Checksum(), sum)
		}
	}
	plain, _ := Invert(context.Background(), p, &Options{Draws: o.Draws, Seed: o.Seed})
	if plain.Checksum() == sum {
		t.Error("drawing the data changed nothing")
	}
	// The amounts follow each draw's own Na: the silicate Na of a kept
	// draw is its share times that draw's Na.
	d, split, _ := ref.Draw(0, 0)
	na := p.Waters[0].Conc[chem.Na] * RainScales(o.Draws, o.Seed, correct.Uncertainty{Ratios: 0.1}, false)[d].Ratios[chem.Na]
	tot := 0.0
	for src := range NSources {
		tot += split[src][0]
	}
	if math.Abs(tot-na) > 1e-9*na {
		t.Errorf("draw %d: Na sources add to %g, want the draw's Na %g", d, tot, na)
	}
}
