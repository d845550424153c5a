package notebook

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"
)

// countingFuncs returns compute functions that record nothing but pass a
// number down the chain: each cell outputs 1 + the sum of its inputs, so a
// wrong order or a missing rerun shows in the numbers.
func countingFuncs() map[Kind]ComputeFunc {
	f := func(e *Env) (*Output, error) {
		sum := 1.0
		for _, r := range e.Cell.Kind.Roles() {
			o, err := e.Input(r.Name)
			if err != nil {
				return nil, err
			}
			if o != nil {
				sum += o.Figures[0].Median
			}
		}
		if s, ok := e.Cell.Settings.(*AtmosphereSettings); ok {
			sum += s.NaPerCl
		}
		e.Report(1, 1)
		return &Output{Figures: []Figure{Point("value", "", sum)}}, nil
	}
	m := map[Kind]ComputeFunc{}
	for _, k := range Kinds {
		m[k] = f
	}
	return m
}

// chainDoc is a budget with one cell of every kind, in the usual order.
func chainDoc(t *testing.T) *Document {
	t.Helper()
	d := New("chain")
	d.funcs = countingFuncs()
	for _, k := range []Kind{KindSite, KindSamples, KindDischarge, KindAtmosphere, KindSources,
		KindApportionment, KindFluxes, KindCO2, KindNote} {
		if _, err := d.Add(k, -1); err != nil {
			t.Fatal(err)
		}
	}
	return d
}

