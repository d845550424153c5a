package mix

import (
	"context"
	"testing"
)

// shareRounds drives a catchment-wide run round by round, each unit worked
// by one of copies separate runs of the same problem, options and seed
// (as the page's Web Workers are), the units handed out last first and
// round-robin, so that a copy works the chains of another copy's last
// round; it returns the driving run's result and the rounds.
func shareRounds(t *testing.T, p Problem, o *Options, co *CatchmentOptions, copies int) (*Result, int) {
	t.Helper()
	drive, err := NewCatchmentRun(p, o, co)
	if err != nil {
		t.Fatal(err)
	}
	works := make([]*CatchmentRun, copies)
	for i := range works {
		if works[i], err = NewCatchmentRun(p, o, co); err != nil {
			t.Fatal(err)
		}
	}
	rounds, turn := 0, 0
	last := 0.0
	for {
		state, units := drive.Round()
		if units == nil {
			break
		}
		rounds++
		for k := len(units) - 1; k >= 0; k-- {
			w := works[turn%copies]
			turn++
			b, err := w.WorkUnit(context.Background(), state, units[k], nil)
			if err != nil {
				t.Fatalf("round %d, unit %d: %v", rounds, units[k], err)
			}
			if err := drive.PutUnit(units[k], b); err != nil {
				t.Fatalf("round %d, unit %d: %v", rounds, units[k], err)
			}
			if pr := drive.RoundProgress(float64(len(units)-k) / float64(len(units))); pr < last {
				t.Fatalf("progress fell from %g to %g", last, pr)
			} else {
				last = pr
			}
		}
	}
	if !drive.Done() {
		t.Fatal("no round left, yet the run is not done")
	}
	return drive.Result(), rounds
}

// TestCatchmentRoundsSameBits: a run whose chains and samples are worked
// round by round in other runs gives the bits of InvertCatchment, with one
// copy and with three, for the machinery's small problem and a longer one
// with a warm-up and several checks.
func TestCatchmentRoundsSameBits(t *testing.T) {
	p, o, co := quickCatchment()
	sc := makeCatchment(30, 3, 5)
	cases := []struct {
		name string
		p    Problem
		o    *Options
		co   *CatchmentOptions
	}{
		{"quick", p, o, co},
		{"30x3", sc.prob, &Options{Seed: 3, Draws: 200}, &CatchmentOptions{Keep: 200}},
		// checks every 25 steps: a round of the chains runs past several
		// (aheadChecks), which the driving run then makes one by one
		{"30x3 close checks", sc.prob, &Options{Seed: 4, Draws: 200}, &CatchmentOptions{Keep: 200, Batch: 25}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			ref, err := InvertCatchment(context.Background(), tc.p, tc.o, tc.co)
			if err != nil {
				t.Fatal(err)
			}
			if ref.Catchment.Fallback != "" {
				t.Fatal(ref.Catchment.Fallback)
			}
			for _, copies := range []int{1, 3} {
				res, rounds := shareRounds(t, tc.p, tc.o, tc.co, copies)
				if got, want := res.Checksum(), ref.Checksum(); got != want {
					t.Errorf("%d copies, %d rounds: checksum %#x, want %#x", copies, rounds, got, want)
				}
				g, w := res.Catchment, ref.Catchment
				if g.Steps != w.Steps || g.Acceptance != w.Acceptance || g.MaxRHat != w.MaxRHat || g.MinESS != w.MinESS || g.Converged != w.Converged {
					t.Errorf("%d copies: steps %d, acceptance %v, R-hat %v, ESS %v, converged %v; want %d, %v, %v, %v, %v",
						copies, g.Steps, g.Acceptance, g.MaxRHat, g.MinESS, g.Converged, w.Steps, w.Acceptance, w.MaxRHat, w.MinESS, w.Converged)
				}
				t.Logf("%d copies: %d rounds, %d kept steps per chain", copies, rounds, g.Steps)
				if rounds < 3 {
					t.Errorf("%d rounds, want the searches, chains and samples apart", rounds)
				}
			}
		})
	}
}

// TestCatchmentRoundsBadState: a copy refuses a state it cannot read and a
// unit that is not the round's, with an error rather than a panic.
func TestCatchmentRoundsBadState(t *testing.T) {
	p, o, co := quickCatchment()
	drive, _ := NewCatchmentRun(p, o, co)
	work, _ := NewCatchmentRun(p, o, co)
	state, units := drive.Round()
	if len(units) == 0 {
		t.Fatal("no first round")
	}
	for _, bad := range [][]byte{nil, {9}, state[:len(state)/2]} {
		if _, err := work.WorkUnit(context.Background(), bad, 0, nil); err == nil {
			t.Errorf("state % x…: no error", bad[:min(len(bad), 4)])
		}
	}
	if _, err := work.WorkUnit(context.Background(), state, 99, nil); err == nil {
		t.Error("unit 99: no error")
	}
	if err := drive.PutUnit(0, []byte{1, 2, 3}); err == nil {
		t.Error("bad bytes put: no error")
	}
}
