package co2

import (
	"errors"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

// chain runs the per-sample pipeline: correct, mix.Forward, Consumption.
func chain(t testing.TB, c chem.Composition, copt *correct.Options, fopt *mix.ForwardOptions, opt *Options) (Result, mix.ForwardResult) {
	t.Helper()
	cr, err := correct.Apply(c, copt)
	if err != nil {
		t.Fatal(err)
	}
	fr, err := mix.Forward(&cr, fopt)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Consumption(&fr.Split, cr.SO4Sulf, opt)
	if err != nil {
		t.Fatal(err)
	}
	return r, fr
}

// water returns a composition with the majors at zero (measured, none
// present) and the given values.
func water(kv map[chem.Species]float64) chem.Composition {
	c := chem.NewComposition()
	for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Alk, chem.SiO2} {
		c[s] = 0
	}
	for s, v := range kv {
		c[s] = v
	}
	return c
}

// zeroSil is a silicate end-member without Ca and Mg, for Na and K
// feldspar waters.
var zeroSil = &mix.SilicateRatios{KNa: mix.SilicateRatio{Value: math.NaN()}}

// fromReaction builds the water that xi µmol/L of a §9.1 reaction leaves
// (dissolved products; solids and water ignored) and the CO2 it consumed
// (reactant CO2 minus product CO2, µmol/L).
func fromReaction(t *testing.T, eq string, xi float64) (chem.Composition, float64) {
	t.Helper()
	lhs, rhs, _ := strings.Cut(eq, " -> ")
	ion := map[string]chem.Species{
		"Na+": chem.Na, "K+": chem.K, "Ca+2": chem.Ca, "Mg+2": chem.Mg,
		"SO4-2": chem.SO4, "HCO3-": chem.Alk, "H4SiO4": chem.SiO2,
	}
	c := water(nil)
	co2 := 0.0
	for sign, s := range map[float64]string{-1: lhs, +1: rhs} {
		terms, err := side(s)
		if err != nil {
			t.Fatal(err)
		}
		for _, tm := range terms {
			if tm.formula == "CO2" {
				co2 -= sign * tm.coef * xi
			}
			if sp, ok := ion[tm.formula]; ok && sign > 0 {
				c[sp] += tm.coef * xi
			}
		}
	}
	return c, co2
}

func TestReactionWaters(t *testing.T) {
	// Water made by each weathering reaction of the docs/methods.md §9.1,
	// apportioned by the forward model: the short-term consumption
	// phi_total equals the CO2 the reaction consumed, and the geological
	// figure net_long follows §9.3 (0 for calcite and carbonic acid, ½ Alk
	// for Na silicate, 0 for silicate and sulfuric acid, −1 per SO4_sulf for
	// carbonate and sulfuric acid). Anorthite, forsterite and wollastonite
	// release Ca or Mg without Na, which the Na-normalised model books as
	// carbonate (§12), so they are left out here.
	tests := []struct {
		reaction string
		xi       float64
		sulfate  correct.Sulfate
		phiSil   float64
		phiCarb  float64
		netLong  float64
		sinkSil  float64
	}{
		{"calcite", 1000, correct.Gypsum, 0, 1000, 0, 0},
		{"dolomite", 250, correct.Gypsum, 0, 500, 0, 0},
		{"albite to kaolinite", 50, correct.Gypsum, 100, 0, 50, 0},
		{"K-feldspar to kaolinite", 50, correct.Gypsum, 100, 0, 50, 0},
		{"pyrite with calcite", 62.5, correct.Sulfide, 0, 0, -500, 0},
		{"calcite by sulfuric acid, buffered", 500, correct.Sulfide, 0, 0, -500, 0},
		{"calcite by excess sulfuric acid", 1000, correct.Sulfide, 0, -1000, -1000, 0},
		{"albite by sulfuric acid", 50, correct.Sulfide, 0, 0, 0, 0},
	}
	eqs := map[string]string{}
	for _, r := range reactions {
		eqs[r.name] = r.equation
	}
	for _, tc := range tests {
		t.Run(tc.reaction, func(t *testing.T) {
			eq, ok := eqs[tc.reaction]
			if !ok {
				t.Fatalf("no reaction %q", tc.reaction)
			}
			c, consumed := fromReaction(t, eq, tc.xi)
			r, _ := chain(t, c, &correct.Options{Sulfate: tc.sulfate}, &mix.ForwardOptions{Silicate: zeroSil}, nil)
			const tol = 1e-9
			if math.Abs(r.PhiTotal-consumed) > tol {
				t.Errorf("phi_total: got %g, want the reaction's CO2 %g", r.PhiTotal, consumed)
			}
			got := []float64{r.PhiSil, r.PhiCarb, r.NetLong, r.SinkSil}
			want := []float64{tc.phiSil, tc.phiCarb, tc.netLong, tc.sinkSil}
			for i, name := range []string{"phi_sil", "phi_carb", "net_long", "sink_sil"} {
				if math.Abs(got[i]-want[i]) > tol {
					t.Errorf("%s: got %g, want %g", name, got[i], want[i])
				}
			}
			// The alkalinity the accounting assigns equals the measured one.
			if math.Abs(r.AlkSil+r.AlkCarb-c[chem.Alk]) > tol {
				t.Errorf("Alk_sil + Alk_carb = %g, want measured Alk %g", r.AlkSil+r.AlkCarb, c[chem.Alk])
			}
		})
	}
}

