package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/examples/synth"
)

// TestProblemsExitStatus checks that quick and rerun, like batch, print the
// whole budget and then exit with status 1 when cells did not compute, and
// with status 4 when every cell computed but some results are doubtful.
func TestProblemsExitStatus(t *testing.T) {
	dir := t.TempDir()
	// A samples table whose headers name no species or date (misspelt).
	wrong := filepath.Join(dir, "misspelt.csv")
	// A budget whose one cell cannot be read: a row longer than the header.
	broken := filepath.Join(dir, "broken.lixiv.json")
	// Waters of albite weathering alone: no silicate end-member fits them.
	albite := filepath.Join(dir, "albite.csv")
	for path, text := range map[string]string{
		wrong:  "Sample,When,Sodum,Potasium,Calc,Magn,Chlor\nA1,2024-01-01,4.1,0.4,2.3,0.9,5\nA2,2024-02-01,4.2,0.5,2.5,1.0,5.5\n",
		broken: `{"format":"lixiv-budget","version":1,"cells":[{"id":"s","kind":"samples","table":{"columns":["a"],"rows":[[1,2]]}}]}`,
		albite: albiteSamples,
	} {
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	// The demo with doubtful fluxes (synth.DoubtfulDemo).
	doubtful := filepath.Join(dir, "doubtful.lixiv.json")
	d, err := synth.DoubtfulDemo()
	if err != nil {
		t.Fatal(err)
	}
	// Fewer draws than the demo's: why the fluxes are doubtful (flow
	// before the first sample) does not depend on the draws.
	for _, p := range [][3]string{{"apportionment", "target_ess", "300"}, {"fluxes", "bootstrap", "100"}, {"fluxes", "series_bootstrap", "50"}} {
		if err := d.SetParam(p[0], p[1], p[2]); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(doubtful, d.Marshal(), 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name     string
		args     []string
		code     int
		err, out string // parts of the error message and of stdout
	}{
		{"quick, nothing recognised", []string{"quick", "-samples", wrong}, 1, "misspelt.csv: samples (problem)", "samples (samples): problem"},
		{"quick -json, nothing recognised", []string{"quick", "-json", "-samples", wrong}, 1, "samples (problem)", `"problems"`},
		{"rerun, unreadable cell", []string{"rerun", broken}, 1, "broken.lixiv.json: s (problem)", "this cell could not be read"},
		{"rerun, good and unreadable", []string{"rerun", rain, broken}, 1, "broken.lixiv.json: s (problem)", "stored results: match"},
		{"rerun, good", []string{"rerun", rain}, 0, "", "stored results: match"},
		{"batch, unreadable cell", []string{"batch", broken}, 1, "1 of 1 budgets failed", "1 cells with problems"},
		{"quick, nothing fits", []string{"quick", "-samples", albite}, errDoubtful, "doubtful results (see above): albite.csv: apportionment",
			"doubtful: all 2 samples do not fit the end-members, fit them only with ratios beyond their ranges, or are poorly sampled"},
		{"rerun, doubtful", []string{"rerun", doubtful}, errDoubtful, "doubtful results (see above): doubtful.lixiv.json: fluxes, co2",
			"fluxes (fluxes): doubtful\n    doubtful: 2 % of the flow passed before the first or after the last apportioned sample (above 1 %)"},
		{"rerun, doubtful and unreadable", []string{"rerun", doubtful, broken}, 1, "broken.lixiv.json: s (problem)", "fluxes (fluxes): doubtful"},
		{"batch, doubtful", []string{"batch", doubtful}, errDoubtful, "1 of 1 budgets have doubtful results", "doubtful: fluxes, co2"},
		{"rerun -json, doubtful", []string{"rerun", "-json", doubtful}, errDoubtful, "doubtful", `"doubtful": {
    "co2": [`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			stdout, code, err := runStatus(tt.args)
			if code != tt.code || tt.err != "" && !strings.Contains(err.Error(), tt.err) {
				t.Errorf("exit status %d (%v), want %d with %q", code, err, tt.code, tt.err)
			}
			if !bytes.Contains(stdout, []byte(tt.out)) {
				t.Errorf("stdout lacks %q:\n%s", tt.out, stdout)
			}
		})
	}
}

// saltySamples are invented samples whose Cl exceeds Na/0.85912 (the
// sea-salt Na/Cl of Millero et al. 2008, docs/methods.md §4.2), so that the
// rain correction takes all their Na. Alkalinity is chosen so that both
// balance (TZ+ = TZ− = 610 and 652 µeq/L).
const saltySamples = "sample,date,Na (µmol/L),K (µmol/L),Ca (µmol/L),Mg (µmol/L),Cl (µmol/L),SO4 (µmol/L),Alk (µeq/L)\n" +
	"S1,2024-01-10,100,10,200,50,150,40,380\n" +
	"S2,2024-02-10,110,12,210,55,160,42,408\n"

// albiteSamples are invented waters of albite weathering alone, with no Ca
// or Mg: no silicate end-member of the global preset (Ca/Na and Mg/Na of
// 0.1 and more) fits them, so their apportionment is doubtful. Alkalinity
// balances the charge (TZ+ = TZ− = 102 and 122 µeq/L).
const albiteSamples = "sample,date,Na (µmol/L),K (µmol/L),Ca (µmol/L),Mg (µmol/L),Cl (µmol/L),SO4 (µmol/L),Alk (µeq/L)\n" +
	"A1,2024-01-10,100,2,0,0,10,5,82\n" +
	"A2,2024-02-10,120,2,0,0,10,5,102\n"

// TestNoValue checks that a figure or a per-sample result without a value
// is printed as "no value" with the reason, never as NaN.
func TestNoValue(t *testing.T) {
	// The salty samples: no mix of Na-bearing end-members fits, and the
	// Na-free rule answers them (Ca* and Mg* to carbonate, K* to
	// silicate), saying so; nothing prints as NaN.
	path := filepath.Join(t.TempDir(), "salty.csv")
	if err := os.WriteFile(path, []byte(saltySamples), 0o644); err != nil {
		t.Fatal(err)
	}
	stdout, _, err := runStatus([]string{"quick", "-samples", path})
	out := string(stdout)
	if strings.Contains(out, "NaN") {
		t.Errorf("NaN printed:\n%s", out)
	}
	for _, want := range []string{
		"S1 2024-01-10 Na* ≤ 0: no silicate or evaporite Na; all Ca* and Mg* to carbonate, K* to silicate",
		"Na* <= 0 after the corrections",
		"atmospheric share of Na above 1 in 2 of 2 samples",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("stdout lacks %q:\n%s (error %v)", want, out, err)
		}
	}
}
