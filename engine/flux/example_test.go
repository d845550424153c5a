package flux_test

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
)

// corrieYear is one invented year of the fictional Corrie Vale burn:
// discharge high in winter, and monthly calcium samples that dilute at
// high flow (C = 120 Q^-0.3 µmol/L, give or take 5 %).
func corrieYear() (*discharge.Record, flux.Series) {
	q := make([]float64, 365)
	for k := range q {
		q[k] = 1.5 + math.Cos(2*math.Pi*float64(k)/365)
	}
	rec := discharge.NewRecord("Corrie Vale", discharge.Date(2021, 1, 1), q)
	var days []discharge.Day
	var c []float64
	for k := 10; k < 365; k += 30 {
		days = append(days, rec.Days[k])
		c = append(c, 120*math.Pow(q[k], -0.3)*(1+0.05*math.Sin(float64(k))))
	}
	return rec, flux.ForSpecies(chem.Ca, days, c)
}

func ExampleEstimate() {
	rec, ca := corrieYear()
	for m := flux.Method(0); m < flux.NMethods; m++ {
		res, err := flux.Estimate(rec, ca, flux.Options{Method: m, AreaKm2: 42})
		if err != nil {
			fmt.Println(err)
			return
		}
		y := res.Years[0]
		fmt.Printf("%-27s %d: %.4g mol/yr  %.3f t/km2/yr  runoff %.0f mm\n", m, y.Label, y.Mol, y.TonnesPerKm2, y.RunoffMM)
		if f := res.Rating; f != nil {
			fmt.Printf("fit: C = %.1f Q^%.3f, R2 %.3f, s %.3f, %v factor %.4f\n", f.A, f.B, f.R2, f.S, f.Bias, f.Factor)
		}
	}
	// Output:
	// discharge-weighted          2021: 4.941e+06 mol/yr  4.715 t/km2/yr  runoff 1126 mm
	// flow-adjusted interpolation 2021: 4.935e+06 mol/yr  4.709 t/km2/yr  runoff 1126 mm
	// rating curve                2021: 4.923e+06 mol/yr  4.697 t/km2/yr  runoff 1126 mm
	// fit: C = 120.2 Q^-0.295, R2 0.956, s 0.038, Duan smearing factor 1.0006
	// Beale ratio                 2021: 4.917e+06 mol/yr  4.692 t/km2/yr  runoff 1126 mm
}

func ExampleBootstrap() {
	rec, ca := corrieYear()
	opt := flux.Options{Method: flux.Rating, AreaKm2: 42}
	u, err := flux.Bootstrap(rec, ca, opt, flux.BootstrapOptions{Replicates: 500, Seed: 1, DischargeError: 0.1, AreaError: 0.02})
	if err != nil {
		fmt.Println(err)
		return
	}
	iv := u.Mean.MolPerKm2
	fmt.Printf("Ca yield %.0f mol/km2/yr (95 %% interval %.0f to %.0f), %d replicates\n", iv.Median, iv.Lo, iv.Hi, u.Replicates)
	// Output:
	// Ca yield 117938 mol/km2/yr (95 % interval 95141 to 144141), 500 replicates
}
