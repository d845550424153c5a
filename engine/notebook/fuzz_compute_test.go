package notebook

import (
	"context"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
)

// FuzzCompute feeds any text as the sample table of a small budget and
// computes it: every cell must end up up to date or with a problem it
// names, never with an internal error (a recovered panic).
func FuzzCompute(f *testing.F) {
	f.Add("sample,date,Na,K,Ca,Mg,Cl,SO4,Alk\n,,µmol/L,µmol/L,µmol/L,µmol/L,µmol/L,µmol/L,µeq/L\nA,2021-05-01,100,10,200,50,50,40,460\n")
	f.Add("sample\tdate\tNa (mg/L)\tCa (mg/L)\tCl (mg/L)\tAlk (meq/L)\nA\t01/05/2021\t2,3\t<0.1\tn.d.\t0.5\n")
	f.Add("sample,date,Na,Cl\n,,mg/L,mg/L\nA,2021-05-01,0,0\nB,2021-05-02,-1,1e308\n")
	f.Fuzz(func(t *testing.T, text string) {
		defer watchdog.Start(text)()
		tab, err := TableFromText(text)
		if err != nil || len(tab.Rows) > 50 || len(tab.Columns) > 20 {
			return
		}
		d := New("fuzz")
		for _, k := range []Kind{KindSamples, KindAtmosphere, KindSources, KindApportionment, KindCO2} {
			if _, err := d.Add(k, -1); err != nil {
				t.Fatal(err)
			}
		}
		src, _ := SourcesTable("global")
		d.SetTable("sources", src)
		d.SetTable("samples", tab)
		if len(text)%2 == 0 { // both models, chosen by the input
			d.SetParam("apportionment", "model", "forward")
		}
		d.SetParam("apportionment", "draws", "20")
		if err := d.Recompute(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
		for _, c := range d.Cells {
			if _, err := d.Status(c.ID); err != nil && strings.Contains(err.Error(), "internal error") {
				t.Fatalf("cell %s: %v", c.ID, err)
			}
		}
	})
}

// FuzzComputeFlow feeds any text as the discharge record of a small budget
// with fixed samples and computes the fluxes and CO2 from it.
func FuzzComputeFlow(f *testing.F) {
	f.Add("date,Q (m3/s)\n2021-05-01,1\n2021-05-02,2\n2021-05-03,1.5\n")
	f.Add("Date;Flow L/s\n01.05.2021;1200,5\n02.05.2021;-3\n04.05.2021;\n")
	f.Add("date\tdischarge\n2021-05-03\t0\n2021-05-01\t1e300\n")
	samples := &Table{Columns: []string{"sample", "date", "Na", "K", "Ca", "Mg", "Cl", "SO4", "Alk"},
		Units: []string{"", "", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µeq/L"},
		Rows: [][]string{
			{"A", "2021-05-01", "100", "10", "200", "50", "50", "40", "460"},
			{"B", "2021-05-02", "90", "9", "190", "45", "48", "38", "430"},
			{"C", "2021-05-03", "120", "12", "230", "60", "55", "45", "540"},
		}}
	f.Fuzz(func(t *testing.T, text string) {
		defer watchdog.Start(text)()
		tab, err := TableFromText(text)
		if err != nil || len(tab.Rows) > 400 || len(tab.Columns) > 6 {
			return
		}
		d := New("fuzz")
		for _, k := range []Kind{KindSite, KindSamples, KindDischarge, KindAtmosphere, KindSources, KindApportionment, KindFluxes, KindCO2} {
			if _, err := d.Add(k, -1); err != nil {
				t.Fatal(err)
			}
		}
		src, _ := SourcesTable("global")
		d.SetTable("sources", src)
		d.SetTable("samples", samples)
		d.SetTable("discharge", tab)
		d.SetParam("site", "area_km2", "10")
		d.SetParam("apportionment", "model", "forward")
		d.SetParam("apportionment", "draws", "20")
		d.SetParam("fluxes", "bootstrap", "10")
		if len(text)%2 == 0 {
			d.SetParam("fluxes", "estimator", "interpolation")
		}
		if err := d.Recompute(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
		for _, c := range d.Cells {
			if _, err := d.Status(c.ID); err != nil && strings.Contains(err.Error(), "internal error") {
				t.Fatalf("cell %s: %v", c.ID, err)
			}
		}
	})
}
