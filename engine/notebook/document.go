package notebook

import (
	"encoding/json"
	"fmt"
	"strings"

	"lixiv/engine/mix"
)

// Cell is one step of a budget: a kind, an id other cells refer to it by, a
// title the user chooses, its inputs (the cells it uses, its settings and
// an optional data table) and, once computed, its outputs (held by the
// Document).
type Cell struct {
	ID       string            // unique within the document: letters, digits, '-' and '_'
	Kind     Kind              // what the cell does
	Title    string            // the user's title
	Section  string            // the section (catchment, period) it belongs to; "" for a cell shared by every section (section.go)
	Uses     map[string]string // role → id of the cell it reads; a missing role means the nearest cell above of that kind
	Settings Settings          // parameters of the kind
	Table    *Table            // data table, for kinds that hold one; nil otherwise

	// Extra keeps fields of the cell object this version does not know, and
	// SettingsExtra those of its settings object, so that they survive a
	// round trip.
	Extra         map[string]json.RawMessage
	SettingsExtra map[string]json.RawMessage

	// Raw and Problem are set on a broken cell: the JSON it was loaded from,
	// kept verbatim and written back unchanged, and why it failed to load.
	Raw     json.RawMessage
	Problem string
}

// Broken reports whether the cell failed to load.
func (c *Cell) Broken() bool { return c.Kind == KindBroken }

// clone returns a deep copy of c.
func (c *Cell) clone() *Cell {
	n := *c
	n.Uses = cloneMap(c.Uses)
	n.Settings = cloneSettings(c.Settings)
	n.Table = c.Table.Clone()
	n.Extra = cloneRaw(c.Extra)
	n.SettingsExtra = cloneRaw(c.SettingsExtra)
	n.Raw = append(json.RawMessage(nil), c.Raw...)
	return &n
}

func cloneMap(m map[string]string) map[string]string {
	if m == nil {
		return nil
	}
	n := make(map[string]string, len(m))
	for k, v := range m {
		n[k] = v
	}
	return n
}

func cloneRaw(m map[string]json.RawMessage) map[string]json.RawMessage {
	if m == nil {
		return nil
	}
	n := make(map[string]json.RawMessage, len(m))
	for k, v := range m {
		n[k] = append(json.RawMessage(nil), v...)
	}
	return n
}

// Document is a budget: an ordered list of cells, the results computed from
// them and a revision counter that changes on every edit. The zero value is
// an empty budget; use New for one with a title. A Document is not safe for
// concurrent use.
type Document struct {
	Title  string  // the budget's name
	Engine string  // engine version that last wrote the file
	Cells  []*Cell // in document order

	// Extra keeps top-level fields this version does not know.
	Extra map[string]json.RawMessage
	// Stored is the results snapshot read from the file, or nil.
	Stored *Snapshot

	// Workers is the number of goroutines a long computation may use; 0
	// means all cores. Results do not depend on it.
	Workers int
	// Farm, when set, works the samples of the per-sample inverse model
	// elsewhere (the page's Web Workers); see Farm. Results do not depend
	// on it.
	Farm Farm
	// Quick makes Step compute stale cells first without their intervals
	// (the bootstraps of fluxes and CO2), so that a page can show the new
	// point values at once, and then refine those cells in order. The
	// refined results are the same as without Quick; only the order of the
	// work changes.
	Quick bool

	rev   uint64
	part  bool // a section's view of a budget with sections, made for its report (report_compare.go)
	state map[string]*cellState
	funcs map[Kind]ComputeFunc // nil: the registered functions
	// searches keeps, per apportionment, the mode searches of its last
	// catchment-wide quick pass, for its full pass (searches.go).
	searches map[string]*mix.Searches
}

// New returns an empty budget with the given title.
func New(title string) *Document { return &Document{Title: title, Engine: EngineVersion} }

// Revision returns a counter that changes on every edit of the document.
func (d *Document) Revision() uint64 { return d.rev }

// Cell returns the cell with the given id, or nil.
func (d *Document) Cell(id string) *Cell {
	for _, c := range d.Cells {
		if c.ID == id {
			return c
		}
	}
	return nil
}

func (d *Document) index(id string) int {
	for i, c := range d.Cells {
		if c.ID == id {
			return i
		}
	}
	return -1
}

// validID reports whether id is usable as a cell id.
func validID(id string) error {
	if id == "" || len(id) > 64 {
		return fmt.Errorf("cell id %q must have 1 to 64 characters", id)
	}
	for _, r := range id {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' || r == '_') {
			return fmt.Errorf("cell id %q may hold only letters, digits, '-' and '_'", id)
		}
	}
	return nil
}

