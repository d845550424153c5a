package mix

import (
	"errors"

	"lixiv/engine/internal/enum"
)

// Status says how the inversion of a sample, or of a whole run, ended: a
// small enum backed by a table of names and errors. A sample's full verdict,
// in words, is SampleResult.Verdict; whether it is well sampled and whether
// the end-member ranges decide its split are SampleResult.WellSampled and
// SampleResult.PriorDecided.
type Status int

// The statuses, from best to worst; a run reports the worst of its samples.
const (
	NotRun   Status = iota // not yet inverted
	Fits                   // the data agree with the model (posterior predictive check)
	Rule                   // answered by a rule without a fit (Na* <= 0: carbonate only)
	NoFit                  // the data disagree with every mix of the end-members
	Skipped                // the sample cannot be inverted (no Na, or no usable end-member)
	Canceled               // the context was cancelled before the sample was done
)

// Stop says why a sample's refinement ended.
type Stop int

// The reasons.
const (
	NotSampled    Stop = iota // no draws were needed (a rule, or a skipped sample)
	TargetReached             // the effective sample size reached Options.TargetESS
	Capped                    // the draws reached Options.MaxDraws first
)

var stopNames = [...]string{"no draws", "target ESS reached", "stopped at the cap of draws"}

// String names the reason.
func (s Stop) String() string { return enum.Name(s, stopNames[:], "unknown") }

// Sentinel errors returned by Status.Err and wrapped by sample warnings.
var (
	ErrNoFit           = errors.New("mix: the data do not fit any mix of the end-members")
	ErrSkipped         = errors.New("mix: sample cannot be inverted")
	ErrCanceled        = errors.New("mix: inversion cancelled")
	ErrNotRun          = errors.New("mix: sample not inverted yet")
	ErrUnderdetermined = errors.New("mix: under-determined (fewer data than end-members)")
	ErrMissingTracer   = errors.New("mix: tracer not measured in this sample")
	ErrNotSeen         = errors.New("mix: end-member left out, no tracer sees it")
	ErrConfused        = errors.New("mix: end-members the tracers cannot tell apart")
	ErrCorrelated      = errors.New("mix: fractions the data cannot split")
	ErrPoorlySampled   = errors.New("mix: posterior poorly sampled")
	ErrNaFree          = errors.New("mix: Na* <= 0 after the corrections")
)

var statusTable = [...]struct {
	name string
	err  error
}{
	NotRun:   {"not run", ErrNotRun},
	Fits:     {"fits", nil},
	Rule:     {"rule", nil},
	NoFit:    {"does not fit", ErrNoFit},
	Skipped:  {"skipped", ErrSkipped},
	Canceled: {"cancelled", ErrCanceled},
}

// String returns the status name.
func (s Status) String() string {
	if s < 0 || int(s) >= len(statusTable) {
		return "unknown status"
	}
	return statusTable[s].name
}

// Err returns nil for Fits and Rule and the matching sentinel error
// otherwise.
func (s Status) Err() error {
	if s < 0 || int(s) >= len(statusTable) {
		return errors.New("mix: unknown status")
	}
	return statusTable[s].err
}
