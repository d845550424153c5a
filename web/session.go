package web

import (
	"bytes"
	"errors"
	"fmt"
	"strings"

	"lixiv/engine/notebook"
)

// maxUndo is how many earlier states undo can go back to.
const maxUndo = 60

// Session is the open budget and what the page knows about it beyond the
// document: undo history, where the budget came from, the last message for
// each cell, the import notes of tables read from files, and which cells
// are folded. The document is the single source of truth for every number;
// the session only routes edits to it.
type Session struct {
	Doc      *notebook.Document
	FileName string // name the budget was opened from or will be saved as
	Origin   Origin // where the budget came from

	// Demo is the demo budget as it opened, so that values a budget grown
	// from it still holds can be marked as the demo's; nil until the demo
	// has been fetched. Set it with SetDemo.
	Demo     *notebook.Document
	demoText []byte // Demo's budget file

	undo, redo []entry

	CellErr   map[string]string   // last rejected edit, per cell id
	Notes     map[string][]string // what a file import did, per cell id
	Collapsed map[string]bool     // folded cells
	Message   string              // last page-wide message (file problems)

	lastOut     map[string]*notebook.Output // the last results of each cell, shown dimmed while it recomputes
	hadInterval map[string]bool             // "cell\x00figure" names shown with an interval, so the quick pass can say one follows

	changed func() // called after every change of the document
	current []byte // the budget file of the document as it is, or nil
	opened  []byte // the budget file as it was opened (without results), or nil until asked for
	// openedDoc is a copy of the budget as it was opened, until opened is
	// first asked for: writing the file takes a while, and a budget just
	// opened is drawn first.
	openedDoc *notebook.Document
}

// Origin says where the open budget came from, as far as the page must
// know. Undo and redo restore it with the budget.
type Origin struct {
	// Demo marks the demo budget, or one grown from it by edits: a file
	// opened over it asks whether to start a budget of one's own.
	Demo bool `json:"demo,omitempty"`
	// Checked says the budget's stored results are the user's: it was
	// opened from a budget file or downloaded with its results. Only then
	// does the footer compare them with the rerun.
	Checked bool `json:"checked,omitempty"`
	// Mixed says the user chose to put a file of their own into the demo,
	// so the page does not ask again.
	Mixed bool `json:"mixed,omitempty"`
}

// entry is one state of the undo history.
type entry struct {
	doc    []byte
	origin Origin
	name   string
}

// Edited reports whether the document differs from the file as it was
// opened, so that its stored results no longer describe it.
func (s *Session) Edited() bool { return !bytes.Equal(s.Current(), s.openedFile()) }

// openedFile returns the budget file as it was opened (without results).
func (s *Session) openedFile() []byte {
	if s.opened == nil && s.openedDoc != nil {
		s.opened, s.openedDoc = s.openedDoc.Marshal(), nil
	}
	return s.opened
}

// Current returns the budget file of the document as it stands (without
// results), kept between edits so that undo and autosave share one copy.
func (s *Session) Current() []byte {
	if s.current == nil {
		s.current = s.Doc.Marshal()
	}
	return s.current
}

// NewSession opens doc, which came from o.
func NewSession(doc *notebook.Document, fileName string, o Origin) *Session {
	s := &Session{}
	s.reset(doc, fileName, o)
	return s
}

func (s *Session) reset(doc *notebook.Document, fileName string, o Origin) {
	s.Doc, s.FileName, s.Origin = doc, fileName, o
	s.opened, s.openedDoc = nil, doc.Clone()
	s.CellErr = map[string]string{}
	s.Notes = map[string][]string{}
	s.lastOut = map[string]*notebook.Output{}
	s.hadInterval = map[string]bool{}
	if s.Collapsed == nil {
		s.Collapsed = map[string]bool{}
	}
}

// OnChange sets the function called after every change of the document
// (the page uses it to autosave and recompute).
func (s *Session) OnChange(f func()) { s.changed = f }

// Do applies an edit. On success the earlier state goes on the undo stack,
// the redo stack is cleared and the change is announced; on failure the
// document is unchanged and the message is kept for the cell.
func (s *Session) Do(cell string, edit func(d *notebook.Document) error) error {
	before := s.state()
	if err := edit(s.Doc); err != nil {
		if cell != "" {
			s.CellErr[cell] = userText(err)
		} else {
			s.Message = userText(err)
		}
		return err
	}
	delete(s.CellErr, cell)
	s.Message = ""
	s.current = nil
	s.push(&s.undo, before)
	s.redo = nil
	s.announce()
	return nil
}