func TestCheckValues(t *testing.T) {
	// docs/methods.md §13 items 6, 7, 8 and 14 (computed with python3 from the
	// constants of §2), through the whole per-sample chain.
	mixed := chem.NewComposition()
	mixed[chem.Na], mixed[chem.K], mixed[chem.Ca], mixed[chem.Mg] = 125.7736, 20.56099, 435.56508, 106.90273
	mixed[chem.Cl], mixed[chem.SO4] = 30, 1.551756
	tests := []struct {
		name                       string
		c                          chem.Composition
		sulfate                    correct.Sulfate
		sil                        *mix.SilicateRatios
		phiSil, phiCarb, netLong   float64
		sinkSil                    float64
		tol                        float64
		wantDeficit, wantReleaseOn bool
	}{
		// Item 6: Ca 1000, Alk 2000 -> phi_carb 1000, phi_sil 0, net_long 0.
		{"6 pure calcite", water(map[chem.Species]float64{chem.Ca: 1000, chem.Alk: 2000}), correct.Gypsum, nil, 0, 1000, 0, 0, 1e-9, false, false},
		// Item 7: Na 100, Alk 100, SiO2 200, zero silicate Ca/Na and Mg/Na ->
		// phi_sil 100, phi_carb 0, sink 0, net_long 50.
		{"7 albite, zero ratios", water(map[chem.Species]float64{chem.Na: 100, chem.Alk: 100, chem.SiO2: 200}), correct.Gypsum, zeroSil, 100, 0, 50, 0, 1e-9, false, false},
		// Item 7, second part (corrected): the default (Ca/Na)_sil 0.35
		// would give silicate Ca and Mg above the measured Ca* = Mg* = 0;
		// they are capped there (never invented), so phi_sil stays 100,
		// net_long 50 and the conventional sink 0, with a warning.
		{"7 albite, default ratios", water(map[chem.Species]float64{chem.Na: 100, chem.Alk: 100, chem.SiO2: 200}), correct.Gypsum, nil, 100, 0, 50, 0, 1e-9, true, false},
		// Item 8: phi_sil 238, phi_carb 480 (tolerance 1e-4 as docs/methods.md §13 gives it).
		{"8 mixed sample", mixed, correct.Gypsum, nil, 238, 480, 238 + 480 - (238+960)/2.0, 59, 1e-4, false, false},
		// Item 14: Ca 1000, SO4 500 (sulfide), Alk 1000 -> phi 0, net_long −500.
		{"14 sulfuric acid", water(map[chem.Species]float64{chem.Ca: 1000, chem.SO4: 500, chem.Alk: 1000}), correct.Sulfide, nil, 0, 0, -500, 0, 1e-9, false, false},
		// Item 14, excess acid: Ca 1000, SO4 1000, Alk 0 -> phi_carb −1000.
		{"14 excess acid", water(map[chem.Species]float64{chem.Ca: 1000, chem.SO4: 1000}), correct.Sulfide, nil, 0, -1000, -1000, 0, 1e-9, false, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, fr := chain(t, tc.c, &correct.Options{Sulfate: tc.sulfate}, &mix.ForwardOptions{Silicate: tc.sil}, nil)
			got := []float64{r.PhiSil, r.PhiCarb, r.NetLong, r.SinkSil}
			want := []float64{tc.phiSil, tc.phiCarb, tc.netLong, tc.sinkSil}
			for i, name := range []string{"phi_sil", "phi_carb", "net_long", "sink_sil"} {
				if math.Abs(got[i]-want[i]) > tc.tol {
					t.Errorf("%s: got %.6f, want %g (tolerance %g)", name, got[i], want[i], tc.tol)
				}
			}
			if got := hasErr(fr.Warnings, mix.ErrSilicateCapped); got != tc.wantDeficit {
				t.Errorf("silicate-capped warning: got %v, want %v", got, tc.wantDeficit)
			}
			if got := hasErr(r.Warnings, ErrRelease); got != tc.wantReleaseOn {
				t.Errorf("CO2-release warning: got %v, want %v", got, tc.wantReleaseOn)
			}
		})
	}
}

