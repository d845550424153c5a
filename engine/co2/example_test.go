package co2_test

import (
	"fmt"

	"lixiv/engine/chem"
	"lixiv/engine/co2"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

// A Marlow Fen river sample (invented values in a fictional catchment) run
// through the per-sample chain under the two sulfate scenarios that bracket
// the CO2 result: all gypsum and all sulfide oxidation.
func ExampleConsumption() {
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 260, 40, 1800, 420
	c[chem.Cl], c[chem.SO4], c[chem.Alk] = 180, 350, 3900
	gyp, sulf, err := correct.Bracket(c, &correct.Options{ClCritical: 150})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("scenario   phi_sil  phi_carb  phi_total  net_long   sink_sil")
	for _, sc := range []struct {
		name string
		r    correct.Result
	}{{"gypsum", gyp}, {"sulfide", sulf}} {
		f, err := mix.Forward(&sc.r, nil)
		if err != nil {
			fmt.Println(err)
			return
		}
		r, err := co2.Consumption(&f.Split, sc.r.SO4Sulf, nil)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%-8s %9.1f %9.1f %10.1f %9.1f %12.1f\n", sc.name, r.PhiSil, r.PhiCarb, r.PhiTotal, r.NetLong, r.SinkSil)
	}
	// A silicate yield of 6.00445e4 mol CO2/km²/yr in tonnes:
	fmt.Printf("%.4f t C/km²/yr, %.4f t CO2/km²/yr\n", co2.TonnesC(6.00445e4), co2.TonnesCO2(6.00445e4))
	// Output:
	// scenario   phi_sil  phi_carb  phi_total  net_long   sink_sil
	// gypsum       257.7    1800.8     2058.4     128.8         59.7
	// sulfide      218.8    1497.3     1716.2    -213.4         50.7
	// 0.7212 t C/km²/yr, 2.6425 t CO2/km²/yr
}
