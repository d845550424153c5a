package correct

import (
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
)

// TestLinearSeaSaltNa checks the figure of docs/methods.md §7.2:
// where 70 % of the Na is sea salt and Na and Cl are measured to 3 %, the
// 1σ of Na* is about 12 % of Na*, not 3 %. Na 100, Cl 70/0.859120 (Millero
// et al. 2008 Na/Cl): Na* = 30, σ = sqrt(3² + (0.03 × 70)²) = 3.661 µmol/L
// (computed).
func TestLinearSeaSaltNa(t *testing.T) {
	c := chem.NewComposition()
	rNa, rMg := SeaSalt()[chem.Na], SeaSalt()[chem.Mg]
	c[chem.Na], c[chem.Cl] = 100, 70/rNa
	r, err := Apply(c, nil)
	if err != nil {
		t.Fatal(err)
	}
	p := UniformPrecision(0.03, 0, 0)
	l := r.Linearize(&p, Uncertainty{}, false)
	na := l.Residual[chem.Na]
	sd := math.Sqrt(na.Var())
	if math.Abs(na.Value-30) > 1e-9 || math.Abs(sd-math.Sqrt(9+2.1*2.1)) > 1e-9 {
		t.Errorf("Na* = %g ± %g, want 30 ± %g", na.Value, sd, math.Sqrt(9+2.1*2.1))
	}
	if rel := sd / na.Value; rel < 0.11 || rel > 0.13 {
		t.Errorf("relative 1σ of Na* %.3f, want about 0.12", rel)
	}
	// Na* and Mg* share the Cl error: their covariance is r_Na r_Mg σ_Cl².
	c[chem.Mg] = 50
	r, _ = Apply(c, nil)
	l = r.Linearize(&p, Uncertainty{}, false)
	want := rNa * rMg * math.Pow(0.03*c[chem.Cl], 2)
	if got := l.Residual[chem.Na].Cov(&l.Residual[chem.Mg]); math.Abs(got-want) > 1e-12 {
		t.Errorf("cov(Na*, Mg*) = %g, want %g", got, want)
	}
}

// TestLinearMatchesApply compares every gradient of Linearize with the
// change of Apply's results when that one input moves by a small step
// (the correction is piecewise linear, so the two agree away from its
// kinks), over random waters with and without Cl above Cl*, halite or
// human input, gypsum, sulfide and measured rain.
func TestLinearMatchesApply(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 5))
	p := UniformPrecision(0.03, 0.5, 0.001)
	u := Uncertainty{Ratios: 0.1, Factor: 0.15}
	for trial := range 300 {
		c := chem.NewComposition()
		for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Sr, chem.Alk} {
			c[s] = math.Exp(rng.Float64()*6 - 1)
		}
		opt := Options{Excess: Excess(trial % 2), Sulfate: Sulfate(trial % 3 % 2), Negative: Keep}
		scaleCl := false
		switch trial % 3 {
		case 0:
			opt.ClCritical = math.Inf(1)
		case 1:
			opt.ClCritical = c[chem.Cl] * (0.3 + rng.Float64())
		case 2:
			opt.Rain = &Rain{Composition: chem.NewComposition(), P: 1000, ET: 400}
			for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.SO4, chem.Sr, chem.Br} {
				opt.Rain.Composition[s] = rng.Float64() * 10
			}
			opt.Rain.Composition[chem.Cl] = c[chem.Cl] / 2.5 * (0.3 + rng.Float64())
			scaleCl = true
		}
		r, err := Apply(c, &opt)
		if err != nil {
			t.Fatal(err)
		}
		l := r.Linearize(&p, u, scaleCl)
		for i, src := range l.Sources {
			const h = 1e-4 // in units of the source's 1σ
			c2, o2 := c, opt
			k := Unit()
			switch src.Kind {
			case Measured:
				c2[src.Species] += h * src.Sigma
			case RainRatio:
				k.Ratios[src.Species] = 1 + h*src.Sigma
			case CriticalCl:
				k.ClCritical = 1 + h*src.Sigma
			}
			r2, err := Apply(c2, &o2)
			if err != nil {
				t.Fatal(err)
			}
			r2 = r2.Vary(&k)
			l2 := r2.Linearize(&p, Uncertainty{}, false) // values only
			check := func(name string, a, b *Affine) {
				t.Helper()
				got := a.Grad[i]
				want := (b.Value - a.Value) / h
				if math.Abs(got-want) > 1e-6*(1+math.Abs(want)+math.Abs(a.Value)) {
					t.Fatalf("trial %d, %s: d%s/d(%s) = %g, finite difference %g", trial, opt.Excess, name, src, got, want)
				}
			}
			for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Sr, chem.Alk} {
				check(s.Symbol()+"*", &l.Residual[s], &l2.Residual[s])
				if s != chem.Alk {
					if l.Atm[s].Grad != nil {
						check(s.Symbol()+"_atm", &l.Atm[s], &l2.Atm[s])
					}
				}
			}
			if l.Halite.Grad != nil {
				check("halite", &l.Halite, &l2.Halite)
			}
			if l.Gypsum.Grad != nil {
				check("gypsum", &l.Gypsum, &l2.Gypsum)
				check("SO4_sulf", &l.SO4Sulf, &l2.SO4Sulf)
			}
		}
		// Values agree with Apply's record (residuals before the policy).
		for _, s := range []chem.Species{chem.Na, chem.Ca, chem.Mg} {
			want := r.Input[s] - r.Atm[s] - r.Evap[s] - r.Human[s]
			if math.Abs(l.Residual[s].Value-want) > 1e-9*(1+math.Abs(want)) {
				t.Fatalf("trial %d: %s* %g, Apply %g", trial, s, l.Residual[s].Value, want)
			}
		}
	}
}
