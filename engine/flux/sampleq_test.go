package flux

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/internal/golden"
)

// TestDischargeAtSampling: a discharge measured at sampling (Series.Q)
// replaces the daily mean in the flow weights and the rating fit; NaN falls
// back to the daily record.
func TestDischargeAtSampling(t *testing.T) {
	rec := constantRecord(1, 365)
	days := []discharge.Day{rec.Days[10], rec.Days[100]}
	s := ForSpecies(chem.Na, days, []float64{100, 200})
	res, _ := Estimate(rec, s, Options{})
	// Equal daily discharge: C_fw = 150.
	if want := 86.4 * (150 * 365.0); relErr(res.Years[0].Mol, want) > 1e-12 {
		t.Errorf("daily Q: load %g, want %g", res.Years[0].Mol, want)
	}
	s.Q = []float64{3, math.NaN()} // storm sample at 3 m³/s; the other takes the daily 1 m³/s
	res, _ = Estimate(rec, s, Options{})
	// C_fw = (100×3 + 200×1)/(3+1) = 125 (docs/methods.md §8.1).
	if want := 86.4 * (125 * 365.0); relErr(res.Years[0].Mol, want) > 1e-12 {
		t.Errorf("Q at sampling: load %g, want %g", res.Years[0].Mol, want)
	}
}

// TestSeasonalRecovery: a concentration with an exact seasonal cycle,
// C = 80 Q^-0.2 exp(0.3 sin 2πt − 0.1 cos 2πt), is recovered term by term.
func TestSeasonalRecovery(t *testing.T) {
	cv := newCorrieVale()
	var c []float64
	for _, d := range cv.series.Days {
		q, _ := cv.gauge.At(d)
		sn, cs := seasonal(d.YearFraction())
		c = append(c, 80*pexp(-0.2*plog(q)+0.3*sn-0.1*cs))
	}
	res, err := Estimate(cv.gauge, ForSpecies(chem.Na, cv.series.Days, c), Options{Method: Rating, Seasonal: true})
	if err != nil {
		t.Fatal(err)
	}
	f := res.Rating
	if relErr(f.A, 80) > 1e-10 || math.Abs(f.B+0.2) > 1e-10 || math.Abs(f.Sin-0.3) > 1e-10 || math.Abs(f.Cos+0.1) > 1e-10 {
		t.Errorf("fit %+v, want A 80, B -0.2, Sin 0.3, Cos -0.1 (1e-10)", *f)
	}
}

// TestCorrieValeDischargeFile writes the synthetic catchment's gauge record
// to the shared testdata (under -update) and otherwise checks that the file
// there still matches it and reads back without problems.
func TestCorrieValeDischargeFile(t *testing.T) {
	cv := newCorrieVale()
	var b strings.Builder
	b.WriteString("Date,Q (m3/s)\n")
	for i, d := range cv.gauge.Days {
		fmt.Fprintf(&b, "%s,%.4f\n", d, cv.gauge.Q[i])
	}
	path := filepath.Join("..", "..", "testdata", "discharge_corrie_vale.csv")
	if *golden.Update {
		if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if string(data) != b.String() {
		t.Fatalf("%s is out of date; rerun with -update", path)
	}
	imp := discharge.ReadString(string(data), discharge.Options{File: "discharge_corrie_vale.csv"})
	if imp.Problems.Err() != nil || imp.Record.Len() != 1095 {
		t.Fatalf("read back: %v, %d days", imp.Problems.Err(), imp.Record.Len())
	}
	// Rounded to 4 decimals the loads move by far less than 0.1 %.
	a, _ := Estimate(cv.gauge, cv.series, Options{Method: Rating})
	r, _ := Estimate(imp.Record, cv.series, Options{Method: Rating})
	if relErr(r.Mean.Mol, a.Mean.Mol) > 1e-3 {
		t.Errorf("mean load from the file %g, in memory %g", r.Mean.Mol, a.Mean.Mol)
	}
}
