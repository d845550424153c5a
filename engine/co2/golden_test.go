package co2

import (
	"bytes"
	"fmt"
	"testing"
	"text/tabwriter"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/internal/golden"
	"lixiv/engine/mix"
)

// goldenSamples are invented samples from the fictional Corrie Vale granite
// burn (CV) and Marlow Fen limestone-and-shale river (MF), µmol/L.
var goldenSamples = []struct {
	name                              string
	na, k, ca, mg, cl, so4, alk, sio2 float64
}{
	{"CV-01 spring baseflow", 142, 14, 48, 31, 118, 22, 210, 165},
	{"CV-02 autumn spate", 96, 9, 29, 19, 102, 18, 95, 98},
	{"CV-03 winter storm", 180, 11, 31, 26, 205, 25, 60, 85},
	{"MF-01 summer low flow", 410, 62, 2650, 390, 300, 610, 5100, 190},
	{"MF-02 spring high flow", 305, 45, 1900, 280, 220, 430, 3650, 150},
	{"MF-03 acid flush", 290, 40, 1750, 300, 210, 900, 2600, 140},
}

// TestGoldenChain runs the golden samples through correct.Bracket,
// mix.Forward and Consumption and compares a fixed-precision table with
// testdata/chain.golden (run with -update to rewrite it; a mismatch writes
// testdata/chain.golden.got). The file guards against unnoticed changes; the
// numbers themselves are checked by the other tests.
func TestGoldenChain(t *testing.T) {
	rain := chem.NewComposition()
	rain[chem.Cl], rain[chem.Na], rain[chem.K], rain[chem.Ca], rain[chem.Mg] = 45, 38, 1.2, 2.5, 4.6
	rain[chem.SO4], rain[chem.Sr], rain[chem.Br] = 6, 0.01, 0.07
	copt := &correct.Options{Rain: &correct.Rain{Composition: rain, P: 1400, ET: 520}}
	var buf bytes.Buffer
	w := tabwriter.NewWriter(&buf, 0, 0, 1, ' ', tabwriter.AlignRight)
	fmt.Fprintln(w, "sample\tscenario\tNa_sil\tK_sil\tCa_sil\tMg_sil\tCa_carb\tMg_carb\tNa_evap\tSO4_sulf\tphi_sil\tphi_carb\tnet_long\twarnings\t")
	for _, s := range goldenSamples {
		c := chem.NewComposition()
		c[chem.Na], c[chem.K], c[chem.Ca], c[chem.Mg] = s.na, s.k, s.ca, s.mg
		c[chem.Cl], c[chem.SO4], c[chem.Alk], c[chem.SiO2] = s.cl, s.so4, s.alk, s.sio2
		g, su, err := correct.Bracket(c, copt)
		if err != nil {
			t.Fatalf("%s: %v", s.name, err)
		}
		for _, sc := range []struct {
			name string
			r    correct.Result
		}{{"gypsum", g}, {"sulfide", su}} {
			f, err := mix.Forward(&sc.r, nil)
			if err != nil {
				t.Fatalf("%s: %v", s.name, err)
			}
			r, err := Consumption(&f.Split, sc.r.SO4Sulf, nil)
			if err != nil {
				t.Fatalf("%s: %v", s.name, err)
			}
			sil, carb := f.Split[mix.Silicate], f.Split[mix.Carbonate]
			fmt.Fprintf(w, "%s\t%s\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%.3f\t%d\t\n",
				s.name, sc.name, sil[0], sil[1], sil[2], sil[3], carb[2], carb[3],
				f.Split[mix.Evaporite][0], sc.r.SO4Sulf, r.PhiSil, r.PhiCarb, r.NetLong,
				len(sc.r.Warnings)+len(f.Warnings)+len(r.Warnings))
		}
	}
	w.Flush()
	golden.Check(t, "chain.golden", buf.Bytes())
}
