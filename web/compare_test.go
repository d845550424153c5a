package web

import (
	"context"
	"encoding/json"
	"os"
	"strings"
	"testing"

	"lixiv/engine/notebook"
)

// twinBudget makes, from the small golden budget, a budget of two sections
// ("T" and "C", copies of it) with the end-member table shared and a
// comparison of them at the end, and computes it.
func twinBudget(t *testing.T) *notebook.Document {
	t.Helper()
	data, err := os.ReadFile("../testdata/budgets/small-forward.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	var top map[string]json.RawMessage
	var cells []map[string]any
	if err := json.Unmarshal(data, &top); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(top["cells"], &cells); err != nil {
		t.Fatal(err)
	}
	var out []map[string]any
	for _, c := range cells {
		if c["kind"] == "sources" {
			out = append(out, c)
		}
	}
	for _, sec := range []string{"T", "C"} {
		for _, c := range cells {
			switch c["kind"] {
			case "sources", "note", "chart":
				continue
			}
			n := map[string]any{}
			for k, v := range c {
				n[k] = v
			}
			n["id"], n["section"] = sec+"-"+c["id"].(string), sec
			out = append(out, n)
		}
	}
	out = append(out, map[string]any{"id": "cmp", "kind": "comparison", "settings": map[string]any{
		"treated_section": "T", "control_section": "C", "replicates": 50, "design_simulations": 20}})
	b, _ := json.Marshal(out)
	top["cells"], top["version"] = b, json.RawMessage("2")
	delete(top, "results")
	file, _ := json.Marshal(top)
	d, err := notebook.Parse(file, "twins")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestSectionsOnThePage: each section's first cell carries its heading,
// the shared cells are marked and headed as such, and a budget without
// sections has neither.
func TestSectionsOnThePage(t *testing.T) {
	s := NewSession(twinBudget(t), "twins.lixiv.json", Origin{})
	views := s.Cells("", 0, &ChartCache{})
	var heads []string
	for _, v := range views {
		if v.SectionHead != "" {
			heads = append(heads, v.ID+":"+v.SectionHead)
		}
		if v.Shared != (v.Section == "") {
			t.Errorf("%s: shared %v in section %q", v.ID, v.Shared, v.Section)
		}
	}
	if got := strings.Join(heads, " | "); got != "sources:Shared by every section | T-site:T | C-site:C | cmp:Shared by every section" {
		t.Errorf("section heads: %s", got)
	}
	// A cell added after a cell of a section joins the section.
	id, err := s.Add(notebook.KindNote, "T-co2")
	if err != nil || s.Doc.Cell(id).Section != "T" {
		t.Errorf("added %q (%v) in section %q, want T", id, err, s.Doc.Cell(id).Section)
	}
	if err := s.SetSection(id, ""); err != nil || s.Doc.Cell(id).Section != "" {
		t.Errorf("moved out of its section: %v", err)
	}
	plain := NewSession(demoBudget(t), "demo.lixiv.json", Origin{})
	for _, v := range plain.Cells("", 0, &ChartCache{}) {
		if v.SectionHead != "" || v.Shared {
			t.Errorf("%s: a budget without sections shows a head %q or a shared mark", v.ID, v.SectionHead)
		}
	}
}

// TestComparisonCharts: the comparison cell draws its differences per km²
// and per mm of runoff and its monitoring design from its tables.
func TestComparisonCharts(t *testing.T) {
	d := twinBudget(t)
	c := d.Cell("cmp")
	o := d.Output("cmp")
	if o == nil {
		st, err := d.Status("cmp")
		t.Fatalf("comparison not computed: %v %v", st, err)
	}
	var titles []string
	for _, ch := range Charts(d, c, o) {
		titles = append(titles, ch.Title)
		if svg := ch.SVG(); strings.Count(svg, "<path")+strings.Count(svg, "<rect") < 5 {
			t.Errorf("chart %q draws almost nothing", ch.Title)
		}
	}
	want := []string{"Difference per km² of catchment", "Difference per mm of runoff"}
	if len(titles) < len(want) {
		t.Fatalf("charts %q", titles)
	}
	for i, w := range want {
		if !strings.HasPrefix(titles[i], w) {
			t.Errorf("chart %d: %q, want %q", i, titles[i], w)
		}
	}
}

// TestComparisonSectionChoices: a comparison's section settings offer the
// budget's sections, and none.
func TestComparisonSectionChoices(t *testing.T) {
	s := NewSession(twinBudget(t), "twins.lixiv.json", Origin{})
	for _, v := range s.Cells("", 0, &ChartCache{}) {
		if v.ID != "cmp" {
			continue
		}
		for _, p := range v.Params {
			if p.Key == "control_section" {
				if strings.Join(p.Options, "|") != "|T|C" || p.OptionLabels[0] != "(none)" || p.Value != "C" {
					t.Errorf("control section choices %q %q, value %q", p.Options, p.OptionLabels, p.Value)
				}
				return
			}
		}
	}
	t.Error("no control section setting shown")
}

// TestHeadlineLeadsWithTheDifference: in a budget with a comparison, the
// summary strip starts with the comparison's differences.
func TestHeadlineLeadsWithTheDifference(t *testing.T) {
	s := NewSession(twinBudget(t), "twins.lixiv.json", Origin{})
	h := Headline(s.Cells("", 0, &ChartCache{}), 6)
	if len(h) < 2 || !strings.Contains(h[0].Name, "difference in silicate CO2") || h[0].Cell != "cmp" {
		t.Errorf("headline starts with %+v", h)
	}
}