// userText is the message of a refused edit as the page shows it beside
// the cell: a setting named by its label, without the cell's id.
func userText(err error) string {
	var se *notebook.SettingError
	if errors.As(err, &se) {
		return se.Error()
	}
	return err.Error()
}

// state is the session's present state for the undo history.
func (s *Session) state() entry { return entry{doc: s.Current(), origin: s.Origin, name: s.FileName} }

func (s *Session) push(stack *[]entry, b entry) {
	*stack = append(*stack, b)
	if len(*stack) > maxUndo {
		*stack = (*stack)[len(*stack)-maxUndo:]
	}
}

func (s *Session) announce() {
	if s.changed != nil {
		s.changed()
	}
}

// CanUndo and CanRedo report whether there is something to undo or redo.
func (s *Session) CanUndo() bool { return len(s.undo) > 0 }

// CanRedo reports whether an undone edit can be applied again.
func (s *Session) CanRedo() bool { return len(s.redo) > 0 }

// Undo goes back one edit.
func (s *Session) Undo() error { return s.step(&s.undo, &s.redo) }

// Redo applies the last undone edit again.
func (s *Session) Redo() error { return s.step(&s.redo, &s.undo) }

func (s *Session) step(from, to *[]entry) error {
	if len(*from) == 0 {
		return nil
	}
	e := (*from)[len(*from)-1]
	doc, err := notebook.Parse(e.doc, e.name)
	if err != nil {
		return fmt.Errorf("undo: %w", err)
	}
	*from = (*from)[:len(*from)-1]
	s.push(to, s.state())
	s.Doc, s.current, s.Origin, s.FileName = doc, e.doc, e.origin, e.name
	s.CellErr = map[string]string{}
	s.announce()
	return nil
}

// Replace opens another document (a file the user opened, a new budget,
// the demo), which came from o; the current one stays reachable by undo.
func (s *Session) Replace(doc *notebook.Document, fileName string, o Origin) {
	s.push(&s.undo, s.state())
	s.redo = nil
	s.reset(doc, fileName, o)
	s.current = nil
	s.announce()
}

// SetDemo keeps the demo budget as it opened, for the marks of values a
// budget grown from it still holds.
func (s *Session) SetDemo(d *notebook.Document) { s.Demo, s.demoText = d, nil }

// Saved records that the budget was just written with its results: from
// now on they are the user's, and the file as saved is the one edits are
// told against.
func (s *Session) Saved() {
	s.Origin.Checked = true
	s.current = nil
	s.opened, s.openedDoc = s.Current(), nil
}

// SetParam sets one setting of a cell from text. Text that is the
// setting's value already changes nothing.
func (s *Session) SetParam(cell, key, text string) error {
	if c := s.Doc.Cell(cell); c != nil && c.Settings != nil && !c.Broken() {
		for _, p := range notebook.Params(c.Settings) {
			if p.Key == key && p.Value == strings.TrimSpace(text) {
				delete(s.CellErr, cell)
				return nil
			}
		}
	}
	return s.Do(cell, func(d *notebook.Document) error { return d.SetParam(cell, key, text) })
}

// SetTitle renames a cell.
func (s *Session) SetTitle(cell, title string) error {
	return s.Do(cell, func(d *notebook.Document) error { return d.SetTitle(cell, title) })
}

// SetBudgetTitle renames the budget.
func (s *Session) SetBudgetTitle(title string) error {
	return s.Do("", func(d *notebook.Document) error {
		d.Title = strings.TrimSpace(title)
		return nil
	})
}

// SetValue changes one cell of a cell's data table. Text that is there
// already changes nothing.
func (s *Session) SetValue(cell string, row, col int, text string) error {
	if c := s.Doc.Cell(cell); c != nil && c.Table != nil && row < len(c.Table.Rows) && col < len(c.Table.Columns) && c.Table.Cell(row, col) == text {
		return nil
	}
	return s.Do(cell, func(d *notebook.Document) error { return d.SetValue(cell, row, col, text) })
}

// SetColumn renames a column (header) of a cell's data table.
func (s *Session) SetColumn(cell string, col int, name string) error {
	return s.editTable(cell, func(t *notebook.Table) error {
		if col < 0 || col >= len(t.Columns) {
			return fmt.Errorf("no column %d", col+1)
		}
		t.Columns[col] = strings.TrimSpace(name)
		return nil
	})
}

// SetUnit changes the unit of a column of a cell's data table.
func (s *Session) SetUnit(cell string, col int, unit string) error {
	return s.editTable(cell, func(t *notebook.Table) error {
		if col < 0 || col >= len(t.Columns) {
			return fmt.Errorf("no column %d", col+1)
		}
		if len(t.Units) < len(t.Columns) {
			t.Units = pad(t.Units, len(t.Columns))
		}
		t.Units[col] = strings.TrimSpace(unit)
		return nil
	})
}

