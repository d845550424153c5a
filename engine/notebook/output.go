package notebook

import (
	"math"
	"slices"
)

// Output is what a computed cell shows and hands to the cells below it.
type Output struct {
	Tables   []*ResultTable // tables for the page, the CSV export and charts
	Figures  []Figure       // headline figures with their intervals
	Warnings []string       // problems that did not stop the computation
	// Doubtful gives the reasons a computed result is doubtful: it rests
	// on failed fits, or on flow the samples do not bracket, beyond what
	// the cell accepts. A cell with reasons is in the Doubtful state.
	Doubtful []string
	// Messages say, positioned in the input, what the cell could not read,
	// what it read in place of what was written, what it left out (a sample
	// without an ion the cell needs) and what it inferred. They explain
	// the results and are not part of the snapshot's checksum; the tables
	// they change are.
	Messages Messages
	// Rough says the output lacks intervals that a full computation gives
	// (see Document.Quick); a compute function that skips that work sets it.
	Rough bool
	// Value is the typed result cells below read (for example the
	// apportioned samples); it is not written to files.
	Value any
	// Reading says what the cell took each column of its data table as
	// (samples and discharge cells); it is not part of the stored results.
	Reading *Reading
}

// Table returns the output table with the given name, or nil.
func (o *Output) Table(name string) *ResultTable {
	if o == nil {
		return nil
	}
	return named(o.Tables, func(t *ResultTable) bool { return t.Name == name })
}

// named returns the first element of list for which is holds, or nil.
func named[T any](list []*T, is func(*T) bool) *T {
	if i := slices.IndexFunc(list, is); i >= 0 {
		return list[i]
	}
	return nil
}

// Figure returns the headline figure with the given name, or nil.
func (o *Output) Figure(name string) *Figure {
	if o == nil {
		return nil
	}
	for i := range o.Figures {
		if o.Figures[i].Name == name {
			return &o.Figures[i]
		}
	}
	return nil
}

// ResultTable is a computed table: named columns of equal length.
type ResultTable struct {
	Name    string    // short key, used in chart references ("daily")
	Title   string    // heading shown above the table
	Columns []*Column // in display order
}

// Column returns the column with the given name, or nil.
func (t *ResultTable) Column(name string) *Column {
	if t == nil {
		return nil
	}
	return named(t.Columns, func(c *Column) bool { return c.Name == name })
}

// Len returns the number of rows.
func (t *ResultTable) Len() int {
	if len(t.Columns) == 0 {
		return 0
	}
	return t.Columns[0].Len()
}

// Column is one column of a result table: numbers (NaN where there is no
// value) or, for labels and dates, text.
type Column struct {
	Name string    // column name, such as "Ca_silicate"
	Unit string    // unit, such as "µmol/L"; "" for labels and ratios
	Num  []float64 // numeric values; nil for a text column
	Text []string  // text values; nil for a numeric column
}

// Len returns the number of values in the column.
func (c *Column) Len() int {
	if c.Text != nil {
		return len(c.Text)
	}
	return len(c.Num)
}

// NumColumn returns a numeric column.
func NumColumn(name, unit string, v []float64) *Column {
	return &Column{Name: name, Unit: unit, Num: v}
}

// TextColumn returns a text column.
func TextColumn(name string, v []string) *Column { return &Column{Name: name, Text: v} }

// Figure is a headline number: a median with its 95 % interval (Low and High
// are NaN when the figure has no interval).
type Figure struct {
	Name   string  // such as "silicate CO2 consumption"
	Unit   string  // such as "mol/km²/yr"
	Median float64 // central value
	Low    float64 // 2.5 % bound
	High   float64 // 97.5 % bound
	// Note says how the figure was formed where that is not the cell's
	// setting alone (an estimator applied through the measured species,
	// samples left out or filled), or where two figures of one name differ
	// in that ("over the whole record", "over complete years"); "" for
	// none. It is for the reader and not part of the stored results.
	Note string
}

// Point returns a figure without an interval.
func Point(name, unit string, v float64) Figure {
	return Figure{Name: name, Unit: unit, Median: v, Low: math.NaN(), High: math.NaN()}
}
