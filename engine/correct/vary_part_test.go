package correct

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/internal/watchdog"
)

// varyRef is Vary as first written, a copy of the Result redone with the
// package's own steps. It is kept here, unchanged, as the reference the
// faster VaryInto and the single-part functions are checked against.
func varyRef(r *Result, k *Scale) Result {
	v := *r
	v.Warnings, v.Negatives, v.Rejected = nil, nil, false
	v.Atm, v.Evap, v.Human = chem.Composition{}, chem.Composition{}, chem.Composition{}
	for _, s := range corrected {
		v.Ratios[s] = r.Ratios[s] * k.Ratios[s]
	}
	v.ClCritical = r.ClCritical * k.ClCritical
	v.remove()
	v.splitSulfate()
	v.residuals()
	for s, x := range v.Residual {
		if !(x < 0) {
			continue
		}
		switch {
		case -x <= roundoff*v.Input[s] || v.policy == Zero:
			v.Residual[s] = 0
		case v.policy == Reject:
			v.Rejected = true
		}
	}
	return v
}

// bitsDiff names the first field in which two Results differ, bit for bit
// (NaN payloads and signed zeros included), or returns "".
func bitsDiff(got, want *Result) string {
	comps := []struct {
		name string
		a, b *chem.Composition
	}{{"Input", &got.Input, &want.Input}, {"Atm", &got.Atm, &want.Atm}, {"Evap", &got.Evap, &want.Evap},
		{"Human", &got.Human, &want.Human}, {"Residual", &got.Residual, &want.Residual}}
	for _, c := range comps {
		if d := compDiff(c.a, c.b); d != "" {
			return c.name + d
		}
	}
	for s := range got.Ratios {
		if math.Float64bits(got.Ratios[s]) != math.Float64bits(want.Ratios[s]) {
			return fmt.Sprintf("Ratios[%s]: %g, want %g", chem.Species(s), got.Ratios[s], want.Ratios[s])
		}
	}
	for _, f := range []struct {
		name string
		a, b float64
	}{{"ClCritical", got.ClCritical, want.ClCritical}, {"ClExcess", got.ClExcess, want.ClExcess}, {"F", got.F, want.F},
		{"SO4Star", got.SO4Star, want.SO4Star}, {"SO4Sulf", got.SO4Sulf, want.SO4Sulf}, {"FSulf", got.FSulf, want.FSulf}} {
		if math.Float64bits(f.a) != math.Float64bits(f.b) {
			return fmt.Sprintf("%s: %g, want %g", f.name, f.a, f.b)
		}
	}
	switch {
	case got.Rejected != want.Rejected:
		return fmt.Sprintf("Rejected: %v, want %v", got.Rejected, want.Rejected)
	case got.Warnings != nil || got.Negatives != nil:
		return fmt.Sprintf("Warnings %v, Negatives %v, want none", got.Warnings, got.Negatives)
	case got.excess != want.excess || got.policy != want.policy:
		return fmt.Sprintf("choices %v %v, want %v %v", got.excess, got.policy, want.excess, want.policy)
	}
	return ""
}

// compDiff names the first species in which a and b differ bit for bit.
func compDiff(a, b *chem.Composition) string {
	for s := range a {
		if math.Float64bits(a[s]) != math.Float64bits(b[s]) {
			return fmt.Sprintf("[%s]: %g (%#x), want %g (%#x)", chem.Species(s), a[s], math.Float64bits(a[s]), b[s], math.Float64bits(b[s]))
		}
	}
	return ""
}

// checkParts checks Vary, VaryInto (into a fresh Result, into one left
// over from another draw, and in place) and the single-part functions
// against varyRef for one correction and one draw.
func checkParts(t *testing.T, r *Result, k *Scale) {
	t.Helper()
	want := varyRef(r, k)
	v := r.Vary(k)
	if d := bitsDiff(&v, &want); d != "" {
		t.Errorf("Vary: %s", d)
	}
	used := Result{Warnings: []error{ErrHumanInput}, Negatives: []Deficit{{chem.K, -1}}, Rejected: true, excess: HumanInput, policy: Reject,
		SO4Star: -7, SO4Sulf: 3, FSulf: 0.5, ClExcess: 9, F: 2}
	for s := range used.Atm {
		used.Input[s], used.Atm[s], used.Evap[s], used.Human[s], used.Residual[s], used.Ratios[s] = 1, 2, 3, 4, -5, 6
	}
	into := used
	r.VaryInto(&into, k)
	if d := bitsDiff(&into, &want); d != "" {
		t.Errorf("VaryInto over a used Result: %s", d)
	}
	self := *r
	self.VaryInto(&self, k)
	if d := bitsDiff(&self, &want); d != "" {
		t.Errorf("VaryInto in place: %s", d)
	}
	res := used.Residual
	if rej := r.VaryResidual(k, &res); rej != want.Rejected {
		t.Errorf("VaryResidual rejected %v, want %v", rej, want.Rejected)
	}
	if d := compDiff(&res, &want.Residual); d != "" {
		t.Errorf("VaryResidual: Residual%s", d)
	}
	atm, evap := used.Atm, used.Evap
	r.VaryRemoved(k, &atm, &evap)
	if d := compDiff(&atm, &want.Atm); d != "" {
		t.Errorf("VaryRemoved: Atm%s", d)
	}
	if d := compDiff(&evap, &want.Evap); d != "" {
		t.Errorf("VaryRemoved: Evap%s", d)
	}
	if got := r.VarySO4Sulf(k); math.Float64bits(got) != math.Float64bits(want.SO4Sulf) {
		t.Errorf("VarySO4Sulf = %g, want %g", got, want.SO4Sulf)
	}
}