// Paste adds the rows of a block copied from a spreadsheet to a cell's
// table and says how many were added.
func (s *Session) Paste(cell, text string) (int, error) {
	n := 0
	err := s.editTable(cell, func(t *notebook.Table) error {
		n = AppendRows(t, text)
		if n == 0 {
			return fmt.Errorf("the pasted text holds no rows")
		}
		return nil
	})
	if err == nil {
		s.Notes[cell] = []string{fmt.Sprintf("%d rows pasted.", n)}
	}
	return n, err
}

// RemoveRow deletes one row of a cell's table.
func (s *Session) RemoveRow(cell string, row int) error {
	return s.editTable(cell, func(t *notebook.Table) error {
		if row < 0 || row >= len(t.Rows) {
			return fmt.Errorf("no row %d", row+1)
		}
		t.Rows = append(t.Rows[:row:row], t.Rows[row+1:]...)
		return nil
	})
}

// AddRow appends an empty row to a cell's table.
func (s *Session) AddRow(cell string) error {
	return s.editTable(cell, func(t *notebook.Table) error {
		if len(t.Columns) == 0 {
			return fmt.Errorf("the table has no columns yet: paste or open a file with a header row")
		}
		t.Rows = append(t.Rows, make([]string, len(t.Columns)))
		return nil
	})
}

// LoadTable replaces a cell's table with one read from a file.
func (s *Session) LoadTable(cell string, t *notebook.Table, fileName string) error {
	err := s.Do(cell, func(d *notebook.Document) error { return d.SetTable(cell, t) })
	if err == nil {
		s.Notes[cell] = []string{readNote(t, fileName)}
	}
	return err
}

// readNote says what was read into a table from a file.
func readNote(t *notebook.Table, fileName string) string {
	return fmt.Sprintf("Read %d rows of %d columns from %s.", len(t.Rows), len(t.Columns), fileName)
}

func (s *Session) editTable(cell string, f func(t *notebook.Table) error) error {
	return s.Do(cell, func(d *notebook.Document) error {
		c := d.Cell(cell)
		if c == nil {
			return fmt.Errorf("no cell named %q", cell)
		}
		t := c.Table.Clone()
		if t == nil {
			return fmt.Errorf("a %s cell holds no table", c.Kind)
		}
		if err := f(t); err != nil {
			return err
		}
		return d.SetTable(cell, t)
	})
}

// SetUses points an input of a cell at another cell ("" for the nearest above).
func (s *Session) SetUses(cell, role, target string) error {
	return s.Do(cell, func(d *notebook.Document) error { return d.SetUses(cell, role, target) })
}

// Add inserts a new cell of kind k after the cell with id after ("" for the end).
func (s *Session) Add(k notebook.Kind, after string) (string, error) {
	var id string
	err := s.Do("", func(d *notebook.Document) error {
		at := -1
		for i, c := range d.Cells {
			if c.ID == after {
				at = i + 1
			}
		}
		c, err := d.Add(k, at)
		if err != nil {
			return err
		}
		id = c.ID
		if at > 0 && d.Cells[at-1].Section != "" { // a cell added in a section joins it
			if err := d.SetSection(id, d.Cells[at-1].Section); err != nil {
				return err
			}
		}
		if k == notebook.KindSources { // start from the default preset's end-members
			if t, err := notebook.SourcesTable("global"); err == nil {
				return d.SetTable(id, t)
			}
		}
		return nil
	})
	return id, err
}

// Remove deletes a cell.
func (s *Session) Remove(cell string) error {
	return s.Do("", func(d *notebook.Document) error { return d.Remove(cell) })
}

// Move shifts a cell up (by -1) or down (by +1).
func (s *Session) Move(cell string, by int) error {
	return s.Do(cell, func(d *notebook.Document) error {
		for i, c := range d.Cells {
			if c.ID == cell {
				to := i + by
				if to < 0 || to >= len(d.Cells) {
					return nil
				}
				return d.Move(cell, to)
			}
		}
		return fmt.Errorf("no cell named %q", cell)
	})
}

// Toggle folds or unfolds a cell; it is view state, not an edit.
func (s *Session) Toggle(cell string) { s.Collapsed[cell] = !s.Collapsed[cell] }

func (s *Session) expanded(cell string, ti int) bool {
	return s.Collapsed[fmt.Sprintf("%s/result/%d", cell, ti)]
}

func (s *Session) toggleExpanded(cell string, ti int) {
	k := fmt.Sprintf("%s/result/%d", cell, ti)
	s.Collapsed[k] = !s.Collapsed[k]
}
