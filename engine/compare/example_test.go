package compare_test

import (
	"fmt"

	"lixiv/engine/compare"
)

// A basalt's CO2 potential (docs/methods.md §17), and what share of a
// spreading of it an extra 20 t CO2 taken up represents.
func ExampleOxides_Potential() {
	basalt := compare.Oxides{CaO: 10, MgO: 7, Na2O: 2.5, K2O: 0.8}
	fmt.Printf("%.3f mol/kg of charge, %.4f t CO2/t\n", basalt.Charge(), basalt.Potential(1))
	a := compare.Application{TonnesPerHa: 40, AreaHa: 120, Oxides: basalt, Eta: 1}
	fmt.Printf("%.0f t spread, potential %.0f t CO2; 20 t CO2 is %.2f %% of it\n", a.Tonnes(), a.PotentialTonnes(), 100*a.Share(20))
	// An invented basalt (no published analysis); the figures are computed
	// by the oxide form of Renforth (2012), Int. J. Greenh. Gas Control 10,
	// 229–243, eq. for the CO2 potential of cations.
	// Output:
	// 8.017 mol/kg of charge, 0.3528 t CO2/t
	// 4800 t spread, potential 1693 t CO2; 20 t CO2 is 1.18 % of it
}

// The before-after-control-impact difference of four mean annual yields.
func ExampleDesign_Combine() {
	// treated after, control after, treated before, control before
	yields := []float64{1300, 1050, 1100, 1000}
	fmt.Println(compare.BACI.Formula(), "=", compare.BACI.Combine(yields))
	// Output:
	// (after − before) treated − (after − before) control = 150
}
