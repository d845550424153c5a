package web

import (
	"context"
	"fmt"
	"path"
	"strings"
	"time"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
	"lixiv/engine/sample"
)

// demoFile is the demo budget the build copies next to the page.
const demoFile = "demo" + notebook.Extension

// Root is the page's top component: header, summary strip, cells, footer.
type Root struct {
	env vugu.EventEnv
	S   *Session

	Cells    []CellView
	Headline []FigureView
	Verify   string // whether stored results match the rerun
	Seeds    string
	Loading  string // what the page is loading, "" when idle
	AddKind  string // kind chosen in the "add a cell" list
	Dragging bool

	SavedText string // the visible saved state
	SavedOK   bool
	Unsaved   bool // changed since the last download

	charts   ChartCache
	running  string
	progress float64
	busy     bool
	cancel   context.CancelFunc
	loopDone chan struct{}

	editStart  float64 // when the edit now computing was made (ms)
	painted    bool    // the page has repainted since that edit
	stepMillis float64 // time in Step (including yields) since the edit

	// The render loop holds the repaint after an edit until the quick pass
	// (notebook.Document.Quick) has point values, for at most HoldMillis,
	// so that a quick edit paints once, with its result.
	quickDone  chan struct{} // closed when the quick pass of the run is done
	holding    bool          // the render loop waits on quickDone
	quickShown bool          // the quick pass's result has been painted

	verifyGen  int                // recompute the cached verification belongs to
	verifyDoc  *notebook.Document // and its document
	verifyText string

	buildStart  float64 // when the render now running began (ms)
	savePending bool    // an edit waits to be saved to browser storage
	docTitle    string  // the browser tab's title as last set
	startMsg    string  // a problem met before the budget opened
	gen         int     // completed recomputes
	ready       bool
	keys        js.Func
	rows        map[string]int // rows shown per input table
}

// Init loads the last autosaved budget, or the demo on a first visit.
func (c *Root) Init(ctx vugu.InitCtx) {
	c.env = ctx.EventEnv()
	c.AddKind = string(notebook.KindNote)
	c.listenKeys()
	if text, ok := storageGet(storageKey); ok && text != "" {
		doc, err := notebook.Parse([]byte(text), "autosave")
		if err == nil {
			c.open(doc, docFileName(doc))
			c.savePending = false // it is what storage holds
			c.SavedText, c.SavedOK = "Reopened from this browser's storage", true
			return
		}
		// Keep the unreadable text under another key before anything is saved.
		c.startMsg = "The autosaved budget could not be read (" + err.Error() + "); the demo is open instead."
		if storageSet(storageKey+".unreadable", text) == nil {
			c.startMsg += " The unreadable text is kept in this browser's storage under " + storageKey + ".unreadable."
		}
	}
	c.Loading = "Opening the demo budget…"
	go c.loadDemo(true)
}

// loadDemo opens the demo budget. On the first visit (initial) it gives way
// to a file the user opened while the demo was still loading.
func (c *Root) loadDemo(initial bool) {
	text, err := fetchText(demoFile)
	c.env.Lock()
	defer c.env.UnlockRender()
	c.Loading = ""
	if initial && c.S != nil {
		return
	}
	var doc *notebook.Document
	if err == nil && strings.TrimSpace(text) != "" {
		doc, err = notebook.Parse([]byte(text), demoFile)
	}
	if doc == nil {
		doc = notebook.New("Untitled budget")
	}
	if c.S == nil {
		c.open(doc, docFileName(doc))
	} else {
		c.S.Replace(doc, docFileName(doc))
	}
	c.Unsaved = false
	if err != nil {
		c.S.Message = "The demo budget could not be opened: " + err.Error()
	}
	if c.startMsg != "" {
		c.S.Message, c.startMsg = strings.TrimSpace(c.startMsg+" "+c.S.Message), ""
	}
}

// open starts a session on doc and computes it.
func (c *Root) open(doc *notebook.Document, name string) {
	if c.S == nil {
		c.S = NewSession(doc, name)
		c.S.OnChange(c.changed)
	} else {
		c.S.Replace(doc, name)
		return
	}
	c.changed()
}

// changed runs after every change of the document: autosave, then recompute.
func (c *Root) changed() {
	c.Unsaved = true
	c.savePending = true // saved by the recompute at its first yield
	c.editStart, c.painted = nowMillis(), false
	c.recompute()
}

