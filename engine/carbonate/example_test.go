package carbonate_test

import (
	"fmt"

	"lixiv/engine/carbonate"
)

// A stream water at 12 °C: its carbonate system with Davies activities.
func ExampleAnalyse() {
	w := carbonate.Water{TempC: 12, PH: 7.9, Alk: 1.8e-3, Ca: 0.85e-3, Mg: 0.2e-3, Background: 3.1e-3}
	r, err := carbonate.Analyse(w, carbonate.Davies)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("I %.2e mol/L, DIC %.3f mmol/L, pCO2 %.0f µatm\n", r.I, r.DIC*1e3, r.PCO2*1e6)
	fmt.Printf("SI calcite %+.2f, aragonite %+.2f, dolomite %+.2f\n", r.SICalcite, r.SIAragonite, r.SIDolomite)
	// Output:
	// I 4.01e-03 mol/L, DIC 1.852 mmol/L, pCO2 1165 µatm
	// SI calcite -0.11, aragonite -0.26, dolomite -0.91
}
