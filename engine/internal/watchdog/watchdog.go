// Package watchdog catches a fuzz input that hangs: Start arms a timer for
// one input, and if the input is still being worked on when it fires, the
// process stops with the input quoted. Go's fuzzing engine saves the input
// of a worker that dies under testdata/fuzz/, so a stalling input names
// itself instead of freezing the run. It is a hang detector, never a speed
// test: the limits are far beyond what any input the caps allow needs.
package watchdog

import (
	"flag"
	"fmt"
	"os"
	"time"
)

// Limits of one input: Fuzzing while the fuzzing engine explores (small
// inputs, and a stall must show within a short run), Replay when plain `go
// test` replays the seed corpus and committed findings.
const (
	Fuzzing = 20 * time.Second
	Replay  = 5 * time.Minute
)

// Start arms the watchdog for input and returns the function that disarms
// it; call it (or defer it) when the input is done.
func Start(input any) (stop func()) {
	d := Replay
	if f := flag.Lookup("test.fuzz"); f != nil && f.Value.String() != "" {
		d = Fuzzing
	}
	return start(input, d)
}

func start(input any, d time.Duration) (stop func()) {
	t := time.AfterFunc(d, func() {
		fmt.Fprintf(os.Stderr, "input still running after %v (a hang): %#v\n", d, input)
		panic(fmt.Sprintf("input still running after %v (a hang): %#v", d, input))
	})
	return func() { t.Stop() }
}