func (c *Root) autosave() {
	c.savePending = false
	if err := storageSet(storageKey, string(c.S.Current())); err != nil {
		c.SavedText, c.SavedOK = "Not saved: "+err.Error(), false
		return
	}
	c.SavedText, c.SavedOK = "Saved in this browser at "+time.Now().Format("15:04:05"), true
}

func docFileName(d *notebook.Document) string {
	base := strings.Map(func(r rune) rune {
		if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '-' || r == '_' {
			return r
		}
		if r == ' ' {
			return '-'
		}
		return -1
	}, d.Title)
	if base == "" {
		base = "budget"
	}
	return base + notebook.Extension
}

// Compute gathers what the page shows before each render.
func (c *Root) Compute(ctx vugu.ComputeCtx) {
	c.buildStart = nowMillis()
	if c.S == nil {
		return
	}
	c.Cells = c.S.Cells(c.running, c.progress, &c.charts)
	c.Headline = Headline(c.Cells, 6)
	c.Verify, c.Seeds = c.footer()
}

func (c *Root) footer() (verify, seeds string) {
	d := c.S.Doc
	var ss []string
	for _, cell := range d.Cells {
		for _, p := range notebook.Params(cell.Settings) {
			if p.Key == "seed" {
				ss = append(ss, cell.ID+" "+p.Value)
			}
		}
	}
	seeds = strings.Join(ss, ", ")
	if seeds == "" {
		seeds = "none"
	}
	switch {
	case c.busy || len(d.Pending()) > 0:
		verify = "checking once the rerun is done"
	case d.Stored == nil:
		verify = "this budget holds no stored results"
	case c.verifyGen == c.gen && c.verifyDoc == d:
		verify = c.verifyText // the checksum covers every output: compute it once per recompute
	default:
		v, err := d.Verify()
		switch {
		case err != nil:
			verify = "cannot compare: " + err.Error()
		case v.Match:
			verify = "stored results match the rerun"
		case c.S.Edited():
			verify = "the budget was edited after its results were stored; downloading it stores the new results"
		case len(v.Differ) == 0:
			verify = "stored results DIFFER from the rerun in the tables (the headline figures agree)"
		default:
			verify = fmt.Sprintf("stored results DIFFER from the rerun (%d headline figures differ)", len(v.Differ))
		}
		c.verifyGen, c.verifyDoc, c.verifyText = c.gen, d, verify
	}
	return verify, seeds
}

// EngineVersion is shown in the footer.
func (c *Root) EngineVersion() string { return notebook.EngineVersion }

// Title is the budget name shown in the header.
func (c *Root) Title() string {
	if c.S == nil {
		return "Lixiv"
	}
	if c.S.Doc.Title == "" {
		return "Untitled budget"
	}
	return c.S.Doc.Title
}

// Busy reports a recompute in progress.
func (c *Root) Busy() bool { return c.busy }

// Kinds lists the kinds a user can add.
func (c *Root) Kinds() []string {
	var out []string
	for _, k := range notebook.Kinds {
		out = append(out, string(k))
	}
	return out
}

// KindName is the label of a kind given as text.
func (c *Root) KindName(k string) string { return KindLabel(notebook.Kind(k)) }

// Rendered runs after each render (called by the render loop in wasm/,
// because vugu does not call it on the root). It marks the body for tests
// and the timing harness: data-ready after the first render, data-busy and
// data-gen as recomputes start and finish.
func (c *Root) Rendered() {
	body := js.Global().Get("document").Get("body")
	if !body.Truthy() {
		return
	}
	if t := c.Title() + " · Lixiv"; c.S != nil && c.docTitle != t {
		c.docTitle = t
		js.Global().Get("document").Set("title", t)
	}
	ds := body.Get("dataset")
	if c.buildStart > 0 { // for the timing harness: the cost of one full render
		js.Global().Set("lixivLastRender", nowMillis()-c.buildStart)
	}
	if !c.ready && c.S != nil && c.Loading == "" {
		c.ready = true
		ds.Set("ready", "1")
		if b := js.Global().Get("lixivBoot"); b.Truthy() {
			b.Set("firstRender", nowMillis())
		}
	}
	if c.editStart > 0 && !c.painted {
		c.painted = true
		js.Global().Set("lixivLastFirstPaint", nowMillis()-c.editStart)
	}
	if c.editStart > 0 && !c.quickShown && c.quickDone != nil {
		select {
		case <-c.quickDone: // for the timing harness: point values painted
			c.quickShown = true
			js.Global().Set("lixivLastQuickPaint", nowMillis()-c.editStart)
			g := js.Global()
			js.Global().Set("lixivLastQuickRender", fmt.Sprintf("build %.0f ms, sync %.0f ms",
				g.Get("lixivLastBuild").Float(), g.Get("lixivLastSync").Float()))
		default:
		}
	}
	busy := "0"
	if c.busy {
		busy = "1"
	}
	if ds.Get("busy").String() != busy || ds.Get("gen").String() != fmt.Sprint(c.gen) {
		ds.Set("busy", busy)
		ds.Set("gen", fmt.Sprint(c.gen))
		if !c.busy && c.editStart > 0 {
			js.Global().Set("lixivLastRecompute", nowMillis()-c.editStart)
			js.Global().Set("lixivLastStep", c.stepMillis)
			js.Global().Set("lixivLastCharts", c.charts.Millis)
			c.stepMillis, c.charts.Millis = 0, 0
			c.editStart = 0
		}
	}
}