func TestDilutedSeawaterNoCO2(t *testing.T) {
	// docs/methods.md §13 item 2: diluted Millero et al. (2008) seawater is
	// all atmospheric, so no CO2 is consumed, at any dilution.
	sea := chem.NewComposition()
	sea[chem.Na], sea[chem.Mg], sea[chem.Ca], sea[chem.K] = 486.0597, 54.7421, 10.6568, 10.5797
	sea[chem.Sr], sea[chem.Cl], sea[chem.SO4] = 0.0940, 565.7647, 29.2643
	for _, f := range []float64{1, 0.1, 1e-3, 1.0 / 35000} {
		for _, s := range []correct.Sulfate{correct.Gypsum, correct.Sulfide} {
			r, fr := chain(t, sea.Scale(f), &correct.Options{Sulfate: s}, nil, nil)
			for _, v := range []float64{r.PhiSil, r.PhiCarb, r.PhiTotal, r.NetLong, r.SinkSil} {
				if math.Abs(v) >= 1e-6 {
					t.Errorf("dilution %g, %s: CO2 figures %+v, want all 0 (|x| < 1e-6)", f, s, r)
					break
				}
			}
			for i := range mix.Cations {
				if math.Abs(fr.Split[mix.Silicate][i])+math.Abs(fr.Split[mix.Carbonate][i]) >= 1e-6 {
					t.Errorf("dilution %g, %s: %s silicate %g, carbonate %g; want 0", f, s, mix.Cations[i], fr.Split[mix.Silicate][i], fr.Split[mix.Carbonate][i])
				}
			}
		}
	}
}

