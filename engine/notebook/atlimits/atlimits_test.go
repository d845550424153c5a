package atlimits

import (
	"context"
	"os"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/notebook"
)

// The budget sits at the limits: a target ESS one higher, or one replicate more, is
// refused before any work (the computation at the limits themselves is
// BenchmarkWorstAllowed's, too long for a test).
func TestAtTheLimits(t *testing.T) {
	demo, err := os.ReadFile("../../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, cell string
		set        [][3]string
		want       string
	}{
		{"one more effective draw", "apportionment", [][3]string{{"apportionment", "target_ess", strconv.Itoa(Draws + 1)}}, "above the limit of 4,000,000"},
		{"one replicate more", "fluxes", [][3]string{{"apportionment", "draws", "1"}, {"apportionment", "target_ess", "1"}, {"apportionment", "max_draws", "1"}, {"fluxes", "bootstrap", strconv.Itoa(Replicates + 1)}},
			"bootstrap replicates (bootstrap): 648 replicates × (4,000 samples + 73,200 days of discharge)"},
		{"one series replicate more", "fluxes", [][3]string{{"apportionment", "draws", "1"}, {"apportionment", "target_ess", "1"}, {"apportionment", "max_draws", "1"}, {"fluxes", "series_bootstrap", strconv.Itoa(Replicates + 1)}},
			"series bootstrap replicates (series_bootstrap): 648 replicates"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d, err := Budget(demo)
			if err != nil {
				t.Fatal(err)
			}
			for _, s := range tt.set {
				if err := d.SetParam(s[0], s[1], s[2]); err != nil {
					t.Fatal(err)
				}
			}
			d.Recompute(context.Background(), nil)
			st, err := d.Status(tt.cell)
			if st != notebook.Problem || err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("got %v %v, want a problem containing %q", st, err, tt.want)
			}
			for _, c := range []string{"samples", "discharge"} {
				if st, err := d.Status(c); st != notebook.UpToDate {
					t.Errorf("%s: %v %v", c, st, err)
				}
			}
		})
	}
}
