package notebook_test

import (
	"context"
	"fmt"
	"os"
	"time"

	"lixiv/engine/notebook"
)

// Example_budget builds a small budget for a fictional catchment from
// scratch, computes it, edits the rain correction and saves it.
func Example_budget() {
	d := notebook.New("Glen Example, one year")
	for _, k := range []notebook.Kind{notebook.KindSite, notebook.KindSamples, notebook.KindDischarge,
		notebook.KindAtmosphere, notebook.KindSources, notebook.KindApportionment, notebook.KindFluxes, notebook.KindCO2} {
		if _, err := d.Add(k, -1); err != nil {
			fmt.Println(err)
			return
		}
	}
	d.SetParam("site", "name", "Glen Example")
	d.SetParam("site", "area_km2", "25")

	// Twelve monthly samples in µmol/L (alkalinity µeq/L): sea salt plus
	// silicate and a little carbonate weathering; invented numbers.
	samples := &notebook.Table{
		Columns: []string{"sample", "date", "Na", "K", "Ca", "Mg", "Cl", "SO4", "Alk"},
		Units:   []string{"", "", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µeq/L"},
	}
	for m := 0; m < 12; m++ {
		f := 1 + 0.1*float64(m%3) // a little dilution
		samples.Rows = append(samples.Rows, []string{
			fmt.Sprintf("GE-%d", m+1), time.Date(2021, time.Month(10+m), 15, 0, 0, 0, 0, time.UTC).Format("2006-01-02"),
			fmt.Sprint(146 / f), fmt.Sprint(10 / f), fmt.Sprint(62 / f), fmt.Sprint(28 / f),
			fmt.Sprint(100 / f), fmt.Sprint(5.2 / f), fmt.Sprint(226 / f)})
	}
	d.SetTable("samples", samples)

	// A year of daily discharge, 0.8 m³/s with a winter high.
	flow := &notebook.Table{Columns: []string{"date", "discharge"}, Units: []string{"", "m3/s"}}
	start := time.Date(2021, 10, 1, 0, 0, 0, 0, time.UTC)
	for i := 0; i < 365; i++ {
		q := 0.8
		if i > 60 && i < 180 {
			q = 1.4
		}
		flow.Rows = append(flow.Rows, []string{start.AddDate(0, 0, i).Format("2006-01-02"), fmt.Sprint(q)})
	}
	d.SetTable("discharge", flow)

	src, _ := notebook.SourcesTable("granite")
	d.SetTable("sources", src)
	d.SetParam("apportionment", "model", "forward")
	d.SetParam("apportionment", "draws", "500")
	d.SetParam("fluxes", "estimator", "interpolation")
	d.SetParam("fluxes", "bootstrap", "200")

	if err := d.Recompute(context.Background(), nil); err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range d.Cells {
		if st, err := d.Status(c.ID); st != notebook.UpToDate {
			fmt.Println(c.ID, st, err)
		}
	}
	// By hand (sea-salt ratios, granite Ca/Na 0.3 and Mg/Na 0.2): Na_sil =
	// 146 − 0.859 × 100 = 60, phi_sil = 60 + 8.1 + 2 (18 + 12) = 128 µmol/L;
	// runoff 1258 mm/yr; mean dilution 0.91: about 1.47e5 mol/km²/yr.
	co2 := d.Output("co2")
	if co2 == nil {
		return
	}
	for _, name := range []string{"silicate CO2 consumption per km²", "carbonate CO2 consumption per km²"} {
		f := co2.Figure(name)
		fmt.Printf("%s: %.3g [%.3g, %.3g] %s\n", f.Name, f.Median, f.Low, f.High, f.Unit)
	}

	// Count the sea salt's Na higher: only the cells below the rain cell rerun.
	d.SetParam("atmosphere", "na_per_cl", "0.95")
	d.Recompute(context.Background(), nil)
	fmt.Println("site ran", d.Runs("site"), "time(s); co2 ran", d.Runs("co2"), "times")
	f := d.Output("co2").Figure("silicate CO2 consumption per km²")
	fmt.Printf("after the edit: %.3g %s\n", f.Median, f.Unit)

	// Save with the results, so that a co-author can check a rerun.
	d.Keep()
	out, _ := os.CreateTemp("", "glen-*"+notebook.Extension)
	defer os.Remove(out.Name())
	d.Save(out)
	out.Close()
	in, _ := os.Open(out.Name())
	again, err := notebook.Load(in, "glen")
	in.Close()
	if err != nil {
		fmt.Println(err)
		return
	}
	again.Recompute(context.Background(), nil)
	v, _ := again.Verify()
	fmt.Println("rerun matches the saved results:", v.Match)
	// Output:
	// silicate CO2 consumption per km²: 1.49e+05 [1.25e+05, 1.78e+05] mol/km²/yr
	// carbonate CO2 consumption per km²: 5.54e+04 [4.6e+04, 6.49e+04] mol/km²/yr
	// site ran 1 time(s); co2 ran 2 times
	// after the edit: 1.29e+05 mol/km²/yr
	// rerun matches the saved results: true
}
