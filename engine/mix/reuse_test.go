package mix

import (
	"context"
	"fmt"
	"math"
	"slices"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// sulfateProblems returns determinismProblem's waters (with the rain
// ratios' spread) given sulfate, corrected with all the sulfate above the
// rain share from gypsum and from sulfide oxidation: samples 1 and 3 have
// some, the others less sulfate than their rain share (SO4* < 0), so that
// only 1 and 3 differ between the two problems.
func sulfateProblems(t *testing.T) (gypsum, sulfide Problem, o *Options, changed []int) {
	t.Helper()
	p, o := determinismProblem()
	gypsum, sulfide = p, p
	gypsum.Waters = slices.Clone(p.Waters)
	sulfide.Waters = slices.Clone(p.Waters)
	sea := correct.SeaSalt()
	for i, w := range p.Waters {
		c := w.Correction.Input
		c[chem.SO4] = 0.5 * c[chem.Cl] * sea[chem.SO4] // below the rain share
		if i == 1 || i == 3 {
			c[chem.SO4] = 40 + c[chem.Cl]*sea[chem.SO4]
			changed = append(changed, i)
		}
		g, err := correct.Apply(c, &correct.Options{Sulfate: correct.Gypsum})
		if err != nil {
			t.Fatal(err)
		}
		s, err := correct.Apply(c, &correct.Options{Sulfate: correct.Sulfide})
		if err != nil {
			t.Fatal(err)
		}
		if (g.SO4Star > 0) != (i == 1 || i == 3) {
			t.Fatalf("water %d: SO4* = %g; the case needs it above zero only for waters 1 and 3", i, g.SO4Star)
		}
		gypsum.Waters[i].Name = fmt.Sprint("water ", i+1)
		sulfide.Waters[i].Name = gypsum.Waters[i].Name
		gypsum.Waters[i].Correction, sulfide.Waters[i].Correction = &g, &s
	}
	return gypsum, sulfide, o, changed
}

// TestReuseSameBits runs the sulfide problem of sulfateProblems from
// scratch and again taking over the gypsum run's samples: Reuse leaves
// exactly the samples with sulfate above their rain share to work, and
// every field of every sample, the result's checksum and the error at a
// cap on the kept draws equal the full run's, whether the run is driven
// by Step, Invert on three goroutines or gathered from WorkSample.
func TestReuseSameBits(t *testing.T) {
	gyp, sulf, o, changed := sulfateProblems(t)
	ctx := context.Background()
	prev, err := Invert(ctx, gyp, o)
	if err != nil {
		t.Fatal(err)
	}
	// The caps stop the run at sample 2 (taken over) and at sample 3
	// (worked again).
	for _, maxKept := range []int{0, 300, 600} {
		oo := *o
		oo.MaxKept = maxKept
		full, err := NewRun(sulf, &oo)
		if err != nil {
			t.Fatal(err)
		}
		for !full.Step(ctx, 700) {
		}
		ref, refErr := full.Result(), full.Err()
		if maxKept > 0 && refErr == nil {
			t.Fatalf("MaxKept %d: the full run did not stop at the cap; the case is meant to", maxKept)
		}

		step, err := NewRun(sulf, &oo)
		if err != nil {
			t.Fatal(err)
		}
		if todo := step.Reuse(prev); !slices.Equal(todo, changed) {
			t.Errorf("MaxKept %d: samples left to work %v, want %v (those with sulfate above the rain share)", maxKept, todo, changed)
		}
		for !step.Step(ctx, 700) {
		}

		oo.Workers = 3
		inv, invErr := InvertReusing(ctx, sulf, &oo, prev)
		oo.Workers = 0

		g, err := NewGather(sulf, &oo)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range g.Reuse(prev) {
			w, err := NewRun(sulf, &oo)
			if err != nil {
				t.Fatal(err)
			}
			b, err := w.WorkSample(ctx, s, nil)
			if err != nil {
				t.Fatal(err)
			}
			if err := g.PutSample(s, b); err != nil {
				t.Fatal(err)
			}
		}
		g.Gather(ctx)

		for _, c := range []struct {
			name string
			res  *Result
			err  error
		}{{"Step", step.Result(), step.Err()}, {"Invert", inv, invErr}, {"Gather", g.Result(), g.Err()}} {
			if c.name == "Invert" && maxKept > 0 {
				// On several goroutines the sample that passes the cap
				// depends on which finishes first: only the error counts.
				if c.err == nil {
					t.Errorf("MaxKept %d, Invert: no error at the cap", maxKept)
				}
				continue
			}
			if fmt.Sprint(c.err) != fmt.Sprint(refErr) {
				t.Errorf("MaxKept %d, %s: error %v, want %v", maxKept, c.name, c.err, refErr)
			}
			if c.res.Checksum() != ref.Checksum() || c.res.Status != ref.Status {
				t.Errorf("MaxKept %d, %s: checksum %#x status %v, want %#x %v", maxKept, c.name, c.res.Checksum(), c.res.Status, ref.Checksum(), ref.Status)
			}
			for s := range ref.Samples {
				if a, b := printSample(c.res.Samples[s]), printSample(ref.Samples[s]); a != b {
					t.Errorf("MaxKept %d, %s, sample %d differs:\n got %.300s\nwant %.300s", maxKept, c.name, s, a, b)
				}
			}
		}
	}
}

// TestReuseTakesNothingElse: a run takes over no sample from a run of
// other options, end-members, tracers or names, nor one not finished.
func TestReuseTakesNothingElse(t *testing.T) {
	gyp, _, o, _ := sulfateProblems(t)
	ctx := context.Background()
	prev, err := Invert(ctx, gyp, o)
	if err != nil {
		t.Fatal(err)
	}
	all := []int{0, 1, 2, 3, 4}
	seed := *o
	seed.Seed++
	spread := *o
	spread.Rain.Ratios = 0.06
	prior := gyp
	prior.EndMembers = slices.Clone(gyp.EndMembers)
	prior.EndMembers[0].Ratio[CaNa].Hi *= 1.01
	tracers := gyp
	tracers.Tracers = []Tracer{CaNa, MgNa, HCO3Na, ClNa}
	named := gyp
	named.Waters = slices.Clone(gyp.Waters)
	named.Waters[2].Name = "another"
	cut := *prev
	cut.Samples = slices.Clone(prev.Samples)
	cut.Samples[4].Status = Canceled
	for _, c := range []struct {
		name string
		p    Problem
		o    *Options
		prev *Result
		want []int
	}{
		{"the same run", gyp, o, prev, nil},
		{"progress, workers and the cap only", gyp, &Options{Seed: o.Seed, TargetESS: o.TargetESS, Rain: o.Rain, Workers: 2, MaxKept: 10, Progress: func(int, int) {}}, prev, nil},
		{"no earlier run", gyp, o, nil, all},
		{"another seed", gyp, &seed, prev, all},
		{"another rain spread", gyp, &spread, prev, all},
		{"another prior", prior, o, prev, all},
		{"other tracers", tracers, o, prev, all},
		{"a sample renamed", named, o, prev, []int{2}},
		{"a sample cancelled", gyp, o, &cut, []int{4}},
	} {
		r, err := NewRun(c.p, c.o)
		if err != nil {
			t.Fatal(err)
		}
		if got := r.Reuse(c.prev); !slices.Equal(got, c.want) && !(len(got) == 0 && len(c.want) == 0) {
			t.Errorf("%s: left to work %v, want %v", c.name, got, c.want)
		}
	}
}

// TestSameBits checks the comparison Reuse rests on: floats bit for bit,
// slices nil apart from empty, pointers by what they point to.
func TestSameBits(t *testing.T) {
	nan, one := math.NaN(), 1.0
	type s struct {
		x  float64
		p  *float64
		g  []float64
		e  error
		fn func()
	}
	for _, c := range []struct {
		a, b any
		want bool
	}{
		{nan, nan, true},
		{0.0, math.Copysign(0, -1), false},
		{s{x: nan, p: &one, g: []float64{1}}, s{x: nan, p: new(float64), g: []float64{1}}, false},
		{s{p: &one}, s{p: new(float64)}, false},
		{s{p: &one, g: []float64{}}, s{p: &one, g: nil}, false},
		{s{p: &one, g: []float64{2, nan}, e: fmt.Errorf("w: %w", ErrNoFit)}, s{p: &one, g: []float64{2, nan}, e: fmt.Errorf("w: %w", ErrNoFit)}, true},
		{s{e: fmt.Errorf("w: %w", ErrNoFit)}, s{e: fmt.Errorf("v: %w", ErrNoFit)}, false},
		{s{fn: func() {}}, s{fn: func() {}}, false},
		{[2]int{1, 2}, [2]int{1, 2}, true},
		{1, int64(1), false},
	} {
		if got := sameBits(c.a, c.b); got != c.want {
			t.Errorf("sameBits(%v, %v) = %v, want %v", c.a, c.b, got, c.want)
		}
	}
}
