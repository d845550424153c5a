package notebook

import (
	"fmt"
	"sort"
	"strings"
)

// CycleError reports cells that depend on each other in a loop.
type CycleError struct {
	Path []string // cell ids along the loop, the first repeated at the end
}

// Error implements error.
func (e *CycleError) Error() string {
	return "cells depend on each other in a loop: " + strings.Join(e.Path, " → ") +
		"; point one of them at a cell above it"
}

// resolve returns the id of the cell that fills role r of cell c, or "" and
// a message when there is none.
func (d *Document) resolve(c *Cell, r Role) (string, error) {
	if id, ok := c.Uses[r.Name]; ok && id != "" {
		t := d.Cell(id)
		if t == nil {
			return id, fmt.Errorf("input %q names cell %q, which does not exist", r.Name, id)
		}
		if t.Kind != r.Kind {
			return id, fmt.Errorf("input %q names cell %q, a %s cell, where a %s cell is needed", r.Name, id, t.Kind, r.Kind)
		}
		return id, nil
	}
	return d.nearest(c, r) // section.go
}

// chartRefs returns the cell ids a chart's axes name.
func chartRefs(c *Cell) []string {
	s, ok := c.Settings.(*ChartSettings)
	if !ok {
		return nil
	}
	var ids []string
	for _, ref := range []string{s.X, s.Y} {
		if id, _, ok := strings.Cut(ref, "."); ok && id != "" {
			ids = append(ids, id)
		}
	}
	return ids
}

// depIDs returns the ids of the cells c reads, sorted, without repeats;
// references to missing cells are included (they are reported when the
// cell computes).
func (d *Document) depIDs(c *Cell) []string {
	seen := map[string]bool{}
	for _, r := range c.Kind.Roles() {
		if id, _ := d.resolve(c, r); id != "" {
			seen[id] = true
		}
	}
	for _, id := range chartRefs(c) {
		seen[id] = true
	}
	ids := make([]string, 0, len(seen))
	for id := range seen {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	return ids
}

// order returns the cells in an order where every cell comes after the cells
// it reads, keeping document order where the graph allows; a loop gives a
// *CycleError.
func (d *Document) order() ([]*Cell, error) {
	const (
		white = iota
		grey
		black
	)
	colour := make(map[string]int, len(d.Cells))
	var out []*Cell
	var stack []string
	var visit func(c *Cell) error
	visit = func(c *Cell) error {
		switch colour[c.ID] {
		case black:
			return nil
		case grey:
			i := 0
			for i < len(stack) && stack[i] != c.ID {
				i++
			}
			path := append(append([]string(nil), stack[i:]...), c.ID)
			return &CycleError{Path: path}
		}
		colour[c.ID] = grey
		stack = append(stack, c.ID)
		for _, id := range d.depIDs(c) {
			if t := d.Cell(id); t != nil {
				if err := visit(t); err != nil {
					return err
				}
			}
		}
		stack = stack[:len(stack)-1]
		colour[c.ID] = black
		out = append(out, c)
		return nil
	}
	for _, c := range d.Cells {
		if err := visit(c); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// Downstream returns the ids of every cell that reads, directly or through
// others, the cell with the given id, in compute order.
func (d *Document) Downstream(id string) []string {
	order, err := d.order()
	if err != nil {
		return nil
	}
	reach := map[string]bool{id: true}
	var out []string
	for _, c := range order {
		for _, dep := range d.depIDs(c) {
			if reach[dep] && !reach[c.ID] {
				reach[c.ID] = true
				out = append(out, c.ID)
			}
		}
	}
	return out
}

// markStale marks the given cells and everything downstream of them stale.
func (d *Document) markStale(ids ...string) {
	if d.state == nil {
		d.state = map[string]*cellState{}
	}
	for _, id := range ids {
		d.st(id).stale = true
		for _, dn := range d.Downstream(id) {
			d.st(dn).stale = true
		}
	}
	for id := range d.state { // forget removed cells
		if d.Cell(id) == nil {
			delete(d.state, id)
		}
	}
}