// applied runs Apply and keeps the Result whenever it is filled: a nil
// error or a rejection by the Reject policy.
func applied(c chem.Composition, opt *Options) (Result, bool) {
	r, err := Apply(c, opt)
	var ne *NegativeError
	return r, err == nil || errors.As(err, &ne)
}

// partScales are draws of the rain inputs for the table test: none, the
// log-normal spreads RainScales gives, and edge multipliers.
func partScales() []Scale {
	rng := rand.New(rand.NewPCG(7, 11))
	out := []Scale{Unit()}
	for range 20 {
		k := Unit()
		for _, s := range corrected {
			k.Ratios[s] = math.Exp(0.3 * rng.NormFloat64())
		}
		k.ClCritical = math.Exp(0.3 * rng.NormFloat64())
		out = append(out, k)
	}
	for _, x := range []float64{0, 1e-300, 3, 1e300, math.Inf(1), math.NaN()} {
		k := Unit()
		for _, s := range corrected {
			k.Ratios[s] = x
		}
		out = append(out, k)
		k = Unit()
		k.ClCritical = x
		out = append(out, k)
	}
	return out
}

// TestVaryParts checks VaryInto and the single-part functions against the
// reference Vary, bit for bit, under every choice a correction repeats:
// the three negative policies, excess chloride to halite or human input,
// Cl* finite or infinite, the three sulfate scenarios, a missing SO4, and
// samples whose residuals are rounding noise.
func TestVaryParts(t *testing.T) {
	river := sample(map[chem.Species]float64{chem.Na: 300, chem.K: 12, chem.Ca: 400, chem.Mg: 90, chem.Cl: 320,
		chem.SO4: 80, chem.Alk: 900, chem.Sr: 0.9, chem.Br: 0.4, chem.SiO2: 150})
	lowNa := sample(map[chem.Species]float64{chem.Na: 100, chem.K: 1, chem.Ca: 50, chem.Mg: 20, chem.Cl: 200, chem.SO4: 5})
	noSO4 := sample(map[chem.Species]float64{chem.Na: 300, chem.K: 12, chem.Ca: 400, chem.Mg: 90, chem.Cl: 320})
	// Diluted seawater (Millero et al. 2008 reference composition): every
	// residual of the corrected species is zero up to rounding.
	sea := chem.NewComposition()
	for s, m := range SeawaterMolality {
		if m > 0 {
			sea[s] = m * 1e3 / 7
		}
	}
	rain := &Rain{Composition: sample(map[chem.Species]float64{chem.Na: 17, chem.Cl: 20, chem.K: 0.5, chem.Ca: 1, chem.Mg: 2, chem.SO4: 3}),
		P: 1000, ET: 600}
	waters := []struct {
		name string
		c    chem.Composition
	}{{"river", river}, {"low Na", lowNa}, {"no SO4", noSO4}, {"seawater", sea}}
	atmospheres := []struct {
		name string
		opt  Options
	}{
		{"sea salt, Cl* infinite", Options{ClCritical: math.Inf(1)}},
		{"sea salt, Cl* 150", Options{ClCritical: 150}},
		{"measured rain", Options{Rain: rain}},
	}
	sulfates := []struct {
		name string
		s    Sulfate
	}{{"gypsum", Gypsum}, {"sulfide", Sulfide}, {"isotope", Isotope}}
	scales := partScales()
	n := 0
	for _, w := range waters {
		for _, a := range atmospheres {
			for _, ex := range []Excess{Halite, HumanInput} {
				for _, su := range sulfates {
					for _, pol := range []Negative{Zero, Keep, Reject} {
						opt := a.opt
						opt.Excess, opt.Sulfate, opt.Negative = ex, su.s, pol
						opt.Delta34S = Delta34S{River: 5, Evaporite: 15, Sulfide: -10}
						name := fmt.Sprintf("%s/%s/%s/%s/%s", w.name, a.name, ex, su.name, pol)
						t.Run(name, func(t *testing.T) {
							r, ok := applied(w.c, &opt)
							if !ok {
								t.Fatal("Apply failed")
							}
							for _, k := range scales {
								checkParts(t, &r, &k)
							}
						})
						n++
					}
				}
			}
		}
	}
	if n != 4*3*2*3*3 {
		t.Errorf("%d cases run", n)
	}
}

