package notebook

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"strings"
	"testing"

	"lixiv/engine/compare"
)

// sectionDoc is a budget of two sections, A and B, each with a site and a
// discharge cell, and a shared site between them, computed with the
// counting functions.
func sectionDoc(t *testing.T) *Document {
	t.Helper()
	d := New("sections")
	d.funcs = countingFuncs()
	for _, c := range []struct {
		k          Kind
		id, sector string
	}{
		{KindSite, "site-a", "A"}, {KindSite, "shared-site", ""}, {KindSite, "site-b", "B"},
		{KindDischarge, "q-a", "A"}, {KindDischarge, "q-b", "B"}, {KindDischarge, "q-c", "C"}, {KindDischarge, "q-shared", ""},
	} {
		cell := NewCell(c.k, c.id, "")
		cell.Section = c.sector
		if err := d.Insert(cell, -1); err != nil {
			t.Fatal(err)
		}
	}
	return d
}

// TestSectionResolution: a role reads the nearest cell of its kind above in
// its own section, else the nearest shared cell above; a shared cell reads
// shared cells only; a budget without sections reads as before.
func TestSectionResolution(t *testing.T) {
	d := sectionDoc(t)
	site := Role{"site", KindSite, true}
	for _, c := range []struct{ cell, want string }{
		{"q-a", "site-a"},           // its own section, though site-b and the shared site are nearer
		{"q-b", "site-b"},           // its own
		{"q-c", "shared-site"},      // section C has no site: the shared one
		{"q-shared", "shared-site"}, // a shared cell reads shared cells only
	} {
		if got, err := d.resolve(d.Cell(c.cell), site); got != c.want || err != nil {
			t.Errorf("%s reads %q (%v), want %q", c.cell, got, err, c.want)
		}
	}
	// A required role with nothing in the section or shared: the message
	// names the section.
	a := NewCell(KindAtmosphere, "rain-c", "")
	a.Section = "C"
	if err := d.Insert(a, -1); err != nil {
		t.Fatal(err)
	}
	if _, err := d.resolve(a, Role{"samples", KindSamples, false}); err == nil || !strings.Contains(err.Error(), `in section "C", or a shared one`) {
		t.Errorf("missing samples: %v", err)
	}
	// Moving site-a out of section A makes q-a read... the nearest shared
	// site above it (site-a itself, now shared), and it becomes stale.
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if err := d.SetSection("shared-site", "A"); err != nil {
		t.Fatal(err)
	}
	if got, _ := d.resolve(d.Cell("q-c"), site); got != "" {
		t.Errorf("with no shared site left, q-c reads %q, want none", got)
	}
	if st, _ := d.Status("q-c"); st != Stale {
		t.Errorf("q-c is %v after its site left, want stale", st)
	}
	if got, _ := d.resolve(d.Cell("q-a"), site); got != "shared-site" {
		t.Errorf("q-a reads %q, want the nearer site of its section, shared-site", got)
	}
	if err := d.SetSection("q-a", " A"); err == nil {
		t.Error("a section name starting with a space is refused")
	}
	if got := strings.Join(d.Sections(), "|"); got != "A|B|C" {
		t.Errorf("sections %q, want A|B|C", got)
	}
}