// recompute cancels a run in progress and starts computing the stale
// cells. Call it with the event lock held.
func (c *Root) recompute() {
	if c.cancel != nil {
		c.cancel()
	}
	ctx, cancel := context.WithCancel(context.Background())
	c.cancel = cancel
	prev, done := c.loopDone, make(chan struct{})
	c.loopDone = done
	c.busy = true
	c.S.Doc.Quick = true
	c.quickDone, c.holding, c.quickShown = make(chan struct{}), false, false
	go c.run(ctx, c.S.Doc, prev, done, c.quickDone)
}

// HoldMillis is the longest the render loop holds a repaint for the quick
// pass of a recompute.
const HoldMillis = 120

// Hold returns a channel the render loop waits on, for at most HoldMillis,
// before it renders: it is closed when the quick pass of the recompute
// just started has its point values. It is nil when there is nothing to
// wait for. Call it with the event lock held.
func (c *Root) Hold() <-chan struct{} {
	if !c.ready || !c.busy || c.quickDone == nil || c.painted || c.editStart == 0 {
		return nil
	}
	select {
	case <-c.quickDone:
		return nil
	default:
	}
	c.holding = true
	return c.quickDone
}

// Unhold tells the root the render loop stopped holding (the quick pass
// took longer than HoldMillis, or was done). Call it with the event lock held.
func (c *Root) Unhold() { c.holding = false }

// quickPassDone closes done once and repaints: through the render loop
// when it is holding for it, else by asking for a render. Call it with the
// event lock held; it releases it.
func (c *Root) quickPassDone(done chan struct{}) {
	if done != c.quickDone { // a run cancelled by a later edit: nothing to show
		c.env.UnlockOnly()
		return
	}
	select {
	case <-done:
		c.env.UnlockOnly()
		return
	default:
	}
	close(done)
	if c.editStart > 0 {
		js.Global().Set("lixivLastQuick", nowMillis()-c.editStart)
	}
	if c.holding && done == c.quickDone {
		c.holding = false
		c.env.UnlockOnly() // the render loop renders as it wakes
		return
	}
	c.env.UnlockRender()
}

