package mix

import "errors"

// Status reports how the inversion of a sample, or of a whole run, ended,
// in the manner of gonum's optimize.Status: a small enum backed by a table
// of names and errors.
type Status int

// The statuses, from best to worst; a run reports the worst of its samples.
const (
	NotRun      Status = iota // not yet inverted
	Success                   // enough draws were accepted
	FewAccepted               // fewer draws accepted than Options.MinAccepted, but some
	NoFit                     // no draw fits the sample
	Skipped                   // the sample cannot be inverted (no Na, or no usable tracer)
	Canceled                  // the context was cancelled before the sample was done
)

// Sentinel errors returned by Status.Err and wrapped by sample warnings.
var (
	ErrFewAccepted     = errors.New("mix: too few accepted draws")
	ErrNoFit           = errors.New("mix: no draw fits the sample")
	ErrSkipped         = errors.New("mix: sample cannot be inverted")
	ErrCanceled        = errors.New("mix: inversion cancelled")
	ErrNotRun          = errors.New("mix: sample not inverted yet")
	ErrUnderdetermined = errors.New("mix: under-determined (fewer independent tracers than end-members minus one)")
	ErrIllConditioned  = errors.New("mix: end-members nearly collinear in the tracers used")
	ErrMissingTracer   = errors.New("mix: tracer not measured in this sample")
)

var statusTable = [...]struct {
	name string
	err  error
}{
	NotRun:      {"not run", ErrNotRun},
	Success:     {"success", nil},
	FewAccepted: {"few accepted draws", ErrFewAccepted},
	NoFit:       {"no fit", ErrNoFit},
	Skipped:     {"skipped", ErrSkipped},
	Canceled:    {"cancelled", ErrCanceled},
}

// String returns the status name.
func (s Status) String() string {
	if s < 0 || int(s) >= len(statusTable) {
		return "unknown status"
	}
	return statusTable[s].name
}

// Err returns nil for Success and the matching sentinel error otherwise.
func (s Status) Err() error {
	if s < 0 || int(s) >= len(statusTable) {
		return errors.New("mix: unknown status")
	}
	return statusTable[s].err
}