// TestSectionFile: a budget with sections is written as version 2 with each
// cell's section after its title, and reads back the same; one without
// sections is written as version 1.
func TestSectionFile(t *testing.T) {
	d := sectionDoc(t)
	b := d.Marshal()
	if !strings.Contains(string(b), `"version": 2`) || !strings.Contains(string(b), "\"title\": \"\",\n      \"section\": \"A\",\n") {
		t.Fatalf("file:\n%s", b)
	}
	e, err := Parse(b, "sections")
	if err != nil {
		t.Fatal(err)
	}
	if string(e.Marshal()) != string(b) {
		t.Errorf("round trip changed the file:\n%s", e.Marshal())
	}
	if e.Cell("q-c").Section != "C" || e.Cell("q-shared").Section != "" {
		t.Errorf("sections read back: %q, %q", e.Cell("q-c").Section, e.Cell("q-shared").Section)
	}
	plain := New("plain")
	if _, err := plain.Add(KindSite, -1); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(plain.Marshal()), `"version": 1,`) {
		t.Errorf("a budget without sections:\n%s", plain.Marshal())
	}
	// A section name that is not one makes a broken cell; the rest loads.
	bad := strings.Replace(string(b), `"section": "B"`, `"section": "  B"`, 1)
	e, err = Parse([]byte(bad), "bad")
	if err != nil {
		t.Fatal(err)
	}
	if c := e.Cell("site-b"); c == nil || !c.Broken() || !strings.Contains(c.Problem, "space") {
		t.Errorf("a bad section: %+v", c)
	}
}

// TestMigrateSectionField: a version-1 file whose cell holds a field named
// "section" — unknown to version 1, so it meant nothing — keeps it as
// "section_v1", and the cell stays shared.
func TestMigrateSectionField(t *testing.T) {
	v1 := `{"format": "lixiv-budget", "version": 1, "title": "old", "cells": [
  {"id": "site", "kind": "site", "title": "", "section": "kept as it was", "settings": {"area_km2": 3}},
  {"id": "q", "kind": "discharge", "title": "", "settings": {}}]}`
	d, err := Parse([]byte(v1), "old")
	if err != nil {
		t.Fatal(err)
	}
	c := d.Cell("site")
	if c.Section != "" || string(c.Extra["section_v1"]) != `"kept as it was"` {
		t.Errorf("section %q, extra %s", c.Section, c.Extra["section_v1"])
	}
	if got, _ := d.resolve(d.Cell("q"), Role{"site", KindSite, true}); got != "site" {
		t.Errorf("the discharge reads %q, want site", got)
	}
	var top map[string]json.RawMessage
	if err := json.Unmarshal(d.Marshal(), &top); err != nil || string(top["version"]) != "1" {
		t.Errorf("written back as version %s (%v), want 1", top["version"], err)
	}
}

