package notebook

import (
	"context"
	"fmt"
	"slices"
	"strings"
)

// EngineVersion is stored in every file this engine writes; a snapshot
// computed by another version may differ.
const EngineVersion = "0.1.0"

// ComputeFunc computes one cell from its settings, table and inputs.
type ComputeFunc func(e *Env) (*Output, error)

var computers = map[Kind]ComputeFunc{}

// Register sets the function that computes cells of kind k, replacing the
// built-in one. It is meant for setup code and tests, not for concurrent use.
func Register(k Kind, f ComputeFunc) { computers[k] = f }

// Progress reports how far a computation has come.
type Progress struct {
	Cell  string // id of the cell computing
	Done  int    // units of work done (for example samples apportioned)
	Total int    // units of work in all
}

// Env is what a ComputeFunc sees: the cell, its inputs, a context for
// cancelling and a progress reporter.
type Env struct {
	Ctx      context.Context
	Cell     *Cell
	doc      *Document
	progress func(Progress)
	rough    bool
	without  []string // optional inputs left out: they lack what they need
}

// Rough reports that this is the quick first pass of Document.Quick: the
// cell may leave out its intervals, and then sets Output.Rough.
func (e *Env) Rough() bool { return e.rough }

// Input returns the output of the cell filling role, or nil when an optional
// role is empty.
func (e *Env) Input(role string) (*Output, error) {
	for _, r := range e.Cell.Kind.Roles() {
		if r.Name != role {
			continue
		}
		id, err := e.doc.resolve(e.Cell, r)
		if err != nil {
			return nil, err
		}
		if id == "" || slices.Contains(e.without, id) {
			return nil, nil
		}
		return e.doc.outputOf(id)
	}
	return nil, fmt.Errorf("notebook: %s cell has no role %q", e.Cell.Kind, role)
}

// inputOf returns the value of the output that feeds role, a required
// input whose kind's value is a T.
func inputOf[T any](e *Env, role string) (T, error) {
	o, err := e.Input(role)
	if err != nil {
		var none T
		return none, err
	}
	return o.Value.(T), nil
}

// OutputOf returns the output of any cell by id (for charts).
func (e *Env) OutputOf(id string) (*Output, error) { return e.doc.outputOf(id) }

// Report passes progress to the caller's callback, if any.
func (e *Env) Report(done, total int) {
	if e.progress != nil {
		e.progress(Progress{Cell: e.Cell.ID, Done: done, Total: total})
	}
}

func (d *Document) outputOf(id string) (*Output, error) {
	c := d.Cell(id)
	if c == nil {
		return nil, fmt.Errorf("no cell named %q", id)
	}
	s := d.st(id)
	if s.stale {
		return nil, fmt.Errorf("cell %q has not been computed", id)
	}
	if s.err != nil {
		return nil, &InputError{Cell: id, Waits: lacking(s.err)}
	}
	return s.out, nil
}

// DoubtfulError gives the reasons a cell's result is doubtful.
type DoubtfulError struct {
	Reasons []string
}

// Error joins the reasons.
func (e *DoubtfulError) Error() string { return "doubtful: " + strings.Join(e.Reasons, "; ") }

// InputError says that a cell waits on an input cell that has a problem,
// or that waits itself for something it needs (Document.Needs says what).
type InputError struct {
	Cell  string // id of the input cell
	Waits bool   // the input waits for what it needs, rather than having a problem
}

// Error implements error.
func (e *InputError) Error() string {
	if e.Waits {
		return fmt.Sprintf("waiting for cell %q, which waits for what it needs", e.Cell)
	}
	return fmt.Sprintf("waiting for cell %q, which has a problem", e.Cell)
}

type cellState struct {
	out   *Output
	err   error
	stale bool
	rough bool // computed by the quick pass without intervals, or from an input that was
	runs  int
}

func (d *Document) st(id string) *cellState {
	if d.state == nil {
		d.state = map[string]*cellState{}
	}
	s, ok := d.state[id]
	if !ok {
		s = &cellState{stale: true}
		d.state[id] = s
	}
	return s
}

// State says where a cell stands.
type State int

// Cell states.
const (
	Stale    State = iota // not computed since its last change
	UpToDate              // computed without a problem
	Waiting               // an input cell has a problem
	Problem               // failed; see Status.Err
	Refining              // point values computed, intervals to follow (Document.Quick)
	Doubtful              // computed, but rests on failed fits or unbracketed flow (Output.Doubtful says why)
)

var stateNames = [...]string{"stale", "up to date", "waiting for inputs", "problem", "computing intervals", "doubtful"}

// String returns the state as the page shows it.
func (s State) String() string { return stateNames[s] }

// Status returns the state of a cell and, for Waiting, Problem and
// Doubtful, why (for Doubtful, a DoubtfulError listing the reasons).
func (d *Document) Status(id string) (State, error) {
	c := d.Cell(id)
	if c == nil {
		return Problem, fmt.Errorf("no cell named %q", id)
	}
	s := d.st(id)
	switch {
	case s.stale:
		return Stale, nil
	case s.err == nil && s.rough:
		return Refining, nil
	case s.err == nil && s.out != nil && len(s.out.Doubtful) > 0:
		return Doubtful, &DoubtfulError{Reasons: s.out.Doubtful}
	case s.err == nil:
		return UpToDate, nil
	case waiting(s.err):
		return Waiting, s.err
	}
	return Problem, s.err
}

