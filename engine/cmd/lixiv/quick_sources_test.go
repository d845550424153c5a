package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"lixiv/engine/discharge"
	"lixiv/examples/synth"
)

// TestQuickThreeSources runs `lixiv quick` with its defaults on a fictional
// catchment of three sources, rain (sea salt), silicate and carbonate, with
// no evaporite and end-member ratios inside the priors of the global preset
// (silicate Ca/Na 0.35, Mg/Na 0.24, K/Na 0.15 with the alkalinity of
// carbonic-acid weathering; carbonate Ca/Na 50 and Mg/Ca 0.2): the silicate
// CO2 consumption must come within 15 % of the truth the catchment implies,
// with a 95 % interval that holds the truth and stays clear of zero. The
// preset's evaporite end-member must stay out (no tracer sees it).
func TestQuickThreeSources(t *testing.T) {
	tr := &synth.Truth{Name: "Brannock Water", Code: "BW", Title: "Brannock Water", AreaKm2: 40, P: 1100, ET: 450,
		Start: discharge.Date(2021, 10, 1), Days: 730, SampleEvery: 14, Seed: 41, BaseQ: 0.8, Storminess: 3,
		Cl: 120, NaSil: 90, CaNaSil: 0.35, MgNaSil: 0.24, KNaSil: 0.15, CaCarb: 150, MgCarb: 30, CaNaCarb: 50,
		SiPerNa: 2, Slope: -0.15, Noise: 0.03}
	q := tr.Discharge()
	dir := t.TempDir()
	smp, flow := filepath.Join(dir, "samples.csv"), filepath.Join(dir, "flow.csv")
	writeTable := func(path string, cols []string, units []string, rows [][]string) {
		var b bytes.Buffer
		for i, c := range cols {
			if i > 0 {
				b.WriteByte(',')
			}
			if units[i] != "" {
				c += " (" + units[i] + ")"
			}
			b.WriteString(c)
		}
		b.WriteByte('\n')
		for _, r := range rows {
			for i, c := range r {
				if i > 0 {
					b.WriteByte(',')
				}
				b.WriteString(c)
			}
			b.WriteByte('\n')
		}
		if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	st := synth.SampleTable(tr.Samples(q))
	writeTable(smp, st.Columns, st.Units, st.Rows)
	dt := synth.DischargeTable(tr.Start, q)
	writeTable(flow, dt.Columns, dt.Units, dt.Rows)
	var stdout, stderr bytes.Buffer
	if err := run([]string{"quick", "-samples", smp, "-discharge", flow, "-area", "40", "-json"}, &stdout, &stderr); err != nil {
		t.Fatalf("quick: %v\n%s", err, stderr.String())
	}
	var rep struct {
		CO2 map[string]struct {
			Mean struct {
				PerKm2 struct{ Median, Low, High float64 } `json:"mol_per_km2_per_yr"`
			} `json:"mean"`
		} `json:"co2_consumption"`
		Warnings map[string][]string `json:"warnings"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &rep); err != nil {
		t.Fatalf("report: %v\n%s", err, stdout.String())
	}
	want := tr.TrueSilicateCO2(q)
	got := rep.CO2["silicate"].Mean.PerKm2
	t.Logf("truth %.4g mol/km²/yr; quick budget %.4g [%.4g, %.4g]", want, got.Median, got.Low, got.High)
	if r := got.Median / want; r < 0.85 || r > 1.15 {
		t.Errorf("silicate CO2 %.4g is %.0f %% of the truth %.4g; want within 15 %%", got.Median, 100*r, want)
	}
	if !(got.Low <= want && want <= got.High) {
		t.Errorf("95 %% interval [%.4g, %.4g] misses the truth %.4g", got.Low, got.High, want)
	}
	if !(got.Low > 0.2*want) {
		t.Errorf("95 %% interval [%.4g, %.4g] reaches towards zero", got.Low, got.High)
	}
	seen := false
	for _, w := range rep.Warnings["apportionment"] {
		seen = seen || bytes.Contains([]byte(w), []byte("evaporite"))
	}
	if !seen {
		t.Errorf("no word that the evaporite end-member was left out: %v", rep.Warnings["apportionment"])
	}
}