func TestSulfurSplit(t *testing.T) {
	// docs/methods.md §9.3: S shared in proportion to cation equivalents, or
	// all to carbonate; phi_total does not depend on the split. Silicate
	// equivalents 100 + 0 + 2(20 + 10) = 160, carbonate 2(300 + 100) = 800,
	// SO4_sulf 96 -> S_carb = 96 × 800/960 = 80, S_sil = 16.
	var s mix.Split
	s[mix.Silicate] = [mix.NCations]float64{100, 0, 20, 10}
	s[mix.Carbonate] = [mix.NCations]float64{0, 0, 300, 100}
	tests := []struct {
		split                     SulfurSplit
		sSil, sCarb               float64
		alkSil, alkCarb           float64
		phiSil, phiCarb, phiTotal float64
		sinkSil                   float64
	}{
		{Proportional, 16, 80, 128, 640, 128, 240, 368, 24},
		{AllCarbonate, 0, 96, 160, 608, 160, 208, 368, 30},
	}
	for _, tc := range tests {
		t.Run(tc.split.String(), func(t *testing.T) {
			r, err := Consumption(&s, 96, &Options{Sulfur: tc.split})
			if err != nil {
				t.Fatal(err)
			}
			got := []float64{r.SSil, r.SCarb, r.AlkSil, r.AlkCarb, r.PhiSil, r.PhiCarb, r.PhiTotal}
			want := []float64{tc.sSil, tc.sCarb, tc.alkSil, tc.alkCarb, tc.phiSil, tc.phiCarb, tc.phiTotal}
			for i, name := range []string{"S_sil", "S_carb", "Alk_sil", "Alk_carb", "phi_sil", "phi_carb", "phi_total"} {
				if math.Abs(got[i]-want[i]) > 1e-9 {
					t.Errorf("%s: got %g, want %g", name, got[i], want[i])
				}
			}
			// net_long = phi_total − (Alk_sil + Alk_carb)/2 = 368 − 384 = −16,
			// of which Alk_sil/2 silicate and −S_carb carbonate. The
			// conventional sink (Ca+Mg)_sil = 30 loses the Ca+Mg share of
			// S_sil, 16 × 60/160 = 6 (Result.SinkSil).
			if math.Abs(r.NetLong-(-16)) > 1e-9 || math.Abs(r.SinkSil-tc.sinkSil) > 1e-9 ||
				math.Abs(r.NetLongSil-tc.alkSil/2) > 1e-9 || math.Abs(r.NetLongCarb+tc.sCarb) > 1e-9 {
				t.Errorf("net_long %g (silicate %g, carbonate %g), sink %g; want −16 (%g, %g), %g",
					r.NetLong, r.NetLongSil, r.NetLongCarb, r.SinkSil, tc.alkSil/2, -tc.sCarb, tc.sinkSil)
			}
		})
	}
}

func TestLongTermSilicateSink(t *testing.T) {
	// Silicate waters made by the reactions of the docs/methods.md §9.1, their
	// cations booked to silicate and their sulfate to sulfide oxidation.
	// Short term phi_sil is the CO2 the reaction consumed. Long term
	// (§9.2-9.3): carbonic-acid weathering of a Ca or Mg silicate is a sink
	// of one CO2 per Ca or Mg (the Urey reaction, Berner, Lasaga & Garrels
	// 1983, from memory) in both conventions; Na and K count ½ per ion in
	// the alkalinity-based one and 0 in the conventional one; silicate
	// weathering by H2SO4 consumes no CO2 in either.
	eqs := map[string]string{}
	for _, r := range reactions {
		eqs[r.name] = r.equation
	}
	type part struct {
		reaction string
		xi       float64
	}
	tests := []struct {
		name             string
		parts            []part
		sink, netLongSil float64
	}{
		{"wollastonite", []part{{"wollastonite", 100}}, 100, 100},
		{"anorthite", []part{{"anorthite to kaolinite", 100}}, 100, 100},
		{"forsterite", []part{{"forsterite", 50}}, 100, 100},
		{"albite", []part{{"albite to kaolinite", 50}}, 0, 50},
		{"wollastonite by H2SO4", []part{{"wollastonite by sulfuric acid", 100}}, 0, 0},
		{"anorthite by H2SO4", []part{{"anorthite by sulfuric acid", 100}}, 0, 0},
		{"albite by H2SO4", []part{{"albite by sulfuric acid", 50}}, 0, 0},
		// Ca 150 of which 50 came with sulfuric acid: S_sil = 50 comes off
		// the conventional sink, leaving the carbonic-acid 100.
		{"wollastonite, both acids", []part{{"wollastonite", 100}, {"wollastonite by sulfuric acid", 50}}, 100, 100},
		{"anorthite, both acids", []part{{"anorthite to kaolinite", 30}, {"anorthite by sulfuric acid", 70}}, 30, 30},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var s mix.Split
			consumed, so4 := 0.0, 0.0
			for _, p := range tc.parts {
				c, co2 := fromReaction(t, eqs[p.reaction], p.xi)
				for i, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg} {
					s[mix.Silicate][i] += c[sp]
				}
				consumed, so4 = consumed+co2, so4+c[chem.SO4]
			}
			r, err := Consumption(&s, so4, nil)
			if err != nil {
				t.Fatal(err)
			}
			const tol = 1e-9
			if math.Abs(r.PhiSil-consumed) > tol || math.Abs(r.SinkSil-tc.sink) > tol || math.Abs(r.NetLongSil-tc.netLongSil) > tol {
				t.Errorf("phi_sil %g, conventional sink %g, alkalinity-based %g; want %g, %g, %g",
					r.PhiSil, r.SinkSil, r.NetLongSil, consumed, tc.sink, tc.netLongSil)
			}
			if r.SinkSil > r.NetLongSil+tol || r.NetLongCarb != 0 {
				t.Errorf("conventional sink %g above the alkalinity-based %g, or carbonate part %g", r.SinkSil, r.NetLongSil, r.NetLongCarb)
			}
		})
	}
}

