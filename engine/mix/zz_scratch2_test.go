package mix

import (
	"context"
	"testing"
	"time"
)

func TestScratchRounds(t *testing.T) {
	sc := makeCatchment(100, 4, 7)
	sc.prob.Tracers = append(sc.prob.Tracers, KNa)
	for _, co := range []*CatchmentOptions{{Warmup: 600, Batch: 400, MaxSteps: 400, Keep: 200}, {Keep: 1000}} {
		run, err := NewCatchmentRun(sc.prob, &Options{Seed: 1, Workers: 1}, co)
		if err != nil {
			t.Fatal(err)
		}
		work, _ := NewCatchmentRun(sc.prob, &Options{Seed: 1, Workers: 1}, co)
		var tRound, tWork, tPut, maxUnit time.Duration
		rounds, bytes, outb := 0, 0, 0
		for {
			t0 := time.Now()
			state, units := run.Round()
			tRound += time.Since(t0)
			if units == nil {
				break
			}
			rounds++
			bytes += len(state) * len(units)
			for _, u := range units {
				t1 := time.Now()
				b, err := work.WorkUnit(context.Background(), state, u, func(float64) {})
				d := time.Since(t1)
				tWork += d
				maxUnit = max(maxUnit, d)
				if err != nil {
					t.Fatal(err)
				}
				outb += len(b)
				t2 := time.Now()
				if err := run.PutUnit(u, b); err != nil {
					t.Fatal(err)
				}
				tPut += time.Since(t2)
			}
			t.Logf("round %d: units %d state %d B", rounds, len(units), len(state))
		}
		t.Logf("rounds %d, page-side Round %v, put %v, work %v (max unit %v), state bytes sent %d, results %d", rounds, tRound, tPut, tWork, maxUnit, bytes, outb)
	}
}
