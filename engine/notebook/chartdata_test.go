package notebook_test

import (
	"context"
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/notebook"
)

func TestPositiveRange(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		name   string
		v      []float64
		lo, hi float64
	}{
		{"spread", []float64{3, -1, 0, 0.5, nan, math.Inf(1), 7}, 0.5, 7},
		{"one value", []float64{2, 2}, 1, 4},
		{"none", []float64{0, -3, nan}, 1, 10},
	}
	for _, tt := range tests {
		if lo, hi := notebook.PositiveRange(tt.v); lo != tt.lo || hi != tt.hi {
			t.Errorf("%s: %g to %g, want %g to %g", tt.name, lo, hi, tt.lo, tt.hi)
		}
	}
}

// TestCQ: the curve the page draws is the rating curve the fluxes cell
// fits, C = a Q^b, over the samples' discharges.
func TestCQ(t *testing.T) {
	d, _ := load(t, "../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	var v *notebook.Fluxes
	for _, c := range d.Cells {
		if f, ok := d.Output(c.ID).Value.(*notebook.Fluxes); ok && c.Kind == notebook.KindFluxes {
			v = f
		}
	}
	if v == nil {
		t.Fatal("no fluxes cell")
	}
	cqs := v.CQ(chem.Na, chem.Ca)
	if len(cqs) != 2 {
		t.Fatalf("%d series, want 2", len(cqs))
	}
	for _, cq := range cqs {
		if cq.Fit == nil || len(cq.CurveQ) != 41 || len(cq.Q) != len(cq.Names) || len(cq.C) != len(cq.Names) {
			t.Fatalf("%s: fit %v, %d curve points, %d samples", cq.Species, cq.Fit, len(cq.CurveQ), len(cq.Names))
		}
		lo, hi := notebook.PositiveRange(cq.Q)
		if cq.CurveQ[0] != lo || math.Abs(cq.CurveQ[40]-hi) > 1e-9*hi {
			t.Errorf("%s: curve from %g to %g, samples from %g to %g", cq.Species, cq.CurveQ[0], cq.CurveQ[40], lo, hi)
		}
		for j, q := range cq.CurveQ {
			if want := cq.Fit.A * math.Pow(q, cq.Fit.B); math.Abs(cq.CurveC[j]-want) > 1e-12*want {
				t.Errorf("%s: C(%g) = %g, the fit gives %g", cq.Species, q, cq.CurveC[j], want)
			}
		}
	}
}
