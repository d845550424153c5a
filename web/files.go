package web

import (
	"path"
	"strings"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
	"lixiv/engine/sample"
)

// Opening files. A budget file replaces the open budget. A table (CSV,
// TSV, or the first sheet of an .xlsx workbook) goes into the samples or
// discharge cell, as the engine decides from its header
// (notebook.TableKind). A table opened or dropped over the demo first asks
// whether to start a budget of one's own from it (the default) or to put
// it into the demo's table; so a user's data never mixes with the demo's
// silently. Every open, drop and paste ends in the import banner at the
// top, which says what the cell made of the file.

// PendingFile is a table read from a file, waiting for the user to choose
// where it goes.
type PendingFile struct {
	Name    string          // the file's name
	Table   *notebook.Table // as read, cells as written
	Kind    notebook.Kind   // the cell that takes it
	Verb    string          // "opened" or "dropped"
	focused bool            // the default choice has had the focus
}

// Banner is the import report of the last open, drop or paste.
type Banner struct {
	Cell  string // the cell that took the table; "" for a budget file
	File  string // the file; "" for pasted rows
	Verb  string // "opened", "dropped" or "pasted"
	Cells int    // cells of a budget file
}

// OnOpenFile reads the file chosen in the picker.
func (c *Root) OnOpenFile(e vugu.DOMEvent) {
	defer c.guard()
	files := e.JSEventTarget().Get("files")
	if files.Length() == 0 {
		return
	}
	f := files.Index(0)
	e.JSEventTarget().Set("value", "")
	go c.readAndOpen(f, "opened")
}

// OnDragOver lets a file be dropped anywhere on the page.
func (c *Root) OnDragOver(e vugu.DOMEvent) {
	e.PreventDefault()
	c.Dragging = true
}

// OnDragLeave clears the drop hint.
func (c *Root) OnDragLeave(e vugu.DOMEvent) { c.Dragging = false }

// OnDrop opens a file dropped on the page.
func (c *Root) OnDrop(e vugu.DOMEvent) {
	defer c.guard()
	e.PreventDefault()
	c.Dragging = false
	files := e.JSEvent().Get("dataTransfer").Get("files")
	if files.Length() == 0 {
		return
	}
	go c.readAndOpen(files.Index(0), "dropped")
}

// readAndOpen reads a File (verb says how it came) and opens it.
func (c *Root) readAndOpen(f js.Value, verb string) {
	name := f.Get("name").String()
	workbook := strings.HasSuffix(strings.ToLower(name), ".xlsx")
	var text string
	var b []byte
	var err error
	if workbook {
		b, err = readFileBytes(f)
	} else {
		text, err = readFile(f)
	}
	c.env.Lock()
	defer c.env.UnlockRender()
	defer c.guard()
	if c.S == nil { // still opening the demo: start from a new budget
		c.open(notebook.NewBudget("Untitled budget"), "", Origin{})
	}
	switch {
	case err != nil:
		c.S.Message = name + ": " + err.Error()
	case workbook:
		c.OpenWorkbook(name, b, verb)
	default:
		c.OpenText(name, text, verb)
	}
}

// OpenWorkbook reads the first sheet of an .xlsx workbook into the samples
// or discharge cell (by its header), through the sheet's cells: rows are
// the spreadsheet's, a header over merged rows is one header, and the
// other sheets are named in a note. Rows the workbook reader cannot read
// stop the import, so that none is lost silently. Over the demo it asks
// first.
func (c *Root) OpenWorkbook(name string, b []byte, verb string) {
	defer c.guard()
	g, err := sample.SheetGrid(b, path.Base(name), "")
	switch {
	case err != nil:
		c.S.Message = err.Error()
		return
	case len(g.Problems) > 0:
		c.S.Message = g.Problems.Error()
		return
	}
	t, err := notebook.TableFromGrid(g)
	if err != nil {
		c.S.Message = err.Error()
		return
	}
	c.openTable(path.Base(name), t, verb)
}

// OpenText opens a budget file, or reads a CSV/TSV table into the samples
// or discharge cell (by its header). Over the demo it asks first.
func (c *Root) OpenText(name, text, verb string) {
	defer c.guard()
	base := path.Base(name)
	trim := strings.TrimSpace(strings.TrimPrefix(text, "\ufeff"))
	if strings.HasSuffix(strings.ToLower(name), ".json") || strings.HasPrefix(trim, "{") {
		doc, err := notebook.Parse([]byte(text), name)
		if err != nil {
			c.S.Message = err.Error()
			return
		}
		c.Pending = nil
		c.S.Replace(doc, base, Origin{Checked: true})
		c.Banner = &Banner{File: base, Verb: verb, Cells: len(doc.Cells)}
		c.Unsaved = false
		return
	}
	t, err := notebook.ReadTable(base, text)
	if err != nil || len(t.Columns) == 0 {
		c.S.Message = name + ": no table found (a CSV or TSV file needs a header row)"
		if err != nil {
			c.S.Message = err.Error()
		}
		return
	}
	c.openTable(base, t, verb)
}

