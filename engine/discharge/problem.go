package discharge

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"lixiv/engine/problem"
)

// The kinds of problem the importer reports. Each Problem wraps one of them.
var (
	ErrNotTable      = errors.New("not a table")
	ErrNoDateColumn  = errors.New("no date column")
	ErrNoQColumn     = errors.New("no discharge column")
	ErrNoUnit        = errors.New("no discharge unit")
	ErrMixedUnits    = errors.New("mixed units")
	ErrBadDate       = errors.New("not a date")
	ErrAmbiguousDate = errors.New("ambiguous date order")
	ErrNotNumber     = errors.New("not a number")
	ErrNegative      = errors.New("negative discharge")
	ErrDuplicateDay  = errors.New("duplicated day")
	ErrUnsorted      = errors.New("dates not in order")
	ErrShortRow      = errors.New("row too short")
	ErrSyntax        = errors.New("malformed line")
	ErrMissingDay    = errors.New("no value")
	ErrBadDays       = errors.New("days left out")
	ErrDateOrder     = errors.New("date order inferred")
)

// effects gives the severity and effect of each kind of problem; kinds
// not listed are errors whose value was left out.
var effects = problem.Classes{
	ErrNotTable: problem.ClassOf(problem.Error, problem.Unread), ErrNoDateColumn: problem.ClassOf(problem.Error, problem.Unread),
	ErrNoQColumn: problem.ClassOf(problem.Error, problem.Unread), ErrNoUnit: problem.ClassOf(problem.Error, problem.Unread),
	ErrAmbiguousDate: problem.ClassOf(problem.Error, problem.Refused), ErrMixedUnits: problem.ClassOf(problem.Warning, problem.Inferred),
	ErrUnsorted: problem.ClassOf(problem.Warning, problem.Inferred), ErrMissingDay: problem.ClassOf(problem.Warning, problem.LeftOut),
	ErrBadDays: problem.ClassOf(problem.Warning, problem.LeftOut), ErrDateOrder: problem.ClassOf(problem.Note, problem.Inferred),
	ErrDuplicateDay: problem.ClassOf(problem.Warning, problem.LeftOut),
}

// classify sets p's severity and effect from its kind.
func (p *Problem) classify() {
	p.Severity, p.Effect = problem.Error, problem.LeftOut
	if c, ok := effects.Of(p.Err); ok {
		p.Severity, p.Effect = c.Severity, c.Effect
	}
}

// Problem is one thing wrong with an imported table, positioned at a row
// and column of the file. Row and Col count from 1 (the header is row 1 when
// there is one); 0 means the whole file or the whole row.
type Problem struct {
	File   string // file name as given in Options.File, for messages
	Row    int    // line number in the input, from 1
	Col    int    // column number, from 1
	Column string // column name from the header, if any
	Err    error  // one of the Err* kinds above
	Value  string // the cell as written, if any
	Detail string // what was found and what was done about it

	// Severity and Effect say how much the problem matters and what was
	// done; Read sets them from Err.
	Severity problem.Severity
	Effect   problem.Effect
}

// Error formats the problem as "file:row:col (column): kind: detail",
// without the kind for a warning or a note that has a detail.
func (p *Problem) Error() string {
	var b strings.Builder
	file := p.File
	if file == "" {
		file = "input"
	}
	problem.Place(&b, file, p.Row, p.Col, p.Column)
	if p.Detail != "" && (errors.Is(p.Err, ErrMissingDay) || errors.Is(p.Err, ErrBadDays) || errors.Is(p.Err, ErrDateOrder)) {
		b.WriteString(": " + p.Detail) // a notice says it all in its detail
		return b.String()
	}
	fmt.Fprintf(&b, ": %v", p.Err)
	if p.Detail != "" {
		b.WriteString(": ")
		b.WriteString(p.Detail)
	}
	return b.String()
}

// Unwrap returns the kind of problem, so errors.Is(p, ErrNegative) works.
func (p *Problem) Unwrap() error { return p.Err }

// Problems is a list of import problems. The zero value is an empty list.
type Problems = problem.Of[*Problem]

// sortProblems orders ps by row, then column.
func sortProblems(ps Problems) {
	sort.SliceStable(ps, func(i, j int) bool {
		if ps[i].Row != ps[j].Row {
			return ps[i].Row < ps[j].Row
		}
		return ps[i].Col < ps[j].Col
	})
}
