package notebook

import (
	"context"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// TestAtmosphereRatios checks the atmosphere cell's ratios table on the
// first demo sample against a hand computation.
func TestAtmosphereRatios(t *testing.T) {
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	for range d.Cells { // the atmosphere cell comes early in compute order
		if d.Output("rain") != nil {
			break
		}
		if _, err := d.Step(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	o := d.Output("rain")
	if o == nil {
		st, err := d.Status("rain")
		t.Fatalf("atmosphere cell: %v %v", st, err)
	}
	rt := o.Table("ratios")
	if rt == nil {
		t.Fatal("no ratios table")
	}
	if got := rt.Column("sample").Text[0]; got != "CV-001" {
		t.Fatalf("first sample %q, want CV-001", got)
	}
	if got := rt.Column("date").Text[0]; got != "2020-10-04" {
		t.Errorf("date %q, want 2020-10-04", got)
	}
	// Hand computation for CV-001 (examples/corrie-vale): Na 3.86, K 0.294,
	// Ca 1.178, Mg 0.56, Cl 4.822, SO4 0.675 mg/L, Alk 123.5 µeq/L. Atomic
	// weights (IUPAC standard atomic weights, from memory): Na 22.98976928,
	// K 39.0983, Ca 40.078, Mg 24.305, Cl 35.45, S 32.06, O 15.999. All Cl is
	// atmospheric (no critical chloride); X_atm = Cl × (X/Cl) with the cell's
	// seawater ratios (Millero et al. 2008, as typed in the cell): Na 0.85912,
	// K 0.0186998, Ca 0.0188361, Mg 0.0967577, SO4 0.0517252. SO4* =
	// 7.02715 − 0.0517252 × 136.02257 < 0, so no gypsum Ca is removed.
	cl := 4822 / 35.45
	na := 3860/22.98976928 - 0.85912*cl // Na* = 51.0411 µmol/L
	want := map[string]float64{
		"Ca/Na":   (1178/40.078 - 0.0188361*cl) / na, // 0.525666
		"Mg/Na":   (560/24.305 - 0.0967577*cl) / na,  // 0.193556
		"HCO3/Na": 123.5 / na,                        // 2.41962, alkalinity for HCO3
		"K/Na":    (294/39.0983 - 0.0186998*cl) / na, // 0.0974884
	}
	for name, w := range want {
		t.Run(name, func(t *testing.T) {
			c := rt.Column(name)
			if c == nil || c.Unit != "mol/mol" {
				t.Fatalf("column %s: %+v, want one in mol/mol", name, c)
			}
			if got := c.Num[0]; math.Abs(got-w) > 1e-9*w {
				t.Errorf("%s = %.9g, want %.9g (relative tolerance 1e-9)", name, got, w)
			}
		})
	}
}

// TestRatioTableBlank checks that a sample whose Na* is not positive gets
// NaN ratios and is counted.
func TestRatioTableBlank(t *testing.T) {
	var rs [3]correct.Result
	for i, na := range []float64{10, 0, -2} {
		rs[i].Residual[chem.Na] = na
		rs[i].Residual[chem.Ca] = 5
		rs[i].Residual[chem.HCO3] = math.NaN()
		rs[i].Residual[chem.Alk] = 40
	}
	tb, blank := ratioTable([]string{"a", "b", "c"}, []string{"", "", ""}, rs[:])
	if blank != 2 {
		t.Errorf("blank = %d, want 2", blank)
	}
	tests := []struct {
		col  string
		row  int
		want float64 // NaN: blank
	}{
		{"Ca/Na", 0, 0.5}, {"HCO3/Na", 0, 4}, {"Ca/Na", 1, math.NaN()}, {"HCO3/Na", 2, math.NaN()},
	}
	for _, tc := range tests {
		got := tb.Column(tc.col).Num[tc.row]
		if math.IsNaN(tc.want) != math.IsNaN(got) || (!math.IsNaN(got) && math.Abs(got-tc.want) > 1e-12) {
			t.Errorf("%s row %d = %g, want %g", tc.col, tc.row, got, tc.want)
		}
	}
}

// TestRainExcessWarning checks that an atmospheric share of Na above 1 is
// kept and warned about, never capped.
func TestRainExcessWarning(t *testing.T) {
	// A water with Cl above Na/0.85912 (sea-salt Na/Cl, Millero et al. 2008,
	// Table 4 as in docs/methods.md §4.2): Na 80, Cl 100 µmol/L gives Na_atm
	// 85.912, a share of 1.0739.
	c := chem.NewComposition()
	c[chem.Na], c[chem.Cl] = 80, 100
	r, err := correct.Apply(c, &correct.Options{})
	if err != nil {
		t.Fatal(err)
	}
	over := r.Atm[chem.Na] / c[chem.Na]
	if math.Abs(over-1.0739) > 1e-4 {
		t.Fatalf("share %g, want 1.0739", over)
	}
	tests := []struct {
		share []float64
		want  string
	}{
		{[]float64{0.2, 1, math.NaN()}, ""},
		{[]float64{0.2, over, 1}, "atmospheric share of Na above 1 in 1 of 3 samples (largest 1.07): rain supplies more Na than the river carries; " +
			"Na was lost (cation exchange) or Cl is not from rain (road salt, sewage, evaporite); see the Cl* setting"},
	}
	for _, tc := range tests {
		if got := rainExcessWarning(tc.share); got != tc.want {
			t.Errorf("shares %v: %q, want %q", tc.share, got, tc.want)
		}
	}
}