// run computes the stale cells of doc one at a time, handing the main
// thread back to the browser every few tens of milliseconds (also from
// inside a long cell, through its progress reports) so that the page
// scrolls and takes typing. The page repaints at most every paintEvery ms
// while computing (each repaint rebuilds the page), and once at the end.
func (c *Root) run(ctx context.Context, doc *notebook.Document, prev, done, quick chan struct{}) {
	defer close(done)
	defer func() { // cancelled or failed before the quick pass was over
		c.env.Lock()
		c.quickPassDone(quick)
	}()
	if prev != nil {
		<-prev
	}
	// The edit is saved to browser storage at the first yield: after the
	// quick pass has painted, or at the first hand-back of a long one.
	saveIfPending := func() {
		c.env.Lock()
		if c.savePending {
			c.autosave()
		}
		c.env.UnlockOnly()
	}
	defer func() { // a run without a yield saves at its end, and shows it
		c.env.Lock()
		if c.savePending {
			c.autosave()
			c.env.UnlockRender()
			return
		}
		c.env.UnlockOnly()
	}()
	var stepped []string                             // for the timing harness: when each step began
	const slice, paintEvery = 40, 250                // ms
	lastYield, lastPaint := nowMillis(), nowMillis() // the edit's handler has just painted
	longest, longestCell := 0.0, ""
	breathe := func() {
		if d := nowMillis() - lastYield; d > slice {
			if d > longest {
				longest, longestCell = d, c.running
			}
			// Save at this hand-back once the quick pass has painted, or
			// when it runs long; a short quick pass saves after its paint.
			select {
			case <-quick:
				saveIfPending()
			default:
				if nowMillis()-c.editStart > 250 {
					saveIfPending()
				}
			}
			yieldToBrowser()
			lastYield = nowMillis()
		}
	}
	publish := func(final bool) { // call with the lock held
		if final || nowMillis()-lastPaint > paintEvery {
			lastPaint = nowMillis()
			c.env.UnlockRender()
			return
		}
		c.env.UnlockOnly()
	}
	progress := func(p notebook.Progress) {
		if nowMillis()-lastYield <= slice {
			return
		}
		if ctx.Err() != nil { // cancelled: keep the page live until the cell gives up
			breathe()
			return
		}
		c.env.Lock()
		c.running = p.Cell
		if p.Total > 0 {
			c.progress = float64(p.Done) / float64(p.Total)
		}
		publish(false)
		breathe()
	}
	for {
		if ctx.Err() != nil {
			return
		}
		if pending := doc.Pending(); len(pending) > 0 {
			c.env.Lock()
			c.running, c.progress = pending[0], 0
			c.env.UnlockOnly()
		}
		t0 := nowMillis()
		stepped = append(stepped, fmt.Sprintf("%s %.0f", doc.Pending()[0], t0-c.editStart))
		more, err := func() (more bool, err error) {
			defer func() {
				if r := recover(); r != nil {
					more, err = false, fmt.Errorf("internal error: %v", r)
				}
			}()
			return doc.Step(ctx, progress)
		}()
		c.stepMillis += nowMillis() - t0
		if ctx.Err() != nil {
			return
		}
		c.env.Lock()
		if err == nil && more && doc.QuickPassDone() {
			select {
			case <-quick:
			default:
				// The point values are in: paint them, then refine.
				js.Global().Set("lixivQuickSteps", strings.Join(stepped, ", ")+fmt.Sprintf(", done %.0f", nowMillis()-c.editStart))
				lastPaint = nowMillis()
				c.quickPassDone(quick)
				yieldToBrowser()
				saveIfPending()
				lastYield = nowMillis()
				continue
			}
		}
		if err != nil || !more {
			// For the timing harness: the longest stretch without a yield.
			js.Global().Set("lixivLongestSlice", fmt.Sprintf("%.0f ms in %s", longest, longestCell))
			c.running, c.busy = "", false
			c.gen++
			if err != nil {
				c.S.Message = "Recompute stopped: " + err.Error()
			}
			select {
			case <-quick:
				publish(true)
			default: // no refining: the quick pass was the whole run
				c.quickPassDone(quick)
			}
			return
		}
		publish(false)
		breathe()
	}
}

// listenKeys binds Ctrl+Z (undo) and Ctrl+Shift+Z or Ctrl+Y (redo) outside
// text fields, where the browser's own undo applies.
func (c *Root) listenKeys() {
	c.keys = js.FuncOf(func(_ js.Value, args []js.Value) any {
		e := args[0]
		if !(e.Get("ctrlKey").Bool() || e.Get("metaKey").Bool()) {
			return nil
		}
		key := strings.ToLower(e.Get("key").String())
		if key != "z" && key != "y" {
			return nil
		}
		tag := strings.ToLower(e.Get("target").Get("tagName").String())
		if tag == "input" || tag == "textarea" || tag == "select" {
			return nil
		}
		e.Call("preventDefault")
		redo := key == "y" || e.Get("shiftKey").Bool()
		go func() {
			c.env.Lock()
			defer c.env.UnlockRender()
			if redo {
				c.Redo()
			} else {
				c.Undo()
			}
		}()
		return nil
	})
	js.Global().Get("document").Call("addEventListener", "keydown", c.keys)
}

// Undo goes back one edit.
func (c *Root) Undo() {
	defer c.guard()
	if err := c.S.Undo(); err != nil {
		c.S.Message = err.Error()
	}
}

