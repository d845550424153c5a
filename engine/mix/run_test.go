package mix

import (
	"context"
	"errors"
	"strings"
	"testing"
)

// A run whose draws kept pass Options.MaxKept stops there with
// ErrTooManyKept, naming the sample, natively and one chunk at a time.
func TestMaxKeptStopsTheRun(t *testing.T) {
	p, base := determinismProblem() // five waters, each keeping more than 200 draws
	for _, workers := range []int{0, 1} {
		o := *base
		o.MaxKept, o.Workers = 500, workers
		var err error
		if workers == 1 {
			run, e := NewRun(p, &o)
			if e != nil {
				t.Fatal(e)
			}
			for !run.Step(context.Background(), 1000) {
			}
			err = run.Err()
		} else {
			_, err = Invert(context.Background(), p, &o)
		}
		if !errors.Is(err, ErrTooManyKept) || !strings.Contains(err.Error(), "limit of 500 at sample") {
			t.Errorf("workers %d: got %v, want ErrTooManyKept", workers, err)
		}
		o.MaxKept = 0
		if _, err := Invert(context.Background(), p, &o); err != nil {
			t.Errorf("workers %d, no cap: %v", workers, err)
		}
	}
}