// twinSections builds, from a one-catchment budget file, a document whose
// sections are copies of it (ids prefixed with the section's letter), the
// end-member table shared, and a comparison of them at the end.
func twinSections(t *testing.T, path string, sections []string, cs *CompareSettings) *Document {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	src, err := Parse(data, path)
	if err != nil {
		t.Fatal(err)
	}
	d := New("twins")
	for _, c := range src.Cells {
		if c.Kind == KindSources {
			if err := d.Insert(c.clone(), -1); err != nil {
				t.Fatal(err)
			}
		}
	}
	for _, sec := range sections {
		for _, c := range src.Cells {
			switch c.Kind {
			case KindSources, KindNote, KindChart:
				continue
			}
			n := c.clone()
			n.ID, n.Section = sec+"-"+c.ID, sec
			if f, ok := n.Settings.(*FluxSettings); ok {
				f.Bootstrap, f.SeriesBootstrap = 50, 0
			}
			if err := d.Insert(n, -1); err != nil {
				t.Fatal(err)
			}
		}
	}
	c := NewCell(KindCompare, "cmp", "")
	c.Settings = cs
	if err := d.Insert(c, -1); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestCompareTwins: a catchment compared with itself, in both designs,
// differs by exactly zero in its point values, its paired replicates
// scatter about zero, the draws are taken once for both (one table, one
// seed), and the cell gives its tables, its design curve and its
// cautions.
func TestCompareTwins(t *testing.T) {
	for _, design := range []string{"treated-control", "before-after-control-impact"} {
		t.Run(design, func(t *testing.T) {
			cs := defaultCompareSettings()
			cs.Design, cs.Replicates, cs.Simulations = design, 200, 40
			cs.Treated, cs.Control, cs.TreatedBefore, cs.ControlBefore = "T", "C", "TB", "CB"
			cs.TonnesPerHa, cs.AreaHa, cs.CaO, cs.MgO, cs.Na2O, cs.K2O = 40, 100, 10, 7, 2.5, 0.8
			secs := []string{"T", "C"}
			if design != "treated-control" {
				secs = append(secs, "TB", "CB")
			}
			d := twinSections(t, "../../testdata/budgets/small-forward.lixiv.json", secs, cs)
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			if st, err := d.Status("cmp"); st != UpToDate {
				t.Fatalf("comparison: %v %v", st, err)
			}
			o := d.Output("cmp")
			diff := o.Table("difference")
			for i, q := range diff.Column("quantity").Text {
				if p := diff.Column("point").Num[i]; p != 0 {
					t.Errorf("%s: point difference %g, want 0", q, p)
				}
				if pa := diff.Column("p_above_zero").Num[i]; !(pa > 0.2 && pa < 0.8) {
					t.Errorf("%s: P(D > 0) = %g, want near one half", q, pa)
				}
			}
			if got := o.Table("shared").Column("drawn").Text[3]; !strings.HasPrefix(got, "once per replicate for every budget") {
				t.Errorf("apportionment draws: %q", got)
			}
			for _, name := range []string{"per-mm", "budgets", "feedstock", "years"} {
				if o.Table(name) == nil {
					t.Errorf("no %s table", name)
				}
			}
			if f := o.Figure("CO2 potential of the feedstock"); f == nil || math.Abs(f.Median-0.3528) > 5e-4 {
				t.Errorf("feedstock potential %+v, want 0.3528 t CO2/t (docs/methods.md §17)", f)
			}
			warn := strings.Join(o.Warnings, "\n")
			for _, w := range []string{"not a carbon-removal credit", "exchange sites", "degassing"} {
				if !strings.Contains(warn, w) {
					t.Errorf("no caution about %q:\n%s", w, warn)
				}
			}
		})
	}
}

// TestCompareNeedsSections: a comparison without the sections it reads
// says which setting to give; one whose budgets apportion with different
// seeds takes each sample's draw separately and says why.
func TestCompareNeedsSections(t *testing.T) {
	cs := defaultCompareSettings()
	cs.Replicates, cs.Simulations, cs.Treated = 50, 20, "T"
	d := twinSections(t, "../../testdata/budgets/small-forward.lixiv.json", []string{"T", "C"}, cs)
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if st, err := d.Status("cmp"); st != Problem || !strings.Contains(err.Error(), "control catchment: its section") {
		t.Errorf("without the control's section: %v %v", st, err)
	}
	if err := d.SetParam("cmp", "control_section", "C"); err != nil {
		t.Fatal(err)
	}
	if err := d.SetParam("C-apportionment", "seed", "2"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if st, err := d.Status("cmp"); st != UpToDate {
		t.Fatalf("%v %v", st, err)
	}
	if got := d.Output("cmp").Table("shared").Column("drawn").Text[3]; !strings.Contains(got, "different seeds (1 and 2)") {
		t.Errorf("apportionment draws: %q", got)
	}
}

// TestCompareDesign: on budgets with a complete year (apportioned with
// the inverse model, each sample's draws its own, which the cell says),
// the monitoring design gives the detectable increase at every frequency of its curve,
// falling as samples are taken more often, marks the design's own, and
// gives the samples a year needed for the target.
func TestCompareDesign(t *testing.T) {
	cs := defaultCompareSettings()
	cs.Replicates, cs.Simulations, cs.Treated, cs.Control, cs.Years = 100, 100, "T", "C", 1
	d := twinSections(t, "../../testdata/budgets/small-rain.lixiv.json", []string{"T", "C"}, cs)
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if st, err := d.Status("cmp"); st != UpToDate {
		t.Fatalf("%v %v", st, err)
	}
	o := d.Output("cmp")
	// The budget apportions with the inverse model, whose draws belong to
	// their sample: no joint draws, and the cell names the consequence.
	if got := o.Table("shared").Column("drawn").Text[3]; !strings.Contains(got, "inverse model, whose draws belong to their sample") {
		t.Errorf("apportionment draws: %q", got)
	}
	if w := strings.Join(o.Warnings, "\n"); !strings.Contains(w, "not carried as shared") {
		t.Errorf("no warning that the shared uncertainty is not carried as shared:\n%s", w)
	}
	for _, f := range o.Figures {
		if strings.Contains(f.Name, "difference in") && !strings.Contains(f.Note, "not carried as shared") {
			t.Errorf("%s: note %q", f.Name, f.Note)
		}
	}
	tb := o.Table("design")
	if tb == nil {
		t.Fatalf("no design table; warnings %q", o.Warnings)
	}
	n, inc, mark := tb.Column("samples_per_year").Num, tb.Column("detectable_increase").Num, tb.Column("design").Text
	if len(n) < len(DesignFrequencies) || !(inc[0] > inc[len(inc)-1]) {
		t.Errorf("design curve %v: %v", n, inc)
	}
	chosen := 0
	for _, m := range mark {
		if m == "chosen" {
			chosen++
		}
	}
	if chosen != 1 {
		t.Errorf("%d rows marked chosen", chosen)
	}
	found := false
	for _, f := range o.Figures {
		if strings.HasPrefix(f.Name, "samples a year needed to detect a 10 % increase") {
			found = true
		}
	}
	if !found {
		t.Errorf("no figure of the samples a year needed; warnings %q", o.Warnings)
	}
}

// TestReportSections: the report of a budget with sections gives each
// section's budget and the comparison.
func TestReportSections(t *testing.T) {
	cs := defaultCompareSettings()
	cs.Replicates, cs.Simulations, cs.Treated, cs.Control = 50, 20, "T", "C"
	d := twinSections(t, "../../testdata/budgets/small-forward.lixiv.json", []string{"T", "C"}, cs)
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	var r struct {
		Sections []struct {
			Section string                     `json:"section"`
			Area    float64                    `json:"area_km2"`
			CO2     map[string]json.RawMessage `json:"co2_consumption"`
		} `json:"sections"`
		Comparison struct {
			Design      string                     `json:"design"`
			Budgets     []map[string]string        `json:"budgets"`
			Differences map[string]json.RawMessage `json:"differences"`
			Cautions    []string                   `json:"cautions"`
		} `json:"comparison"`
	}
	if err := json.Unmarshal(d.Report().JSON(), &r); err != nil {
		t.Fatal(err)
	}
	if len(r.Sections) != 2 || r.Sections[1].Section != "C" || !(r.Sections[0].Area > 0) || r.Sections[0].CO2["silicate"] == nil {
		t.Errorf("sections %+v", r.Sections)
	}
	c := r.Comparison
	if c.Design != "treated-control" || len(c.Budgets) != 2 || c.Budgets[1]["section"] != "C" || c.Differences["silicate CO2"] == nil || len(c.Cautions) < 4 {
		t.Errorf("comparison %+v", c)
	}
}

// TestAboveFigureNotes: a probability of 1 or 0 from the paired replicates
// says that every replicate, or none, was above zero and how far the
// replicates resolve it; one in between has no such note.
func TestAboveFigureNotes(t *testing.T) {
	for _, c := range []struct {
		above float64
		want  string
	}{
		{1, "all 500 paired replicates above zero: more replicates resolve it beyond 0.998"},
		{0, "none of 500 paired replicates above zero: more replicates resolve it below 0.002"},
		{0.9, ""},
	} {
		f := aboveFigure("silicate CO2", compare.Difference{Above: c.above, Replicates: 500})
		if f.Note != c.want || f.Median != c.above {
			t.Errorf("P = %g: %v %q, want %q", c.above, f.Median, f.Note, c.want)
		}
	}
}