func TestConsumptionErrors(t *testing.T) {
	var s mix.Split
	tests := []struct {
		name string
		s    *mix.Split
		so4  float64
		opt  *Options
	}{
		{"nil split", nil, 0, nil},
		{"negative SO4_sulf", &s, -1, nil},
		{"NaN SO4_sulf", &s, math.NaN(), nil},
		{"unknown split", &s, 0, &Options{Sulfur: 5}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := Consumption(tc.s, tc.so4, tc.opt); !errors.Is(err, ErrInput) {
				t.Errorf("got %v, want ErrInput", err)
			}
		})
	}
	t.Run("acid beyond the cations is warned", func(t *testing.T) {
		s := s
		s[mix.Carbonate][2] = 100
		r, err := Consumption(&s, 150, nil)
		if err != nil || !hasErr(r.Warnings, ErrInput) {
			t.Errorf("got err %v, warnings %v; want a warning wrapping ErrInput", err, r.Warnings)
		}
	})
}

func TestTonnes(t *testing.T) {
	// docs/methods.md §13 item 9: 6.00445e4 mol/km²/yr of CO2 = 2.64250 t
	// CO2/km²/yr = 0.721195 t C/km²/yr (12.011 and 44.009 g/mol, CIAAW 2021);
	// tolerance 1e-5 relative.
	tests := []struct {
		name      string
		got, want float64
	}{
		{"t CO2", TonnesCO2(6.00445e4), 2.64250},
		{"t C", TonnesC(6.00445e4), 0.721195},
		{"1 mol as C", TonnesC(1e6), 12.011},
		{"1 mol as CO2", TonnesCO2(1e6), 44.009},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want)/tc.want > 1e-5 {
			t.Errorf("%s: got %.7g, want %.7g (tolerance 1e-5 relative)", tc.name, tc.got, tc.want)
		}
	}
}

func hasErr(ws []error, target error) bool {
	for _, w := range ws {
		if errors.Is(w, target) {
			return true
		}
	}
	return false
}

func TestConsumptionMissingCation(t *testing.T) {
	// A cation not measured (NaN) gives NaN figures with a warning, never
	// a silent zero (issue 3, bad input rule).
	var s mix.Split
	s[mix.Silicate] = [mix.NCations]float64{100, math.NaN(), 35, 24}
	r, err := Consumption(&s, 0, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsNaN(r.PhiSil) || !hasErr(r.Warnings, ErrInput) {
		t.Errorf("phi_sil %g, warnings %v; want NaN and a warning", r.PhiSil, r.Warnings)
	}
	if r.SinkSil != 59 {
		t.Errorf("sink: got %g, want 59 (Ca and Mg are present)", r.SinkSil)
	}
}
