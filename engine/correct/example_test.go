package correct_test

import (
	"fmt"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// A Corrie Vale burn sample corrected with sea-salt ratios and a critical
// chloride of 100 µmol/L (invented values in a fictional catchment).
func ExampleApply() {
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 180, 15, 120, 60
	c[chem.Cl], c[chem.SO4] = 140, 20
	r, err := correct.Apply(c, &correct.Options{ClCritical: 100})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("Cl_atm %.1f, Cl_excess %.1f\n", r.Atm[chem.Cl], r.ClExcess)
	for _, s := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.SO4} {
		fmt.Printf("%-3s atm %7.3f  evap %7.3f  residual %7.3f\n", s, r.Atm[s], r.Evap[s], r.Residual[s])
	}
	// Output:
	// Cl_atm 100.0, Cl_excess 40.0
	// Na  atm  85.912  evap  40.000  residual  54.088
	// K   atm   1.870  evap   0.000  residual  13.130
	// Ca  atm   1.884  evap  14.827  residual 103.289
	// Mg  atm   9.676  evap   0.000  residual  50.324
	// SO4 atm   5.173  evap  14.827  residual   0.000
}

// The measured-rain worked example of docs/methods.md (§13 item 5): rain
// Cl 20 and Na 17 µmol/L, P 1000 mm/yr, ET 600 mm/yr.
func ExampleApply_measuredRain() {
	rain := chem.NewComposition()
	rain[chem.Cl], rain[chem.Na], rain[chem.K], rain[chem.Ca], rain[chem.Mg] = 20, 17, 0.5, 1, 2
	rain[chem.SO4], rain[chem.Sr], rain[chem.Br] = 3, 0, 0
	c := chem.NewComposition()
	c[chem.Cl], c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.SO4] = 80, 200, 20, 100, 40, 30
	r, err := correct.Apply(c, &correct.Options{Rain: &correct.Rain{Composition: rain, P: 1000, ET: 600}})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("F %.1f, Cl* %.0f, Cl_atm %.0f, halite Cl %.0f\n", r.F, r.ClCritical, r.Atm[chem.Cl], r.Evap[chem.Cl])
	fmt.Printf("Na_atm %.1f, Na_evap %.0f, Na residual %.1f\n", r.Atm[chem.Na], r.Evap[chem.Na], r.Residual[chem.Na])
	// Output:
	// F 2.5, Cl* 50, Cl_atm 50, halite Cl 30
	// Na_atm 42.5, Na_evap 30, Na residual 127.5
}

// Bracket runs the all-gypsum and all-sulfide sulfate scenarios, which
// bracket the CO2 result.
func ExampleBracket() {
	c := chem.NewComposition()
	c[chem.Cl], c[chem.Na], c[chem.Ca], c[chem.Mg], c[chem.SO4] = 50, 60, 900, 200, 250
	g, s, err := correct.Bracket(c, &correct.Options{ClCritical: 60})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("gypsum:  Ca_evap %.2f  SO4_sulf %.2f\n", g.Evap[chem.Ca], g.SO4Sulf)
	fmt.Printf("sulfide: Ca_evap %.2f  SO4_sulf %.2f\n", s.Evap[chem.Ca], s.SO4Sulf)
	// Output:
	// gypsum:  Ca_evap 247.41  SO4_sulf 0.00
	// sulfide: Ca_evap 0.00  SO4_sulf 247.41
}

// A negative residual is reported with its amount and handled by the
// chosen policy.
func ExampleApply_negativeResidual() {
	c := chem.NewComposition()
	c[chem.Cl], c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.SO4] = 100, 120, 1, 40, 20, 10
	for _, p := range []correct.Negative{correct.Zero, correct.Keep, correct.Reject} {
		r, err := correct.Apply(c, &correct.Options{ClCritical: 200, Negative: p})
		fmt.Printf("%-11s K* %6.3f  deficits %v  err %v\n", p, r.Residual[chem.K], r.Negatives, err)
	}
	// Output:
	// set to zero K*  0.000  deficits [K* = -0.87 µmol/L]  err <nil>
	// keep        K* -0.870  deficits [K* = -0.87 µmol/L]  err <nil>
	// reject      K* -0.870  deficits [K* = -0.87 µmol/L]  err sample rejected: negative residual after correction: K* = -0.87 µmol/L
}