// openTable puts a table read from a file into its cell (notebook.TableKind
// says which), or over the demo asks first.
func (c *Root) openTable(name string, t *notebook.Table, verb string) {
	kind := notebook.TableKind(t)
	if c.S.Origin.Demo && !c.S.Origin.Mixed {
		c.Pending = &PendingFile{Name: name, Table: t, Kind: kind, Verb: verb}
		return
	}
	c.loadTable(name, t, kind, verb)
}

// loadTable puts a table read from a file into the first cell of kind,
// adding one when there is none, and reports it in the banner.
func (c *Root) loadTable(name string, t *notebook.Table, kind notebook.Kind, verb string) {
	target := firstOf(c.S.Doc, kind)
	if target == "" {
		id, err := c.S.Add(kind, "")
		if err != nil {
			return
		}
		target = id
	}
	if err := c.S.LoadTable(target, t, name); err == nil {
		c.shownTable(target, name, verb)
	}
}

// shownTable reports a table a cell took in the banner and scrolls to it.
func (c *Root) shownTable(cell, file, verb string) {
	c.S.Collapsed[cell] = false
	c.Banner = &Banner{Cell: cell, File: file, Verb: verb}
	js.Global().Get("location").Set("hash", "#import-banner")
}

// ChooseNew starts a new budget from the file waiting for a choice: the
// new budget's cells with the file in its cell, as one step of undo.
func (c *Root) ChooseNew() {
	defer c.guard()
	p := c.takePending()
	if p == nil {
		return
	}
	doc := notebook.NewBudget("Untitled budget")
	target := firstOf(doc, p.Kind)
	if err := doc.SetTable(target, p.Table); err != nil {
		c.S.Message = err.Error()
		return
	}
	c.S.Replace(doc, "", Origin{})
	c.S.Notes[target] = []string{readNote(p.Table, p.Name)}
	c.shownTable(target, p.Name, p.Verb)
}

// firstOf returns the id of the first cell of kind k, "" when there is none.
func firstOf(d *notebook.Document, k notebook.Kind) string {
	for _, cell := range d.Cells {
		if cell.Kind == k {
			return cell.ID
		}
	}
	return ""
}

// ChooseDemo puts the file waiting for a choice into the demo's table; the
// page does not ask again for this budget.
func (c *Root) ChooseDemo() {
	defer c.guard()
	p := c.takePending()
	if p == nil {
		return
	}
	c.loadTable(p.Name, p.Table, p.Kind, p.Verb)
	c.S.Origin.Mixed = true // after the edit: undo returns to the demo as it was, which asks again
}

// ChooseCancel drops the file waiting for a choice.
func (c *Root) ChooseCancel() { c.Pending = nil }

// takePending returns the file waiting for a choice (nil when none) and
// clears it.
func (c *Root) takePending() *PendingFile {
	p := c.Pending
	c.Pending = nil
	return p
}

// ChoiceKind names the cell that takes the file waiting for a choice.
func (c *Root) ChoiceKind() string { return strings.ToLower(KindLabel(c.Pending.Kind)) }

// FocusChoice gives the default choice the focus once, when it appears.
func (c *Root) FocusChoice(el js.Value) {
	if c.Pending != nil && !c.Pending.focused {
		c.Pending.focused = true
		el.Call("focus")
	}
}

// NewBudget starts an empty budget of the usual cells (the open one stays
// reachable by undo).
func (c *Root) NewBudget() {
	defer c.guard()
	c.Pending, c.Banner = nil, nil
	c.S.Replace(notebook.NewBudget("Untitled budget"), "", Origin{})
	c.Unsaved = true
	js.Global().Get("window").Call("scrollTo", 0, 0)
}

// CloseBanner dismisses the import report.
func (c *Root) CloseBanner() { c.Banner = nil }

// DownloadBudget offers the budget file, with its results snapshot when
// every cell is computed; from then on the footer compares the stored
// results with the rerun.
func (c *Root) DownloadBudget() {
	defer c.guard()
	d := c.S.Doc
	if len(d.Pending()) == 0 && !c.busy && d.Keep() == nil {
		c.S.Saved()
		c.verifyDoc = nil
		c.autosave()
	}
	name := c.S.FileName
	if name == "" || !strings.HasSuffix(name, notebook.Extension) {
		name = docFileName(d)
	}
	download(name, "application/json", d.Marshal())
	c.Unsaved = false
}