// TestVaryPartsReachEdges checks that the table of TestVaryParts reaches
// the edges it names: a rejected draw, a residual kept negative, a
// rounding residual set to zero, excess chloride to each place.
func TestVaryPartsReachEdges(t *testing.T) {
	lowNa := sample(map[chem.Species]float64{chem.Na: 100, chem.K: 1, chem.Ca: 50, chem.Mg: 20, chem.Cl: 200, chem.SO4: 5})
	k := Unit()
	for _, tc := range []struct {
		name string
		opt  Options
		ok   func(v *Result) bool
	}{
		{"rejected", Options{Negative: Reject}, func(v *Result) bool { return v.Rejected }},
		{"kept negative", Options{Negative: Keep}, func(v *Result) bool { return v.Residual[chem.Na] < 0 }},
		{"halite", Options{ClCritical: 150}, func(v *Result) bool { return v.Evap[chem.Cl] == 50 && v.Human[chem.Cl] == 0 }},
		{"human", Options{ClCritical: 150, Excess: HumanInput}, func(v *Result) bool { return v.Human[chem.Na] == 50 && v.Evap[chem.Na] == 0 }},
	} {
		r, ok := applied(lowNa, &tc.opt)
		if !ok {
			t.Fatalf("%s: Apply failed", tc.name)
		}
		if v := r.Vary(&k); !tc.ok(&v) {
			t.Errorf("%s: not reached: %+v", tc.name, v)
		}
	}
	// Seawater: Na* = Na − Cl × Na/Cl is rounding noise, set to exactly 0.
	sea := chem.NewComposition()
	for s, m := range SeawaterMolality {
		if m > 0 {
			sea[s] = m * 1e3 / 7
		}
	}
	r, _ := applied(sea, &Options{Negative: Keep})
	noise := false
	for _, s := range corrected {
		x := sea[s] - sea[chem.Cl]*SeaSalt()[s]
		noise = noise || x < 0
		if v := r.Vary(&k); v.Residual[s] != 0 {
			t.Errorf("seawater %s* = %g, want 0", s, v.Residual[s])
		}
	}
	if !noise {
		t.Error("no seawater residual falls below zero by rounding; the roundoff case is not reached")
	}
}

// TestVaryPartsSpecies checks that the species VaryResidual writes out
// are still the ones the correction changes.
func TestVaryPartsSpecies(t *testing.T) {
	want := [...]chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.SO4, chem.Sr, chem.Br}
	if corrected != want {
		t.Errorf("corrected species %v; VaryResidual handles %v: update it", corrected, want)
	}
}

// FuzzVaryParts checks VaryInto and the single-part functions against the
// reference Vary, bit for bit, on arbitrary samples, options and draws.
func FuzzVaryParts(f *testing.F) {
	f.Add(320.0, 300.0, 12.0, 400.0, 90.0, 80.0, 0.9, 150.0, uint8(0), 1.1, 0.9, 1.2, 0.8)
	f.Add(200.0, 100.0, 1.0, 50.0, 20.0, 5.0, 0.0, 0.0, uint8(0x15), 1.5, 1.0, 1.0, 1.3)
	f.Add(565.7647, 486.0597, 10.5797, 10.6568, 54.7421, 29.2643, 0.094, math.Inf(1), uint8(0x0a), 1.0, 1.0, 1.0, 1.0)
	f.Add(80.0, 200.0, 20.0, 100.0, 40.0, math.NaN(), 0.0, 50.0, uint8(0x2b), 0.0, math.Inf(1), 1e300, math.NaN())
	f.Fuzz(func(t *testing.T, cl, na, kk, ca, mg, so4, sr, clStar float64, mode uint8, kNa, kCa, kSO4, kCl float64) {
		defer watchdog.Start([]any{cl, na, kk, ca, mg, so4, sr, clStar, mode, kNa, kCa, kSO4, kCl})()
		c := chem.NewComposition()
		c[chem.Cl], c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.SO4], c[chem.Sr] = cl, na, kk, ca, mg, so4, sr
		opt := &Options{
			ClCritical: clStar,
			Excess:     Excess(mode & 1),
			Sulfate:    Sulfate((mode >> 1) % 3),
			Negative:   Negative((mode >> 3) % 3),
			Delta34S:   Delta34S{River: float64(mode >> 5), Evaporite: 20, Sulfide: -10},
		}
		r, ok := applied(c, opt)
		if !ok {
			return
		}
		k := Unit()
		k.Ratios[chem.Na], k.Ratios[chem.Ca], k.Ratios[chem.SO4], k.ClCritical = kNa, kCa, kSO4, kCl
		k.Ratios[chem.K], k.Ratios[chem.Mg] = kCa, kNa
		checkParts(t, &r, &k)
	})
}