// Redo applies the last undone edit again.
func (c *Root) Redo() {
	defer c.guard()
	if err := c.S.Redo(); err != nil {
		c.S.Message = err.Error()
	}
}

// CanUndo reports whether undo has something to do.
func (c *Root) CanUndo() bool { return c.S != nil && c.S.CanUndo() }

// CanRedo reports whether redo has something to do.
func (c *Root) CanRedo() bool { return c.S != nil && c.S.CanRedo() }

// OnBudgetTitle renames the budget.
func (c *Root) OnBudgetTitle(e vugu.DOMEvent) {
	c.S.SetBudgetTitle(e.PropString("target", "value"))
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
	go c.readAndOpen(f)
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
	go c.readAndOpen(files.Index(0))
}

func (c *Root) readAndOpen(f js.Value) {
	name := f.Get("name").String()
	if strings.HasSuffix(strings.ToLower(name), ".xlsx") {
		c.readWorkbook(f, name)
		return
	}
	text, err := readFile(f)
	c.env.Lock()
	defer c.env.UnlockRender()
	defer c.guard()
	if c.S == nil { // still opening the demo: start from an empty budget
		c.open(notebook.New("Untitled budget"), "")
	}
	if err != nil {
		c.S.Message = name + ": " + err.Error()
		return
	}
	c.OpenText(name, text)
}

// readWorkbook reads the first sheet of an .xlsx workbook into the samples
// or discharge cell, as OpenText does with its cells as tab-separated text.
func (c *Root) readWorkbook(f js.Value, name string) {
	b, err := readFileBytes(f)
	c.env.Lock()
	defer c.env.UnlockRender()
	defer c.guard()
	if c.S == nil { // still opening the demo: start from an empty budget
		c.open(notebook.New("Untitled budget"), "")
	}
	if err != nil {
		c.S.Message = name + ": " + err.Error()
		return
	}
	c.OpenWorkbook(name, b)
}

// OpenWorkbook reads the first sheet of an .xlsx workbook into the samples
// or discharge cell (by its header). Rows the workbook reader cannot read
// stop the import, so that none is lost silently; a workbook of several
// sheets is named in the message with the sheet read.
func (c *Root) OpenWorkbook(name string, b []byte) {
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
	c.loadTable(name, t)
}

// OpenText opens a budget file, or reads a CSV/TSV table into the samples
// or discharge cell (by its header), adding that cell when there is none.
func (c *Root) OpenText(name, text string) {
	defer c.guard()
	trim := strings.TrimSpace(strings.TrimPrefix(text, "\ufeff"))
	if strings.HasSuffix(strings.ToLower(name), ".json") || strings.HasPrefix(trim, "{") {
		doc, err := notebook.Parse([]byte(text), name)
		if err != nil {
			c.S.Message = err.Error()
			return
		}
		c.S.Replace(doc, path.Base(name))
		c.Unsaved = false
		return
	}
	t, err := notebook.ReadTable(path.Base(name), text)
	if err != nil || len(t.Columns) == 0 {
		c.S.Message = name + ": no table found (a CSV or TSV file needs a header row)"
		return
	}
	c.loadTable(name, t)
}

// loadTable puts a table read from the file called name into the samples
// or discharge cell (by its header), adding that cell when there is none.
// The table remembers the file, so that messages about it name the file
// and count lines as the file does.
func (c *Root) loadTable(name string, t *notebook.Table) {
	kind := TableKind(t)
	target := ""
	for _, cell := range c.S.Doc.Cells {
		if cell.Kind == kind {
			target = cell.ID
			break
		}
	}
	if target == "" {
		id, err := c.S.Add(kind, "")
		if err != nil {
			return
		}
		target = id
	}
	if err := c.S.LoadTable(target, t, path.Base(name)); err == nil {
		c.S.Collapsed[target] = false
		js.Global().Get("location").Set("hash", "#cell-"+target)
	}
}

// TableKind guesses whether a table read from a file is a discharge record
// (a date column and a discharge column, and no major ions) or samples.
func TableKind(t *notebook.Table) notebook.Kind {
	hasQ, hasIon := false, false
	for _, col := range t.Columns {
		l := strings.ToLower(strings.TrimSpace(col))
		f := strings.FieldsFunc(l, func(r rune) bool { return r == ' ' || r == '(' || r == '[' || r == '_' })
		first := ""
		if len(f) > 0 {
			first = f[0]
		}
		switch first {
		case "q", "discharge", "flow", "runoff":
			hasQ = true
		case "ca", "na", "mg", "k", "cl", "so4", "hco3", "alkalinity", "calcium", "sodium":
			hasIon = true
		}
	}
	if hasQ && !hasIon {
		return notebook.KindDischarge
	}
	return notebook.KindSamples
}

