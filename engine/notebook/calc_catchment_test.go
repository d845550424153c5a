package notebook

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"lixiv/engine/flux"
)

// TestCatchmentModelInTheBudget runs the demo budget under the
// catchment-wide model: the apportionment hands on joint draws (the same
// number for every sample with draws), the fluxes cell takes them one draw
// number per replicate, the shared ratios come as a table with prior and
// posterior side by side and as marks on the mixing diagrams, and the
// counting check (or the fall back) is named among the warnings.
func TestCatchmentModelInTheBudget(t *testing.T) {
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.SetParam("apportionment", "model", "catchment"); err != nil {
		t.Fatal(err)
	}
	if err := d.SetParam("apportionment", "tracers", "Ca/Na, Mg/Na, HCO3/Na"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	out := d.Output("apportionment")
	a := out.Value.(*Apportioned)
	named := func(prefix string) bool {
		for _, w := range out.Warnings {
			if strings.HasPrefix(w, prefix) {
				return true
			}
		}
		return false
	}
	if !named("catchment-wide model: ") {
		t.Fatalf("the counting check is not named among the warnings: %q", out.Warnings)
	}
	if a.Catchment == nil {
		t.Fatalf("fell back to the per-sample model (%q): the demo's samples should identify the shared ratios", out.Warnings)
	}
	if !a.Joint || a.Model != "catchment" {
		t.Fatalf("Joint %v, model %q", a.Joint, a.Model)
	}
	nd := -1
	for i := range a.Names {
		if !a.Usable(i) {
			continue
		}
		if nd >= 0 && a.Kept(i) != nd {
			t.Fatalf("sample %d has %d joint draws, others %d", i, a.Kept(i), nd)
		}
		nd = a.Kept(i)
	}
	tab := out.Table("shared")
	if tab == nil || len(tab.Columns[0].Text) != len(a.Catchment.Ratios)+len(a.Catchment.Scatter) {
		t.Fatal("no table of the shared ratios")
	}
	if len(a.Diagram.Shared) != len(a.Catchment.Ratios) {
		t.Fatalf("%d shared marks for %d ratios", len(a.Diagram.Shared), len(a.Catchment.Ratios))
	}
	doubt := strings.Join(out.Doubtful, "; ")
	if a.Catchment.Converged == strings.Contains(doubt, "have not converged") {
		t.Fatalf("converged %v, doubtful %q", a.Catchment.Converged, doubt)
	}
	fv := d.Output("fluxes").Value.(*Fluxes)
	if fv.Bootstrap.Draws != flux.JointDraw {
		t.Fatal("the fluxes cell does not take the joint draws together")
	}
	for _, c := range []string{"fluxes", "co2"} {
		if w := strings.Join(d.Output(c).Warnings, "; "); strings.Contains(w, "averaged away") {
			t.Errorf("%s: joint draws, yet the caution on per-sample draws: %q", c, w)
		}
	}
}

// TestPerSampleDrawsCautioned: with draws that are each sample's own (the
// forward and per-sample inverse models) the fluxes and CO2 cells say that
// their intervals leave out an end-member error the samples share; with
// no draws (draws 0 is refused, so the quick pass's point values stand in)
// there is nothing to say.
func TestPerSampleDrawsCautioned(t *testing.T) {
	for _, model := range []string{"inverse", "forward"} {
		t.Run(model, func(t *testing.T) {
			d := demoDocument(t)
			for _, p := range [][2]string{{"model", model}, {"draws", "100"}, {"target_ess", "50"}} {
				if err := d.SetParam("apportionment", p[0], p[1]); err != nil {
					t.Fatal(err)
				}
			}
			if err := d.SetParam("fluxes", "bootstrap", "20"); err != nil {
				t.Fatal(err)
			}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			for _, c := range []string{"fluxes", "co2"} {
				if w := strings.Join(d.Output(c).Warnings, "; "); !strings.Contains(w, "averaged away") || !strings.Contains(w, "catchment-wide") {
					t.Errorf("%s: no caution on per-sample draws among %q", c, w)
				}
			}
		})
	}
	if w := sharedEndMemberCaution(&Apportioned{}, "x"); w != "" {
		t.Errorf("no draws: %q, want no caution", w)
	}
}

// TestFullPassTakesQuickSearches: with Document.Quick, the catchment-wide
// model's full pass takes over the mode searches of its quick pass (the
// refined results are checked against the stored ones by
// TestQuickPassRefinesToTheSameResults); an edit between the passes makes
// the full pass search again.
func TestFullPassTakesQuickSearches(t *testing.T) {
	for _, edit := range []bool{false, true} {
		d, err := loadFile("../../examples/scarrow-ghyll/scarrow-ghyll.lixiv.json")
		if err != nil {
			t.Fatal(err)
		}
		d.Quick = true
		ctx := context.Background()
		for !d.QuickPassDone() {
			if _, err := d.Step(ctx, nil); err != nil {
				t.Fatal(err)
			}
		}
		id := ""
		for _, c := range d.Cells {
			if s, ok := c.Settings.(*ApportionmentSettings); ok && s.Model == "catchment" {
				id = c.ID
			}
		}
		if id == "" {
			t.Fatal("no catchment-wide apportionment in the example")
		}
		if d.searchesOf(FarmJob{Cell: id}) == nil {
			t.Fatal("the quick pass kept no searches")
		}
		if edit {
			// Another seed: the searches start elsewhere.
			s := d.Cell(id).Settings.(*ApportionmentSettings)
			if err := d.SetParam(id, "seed", fmt.Sprint(s.Seed+1)); err != nil {
				t.Fatal(err)
			}
			d.Quick = false
		}
		if err := d.Recompute(ctx, nil); err != nil {
			t.Fatal(err)
		}
		a := d.Output(id).Value.(*Apportioned)
		if a.inverse == nil || a.inverse.Catchment == nil {
			t.Fatal("no catchment-wide result")
		}
		if got := a.inverse.Catchment.SearchesTaken(); got == edit {
			t.Errorf("edited between the passes %v: searches taken over %v", edit, got)
		}
	}
}
