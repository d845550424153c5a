package sample

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/problem"
)

// Sentinel errors a Problem unwraps to. Test for them with errors.Is.
var (
	ErrNotTable        = errors.New("not a sample table")
	ErrNoColumn        = errors.New("column not found")
	ErrNotNumber       = errors.New("not a number")
	ErrNegative        = errors.New("negative value")
	ErrOutOfRange      = errors.New("value out of range")
	ErrDuplicateColumn = errors.New("duplicated column")
	ErrUnitConflict    = errors.New("conflicting units")
	ErrUnknownUnit     = errors.New("unknown unit")
	ErrNoUnit          = errors.New("no unit given")
	ErrUnitMismatch    = errors.New("unit does not apply")
	ErrBadDate         = errors.New("not a date")
	ErrAmbiguousDate   = errors.New("ambiguous date order")
	ErrFieldCount      = errors.New("wrong number of fields")
	ErrQuote           = errors.New("unterminated quote")
	ErrTooMany         = errors.New("too many problems")

	// The importer's notes (Table.Notes) unwrap to these: what it read in
	// place of what the file wrote, and what it inferred.
	ErrCensored     = errors.New("below detection")
	ErrMissingValue = errors.New("read as missing")
	ErrDateOrder    = errors.New("date order inferred")
	ErrDecimalComma = errors.New("decimal comma")
	ErrUnits        = errors.New("units")
	ErrDefaultUnit  = errors.New("unit from the settings")
	ErrCellUnit     = errors.New("unit in the cell")
	ErrComment      = errors.New("comment line")
	ErrChosenColumn = errors.New("column chosen")
	ErrMergedHeader = errors.New("header over several rows")
	ErrOtherSheets  = errors.New("other sheets")
)

// effects gives the severity and effect of each problem sentinel.
var effects = problem.Classes{
	ErrNotTable: problem.ClassOf(problem.Error, problem.Unread), ErrNoColumn: problem.ClassOf(problem.Error, problem.Unread),
	ErrNotNumber: problem.ClassOf(problem.Error, problem.LeftOut), ErrNegative: problem.ClassOf(problem.Error, problem.LeftOut),
	ErrOutOfRange: problem.ClassOf(problem.Error, problem.LeftOut), ErrDuplicateColumn: problem.ClassOf(problem.Error, problem.Refused),
	ErrUnitConflict: problem.ClassOf(problem.Error, problem.Unread), ErrUnknownUnit: problem.ClassOf(problem.Error, problem.Unread),
	ErrNoUnit: problem.ClassOf(problem.Error, problem.Unread), ErrUnitMismatch: problem.ClassOf(problem.Error, problem.Unread),
	ErrBadDate: problem.ClassOf(problem.Error, problem.Unread), ErrAmbiguousDate: problem.ClassOf(problem.Error, problem.Refused),
	ErrFieldCount: problem.ClassOf(problem.Error, problem.Unread), ErrQuote: problem.ClassOf(problem.Error, problem.Unread),
	ErrTooMany:  problem.ClassOf(problem.Warning, problem.Unread),
	ErrCensored: problem.ClassOf(problem.Warning, problem.Substituted), ErrMissingValue: problem.ClassOf(problem.Warning, problem.LeftOut),
	ErrDateOrder: problem.ClassOf(problem.Note, problem.Inferred), ErrDecimalComma: problem.ClassOf(problem.Note, problem.Inferred),
	ErrUnits: problem.ClassOf(problem.Note, problem.Inferred), ErrDefaultUnit: problem.ClassOf(problem.Warning, problem.Substituted), ErrCellUnit: problem.ClassOf(problem.Note, problem.Inferred),
	ErrComment: problem.ClassOf(problem.Note, problem.LeftOut), ErrChosenColumn: problem.ClassOf(problem.Note, problem.LeftOut),
	ErrMergedHeader: problem.ClassOf(problem.Note, problem.Inferred), ErrOtherSheets: problem.ClassOf(problem.Note, problem.LeftOut),
	ErrNotWorkbook: problem.ClassOf(problem.Error, problem.Unread), ErrNoSheet: problem.ClassOf(problem.Error, problem.Unread),
	ErrBadRow: problem.ClassOf(problem.Error, problem.Unread),
}

// sentinelSeverity is the severity of p's sentinel (Error when unknown).
// The notes' sentinels are all warnings or notes.
func (p *Problem) sentinelSeverity() problem.Severity {
	for _, err := range []error{ErrCensored, ErrMissingValue, ErrDateOrder, ErrDecimalComma, ErrUnits, ErrDefaultUnit, ErrCellUnit, ErrComment, ErrChosenColumn, ErrMergedHeader, ErrOtherSheets} {
		if errors.Is(p.Err, err) {
			return effects[err].Severity
		}
	}
	return problem.Error
}

// classify sets p's severity and effect from its sentinel.
func (p *Problem) classify() {
	if c, ok := effects.Of(p.Err); ok {
		p.Severity, p.Effect = c.Severity, c.Effect
	}
}

// SettingLabels are the labels under which the page shows the budget
// settings that steer the importer (keyed by their names in budget files);
// messages name the settings by these labels.
var SettingLabels = map[string]string{
	"date_order":      "date order",
	"below_detection": "below detection limit",
	"use_columns":     "columns to use",
	"default_unit":    "default unit",
}

// setting quotes the label of a setting for a message.
func setting(key string) string { return strconv.Quote(SettingLabels[key]) }

// Problem is something wrong with the input, positioned in the file. The
// affected cell is left missing (NaN) or kept as metadata; the rest of the
// table loads.
type Problem struct {
	File   string // file name as given to Read
	Line   int    // 1-based line in the file; 0 for the file as a whole
	Col    int    // 1-based column number; 0 for a whole row or the file
	Header string // header text of the column, if any
	Value  string // the cell text, if any
	Err    error  // one of the Err* sentinels, possibly wrapped
	Detail string // what was done about it, for the reader

	// Severity and Effect say how much the problem matters and what was
	// done; Read sets them from Err.
	Severity problem.Severity
	Effect   problem.Effect
}

// Error returns "file:line:col (header): value: err; detail", without err
// for a warning or a note that has a detail.
func (p *Problem) Error() string {
	var b strings.Builder
	problem.Place(&b, p.File, p.Line, p.Col, p.Header)
	b.WriteString(": ")
	if p.Value != "" {
		fmt.Fprintf(&b, "%q: ", p.Value)
	}
	switch {
	case p.Detail != "" && p.sentinelSeverity() != problem.Error:
		b.WriteString(p.Detail) // a note or warning says it all in its detail
	case p.Err != nil && p.Detail != "":
		b.WriteString(p.Err.Error() + "; " + p.Detail)
	case p.Err != nil:
		b.WriteString(p.Err.Error())
	default:
		b.WriteString(p.Detail)
	}
	return b.String()
}

// Unwrap returns the underlying sentinel.
func (p *Problem) Unwrap() error { return p.Err }

// ProblemList is the list of problems met while reading a table, in the
// order they were found (by line, then column). The zero value is empty.
type ProblemList = problem.Of[*Problem]
