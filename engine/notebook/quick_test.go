package notebook_test

import (
	"context"
	"errors"
	"math"
	"slices"
	"testing"

	"lixiv/engine/notebook"
)

// TestQuickPassRefinesToTheSameResults computes every example and golden
// budget with Document.Quick: after the quick pass an inverse apportionment
// holds a rough posterior and the fluxes and CO2 cells point values without
// intervals, all still pending; once refined,
// the results match the stored snapshot exactly, as a plain recompute does.
func TestQuickPassRefinesToTheSameResults(t *testing.T) {
	for _, path := range budgetFiles(t) {
		d, _ := load(t, path)
		d.Quick = true
		ctx := context.Background()
		// The quick pass: step until no cell is stale.
		for !d.QuickPassDone() {
			if _, err := d.Step(ctx, nil); err != nil {
				t.Fatalf("%s: %v", path, err)
			}
		}
		var refining []string
		for _, c := range d.Cells {
			st, _ := d.Status(c.ID)
			out := d.Output(c.ID)
			kind := c.Kind
			if s, ok := c.Settings.(*notebook.ApportionmentSettings); ok && s.Model == "forward" {
				kind = notebook.KindAtmosphere // the forward model has no quick form
			}
			switch kind {
			case notebook.KindApportionment, notebook.KindFluxes, notebook.KindCO2, notebook.KindMinerals:
				if st != notebook.Refining || out == nil || !out.Rough {
					t.Errorf("%s: %s after the quick pass: state %v, output %v; want refining with a rough output", path, c.ID, st, out != nil)
					continue
				}
				refining = append(refining, c.ID)
				for _, f := range out.Figures {
					if math.IsNaN(f.Median) || !math.IsNaN(f.Low) || !math.IsNaN(f.High) {
						t.Errorf("%s: %s figure %q after the quick pass: %v [%v, %v]; want a point value without an interval",
							path, c.ID, f.Name, f.Median, f.Low, f.High)
					}
				}
			case notebook.KindSamples, notebook.KindAtmosphere:
				if st != notebook.UpToDate {
					t.Errorf("%s: %s after the quick pass is %v, want up to date (it has no quick form)", path, c.ID, st)
				}
			}
		}
		if len(refining) == 0 {
			t.Errorf("%s: no cell left to refine after the quick pass", path)
		}
		if p := d.Pending(); !slices.Equal(p[:min(len(p), len(refining))], refining) {
			t.Errorf("%s: pending %v, want the refining cells first %v", path, p, refining)
		}
		if _, err := d.Snapshot(); !errors.Is(err, notebook.ErrNotComputed) {
			t.Errorf("%s: a snapshot of a half-refined budget gave %v, want ErrNotComputed", path, err)
		}
		if err := d.Recompute(ctx, nil); err != nil {
			t.Fatal(err)
		}
		for _, id := range refining {
			if st, _ := d.Status(id); st != notebook.UpToDate || d.Output(id).Rough {
				t.Errorf("%s: %s after refining is %v", path, id, st)
			}
		}
		v, err := d.Verify()
		if err != nil {
			t.Fatal(err)
		}
		if !v.Match {
			t.Errorf("%s: quick pass then refinement does not reproduce the stored results: %v", path, v.Differ)
		}
	}
}

// TestQuickPassRuns counts the computations of an edit of the rain cell
// with Document.Quick: nothing upstream reruns, the atmosphere once, the
// cells with a quick form twice (quick, then refined).
func TestQuickPassRuns(t *testing.T) {
	d, _ := load(t, "../../examples/corrie-vale/corrie-vale.lixiv.json")
	ctx := context.Background()
	if err := d.Recompute(ctx, nil); err != nil {
		t.Fatal(err)
	}
	before := map[string]int{}
	for _, c := range d.Cells {
		before[c.ID] = d.Runs(c.ID)
	}
	d.Quick = true
	if err := d.SetParam("rain", "na_per_cl", "0.80"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(ctx, nil); err != nil {
		t.Fatal(err)
	}
	want := map[notebook.Kind]int{notebook.KindSite: 0, notebook.KindSamples: 0, notebook.KindDischarge: 0,
		notebook.KindAtmosphere: 1, notebook.KindApportionment: 2, notebook.KindFluxes: 2, notebook.KindCO2: 2}
	for _, c := range d.Cells {
		w, ok := want[c.Kind]
		if !ok {
			continue
		}
		if got := d.Runs(c.ID) - before[c.ID]; got != w {
			t.Errorf("%s (%s) ran %d times after the rain edit, want %d", c.ID, c.Kind, got, w)
		}
	}
}
