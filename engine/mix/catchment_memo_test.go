package mix

import (
	"context"
	"testing"
)

// TestTakeSearches: a run handed the mode searches of a quicker run of the
// same problem (the page's quick pass, then its full pass) takes them and
// gives the same bits as searching again, in-process and in steps; a run
// of another problem, seed, scatter prior or set of options the searches
// read takes nothing and searches itself.
func TestTakeSearches(t *testing.T) {
	p, o, co := quickCatchment()
	quick := &CatchmentOptions{Warmup: 200, Batch: 100, MaxSteps: 100, Keep: 40}
	qo := *o
	qo.Draws, qo.TargetESS = 30, 20
	first, err := InvertCatchment(context.Background(), p, &qo, quick)
	if err != nil {
		t.Fatal(err)
	}
	s := first.Catchment.Searches()
	if s == nil {
		t.Fatal("no searches recorded")
	}
	ref, err := InvertCatchment(context.Background(), p, o, co)
	if err != nil {
		t.Fatal(err)
	}
	with := *co
	with.Searches = s
	got, err := InvertCatchment(context.Background(), p, o, &with)
	if err != nil {
		t.Fatal(err)
	}
	if got.Checksum() != ref.Checksum() || got.Catchment.Search != ref.Catchment.Search {
		t.Errorf("with the searches taken over: checksum %#x and %d evaluations, want %#x and %d",
			got.Checksum(), got.Catchment.Search, ref.Checksum(), ref.Catchment.Search)
	}
	c, err := NewCatchmentRun(p, o, &with)
	if err != nil {
		t.Fatal(err)
	}
	if !c.cat.SearchesTaken() || !got.Catchment.SearchesTaken() || ref.Catchment.SearchesTaken() {
		t.Fatal("the searches were not taken over, or taken where none were given")
	}
	for _, ch := range c.chains {
		if !ch.search.done {
			t.Fatal("the searches were not taken over")
		}
	}
	for !c.Step(context.Background(), 500) {
	}
	if c.Result().Checksum() != ref.Checksum() {
		t.Errorf("in steps: checksum %#x, want %#x", c.Result().Checksum(), ref.Checksum())
	}

	other := func(name string, p Problem, o *Options, co CatchmentOptions) {
		t.Helper()
		co.Searches = s
		c, err := NewCatchmentRun(p, o, &co)
		if err != nil {
			t.Fatal(err)
		}
		if c.cat.SearchesTaken() {
			t.Errorf("%s: searches taken over", name)
		}
		for _, ch := range c.chains {
			if ch.search.done || ch.search.evals != 0 {
				t.Errorf("%s: a chain's search taken over", name)
				return
			}
		}
	}
	seed := *o
	seed.Seed++
	other("another seed", p, &seed, *co)
	rain := *o
	rain.ScaleCl = !rain.ScaleCl
	other("another rain option", p, &rain, *co)
	scatter := *co
	scatter.Scatter = 0.2
	other("another scatter prior", p, o, scatter)
	chains := *co
	chains.Chains = 3
	other("other chains", p, o, chains)
	moved := p
	moved.Waters = append([]Water(nil), p.Waters...)
	w := moved.Waters[5] // another list of the same waters: still the same problem
	c, err = NewCatchmentRun(moved, o, &with)
	if err != nil || !c.cat.SearchesTaken() {
		t.Errorf("a copy of the same problem: searches not taken over (%v)", err)
	}
	w.Name = "renamed"
	moved.Waters[5] = w
	other("a sample renamed", moved, o, *co)
	moved.Waters[5] = makeCatchment(12, 2, 12).prob.Waters[5]
	moved.Waters[5].Name = p.Waters[5].Name
	other("a sample's data changed", moved, o, *co)
}