// NewCell returns a cell of kind k with default settings, an empty table
// where the kind holds one, and the given id and title.
func NewCell(k Kind, id, title string) *Cell {
	c := &Cell{ID: id, Kind: k, Title: title, Settings: DefaultSettings(k)}
	if k.hasTable() {
		c.Table = &Table{}
	}
	return c
}

// freeID returns an id based on base that no cell has.
func (d *Document) freeID(base string) string {
	if d.Cell(base) == nil {
		return base
	}
	for i := 2; ; i++ {
		id := fmt.Sprintf("%s-%d", base, i)
		if d.Cell(id) == nil {
			return id
		}
	}
}

// Add inserts a new cell of kind k at position at (len(d.Cells) or -1 to
// append) and returns it. Its id is the kind's name, numbered when taken.
func (d *Document) Add(k Kind, at int) (*Cell, error) {
	if !k.Valid() {
		return nil, fmt.Errorf("unknown cell kind %q", k)
	}
	c := NewCell(k, d.freeID(string(k)), "")
	if err := d.Insert(c, at); err != nil {
		return nil, err
	}
	return c, nil
}

// Insert puts cell c at position at (-1 appends). Its id must be new.
func (d *Document) Insert(c *Cell, at int) error {
	if len(d.Cells) >= MaxCells {
		return fmt.Errorf("a budget holds at most %d cells", MaxCells)
	}
	if err := validID(c.ID); err != nil {
		return err
	}
	if !c.Kind.Valid() && !c.Broken() {
		return fmt.Errorf("unknown cell kind %q", c.Kind)
	}
	if c.Settings == nil {
		c.Settings = DefaultSettings(c.Kind)
	}
	if c.Settings.Kind() != c.Kind {
		return fmt.Errorf("cell %q: %s settings on a %s cell", c.ID, c.Settings.Kind(), c.Kind)
	}
	if err := validate(c.Settings); err != nil {
		return fmt.Errorf("cell %q: %w", c.ID, err)
	}
	if d.Cell(c.ID) != nil {
		return fmt.Errorf("a cell named %q already exists", c.ID)
	}
	if at < 0 || at > len(d.Cells) {
		at = len(d.Cells)
	}
	cells := make([]*Cell, 0, len(d.Cells)+1)
	cells = append(cells, d.Cells[:at]...)
	cells = append(cells, c)
	cells = append(cells, d.Cells[at:]...)
	return d.replaceCells(cells, c.ID)
}

// Remove deletes the cell with the given id. Cells that used it show a
// problem until they are pointed elsewhere.
func (d *Document) Remove(id string) error {
	i := d.index(id)
	if i < 0 {
		return fmt.Errorf("no cell named %q", id)
	}
	cells := append(append([]*Cell(nil), d.Cells[:i]...), d.Cells[i+1:]...)
	return d.replaceCells(cells, "")
}

// Move puts the cell with the given id at position to.
func (d *Document) Move(id string, to int) error {
	i := d.index(id)
	if i < 0 {
		return fmt.Errorf("no cell named %q", id)
	}
	c := d.Cells[i]
	cells := append(append([]*Cell(nil), d.Cells[:i]...), d.Cells[i+1:]...)
	if to < 0 || to > len(cells) {
		to = len(cells)
	}
	cells = append(cells[:to], append([]*Cell{c}, cells[to:]...)...)
	return d.replaceCells(cells, "")
}

// replaceCells installs a new cell list if its graph has no cycle, marks
// stale every cell whose inputs changed (and changed is one, when set) with
// everything downstream, and bumps the revision.
func (d *Document) replaceCells(cells []*Cell, changed string) error {
	nd := &Document{Cells: cells}
	if _, err := nd.order(); err != nil {
		return err
	}
	before := map[string]string{}
	for _, c := range d.Cells {
		before[c.ID] = strings.Join(d.depIDs(c), ",")
	}
	old := d.Cells
	d.Cells = cells
	var dirty []string
	for _, c := range cells {
		if b, ok := before[c.ID]; !ok || b != strings.Join(d.depIDs(c), ",") || c.ID == changed {
			dirty = append(dirty, c.ID)
		}
	}
	_ = old
	d.markStale(dirty...)
	d.rev++
	return nil
}

