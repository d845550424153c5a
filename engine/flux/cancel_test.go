package flux

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

// A cancelled context stops a bootstrap before its next replicate: here
// Tick cancels it after the fifth replicate of 100,000, and Bootstrap
// returns at once with the context's error.
func TestBootstrapCancel(t *testing.T) {
	cv := newCorrieVale()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ticks := 0
	b := BootstrapOptions{Replicates: 100_000, Seed: 1, Context: ctx, Tick: func() {
		if ticks++; ticks == 5 {
			cancel()
		}
	}}
	u, err := Bootstrap(cv.gauge, cv.series, Options{Method: Rating, AreaKm2: cv.area}, b)
	if !errors.Is(err, context.Canceled) || u != nil {
		t.Fatalf("got %v, %v; want no result and context.Canceled", u, err)
	}
	if ticks != 5 {
		t.Errorf("%d replicates ran after the cancel; want none (5 ticks, got %d)", ticks-5, ticks)
	}
}

// factor's redrawing is bounded: a spread that is not a number gives NaN
// after maxRedraws draws instead of looping for ever, and a finite spread
// is unchanged by the bound.
func TestFactorBounded(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	if f := factor(rng, math.NaN()); !math.IsNaN(f) {
		t.Errorf("factor(NaN) = %g, want NaN", f)
	}
	for range 1000 {
		if f := factor(rng, 10); !(f > 0) {
			t.Fatalf("factor(10) = %g, want a positive factor", f)
		}
	}
}
