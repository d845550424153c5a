package mix_test

import (
	"fmt"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

// The mixed sample of docs/methods.md (§13 item 8): sea salt with Cl 30,
// silicate weathering with Na 100, carbonate weathering with Ca 400 and
// Mg 80, apportioned with the default silicate end-member.
func ExampleForward() {
	c := chem.NewComposition()
	c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = 125.7736, 20.56099, 435.56508, 106.90273
	c[chem.Cl], c[chem.SO4] = 30, 1.551756
	cr, err := correct.Apply(c, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := mix.Forward(&cr, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("source       Na        K        Ca       Mg")
	for src := mix.Source(0); src < mix.NSources; src++ {
		fmt.Printf("%-10s", src)
		for i := range mix.Cations {
			fmt.Printf(" %8.3f", res.Split[src][i])
		}
		fmt.Println()
	}
	fmt.Printf("±1σ carbonate Ca %.1f, Mg %.1f\n", res.Sigma[mix.Carbonate][2], res.Sigma[mix.Carbonate][3])
	// Output:
	// source       Na        K        Ca       Mg
	// atmosphere   25.774    0.561    0.565    2.903
	// evaporite     0.000    0.000    0.000    0.000
	// silicate    100.000   20.000   35.000   24.000
	// carbonate     0.000    0.000  400.000   80.000
	// ±1σ carbonate Ca 8.2, Mg 6.7
}
