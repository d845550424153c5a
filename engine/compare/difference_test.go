package compare

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/flux"
)

func TestDesignSigns(t *testing.T) {
	for _, c := range []struct {
		d    Design
		v    []float64
		want float64
	}{
		{TreatedControl, []float64{7, 3}, 4},
		// (after − before) treated − (after − before) control:
		// (10 − 6) − (5 − 4) = 3.
		{BACI, []float64{10, 5, 6, 4}, 3},
	} {
		if got := c.d.Combine(c.v); got != c.want {
			t.Errorf("%v: %g, want %g", c.d, got, c.want)
		}
		if len(c.d.Signs()) != c.d.Budgets() {
			t.Errorf("%v: %d signs for %d budgets", c.d, len(c.d.Signs()), c.d.Budgets())
		}
	}
}

func TestSummarise(t *testing.T) {
	reps := []float64{-1, 1, 2, 3, math.NaN()}
	d := Summarise(1.5, reps)
	if d.Point != 1.5 || d.Replicates != 4 || d.Above != 0.75 || d.Median != 1.5 {
		t.Errorf("%+v: want point 1.5, 4 replicates, P above zero 0.75, median 1.5", d)
	}
	if d.Detected() {
		t.Error("an interval from below zero to above it is not a detection")
	}
	if s := d.Scaled(2); s.Low != 2*d.Low || s.High != 2*d.High || s.Above != d.Above {
		t.Errorf("scaled %+v", s)
	}
	if e := Summarise(0, nil); !math.IsNaN(e.Above) || e.Replicates != 0 {
		t.Errorf("no replicates: %+v", e)
	}
}

// TestJointDraws: only draws every sample of every budget keeps are
// taken, in proportion to the product of their weights.
func TestJointDraws(t *testing.T) {
	ones := func(n int) []float64 {
		v := make([]float64, n)
		for i := range v {
			v[i] = 1
		}
		return v
	}
	a, b := ones(5), ones(5)
	a[0], b[4] = 0, 0 // draw 0 rejected in budget 1, draw 4 in budget 2
	b[2] = 3          // draw 2 three times as likely
	w := [][][]float64{{a, nil}, {b}}
	j, err := JointDraws(w, 6000, 1)
	if err != nil {
		t.Fatal(err)
	}
	if len(j.Draws) != 3 || j.Draws[0] != 1 || j.Draws[2] != 3 {
		t.Fatalf("draws %v, want [1 2 3]", j.Draws)
	}
	// Weights 1, 3, 1: Kish's effective number 25/11.
	if math.Abs(j.Effective-25.0/11) > 1e-12 {
		t.Errorf("effective draws %g, want 25/11", j.Effective)
	}
	count := make([]int, 3)
	for _, p := range j.Picks {
		count[p]++
	}
	// Expected 1200, 3600, 1200 of 6000 (binomial sd about 35 and 38).
	if math.Abs(float64(count[1])-3600) > 150 || math.Abs(float64(count[0])-1200) > 150 {
		t.Errorf("picks %v, want about 1200, 3600, 1200", count)
	}
	a[1], a[2], a[3] = 0, 0, 0
	if _, err := JointDraws(w, 10, 1); !errors.Is(err, ErrNoJoint) {
		t.Errorf("no draw kept by all: %v, want ErrNoJoint", err)
	}
	if _, err := JointDraws([][][]float64{{ones(3), ones(4)}}, 10, 1); err == nil {
		t.Error("rows of different lengths are refused")
	}
}

// TestPairOfTwins: a budget compared with itself (same data, same
// quantity) differs by exactly zero in its point value, and its replicates,
// drawn from seeds of their own, scatter about zero: P(D > 0) near one
// half. The years of the difference are the budget's complete years.
func TestPairOfTwins(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	tt := newTwinTruth(rng, 2, 1<<30, 1)
	rCa, rMg := []float64{1, 1.1, 0.9}, []float64{0.9, 1, 0.8}
	bu, q := tt.budget(rng, 0, len(tt.q), false, 1, rCa, rMg, nil)
	for _, d := range []Design{TreatedControl, BACI} {
		bs, qs := make([]Budget, d.Budgets()), make([]flux.Apportioned, 0)
		for b := range bs {
			bs[b] = bu
			qs = append(qs, q)
		}
		o, err := Pair(bs, qs, Options{Design: d, Replicates: 400, Seed: 5})
		if err != nil {
			t.Fatal(err)
		}
		if o.Yield.Point != 0 || o.PerMM.Point != 0 {
			t.Errorf("%v: point difference %g, %g; want 0", d, o.Yield.Point, o.PerMM.Point)
		}
		if o.Yield.Above < 0.4 || o.Yield.Above > 0.6 {
			t.Errorf("%v: P(D > 0) %.3f, want near 0.5", d, o.Yield.Above)
		}
		if len(o.Years) != 2 || o.Years[0].Year != 2019 || o.Years[1].Year != 2020 {
			t.Errorf("%v: years %+v, want 2019 and 2020", d, o.Years)
		}
		for _, y := range o.Years {
			if y.Yield.Point != 0 && d == TreatedControl {
				t.Errorf("%v: year %d point difference %g, want 0", d, y.Year, y.Yield.Point)
			}
		}
	}
	if _, err := Pair([]Budget{bu}, []flux.Apportioned{q}, Options{Design: TreatedControl}); err == nil {
		t.Error("one budget is refused")
	}
}

// TestPairPointOnly: without the bootstrap, the point differences stand
// alone and every interval is NaN.
func TestPairPointOnly(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	tt := newTwinTruth(rng, 2, 1<<30, 1)
	bu, q := tt.budget(rng, 0, len(tt.q), false, 1, []float64{1}, []float64{0.9}, nil)
	o, err := Pair([]Budget{bu, bu}, []flux.Apportioned{q, q}, Options{PointOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	y, m := o.Budgets[0].Yields()
	if o.Yield.Point != 0 || !math.IsNaN(o.Yield.Low) || !math.IsNaN(y.Lo) || y.Median != o.Budgets[0].Point.Mean.MolPerKm2 || !(m.Median > 0) {
		t.Errorf("point only: %+v, yields %+v %+v", o.Yield, y, m)
	}
	if len(o.Years) != 2 || !math.IsNaN(o.Years[0].Yield.High) {
		t.Errorf("years %+v", o.Years)
	}
}

func BenchmarkPair(b *testing.B) {
	rng := rand.New(rand.NewPCG(9, 9))
	tt := newTwinTruth(rng, 2, 1<<30, 1)
	rCa, rMg := make([]float64, 200), make([]float64, 200)
	for d := range rCa {
		rCa[d], rMg[d] = 1+0.1*rng.NormFloat64(), 0.9+0.1*rng.NormFloat64()
	}
	bt, qt := tt.budget(rng, 0, len(tt.q), true, 1, rCa, rMg, nil)
	bc, qc := tt.budget(rng, 0, len(tt.q), false, 1, rCa, rMg, nil)
	picks := make([]int, 1000)
	for r := range picks {
		picks[r] = r % 200
	}
	for b.Loop() {
		bt.Bootstrap.Cache, bc.Bootstrap.Cache = &flux.Cache{}, &flux.Cache{}
		if _, err := Pair([]Budget{bt, bc}, []flux.Apportioned{qt, qc}, Options{Replicates: 1000, Seed: 1, Picks: picks}); err != nil {
			b.Fatal(err)
		}
	}
}
