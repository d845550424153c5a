package notebook_test

import (
	"context"
	"testing"

	"lixiv/engine/notebook"
)

// TestExactRainCorrection checks that an exact rain correction (both
// uncertainties 0) and one whose uncertainty is too small to move any
// multiplier off 1 (exp(1e-300 z) = 1 in floating point) give the same
// bits in every cell of a forward apportionment: its per-draw correction,
// run with multipliers of 1, is the exact correction. (The inverse model
// carries the spread to first order as error sources of their own; a
// spread of 1e-298 adds terms below the last bit of most numbers, but not
// of every one, so it is not part of this check.)
func TestExactRainCorrection(t *testing.T) {
	for _, path := range []string{"../../testdata/budgets/small-forward.lixiv.json"} {
		t.Run(path, func(t *testing.T) {
			run := func(percent string) *notebook.Document {
				d, _ := load(t, path)
				id := d.Cells[indexOf(d, notebook.KindAtmosphere)].ID
				for _, k := range []string{"rain_ratio_uncertainty_percent", "et_factor_uncertainty_percent"} {
					if err := d.SetParam(id, k, percent); err != nil {
						t.Fatal(err)
					}
				}
				if err := d.Recompute(context.Background(), nil); err != nil {
					t.Fatal(err)
				}
				return d
			}
			exact, unit := run("0"), run("1e-298")
			for _, c := range exact.Cells {
				a, b := exact.Output(c.ID), unit.Output(c.ID)
				if a == nil || b == nil {
					t.Fatalf("cell %s did not compute", c.ID)
				}
				sameOutputs(t, c.ID, a, b)
			}
		})
	}
}

// TestRainUncertaintyWidensTheAtmosphericShare checks that the rain
// uncertainty reaches the apportionment: the 95 % interval of the
// atmospheric share of Na is wider with it than without it in every
// sample. Without it the forward model's atmospheric share is the same in
// every draw (low = median = high); the inverse model of small-rain also
// gives some Na* to its rain end-member, so it has an interval even then.
func TestRainUncertaintyWidensTheAtmosphericShare(t *testing.T) {
	width := func(path, percent string) (w, med []float64) {
		d, _ := load(t, path)
		if err := d.SetParam("rain", "rain_ratio_uncertainty_percent", percent); err != nil {
			t.Fatal(err)
		}
		if err := d.Recompute(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
		tab := d.Output("apportionment").Table("shares")
		lo, hi := tab.Column("Na_atmosphere_low").Num, tab.Column("Na_atmosphere_high").Num
		for i := range lo {
			w = append(w, hi[i]-lo[i])
		}
		return w, tab.Column("Na_atmosphere").Num
	}
	for _, tc := range []struct {
		path       string
		exactPoint bool // the exact correction gives a point value
	}{{"../../testdata/budgets/small-forward.lixiv.json", true}, {"../../testdata/budgets/small-rain.lixiv.json", false}} {
		w0, med := width(tc.path, "0")
		w10, _ := width(tc.path, "10")
		for i := range w0 {
			if !(med[i] > 0) {
				continue
			}
			if tc.exactPoint && w0[i] != 0 {
				t.Errorf("%s sample %d: exact correction gives an interval %g wide", tc.path, i+1, w0[i])
			}
			if !(w10[i] > w0[i]) {
				t.Errorf("%s sample %d: interval of the Na atmospheric share %g with 10 %%, %g without; want wider", tc.path, i+1, w10[i], w0[i])
			}
		}
	}
}

func indexOf(d *notebook.Document, k notebook.Kind) int {
	for i, c := range d.Cells {
		if c.Kind == k {
			return i
		}
	}
	return -1
}