// DownloadBudget offers the budget file, with its results snapshot when
// every cell is computed.
func (c *Root) DownloadBudget() {
	defer c.guard()
	d := c.S.Doc
	if len(d.Pending()) == 0 && !c.busy {
		_ = d.Keep()
		c.verifyDoc = nil
	}
	name := c.S.FileName
	if name == "" || !strings.HasSuffix(name, notebook.Extension) {
		name = docFileName(d)
	}
	download(name, "application/json", d.Marshal())
	c.Unsaved = false
}

// OpenDemo reopens the demo budget (the current one stays reachable by undo).
func (c *Root) OpenDemo() {
	c.Loading = "Opening the demo budget…"
	go c.loadDemo(false)
}

// OnAddKind remembers the kind chosen for a new cell.
func (c *Root) OnAddKind(e vugu.DOMEvent) { c.AddKind = e.PropString("target", "value") }

// AddCell appends a cell of the chosen kind.
func (c *Root) AddCell() {
	defer c.guard()
	if id, err := c.S.Add(notebook.Kind(c.AddKind), ""); err == nil {
		js.Global().Get("location").Set("hash", "#cell-"+id)
	}
}

// shown returns how many rows of a cell's input table are shown.
func (c *Root) shown(cell string) int {
	if c.rows == nil {
		c.rows = map[string]int{}
	}
	if n, ok := c.rows[cell]; ok {
		return n
	}
	return pageRows
}

func (c *Root) showMore(cell string) { c.rows[cell] = c.shown(cell) + 100 }

// PageClass is the class of the page element.
func (c *Root) PageClass() string {
	if c.Dragging {
		return "page dragging"
	}
	return "page"
}

// SavedClass styles the saved state.
func (c *Root) SavedClass() string {
	if c.SavedOK {
		return "saved ok"
	}
	return "saved bad"
}

// SavedLine is the visible saved state.
func (c *Root) SavedLine() string {
	s := c.SavedText
	if c.Unsaved && c.SavedOK {
		s += "; not yet downloaded"
	}
	return s
}

// Message is the page-wide message, if any.
func (c *Root) Message() string {
	if c.S == nil {
		return ""
	}
	return c.S.Message
}

// CountsLine counts the samples, flags, warnings and cells in trouble.
func (c *Root) CountsLine() string {
	var parts []string
	for _, v := range c.Cells {
		for _, f := range v.Figures {
			switch f.Name {
			case "samples read":
				parts = append(parts, f.Value+" samples")
			case "samples flagged":
				parts = append(parts, f.Value+" flagged")
			}
		}
	}
	warn, bad := 0, 0
	for _, v := range c.Cells {
		warn += len(v.Warnings)
		for _, p := range v.TableProblems {
			if p.Severity != problem.Note {
				warn++
			}
		}
		if v.State == "problem" || v.State == "waiting" {
			bad++
		}
	}
	parts = append(parts, fmt.Sprintf("%d warnings", warn), fmt.Sprintf("%d cells with problems", bad))
	return strings.Join(parts, ", ")
}

// BusyLine says whether a recompute is running.
func (c *Root) BusyLine() string {
	if c.busy {
		return "recomputing…"
	}
	return "all computed"
}

// Slug turns a figure name into an id fragment.
func Slug(s string) string {
	return strings.Map(func(r rune) rune {
		if r >= 'a' && r <= 'z' || r >= '0' && r <= '9' {
			return r
		}
		if r >= 'A' && r <= 'Z' {
			return r + 32
		}
		return '-'
	}, s)
}

// guard turns a panic in an event handler into a message on the page: the
// program keeps running and nothing the user typed is lost.
func (c *Root) guard() {
	if r := recover(); r != nil && c.S != nil {
		c.S.Message = fmt.Sprintf("internal error: %v (the budget is unchanged; please report this)", r)
	}
}

// VerifyClass marks a rerun that does not reproduce the stored results.
func (c *Root) VerifyClass() string {
	if strings.Contains(c.Verify, "DIFFER") {
		return "verify bad"
	}
	return "verify"
}