// Output returns the output of a computed cell, or nil when it is stale.
// A cell with a problem may still have an output that shows why (the
// samples cell keeps its table and flags when no sample enters the
// budget); cells below it wait all the same. While the cell is Refining it
// is the output of the quick pass (Output.Rough set).
func (d *Document) Output(id string) *Output {
	if d.Cell(id) == nil {
		return nil
	}
	s := d.st(id)
	if s.stale {
		return nil
	}
	return s.out
}

// Runs returns how many times the cell has been computed since the document
// was loaded; tests use it to prove an edit reruns only what it must.
func (d *Document) Runs(id string) int { return d.st(id).runs }

// Pending returns the ids of the cells still to compute in compute order:
// the stale ones, then those the quick pass left rough.
func (d *Document) Pending() []string {
	order, err := d.order()
	if err != nil {
		return nil
	}
	var ids, rough []string
	for _, c := range order {
		switch s := d.st(c.ID); {
		case s.stale:
			ids = append(ids, c.ID)
		case s.rough:
			rough = append(rough, c.ID)
		}
	}
	return append(ids, rough...)
}

// QuickPassDone reports whether no cell is stale: every cell has at least
// its point values, and what remains pending (see Document.Quick) is only
// refining.
func (d *Document) QuickPassDone() bool {
	for _, id := range d.Pending() {
		if d.st(id).stale {
			return false
		}
	}
	return true
}

// Step computes the next stale cell and reports whether any remain. The
// page calls it between frames so that it stays responsive. Only a
// cancelled context or a cycle is returned as an error; a cell's own
// problem is kept in its Status.
func (d *Document) Step(ctx context.Context, progress func(Progress)) (more bool, err error) {
	pending := d.Pending()
	if len(pending) == 0 {
		if _, err := d.order(); err != nil {
			return false, err
		}
		return false, nil
	}
	if err := ctx.Err(); err != nil {
		return true, err
	}
	c := d.Cell(pending[0])
	s := d.st(c.ID)
	// A stale cell is computed quickly when asked; a rough one (all stale
	// cells done) in full. Its inputs come before it in the order, so when
	// a rough cell is refined its inputs are already refined.
	rough := d.Quick && s.stale
	out, cerr := d.computeCell(ctx, c, progress, rough)
	if ctx.Err() != nil { // cancelled mid-cell: leave it as it was
		return true, ctx.Err()
	}
	s.out, s.err, s.stale = out, cerr, false
	s.rough = cerr == nil && (out.Rough || d.roughInputs(c))
	s.runs++
	return len(pending) > 1, nil
}

// Recompute computes every stale cell, in dependency order, reusing the
// results of the others.
func (d *Document) Recompute(ctx context.Context, progress func(Progress)) error {
	for {
		more, err := d.Step(ctx, progress)
		if err != nil {
			return err
		}
		if !more {
			return nil
		}
	}
}

// computeCell runs the compute function of c, turning a panic in it into
// a problem on the cell rather than a crash of the page.
func (d *Document) computeCell(ctx context.Context, c *Cell, progress func(Progress), rough bool) (out *Output, err error) {
	if c.Broken() {
		return nil, fmt.Errorf("this cell could not be read: %s", c.Problem)
	}
	f := d.funcs[c.Kind]
	if f == nil {
		f = computers[c.Kind]
		// What the cell itself lacks first: the user supplies it there.
		// (A document's own functions, set by tests, decide for themselves.)
		if n := need(c); n != nil {
			return nil, n
		}
	}
	if f == nil {
		return nil, fmt.Errorf("no computation for %s cells", c.Kind)
	}
	// Then its inputs: a clear message if one is missing or failed. An
	// optional input that lacks what it needs is left out, and said so.
	var without []string
	for _, r := range c.Kind.Roles() {
		id, err := d.resolve(c, r)
		if err != nil {
			return nil, err
		}
		if id != "" {
			if _, err := d.outputOf(id); err != nil {
				if r.Optional && lacking(d.st(id).err) {
					without = append(without, id)
					continue
				}
				return nil, err
			}
		}
	}
	defer func() {
		if r := recover(); r != nil {
			out, err = nil, fmt.Errorf("internal error in the %s computation: %v", c.Kind, r)
		}
	}()
	out, err = f(&Env{Ctx: ctx, Cell: c, doc: d, progress: progress, rough: rough, without: without})
	if err == nil && out == nil {
		out = &Output{}
	}
	if out != nil {
		for _, m := range out.Messages {
			m.Cell = c.ID
		}
		for _, id := range without {
			out.Warnings = append(out.Warnings, fmt.Sprintf("computed without cell %q, which waits for %s", id, d.whatLacks(id)))
		}
	}
	return out, err
}

// roughInputs reports whether any cell c reads (charts read any cell) is
// rough: then c's output rests on values without their intervals.
func (d *Document) roughInputs(c *Cell) bool {
	for _, id := range d.depIDs(c) {
		if s, ok := d.state[id]; ok && !s.stale && s.rough {
			return true
		}
	}
	return false
}

// Workers returns the number of goroutines the computation may use (0: all
// cores); see Document.Workers.
func (e *Env) Workers() int { return e.doc.Workers }
