package notebook

import (
	"errors"
	"strings"
)

// NeedError says that a cell has not been given something it cannot
// compute without: a setting (Key) or its data table (Key ""). It is not a
// fault of the budget: the cells of a new budget wait on it until the user
// supplies what it names. Status reports such a cell as Waiting.
type NeedError struct {
	Key  string // the setting needed; "" for the cell's table
	What string // what is needed, as a reader says it: "the catchment area (km²)"
}

// Error implements error.
func (e *NeedError) Error() string { return "needs " + e.What }

// Need is something a cell waits for, in a cell of its own or in one it
// reads (directly or through others).
type Need struct {
	Cell string // id of the cell that lacks it
	NeedError
}

// need returns what c lacks before it can compute, or nil.
func need(c *Cell) *NeedError {
	empty := c.Table == nil || len(c.Table.Columns) == 0 || len(c.Table.Rows) == 0
	switch c.Kind {
	case KindSite:
		if s, ok := c.Settings.(*SiteSettings); ok && !(s.AreaKm2 > 0) {
			return &NeedError{Key: "area_km2", What: "the catchment area (km²)"}
		}
	case KindSamples:
		if empty {
			return &NeedError{What: "a table of water samples: open or drop a CSV, TSV or .xlsx file, or paste rows copied from a spreadsheet"}
		}
	case KindDischarge:
		if empty {
			return &NeedError{What: "a daily discharge record: open or drop a file of dates and daily discharge, or paste one"}
		}
	case KindSources:
		if empty {
			return &NeedError{What: "end-members: fill the table from a preset, or type them"}
		}
	}
	return nil
}

// Needs lists what cell id waits for before it can compute: what it lacks
// itself and what the cells it must read lack, directly or through others,
// in document order. An optional input is not among them: a cell computes
// without an optional input that lacks something, and says so in a
// warning. Needs is empty when nothing is missing (the cell may still have
// a problem of another kind). It does not need the document computed.
func (d *Document) Needs(id string) []Need {
	c := d.Cell(id)
	if c == nil {
		return nil
	}
	up := map[string]bool{}
	var walk func(c *Cell)
	walk = func(c *Cell) {
		if up[c.ID] {
			return
		}
		up[c.ID] = true
		for _, dep := range d.requiredIDs(c) {
			if dc := d.Cell(dep); dc != nil {
				walk(dc)
			}
		}
	}
	walk(c)
	var out []Need
	for _, x := range d.Cells {
		if !up[x.ID] {
			continue
		}
		if n := need(x); n != nil {
			out = append(out, Need{Cell: x.ID, NeedError: *n})
		}
	}
	return out
}

// lacking reports whether err says a cell waits for something it lacks:
// its own NeedError, or an input that lacks something.
func lacking(err error) bool {
	var ne *NeedError
	var ie *InputError
	return errors.As(err, &ne) || errors.As(err, &ie) && ie.Waits
}

// waiting reports whether err makes a cell wait rather than fail: it lacks
// something, or an input has a problem.
func waiting(err error) bool {
	var ne *NeedError
	var ie *InputError
	return errors.As(err, &ne) || errors.As(err, &ie)
}

// requiredIDs returns the ids of the cells c must read: the cells of its
// required roles, and for a chart the cells it plots.
func (d *Document) requiredIDs(c *Cell) []string {
	var ids []string
	for _, r := range c.Kind.Roles() {
		if id, _ := d.resolve(c, r); id != "" && !r.Optional {
			ids = append(ids, id)
		}
	}
	return append(ids, chartRefs(c)...)
}

// whatLacks says what cell id waits for, for a warning of a cell that
// computed without it.
func (d *Document) whatLacks(id string) string {
	var what []string
	for _, n := range d.Needs(id) {
		what = append(what, n.What)
	}
	if len(what) == 0 {
		return "what it needs"
	}
	return strings.Join(what, "; ")
}
