package notebook

import (
	"context"
	"errors"
	"strings"
	"testing"
)

func demoDocument(t *testing.T) *Document {
	t.Helper()
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// An input beyond a limit is refused before any work, with a message
// naming the setting as the page labels it, its key and the limit; the
// cells above keep their results.
func TestLimitsRefuse(t *testing.T) {
	tests := []struct {
		name, file, cell, key, value string
		want                         []string
	}{
		// 13 samples × 400,000 draws: above MaxSampleDraws.
		{"samples × draws", "../../testdata/budgets/small-forward.lixiv.json", "apportionment", "draws", "400000",
			[]string{"prior draws (first stage) (draws): 13 samples × 400,000 draws is 5,200,000 sample-draws", "limit of 1,000,000 for the forward model", "use at most 76,923 draws"}},
		// The demo: 78 samples and 1095 days; 50,000 replicates do 58,650,000.
		{"bootstrap replicates × (samples + days)", "demo", "fluxes", "bootstrap", "50000",
			[]string{"bootstrap replicates (bootstrap): 50,000 replicates × (78 samples + 1,095 days of discharge) is 58,650,000", "limit of 50,000,000", "use at most 42,625 replicates"}},
		{"series bootstrap", "demo", "fluxes", "series_bootstrap", "90000",
			[]string{"series bootstrap replicates (series_bootstrap): 90,000 replicates"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var d *Document
			if tt.file == "demo" {
				d = demoDocument(t)
			} else {
				var err error
				if d, err = loadFile(tt.file); err != nil {
					t.Fatal(err)
				}
			}
			if err := d.SetParam(tt.cell, tt.key, tt.value); err != nil {
				t.Fatal(err)
			}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			st, err := d.Status(tt.cell)
			if st != Problem || err == nil {
				t.Fatalf("got %v %v, want a problem", st, err)
			}
			for _, w := range tt.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err, w)
				}
			}
			if st, _ := d.Status("samples"); st != UpToDate {
				t.Errorf("the samples cell above is %v, want up to date", st)
			}
		})
	}
}

// The inverse model's cap is MaxSampleDraws, the forward model's
// MaxForwardSampleDraws; a product at the cap is allowed.
func TestCheckSampleDraws(t *testing.T) {
	tests := []struct {
		model          string
		samples, draws int
		ok             bool
	}{
		{"inverse", 2000, 2000, true},
		{"inverse", 2001, 2000, false},
		{"forward", 1000, 1000, true},
		{"forward", 1001, 1000, false},
		{"inverse", 1001, 1000, true},
	}
	for _, tt := range tests {
		if err := checkSampleDraws(tt.model, tt.samples, tt.draws); (err == nil) != tt.ok {
			t.Errorf("%s %d × %d: got %v, want ok %v", tt.model, tt.samples, tt.draws, err, tt.ok)
		}
	}
	if err := checkCatchmentSamples(MaxCatchmentSamples); err != nil {
		t.Errorf("the catchment-wide model at its limit of samples: %v", err)
	}
	if err := checkCatchmentSamples(MaxCatchmentSamples + 1); err == nil || !strings.Contains(err.Error(), "per-sample model") {
		t.Errorf("one sample above the catchment-wide model's limit: %v, want a refusal that names the per-sample model", err)
	}
	if err := checkBootstrapWork("bootstrap", 1000, 50, MaxBootstrapWork/1000-50); err != nil {
		t.Errorf("work at the limit: %v", err)
	}
	if err := checkBootstrapWork("bootstrap", 1000, 50, MaxBootstrapWork/1000-49); err == nil {
		t.Errorf("work one replicate-day above the limit was accepted")
	}
}

// A setting out of its range is refused with the page's label (a budget
// file's reader names its key instead: TestBrokenCellsKeepTheirText).
func TestSettingRangeNamesLabel(t *testing.T) {
	d := demoDocument(t)
	for key, want := range map[string]string{
		"draws":     "prior draws (first stage): 2e+06 is outside [1, 1e+06]",
		"bootstrap": "bootstrap replicates: 2e+06 is outside [1, 100000]",
	} {
		cell := "fluxes"
		if key == "draws" {
			cell = "apportionment"
		}
		if err := d.SetParam(cell, key, "2000000"); err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%s: got %v, want %q", key, err, want)
		}
	}
}

// A table beyond MaxColumns or MaxRows is refused by an edit.
func TestTableLimits(t *testing.T) {
	d := demoDocument(t)
	wide := &Table{Columns: make([]string, MaxColumns+1)}
	long := &Table{Columns: []string{"date", "Q (m3/s)"}, Rows: make([][]string, MaxRows+1)}
	for name, tab := range map[string]*Table{"columns": wide, "rows": long} {
		err := d.SetTable("discharge", tab)
		if err == nil || !strings.Contains(err.Error(), "above the limit of 1,000 columns or 2,000,000 rows") {
			t.Errorf("%s: got %v", name, err)
		}
	}
}

// Cancelling a recompute inside the fluxes cell's bootstraps stops it
// there: Recompute returns the context's error and the cell keeps no
// result. The cancel comes from the cell's own progress reports, so the
// test does not depend on the machine's speed.
func TestCancelInsideBootstrap(t *testing.T) {
	d := demoDocument(t)
	d.Workers = 1
	// Every series takes 40,000 replicates, so the cancel falls inside the
	// first series' bootstrap, which reports after every replicate.
	for _, key := range []string{"bootstrap", "series_bootstrap"} {
		if err := d.SetParam("fluxes", key, "40000"); err != nil {
			t.Fatal(err)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	reports := 0
	err := d.Recompute(ctx, func(p Progress) {
		if p.Cell == "fluxes" {
			if reports++; reports == 200 {
				cancel()
			}
		}
	})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
	if st, _ := d.Status("fluxes"); st == UpToDate {
		t.Errorf("the fluxes cell is up to date after a cancel")
	}
	if reports > 202 {
		t.Errorf("%d progress reports after the cancel; the bootstrap did not stop at its next replicate", reports-200)
	}
}

func TestGrouped(t *testing.T) {
	for n, want := range map[int]string{0: "0", 999: "999", 1000: "1,000", 1234567: "1,234,567", -1234: "-1,234"} {
		if got := grouped(n); got != want {
			t.Errorf("grouped(%d) = %q, want %q", n, got, want)
		}
	}
}
