package problem

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// Problem is the engine's one message about the user's input: a problem
// (something that could not be read or was refused), a warning (a
// substitution, or a value, day or sample left out) or a note (an
// inference), positioned at the cell, file, line, column and value it
// concerns. The page places it by its fields (errors.As finds it inside a
// cell's error), the command line lists it, and the report writes it.
type Problem struct {
	Severity Severity
	Effect   Effect
	Cell     string // id of the budget cell whose computation found it; "" outside a budget
	File     string // the file the table was read from, else the id of the cell holding it
	Line     int    // line as the file counts it (spreadsheet row for a workbook); 0 for none
	Col      int    // column number from 1; 0 for none
	Column   string // the column's header
	Value    string // the cell as written
	Sample   string // the water sample concerned, if any
	Text     string // what was found, what was done and what to do next
	// Row is the index in the cell's table of the data row concerned, or
	// -1 (header, units row, the whole table, or another cell's table).
	Row int
	Err error // the sentinel of the package that found it, for errors.Is
}

// Error writes the problem as "file:line:col (column): "value": text".
func (p *Problem) Error() string {
	var b strings.Builder
	Place(&b, p.File, p.Line, p.Col, p.Column)
	if b.Len() > 0 {
		b.WriteString(": ")
	}
	if p.Value != "" {
		fmt.Fprintf(&b, "%q: ", p.Value)
	}
	b.WriteString(p.Text)
	return b.String()
}

// Place writes where a problem stands, as every problem of the engine
// says it: "file:line:col (column)", the line and column only when above
// zero, the column's header only when given.
func Place(b *strings.Builder, file string, line, col int, column string) {
	b.WriteString(file)
	if line > 0 {
		b.WriteString(":" + strconv.Itoa(line))
		if col > 0 {
			b.WriteString(":" + strconv.Itoa(col))
		}
	}
	if column != "" {
		fmt.Fprintf(b, " (%s)", column)
	}
}

// Class is how much a kind of problem matters and what was done about it.
type Class struct {
	Severity Severity
	Effect   Effect
}

// ClassOf returns the class of severity s and effect e.
func ClassOf(s Severity, e Effect) Class { return Class{s, e} }

// Classes gives the class of each sentinel of an importer.
type Classes map[error]Class

// Of returns the class of the sentinel err wraps, and whether it has one.
func (c Classes) Of(err error) (Class, bool) {
	for s, cl := range c {
		if errors.Is(err, s) {
			return cl, true
		}
	}
	return Class{}, false
}

// Unwrap returns the sentinel, so errors.Is(p, sample.ErrCensored) works.
func (p *Problem) Unwrap() error { return p.Err }

// Of is a list of problems in the order of the file: Problem values, or
// the positioned problems of an importer (engine/sample, engine/discharge),
// which keep their own fields until a budget cell turns them into Problems.
// The zero value is empty.
type Of[T error] []T

// List is a list of Problems.
type List = Of[*Problem]

// Error returns the first problem and how many more there are.
func (l Of[T]) Error() string {
	switch len(l) {
	case 0:
		return "no problems"
	case 1:
		return l[0].Error()
	}
	return fmt.Sprintf("%s (and %d more problems)", l[0].Error(), len(l)-1)
}

// Err returns nil for an empty list and the list otherwise.
func (l Of[T]) Err() error {
	if len(l) == 0 {
		return nil
	}
	return l
}

// Unwrap returns the problems, so errors.Is and errors.As find one among
// them.
func (l Of[T]) Unwrap() []error {
	out := make([]error, len(l))
	for i, p := range l {
		out[i] = p
	}
	return out
}

// Count returns the number of problems that unwrap to target.
func (l Of[T]) Count(target error) int {
	n := 0
	for _, p := range l {
		if errors.Is(p, target) {
			n++
		}
	}
	return n
}
