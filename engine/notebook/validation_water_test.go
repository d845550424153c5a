package notebook_test

import (
	"context"
	"fmt"
	"math"
	"strings"
	"testing"

	"lixiv/engine/discharge"
	"lixiv/engine/internal/validation"
	"lixiv/engine/notebook"
	"lixiv/examples/synth"
)

// TestValidationWaterChemistry runs the carbonate and minerals cells on
// 100 invented catchments of the Greyhope kind (examples/synth: plagioclase An30,
// K-feldspar and biotite weathering to kaolinite, a magnesian calcite,
// 3 % analytical noise; seeds 100–199), each with its own discharge and
// noise, and compares each mineral's mean annual yield with the truth's
// over the complete water years the budget averages. The discharge and the
// area are exact in the simulation, so the budgets leave their errors out
// (0 %): the intervals are the sampling bootstrap's alone. Thresholds:
// mean bias within 3 % and coverage of the 95 % intervals at least 85 %
// for the phases that carry the water; biotite, small against the noise
// of the Mg it is found from and held at zero where noise would make it
// negative, leans high, and its thresholds say so (bias below +15 %,
// coverage at least 70 %). The carbonate cell must give back each
// sample's invented pCO2 to within the rounding of its written pH.
func TestValidationWaterChemistry(t *testing.T) {
	const seeds = 100
	type stat struct {
		n, covered int
		ratio      []float64
	}
	stats := map[string]*stat{}
	var pco2 struct {
		n          int
		worst, sum float64
	}
	var order []string
	for seed := uint64(100); seed < 100+seeds; seed++ {
		tr := synth.Greyhope()
		tr.Seed = seed
		d, err := tr.Budget("granite", "forward", 200, 200)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range [][3]string{{"fluxes", "series_bootstrap", "200"}, {"fluxes", "discharge_uncertainty_percent", "0"},
			{"site", "area_uncertainty_percent", "0"}} {
			if err := d.SetParam(e[0], e[1], e[2]); err != nil {
				t.Fatal(err)
			}
		}
		if err := d.Insert(notebook.NewCell(notebook.KindCarbonate, "carbonate", ""), 3); err != nil {
			t.Fatal(err)
		}
		m := notebook.NewCell(notebook.KindMinerals, "minerals", "")
		m.Settings.(*notebook.MineralSettings).Primary = []string{"plagioclase An30", "K-feldspar", "biotite", synth.MagnesianCalcite + " = Ca0.85Mg0.15CO3"}
		if err := d.Insert(m, -1); err != nil {
			t.Fatal(err)
		}
		if err := d.Recompute(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
		if st, err := d.Status("minerals"); st != notebook.UpToDate {
			t.Fatalf("seed %d: minerals %v %v", seed, st, err)
		}
		// The carbonate cell against each sample's invented pCO2.
		ct := d.Output("carbonate").Table("carbonate")
		got := map[string]float64{}
		for i, n := range ct.Column("sample").Text {
			got[n] = ct.Column("pCO2").Num[i]
		}
		for _, smp := range tr.Samples(tr.Discharge()) {
			if x, ok := got[smp.ID]; ok {
				pco2.n++
				r := math.Abs(x/smp.PCO2 - 1)
				pco2.worst = math.Max(pco2.worst, r)
				pco2.sum += r
			}
		}
		truth := synth.GreyhopeYields(tr, discharge.Date(2023, 10, 1)) // the complete water years the budget averages
		pt := d.Output("minerals").Table("period")
		for i, name := range pt.Column("mineral").Text {
			key := strings.Split(name, " = ")[0]
			s := stats[key]
			if s == nil {
				s = &stat{}
				stats[key] = s
				order = append(order, key)
			}
			want := truth[key]
			med, lo, hi := pt.Column("yield").Num[i], pt.Column("yield_low").Num[i], pt.Column("yield_high").Num[i]
			s.n++
			if lo <= want && want <= hi {
				s.covered++
			}
			s.ratio = append(s.ratio, med/want)
		}
	}
	var b strings.Builder
	b.WriteString("Mineral balance (minerals cell, docs/methods.md §16): 100 invented catchments of the Greyhope Beck kind ")
	b.WriteString("(examples/synth; seeds 100–199), three water years of three-weekly samples with 3 % analytical noise, ")
	b.WriteString("exact discharge and area (the budgets' discharge and area errors set to 0 %, so the intervals are the sampling ")
	b.WriteString("bootstrap's, 200 replicates). Truth: the minerals the invented water was made from, fluxed day by day.\n\n")
	b.WriteString("| mineral | mean estimate / truth | 95 % intervals holding the truth |\n|---|---|---|\n")
	for _, k := range order {
		s := stats[k]
		mean := 0.0
		for _, r := range s.ratio {
			mean += r
		}
		mean /= float64(len(s.ratio))
		cov := float64(s.covered) / float64(s.n)
		fmt.Fprintf(&b, "| %s | %.3f | %d of %d (%.0f %%) |\n", k, mean, s.covered, s.n, 100*cov)
		bias, minCov := 0.03, 0.85
		if k == "biotite" {
			bias, minCov = 0.15, 0.70
		}
		if math.Abs(mean-1) > bias || cov < minCov {
			t.Errorf("%s: mean estimate/truth %.3f (allowed 1 ± %g), coverage %.2f (at least %g)", k, mean, bias, cov, minCov)
		}
	}
	b.WriteString("\nBiotite, a few µmol/L found from the Mg left beside the carbonate's, is held at zero in samples where the noise ")
	b.WriteString("would make it negative; the bound makes its mean lean high and its intervals too narrow. The other phases' ")
	b.WriteString("coverage, somewhat under 95 %, is that of the fluxes cell's bootstrap with about 17 samples a year.\n")
	validation.Section(t, "mineral-balance", b.String())
	// pH is written to 0.01, which moves pCO2 by up to 10^0.005 − 1 =
	// 1.2 %; temperature to 0.1 °C adds about 0.1 %.
	if pco2.n < 4000 || pco2.worst > 0.015 {
		t.Errorf("carbonate cell: %d samples, worst pCO2 error %.2f %% (allowed 1.5 %%)", pco2.n, 100*pco2.worst)
	}
	validation.Section(t, "carbonate-system", fmt.Sprintf("Carbonate system (carbonate cell, docs/methods.md §10): in the same 100 catchments each "+
		"sample's pH was made from its alkalinity and an invented pCO2 (Davies activities, the constants of Plummer & Busenberg 1982) "+
		"and written to 0.01 pH, its temperature to 0.1 °C. Over %d samples the cell gives back the invented pCO2 to %.2f %% on average "+
		"and %.2f %% at worst; the rounding of the pH alone allows 1.2 %%. (This checks that the cell inverts its own speciation; "+
		"the constants and activities are checked against published values in engine/carbonate.)\n",
		pco2.n, 100*pco2.sum/float64(pco2.n), 100*pco2.worst))
}
