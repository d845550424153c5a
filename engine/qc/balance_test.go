package qc

import (
	"math"
	"testing"

	"lixiv/engine/chem"
)

func comp(kv map[chem.Species]float64) chem.Composition {
	c := chem.NewComposition()
	for k, v := range kv {
		c[k] = v
	}
	return c
}

// Reference Composition of seawater, Millero, Feistel, Wright & McDougall
// (2008), Deep-Sea Research I 55, 50-72, molalities x 1e6 (µmol/kg taken as
// µmol/L); docs/methods.md §4.2.
var seawater = map[chem.Species]float64{
	chem.Na: 486059.7, chem.Mg: 54742.1, chem.Ca: 10656.8, chem.K: 10579.7, chem.Sr: 94.0,
	chem.Cl: 565764.7, chem.SO4: 29264.3, chem.Br: 872.8, chem.F: 70.8,
}

const (
	swHCO3 = 1780.3 // µmol/kg, Millero et al. 2008
	swCO3  = 247.7
	swBOH4 = 104.5
	swOH   = 8.2
)

func TestChargeBalanceSeawater(t *testing.T) {
	t.Run("full composition", func(t *testing.T) {
		// All 13 ions: the carbonate, borate and hydroxide charge enters as
		// total alkalinity = HCO3 + 2CO3 + B(OH)4 + OH. docs/methods.md §13 item 3:
		// NICB = -1.6e-5 % (≈ 0, tolerance ±0.01 %).
		kv := map[chem.Species]float64{chem.Alk: swHCO3 + 2*swCO3 + swBOH4 + swOH}
		for k, v := range seawater {
			kv[k] = v
		}
		b := ChargeBalance(comp(kv), math.NaN(), math.NaN())
		if math.Abs(b.NICB) > 0.01 {
			t.Errorf("NICB = %.6f %%, want 0 ± 0.01 %%", b.NICB)
		}
		if math.Abs(b.NICB-(-1.6e-5)) > 1e-6 {
			t.Errorf("NICB = %.4g %%, want -1.6e-5 %% (docs/methods.md §13 item 3)", b.NICB)
		}
	})
	t.Run("major seven", func(t *testing.T) {
		// Only Na, K, Ca, Mg, Cl, SO4, HCO3: NICB +0.2173 %, CBE +0.1088 %
		// (docs/methods.md §13 item 3; tolerance 1e-3 %).
		kv := map[chem.Species]float64{chem.HCO3: swHCO3}
		for _, k := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4} {
			kv[k] = seawater[k]
		}
		b := ChargeBalance(comp(kv), math.NaN(), math.NaN())
		if math.Abs(b.NICB-0.2173) > 1e-3 || math.Abs(b.CBE-0.1088) > 1e-3 {
			t.Errorf("NICB %.4f %%, CBE %.4f %%; want +0.2173, +0.1088 (±1e-3)", b.NICB, b.CBE)
		}
	})
}

func TestChargeBalanceWorked(t *testing.T) {
	// docs/methods.md §13 item 4: TZ+ 610, TZ- 590 µeq/L, NICB +3.2787 %, CBE +1.6667 %.
	c := comp(map[chem.Species]float64{chem.Na: 100, chem.K: 10, chem.Ca: 200, chem.Mg: 50,
		chem.Cl: 50, chem.SO4: 40, chem.NO3: 10, chem.Alk: 450})
	tests := []struct {
		name string
		pH   float64
	}{{"no pH", math.NaN()}, {"pH 7.5 (H+ is inside the alkalinity, not added)", 7.5}}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			b := ChargeBalance(c, tc.pH, math.NaN())
			if b.TZPlus != 610 || b.TZMinus != 590 {
				t.Errorf("TZ+ %v, TZ- %v; want 610, 590 µeq/L", b.TZPlus, b.TZMinus)
			}
			if math.Abs(b.NICB-3.2787) > 1e-4 || math.Abs(b.CBE-1.6667) > 1e-4 {
				t.Errorf("NICB %.4f, CBE %.4f; want 3.2787, 1.6667 (±1e-4)", b.NICB, b.CBE)
			}
			if len(b.Cations) != 4 || len(b.Anions) != 4 {
				t.Errorf("used %v and %v; want 4 cations and 4 anions", b.Cations, b.Anions)
			}
		})
	}
}

func TestChargeBalanceAcidWater(t *testing.T) {
	// Without alkalinity, H+ from pH enters TZ+: pH 4 is 100 µmol/L H+.
	c := comp(map[chem.Species]float64{chem.Na: 50, chem.Cl: 50, chem.SO4: 50})
	b := ChargeBalance(c, 4, 10)
	if math.Abs(b.H-100) > 1e-9 || math.Abs(b.TZPlus-150) > 1e-9 || math.Abs(b.NICB) > 1e-9 {
		t.Errorf("H %v, TZ+ %v, NICB %v; want 100, 150, 0", b.H, b.TZPlus, b.NICB)
	}
	// No ions: NaN, not 0.
	if b := ChargeBalance(chem.NewComposition(), 7, 10); !math.IsNaN(b.NICB) || !math.IsNaN(b.CBE) {
		t.Errorf("empty composition gave NICB %v, CBE %v; want NaN", b.NICB, b.CBE)
	}
}

func TestCarbonateConstants(t *testing.T) {
	// Plummer & Busenberg (1982); docs/methods.md §13 item 12, tolerance 5e-4:
	// pK2 10.3289 at 25 °C and 10.6286 at 0 °C; log Kw -13.9947 at 25 °C.
	tests := []struct {
		name      string
		got, want float64
	}{
		{"pK2 25 °C", -math.Log10(K2(25)), 10.3289},
		{"pK2 0 °C", -math.Log10(K2(0)), 10.6286},
		{"log Kw 25 °C", math.Log10(Kw(25)), -13.9947},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > 5e-4 {
			t.Errorf("%s = %.4f, want %.4f (±5e-4)", tc.name, tc.got, tc.want)
		}
	}
}

func TestSplitAlkalinity(t *testing.T) {
	// docs/methods.md §13 item 13: Alk 2.000 meq/L, pH 8.00, 25 °C, γ = 1 ->
	// HCO3 1.98042 mmol/L, CO3 9.2876 µmol/L (tolerance 1e-4 relative).
	hco3, co3 := SplitAlkalinity(2000, 8, 25)
	if math.Abs(hco3-1980.42)/1980.42 > 1e-4 || math.Abs(co3-9.2876)/9.2876 > 1e-4 {
		t.Errorf("HCO3 %.3f, CO3 %.4f µmol/L; want 1980.42, 9.2876", hco3, co3)
	}
	// The split keeps the charge: HCO3 + 2CO3 + OH - H = Alk.
	oh := Kw(25) / 1e-8 * 1e6
	if got := hco3 + 2*co3 + oh - 0.01; math.Abs(got-2000) > 1e-9 {
		t.Errorf("charge of the split = %v µeq/L, want 2000", got)
	}
	// Through ChargeBalance: the split is reported, TZ- is unchanged.
	b := ChargeBalance(comp(map[chem.Species]float64{chem.Ca: 1000, chem.Alk: 2000}), 8, 25)
	if math.Abs(b.HCO3-hco3) > 1e-9 || math.Abs(b.CO3-co3) > 1e-9 || b.TZMinus != 2000 || b.NICB != 0 {
		t.Errorf("balance %+v", b)
	}
	if h, c := SplitAlkalinity(-40, 4.5, 10); h != 0 || c != 0 {
		t.Errorf("acid water split %v %v, want 0 0", h, c)
	}
}