func TestRecomputeOnlyDownstream(t *testing.T) {
	d := chainDoc(t)
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, c := range d.Cells {
		if got := d.Runs(c.ID); got != 1 {
			t.Errorf("first compute: cell %s ran %d times, want 1", c.ID, got)
		}
	}
	if err := d.SetParam("atmosphere", "na_per_cl", "0.9"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	want := map[string]int{"site": 1, "samples": 1, "discharge": 1, "sources": 1, "note": 1,
		"atmosphere": 2, "apportionment": 2, "fluxes": 2, "co2": 2}
	for id, w := range want {
		if got := d.Runs(id); got != w {
			t.Errorf("after editing atmosphere: cell %s ran %d times, want %d", id, got, w)
		}
	}
	// The new ratio reached the bottom: co2 = 1 + fluxes, fluxes = 1 + app + discharge + site ...
	if got := d.Output("atmosphere").Figures[0].Median; got != 1+1+1+0.9 { // 1 + samples(1) + site(1) + ratio
		t.Errorf("atmosphere value %g, want %g", got, 3.9)
	}
}

func TestRevision(t *testing.T) {
	d := chainDoc(t)
	r0 := d.Revision()
	if err := d.SetParam("site", "area_km2", "12.5"); err != nil {
		t.Fatal(err)
	}
	if d.Revision() == r0 {
		t.Errorf("revision unchanged after an edit")
	}
	r1 := d.Revision()
	if err := d.SetParam("site", "area_km2", "lots"); err == nil {
		t.Errorf("a non-number area was accepted")
	}
	if err := d.SetParam("site", "area_km2", "-3"); err == nil {
		t.Errorf("a negative area was accepted")
	}
	if d.Revision() != r1 {
		t.Errorf("revision changed after a refused edit")
	}
	if got := d.Cell("site").Settings.(*SiteSettings).AreaKm2; got != 12.5 {
		t.Errorf("area after refused edits = %g, want 12.5", got)
	}
}

func TestCycleRejected(t *testing.T) {
	d := chainDoc(t)
	// Two charts that read each other form a loop.
	c2 := NewCell(KindChart, "c2", "")
	c2.Settings.(*ChartSettings).X = "c3.t.x"
	c3 := NewCell(KindChart, "c3", "")
	c3.Settings.(*ChartSettings).X = "c2.t.x"
	if err := d.Insert(c2, -1); err != nil {
		t.Fatal(err)
	}
	r := d.Revision()
	err := d.Insert(c3, -1)
	var ce *CycleError
	if !errors.As(err, &ce) {
		t.Fatalf("inserting a loop: got %v, want a CycleError", err)
	}
	if !strings.Contains(err.Error(), "c2 → c3 → c2") && !strings.Contains(err.Error(), "c3 → c2 → c3") {
		t.Errorf("message %q does not show the loop", err)
	}
	if d.Revision() != r || d.Cell("c3") != nil {
		t.Errorf("the refused edit changed the document")
	}
	// An input pointed at a cell below that reads this one is a loop too.
	c4 := NewCell(KindChart, "c4", "")
	c4.Settings.(*ChartSettings).Y = "co2.t.y"
	d.Insert(c4, 0)
	d.SetParam("c4", "x", "co2.t.x")
	if err := d.SetParam("c2", "x", "c4.t.x"); err != nil {
		t.Fatalf("a legal reference was refused: %v", err)
	}
	// The same loop in a file is refused with the same message.
	d2 := New("loop file")
	d2.Cells = []*Cell{c2, c3}
	_, err = Parse(d2.Marshal(), "loop.lixiv.json")
	if err == nil || !strings.Contains(err.Error(), "loop") || !strings.Contains(err.Error(), "loop.lixiv.json") {
		t.Errorf("parsing a loop: got %v, want an error naming the file and the loop", err)
	}
}

func TestInputProblemsWait(t *testing.T) {
	d := chainDoc(t)
	d.funcs[KindSamples] = func(e *Env) (*Output, error) { return nil, fmt.Errorf("row 3, column Ca: not a number") }
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	st, err := d.Status("samples")
	if st != Problem || err == nil || !strings.Contains(err.Error(), "row 3") {
		t.Errorf("samples: got %v %v, want a problem naming row 3", st, err)
	}
	for _, id := range []string{"atmosphere", "apportionment", "fluxes", "co2"} {
		if st, err := d.Status(id); st != Waiting {
			t.Errorf("%s: got %v (%v), want waiting", id, st, err)
		}
	}
	if st, _ := d.Status("site"); st != UpToDate {
		t.Errorf("site: got %v, want up to date", st)
	}
}

func TestStepAndCancel(t *testing.T) {
	d := chainDoc(t)
	var seen []string
	more, err := d.Step(context.Background(), func(p Progress) { seen = append(seen, p.Cell) })
	if err != nil || !more {
		t.Fatalf("first step: more=%v err=%v, want more and no error", more, err)
	}
	if len(seen) != 1 || seen[0] != "site" {
		t.Errorf("progress after one step: %v, want [site]", seen)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := d.Step(ctx, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled step: got %v, want context.Canceled", err)
	}
	if n := len(d.Pending()); n != len(d.Cells)-1 {
		t.Errorf("pending after one step: %d, want %d", n, len(d.Cells)-1)
	}
}

func TestPanicBecomesProblem(t *testing.T) {
	d := chainDoc(t)
	d.funcs[KindSources] = func(e *Env) (*Output, error) { var m map[string]int; m["x"]++; return nil, nil }
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if st, err := d.Status("sources"); st != Problem || !strings.Contains(err.Error(), "internal error") {
		t.Errorf("got %v %v, want a problem saying internal error", st, err)
	}
}

func TestMoveChangesImplicitInputs(t *testing.T) {
	d := chainDoc(t)
	d.Recompute(context.Background(), nil)
	s2, _ := d.Add(KindSamples, -1) // a second samples cell at the bottom: nobody uses it
	d.Recompute(context.Background(), nil)
	if d.Runs("atmosphere") != 1 {
		t.Errorf("adding an unused cell reran atmosphere")
	}
	// Moving it just above the atmosphere cell makes it the atmosphere's input.
	if err := d.Move(s2.ID, d.index("atmosphere")); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	if d.Runs("atmosphere") != 2 || d.Runs("site") != 1 {
		t.Errorf("after the move: atmosphere ran %d, site %d; want 2 and 1", d.Runs("atmosphere"), d.Runs("site"))
	}
}

func TestRoundTripFramework(t *testing.T) {
	d := chainDoc(t)
	d.SetParam("note", "text", "Fortnightly grab samples.\nSecond line, \"quoted\" <b>not markup</b>.")
	d.SetTable("samples", &Table{Columns: []string{"sample", "date", "Na", "Ca"}, Units: []string{"", "", "mg/L", "mg/L"},
		Rows: [][]string{{"A1", "2021-10-04", "2.31", "<0.01"}, {"A2", "2021-10-18", "2.0", "n.d."}, {"A,3", "", "1e-3", "-0"}}})
	d.SetParam("apportionment", "tracers", "Ca/Na, Mg/Na")
	b1 := d.Marshal()
	d2, err := Parse(b1, "t")
	if err != nil {
		t.Fatal(err)
	}
	b2 := d2.Marshal()
	if !bytes.Equal(b1, b2) {
		t.Errorf("round trip changed the file:\n%s\n----\n%s", b1, b2)
	}
	if got := d2.Cell("samples").Table.Rows[1][2]; got != "2.0" {
		t.Errorf("table text %q, want 2.0 kept as written", got)
	}
	if !strings.Contains(string(b1), `["A1", "2021-10-04", 2.31, "<0.01"]`) {
		t.Errorf("rows are not one line each:\n%s", b1)
	}
}

func TestRepairBrokenCell(t *testing.T) {
	src := `{"format": "lixiv-budget", "version": 1, "cells": [
 {"id": "site", "kind": "site", "settings": {"area_km2": "twelve"}}]}`
	d, err := Parse([]byte(src), "r")
	if err != nil {
		t.Fatal(err)
	}
	if !d.Cells[0].Broken() {
		t.Fatalf("cell not broken")
	}
	if err := d.Repair("site", []byte(`{"id": "site", "kind": "site", "settings": {"area_km2": -1}}`)); err == nil {
		t.Errorf("a repair with a negative area was accepted")
	}
	if !d.Cells[0].Broken() {
		t.Errorf("a refused repair changed the cell")
	}
	r := d.Revision()
	if err := d.Repair("site", []byte(`{"id": "site", "kind": "site", "settings": {"area_km2": 12}}`)); err != nil {
		t.Fatal(err)
	}
	if d.Cells[0].Broken() || d.Cells[0].Settings.(*SiteSettings).AreaKm2 != 12 || d.Revision() == r {
		t.Errorf("repair did not install the cell")
	}
	if st, _ := d.Status("site"); st != Stale {
		t.Errorf("repaired cell is %v, want stale", st)
	}
}

func TestInsertChecksCells(t *testing.T) {
	d := New("x")
	tests := []struct {
		name string
		c    *Cell
		want string
	}{
		{"bad id", &Cell{ID: "a.b", Kind: KindNote}, "may hold only"},
		{"bad kind", &Cell{ID: "a", Kind: "wizard"}, "unknown cell kind"},
		{"wrong settings", &Cell{ID: "a", Kind: KindNote, Settings: &SiteSettings{}}, "site settings on a note cell"},
		{"bad value", &Cell{ID: "a", Kind: KindSite, Settings: &SiteSettings{AreaKm2: -1, WaterYearStart: 1}}, "area (km²): -1 is outside"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if err := d.Insert(tt.c, -1); err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("got %v, want an error containing %q", err, tt.want)
			}
		})
	}
	if err := d.Insert(&Cell{ID: "n", Kind: KindNote}, -1); err != nil || d.Cell("n").Settings == nil {
		t.Errorf("a cell without settings: %v; want defaults", err)
	}
	cl := d.Clone()
	cl.SetParam("n", "text", "changed")
	if d.Cell("n").Settings.(*NoteSettings).Text == "changed" {
		t.Errorf("editing a clone changed the original")
	}
}

func TestChunkedInverseMatches(t *testing.T) {
	// The demo computed on one goroutine in chunks, with progress, gives the
	// stored results (computed on all cores).
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Workers = 1
	reports := 0
	last := Progress{}
	err = d.Recompute(context.Background(), func(p Progress) {
		if p.Cell == "apportionment" {
			reports++
			if p.Done < last.Done && last.Cell == p.Cell {
				t.Errorf("progress went back: %v after %v", p, last)
			}
			last = p
		}
	})
	if err != nil {
		t.Fatal(err)
	}
	if reports < 5 || last.Done != last.Total {
		t.Errorf("%d progress reports ending at %d of %d; want several, ending at the total", reports, last.Done, last.Total)
	}
	if v, err := d.Verify(); err != nil || !v.Match {
		t.Errorf("chunked run does not match the stored results: %v %v", v, err)
	}
}
