package flux

import (
	"fmt"
	"strings"
	"testing"
	"text/tabwriter"

	"lixiv/engine/internal/golden"
)

// corrieOptions are the settings of the synthetic catchment runs: the
// seasonal rating curve with Duan's smearing, 7 % discharge and 2 % area
// uncertainty (docs/methods.md §8.6 defaults).
func corrieOptions(cv *corrieVale, m Method) (Options, BootstrapOptions) {
	return Options{Method: m, AreaKm2: cv.area, Seasonal: true},
		BootstrapOptions{Replicates: 1000, Seed: 20210101, DischargeError: 0.07, AreaError: 0.02}
}

// TestSyntheticCatchment: in the synthetic Corrie Vale catchment (three years
// of daily discharge, fortnightly samples, a known true load), each
// estimator's annual and mean annual load lands within 15 % of the truth and
// its 95 % interval contains it (acceptance criterion of the flux issue).
func TestSyntheticCatchment(t *testing.T) {
	cv := newCorrieVale()
	var b strings.Builder
	tw := tabwriter.NewWriter(&b, 0, 8, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "estimator\tyear\ttrue mol\tmol\tmedian\t2.5%%\t97.5%%\tt/km2\tmol/km2\trunoff mm\tsamples\t\n")
	for m := Method(0); m < NMethods; m++ {
		t.Run(m.String(), func(t *testing.T) {
			opt, bopt := corrieOptions(cv, m)
			res, err := Estimate(cv.gauge, cv.series, opt)
			if err != nil {
				t.Fatal(err)
			}
			u, err := Bootstrap(cv.gauge, cv.series, opt, bopt)
			if err != nil {
				t.Fatal(err)
			}
			if len(res.Warnings) != 0 || len(u.Warnings) != 0 {
				t.Errorf("warnings %v %v", res.Warnings, u.Warnings)
			}
			for y := 0; y <= len(res.Years); y++ {
				label, truth, l, iv, n := "mean", cv.trueMean(), res.Mean, u.Mean, res.Samples
				if y < len(res.Years) {
					label, truth, l, iv, n = fmt.Sprint(res.Years[y].Label), cv.trueLoad[y], res.Years[y].Load, u.Years[y].LoadInterval, res.Years[y].Samples
				}
				if e := relErr(l.Mol, truth); e > 0.15 {
					t.Errorf("%s: load %.4g mol, true %.4g: off by %.1f %% (want within 15 %%)", label, l.Mol, truth, 100*e)
				}
				if !iv.Mol.Contains(truth) {
					t.Errorf("%s: 95 %% interval %.4g to %.4g misses the true %.4g", label, iv.Mol.Lo, iv.Mol.Hi, truth)
				}
				fmt.Fprintf(tw, "%s\t%s\t%.5g\t%.5g\t%.5g\t%.5g\t%.5g\t%.5g\t%.5g\t%.5g\t%d\t\n", m, label, truth, l.Mol, iv.Mol.Median, iv.Mol.Lo, iv.Mol.Hi, l.TonnesPerKm2, l.MolPerKm2, l.RunoffMM, n)
			}
			if m == FlowWeighted {
				fmt.Fprintf(tw, "%s\tcoverage\ttop sample exceeded on %.1f %% of days\t\t\t\t\t\t\t\t\t\n", m, 100*res.TopSampled)
			}
			if res.Rating != nil {
				f := res.Rating
				fmt.Fprintf(tw, "%s\tfit\ta %.4g µmol/L\tb %.4f\tR2 %.4f\ts %.4f\tfactor %.5f\t\t\t\t\t\n", m, f.A, f.B, f.R2, f.S, f.Factor)
			}
		})
	}
	tw.Flush()
	golden.Check(t, "corrie_vale.golden", []byte(b.String()))
}
