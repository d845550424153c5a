package qc_test

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/qc"
	"lixiv/engine/sample"
)

// The worked example of docs/methods.md §13 item 4.
func ExampleChargeBalance() {
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 100, 10, 200, 50
	c[chem.Cl], c[chem.SO4], c[chem.NO3], c[chem.Alk] = 50, 40, 10, 450
	b := qc.ChargeBalance(c, math.NaN(), math.NaN())
	fmt.Printf("TZ+ %.0f µeq/L, TZ- %.0f µeq/L\n", b.TZPlus, b.TZMinus)
	fmt.Printf("NICB %+.4f %%, CBE %+.4f %%, %s\n", b.NICB, b.CBE, qc.DefaultThresholds.Classify(b.NICB))
	// Output:
	// TZ+ 610 µeq/L, TZ- 590 µeq/L
	// NICB +3.2787 %, CBE +1.6667 %, ok
}

// Quality control of a small table from the fictional Marlow Fen river.
func ExampleCheck() {
	text := "Sample,pH,Na (mg/L),K (mg/L),Ca (mg/L),Mg (mg/L),Cl (mg/L),SO4 (mg/L),Alk (meq/L)\n" +
		"MF-01,7.85,12.5,2.10,88.4,6.95,25.5,39.4,4.30\n" +
		"MF-02,7.71,11.2,<0.1,76.1,6.02,23.2,35.8,3.00\n"
	t := sample.ParseText(text, "marlow-fen.csv", sample.Options{})
	for _, r := range qc.Check(t.Samples, qc.Options{}) {
		fmt.Printf("%s NICB %+.1f %% %s; HCO3 %.0f, CO3 %.1f µmol/L\n", r.ID, r.Balance.NICB, r.Status, r.Balance.HCO3, r.Balance.CO3)
		for _, w := range r.Warnings {
			fmt.Println("  ", w)
		}
	}
	// Output:
	// MF-01 NICB -4.6 % ok; HCO3 4271, CO3 14.2 µmol/L
	// MF-02 NICB +8.0 % flag; HCO3 2985, CO3 7.2 µmol/L
	//    charge imbalance beyond the accepted limit: NICB +8.0 % (accepted within ±5 %)
	//    values below detection: 1 (substituted values enter the balance)
}