// Edit applies f to a copy of the cell with the given id. If f succeeds, the
// settings validate and the graph has no cycle, the copy replaces the cell,
// the cell and everything downstream of it become stale and the revision
// changes; otherwise the document is left as it was.
func (d *Document) Edit(id string, f func(c *Cell) error) error {
	i := d.index(id)
	if i < 0 {
		return fmt.Errorf("no cell named %q", id)
	}
	c := d.Cells[i].clone()
	if err := f(c); err != nil {
		return fmt.Errorf("cell %q: %w", id, err)
	}
	if c.ID != id {
		return fmt.Errorf("cell %q: use Rename to change an id", id)
	}
	if err := validate(c.Settings); err != nil {
		return fmt.Errorf("cell %q: %w", id, err)
	}
	if err := c.Table.check(); err != nil {
		return fmt.Errorf("cell %q: table: %w", id, err)
	}
	cells := append([]*Cell(nil), d.Cells...)
	cells[i] = c
	return d.replaceCells(cells, id)
}

// SetParam sets one setting of a cell from text, as typed into a field.
func (d *Document) SetParam(id, key, text string) error {
	return d.Edit(id, func(c *Cell) error { return setField(c.Settings, key, text) })
}

// SetTitle changes a cell's title. Titles feed no computation, so no cell
// becomes stale, but the revision changes.
func (d *Document) SetTitle(id, title string) error {
	c := d.Cell(id)
	if c == nil {
		return fmt.Errorf("no cell named %q", id)
	}
	c.Title = title
	d.rev++
	return nil
}

// SetUses points role of cell id at the cell target ("" restores the nearest
// cell above). A change that would close a cycle is refused.
func (d *Document) SetUses(id, role, target string) error {
	return d.Edit(id, func(c *Cell) error {
		known := false
		for _, r := range c.Kind.Roles() {
			known = known || r.Name == role
		}
		if !known {
			return fmt.Errorf("a %s cell has no input %q", c.Kind, role)
		}
		if target == "" {
			delete(c.Uses, role)
			return nil
		}
		if c.Uses == nil {
			c.Uses = map[string]string{}
		}
		c.Uses[role] = target
		return nil
	})
}

// SetTable replaces the data table of a cell.
func (d *Document) SetTable(id string, t *Table) error {
	return d.Edit(id, func(c *Cell) error {
		if !c.Kind.hasTable() {
			return fmt.Errorf("a %s cell holds no table", c.Kind)
		}
		c.Table = t.Clone()
		return nil
	})
}

// SetValue changes one cell of a cell's data table (row and col from 0),
// growing the row when it is short.
func (d *Document) SetValue(id string, row, col int, text string) error {
	return d.Edit(id, func(c *Cell) error {
		if c.Table == nil || row < 0 || row >= len(c.Table.Rows) || col < 0 || col >= len(c.Table.Columns) {
			return fmt.Errorf("no table cell at row %d, column %d", row+1, col+1)
		}
		r := c.Table.Rows[row]
		for len(r) <= col {
			r = append(r, "")
		}
		r[col] = text
		c.Table.Rows[row] = r
		return nil
	})
}

// Repair replaces the cell with the given id (usually a broken one) by the
// cell the JSON text raw describes, as typed into the page's raw editor. The
// new cell may not take another cell's id. On any problem the document is
// left as it was and the error says what is wrong.
func (d *Document) Repair(id string, raw []byte) error {
	i := d.index(id)
	if i < 0 {
		return fmt.Errorf("no cell named %q", id)
	}
	if _, err := checkDepth(raw); err != nil {
		return err
	}
	c, err := parseCell(raw)
	if err != nil {
		return err
	}
	if c.ID != id && d.Cell(c.ID) != nil {
		return fmt.Errorf("a cell named %q already exists", c.ID)
	}
	cells := append([]*Cell(nil), d.Cells...)
	cells[i] = c
	if err := d.replaceCells(cells, c.ID); err != nil {
		return err
	}
	delete(d.state, id)
	return nil
}

// Clone returns a deep copy of the document's cells, title and fields,
// without computed results (for undo stacks and what-if copies).
func (d *Document) Clone() *Document {
	n := &Document{Title: d.Title, Engine: d.Engine, Extra: cloneRaw(d.Extra), Stored: d.Stored, Workers: d.Workers, Farm: d.Farm, Quick: d.Quick, rev: d.rev, funcs: d.funcs}
	for _, c := range d.Cells {
		n.Cells = append(n.Cells, c.clone())
	}
	return n
}
