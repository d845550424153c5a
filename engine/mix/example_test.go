package mix_test

import (
	"context"
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/mix"
)

// Two raw stream waters from the fictional Corrie Vale, a granite upland
// burn with a little limestone, apportioned among rain, granitic silicate
// and carbonate with four tracers.
func ExampleInvert() {
	water := func(name string, na, k, ca, mg, hco3, cl float64) mix.Water {
		c := chem.NewComposition()
		c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg], c[chem.HCO3], c[chem.Cl] = na, k, ca, mg, hco3, cl
		return mix.Water{Name: name, Conc: c, Sr87Sr86: math.NaN()}
	}
	p := mix.Problem{
		EndMembers: []mix.EndMember{mix.PresetRain(), mix.PresetGranitic(), mix.PresetCarbonate()},
		Tracers:    []mix.Tracer{mix.CaNa, mix.MgNa, mix.HCO3Na, mix.ClNa},
		Waters: []mix.Water{
			water("Corrie Vale spring", 180, 14.4, 71.2, 40.7, 268.6, 115.2),
			water("Corrie Vale gauge", 210, 18.7, 242.5, 95.0, 706.0, 122.2),
		},
	}
	res, err := mix.Invert(context.Background(), p, &mix.Options{Draws: 4000, Seed: 2026})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("status:", res.Status)
	for _, s := range res.Samples {
		fmt.Printf("%s (%.0f %% of draws kept)\n", s.Name, 100*s.AcceptRate)
		for _, src := range []mix.Source{mix.Atmosphere, mix.Silicate, mix.Carbonate} {
			ca := mix.CationIndex(chem.Ca)
			fmt.Printf("  Ca from %-10s %5.1f µmol/L [%5.1f, %5.1f]\n", src, s.Amount.Median[src][ca], s.Amount.Lo[src][ca], s.Amount.Hi[src][ca])
		}
	}
	// Output:
	// status: success
	// Corrie Vale spring (9 % of draws kept)
	//   Ca from atmosphere   2.2 µmol/L [  1.9,   2.5]
	//   Ca from silicate    22.8 µmol/L [ 12.4,  39.7]
	//   Ca from carbonate   46.2 µmol/L [ 29.3,  56.7]
	// Corrie Vale gauge (6 % of draws kept)
	//   Ca from atmosphere   2.3 µmol/L [  2.0,   2.7]
	//   Ca from silicate    29.1 µmol/L [ 15.1,  50.5]
	//   Ca from carbonate  211.1 µmol/L [189.7, 224.9]
}
