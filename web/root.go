package web

import (
	"encoding/json"
	"fmt"
	"strings"
	"time"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
)

// demoFile is the demo budget the build copies next to the page.
const demoFile = "demo" + notebook.Extension

// Root is the page's top component: header, summary strip, cells, footer.
type Root struct {
	env vugu.EventEnv
	S   *Session

	Cells    []CellView
	Headline []FigureView
	Seeds    string
	Loading  string // what the page is loading, "" when idle
	AddKind  string // kind chosen in the "add a cell" list
	startMsg string // a problem met before the budget opened
	keys     js.Func

	incoming     // files opened, dropped or pasted
	saving       // the saved state
	verification // the stored results against the rerun
	rendering    // what one render leaves for the next
	charts       ChartCache
	runner       // the recompute in progress
}

// incoming is what the page holds of the files opened, dropped or pasted.
type incoming struct {
	Dragging bool
	Pending  *PendingFile // a table opened over the demo, waiting for the user's choice
	Banner   *Banner      // the import report of the last open, drop or paste
	BannerV  *BannerView  // what it shows
}

// saving is the budget's saved state: in browser storage and downloaded.
type saving struct {
	SavedText   string // the visible saved state
	SavedOK     bool
	Unsaved     bool // changed since the last download
	savePending bool // an edit waits to be saved to browser storage
}

// verification compares the stored results of a budget with the rerun,
// for the footer.
type verification struct {
	Verify     string             // whether stored results match the rerun
	verifyGen  int                // recompute the cached verification belongs to
	verifyDoc  *notebook.Document // and its document
	verifyText string
}

// rendering is what one render of the page leaves for the next.
type rendering struct {
	buildStart float64        // when the render now running began (ms)
	docTitle   string         // the browser tab's title as last set
	focusAfter string         // a field to give the focus once the page has rendered
	ready      bool           // the first budget has rendered
	deferred   bool           // the render now running leaves the bodies of cells below the first few for the next (firstDrawn)
	drawn      bool           // the first budget has rendered whole
	rows       map[string]int // rows shown per input table
}

// Init loads the last autosaved budget, or the demo on a first visit.
func (c *Root) Init(ctx vugu.InitCtx) {
	c.env = ctx.EventEnv()
	c.runner.env = c.env
	c.runner.save = func() bool {
		if !c.savePending {
			return false
		}
		c.autosave()
		return true
	}
	c.runner.fail = func(err error) { c.S.Message = "Recompute stopped: " + err.Error() }
	c.AddKind = string(notebook.KindNote)
	c.listenKeys()
	if text, ok := storageGet(storageKey); ok && text != "" {
		doc, err := notebook.Parse([]byte(text), "autosave")
		if err == nil {
			o := storedOrigin()
			c.open(doc, docFileName(doc), o)
			c.savePending = false // it is what storage holds
			c.SavedText, c.SavedOK = "Reopened from this browser's storage", true
			if o.Demo { // for the marks of values that are still the demo's
				go c.loadDemo(demoReference)
			}
			return
		}
		// Keep the unreadable text under another key before anything is saved.
		c.startMsg = "The autosaved budget could not be read (" + err.Error() + "); the demo is open instead."
		if storageSet(storageKey+".unreadable", text) == nil {
			c.startMsg += " The unreadable text is kept in this browser's storage under " + storageKey + ".unreadable."
		}
	}
	c.Loading = "Opening the demo budget…"
	go c.loadDemo(demoFirst)
}

// How loadDemo is asked for the demo.
const (
	demoFirst     = iota // the first visit: open it, unless a file was opened meanwhile
	demoOpen             // the Demo button: open it
	demoReference        // a budget grown from the demo reopened: only keep it for reference
)

// loadDemo fetches the demo budget and, as how says, opens it.
func (c *Root) loadDemo(how int) {
	text, err := fetchText(demoFile)
	Mark("demo fetched")
	c.env.Lock()
	defer c.env.UnlockRender()
	var doc, ref *notebook.Document
	if err == nil && strings.TrimSpace(text) != "" {
		if doc, err = notebook.Parse([]byte(text), demoFile); err == nil {
			ref = doc.Clone() // a deep copy, as a second parse would give, at a fraction of its time
		}
	}
	if how == demoReference {
		if c.S != nil {
			c.S.SetDemo(ref)
		}
		return
	}
	c.Loading = ""
	if how == demoFirst && c.S != nil {
		return
	}
	origin := Origin{Demo: true}
	if doc == nil {
		doc, origin = notebook.NewBudget("Untitled budget"), Origin{}
	}
	c.Pending, c.Banner = nil, nil
	Mark("demo parsed")
	c.open(doc, docFileName(doc), origin)
	c.S.SetDemo(ref)
	c.Unsaved = false
	if err != nil {
		c.S.Message = "The demo budget could not be opened: " + err.Error()
	}
	if c.startMsg != "" {
		c.S.Message, c.startMsg = strings.TrimSpace(c.startMsg+" "+c.S.Message), ""
	}
}

// open starts a session on doc (or replaces the session's document) and
// computes it.
func (c *Root) open(doc *notebook.Document, name string, o Origin) {
	if c.S != nil {
		c.S.Replace(doc, name, o)
		return
	}
	c.S = NewSession(doc, name, o)
	c.S.OnChange(c.changed)
	c.changed()
}

// changed runs after every change of the document: autosave, then recompute.
func (c *Root) changed() {
	c.Unsaved = true
	c.savePending = true // saved by the recompute at its first yield
	c.editStart, c.painted = nowMillis(), false
	c.paintFirst = !c.ready // a budget just opened is drawn before it computes
	c.recompute(c.S.Doc)
}

// autosave writes the budget, and where it came from, to browser storage.
func (c *Root) autosave() {
	c.savePending = false
	err := storageSet(storageKey, string(c.S.Current()))
	if err == nil {
		o, _ := json.Marshal(c.S.Origin)
		err = storageSet(originKey, string(o))
	}
	if err != nil {
		c.SavedText, c.SavedOK = "Not saved: "+err.Error(), false
		return
	}
	c.SavedText, c.SavedOK = "Saved in this browser at "+time.Now().Format("15:04:05"), true
}

// storedOrigin reads where the autosaved budget came from; a budget saved
// before the page kept it counts as the user's own, its stored results
// not compared.
func storedOrigin() Origin {
	var o Origin
	if text, ok := storageGet(originKey); ok {
		if json.Unmarshal([]byte(text), &o) != nil {
			o = Origin{}
		}
	}
	return o
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
	// The page's first render of a budget draws the bodies of its first
	// cells only, which fill the screen; the others follow in the next
	// render, once the browser has painted (Rendered).
	n := firstDrawn()
	c.deferred = !c.ready && len(c.Cells) > n
	if c.deferred {
		for i := n; i < len(c.Cells); i++ {
			c.Cells[i].Deferred = true
		}
	}
	c.Headline = Headline(c.Cells, 6)
	c.Verify, c.Seeds = c.footer()
	c.BannerV = c.bannerView()
}

// firstDrawn is how many cells the page's first render of a budget draws
// whole: with the header and the summary strip, more than the window
// shows (a cell takes some 200 px or more, the header and strip 250).
func firstDrawn() int {
	return max(3, js.Global().Get("innerHeight").Int()/200)
}

// HoldMillis is the longest the render loop holds a repaint for the quick
// pass of a recompute: short enough that, with a render of some 20–40 ms and the edit's own handling,
// an edit repaints within about 100 ms even when its quick pass is slow.
const HoldMillis = 50

// Hold returns a channel the render loop waits on, for at most HoldMillis,
// before it renders: it is closed when the quick pass of the recompute
// just started has its point values. It is nil when there is nothing to
// wait for. Call it with the event lock held.
func (c *Root) Hold() <-chan struct{} { return c.runner.hold(c.ready) }

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
	c.renderedAt = nowMillis()
	ds := body.Get("dataset")
	if Probing && c.buildStart > 0 { // for the timing harness: the cost of one full render
		Probe("lixivLastRender", nowMillis()-c.buildStart)
	}
	if c.focusAfter != "" {
		if el := js.Global().Get("document").Call("querySelector", c.focusAfter); el.Truthy() {
			el.Call("focus")
			opt := js.Global().Get("Object").New()
			opt.Set("block", "center")
			opt.Set("inline", "center")
			el.Call("scrollIntoView", opt)
		}
		c.focusAfter = ""
	}
	if !c.ready && c.S != nil && c.Loading == "" {
		c.ready = true
		if b := js.Global().Get("lixivBoot"); b.Truthy() {
			b.Set("firstRender", nowMillis())
		}
		go c.afterFirstPaint(c.deferred)
	}
	if c.ready && !c.deferred && !c.drawn {
		c.drawn = true
		ds.Set("ready", "1") // every cell is drawn
		if b := js.Global().Get("lixivBoot"); b.Truthy() {
			b.Set("allDrawn", nowMillis())
		}
	}
	if c.editStart > 0 && !c.painted {
		c.painted = true
		Probe("lixivLastFirstPaint", nowMillis()-c.editStart)
	}
	if c.editStart > 0 && !c.quickShown && c.quickDone != nil {
		select {
		case <-c.quickDone: // for the timing harness: point values painted
			c.quickShown = true
			if Probing {
				Probe("lixivLastQuickPaint", nowMillis()-c.editStart)
				Probe("lixivLastQuickRender", fmt.Sprintf("build %.0f ms, sync %.0f ms", probed("lixivLastBuild"), probed("lixivLastSync")))
			}
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
			if Probing {
				Probe("lixivLastRecompute", nowMillis()-c.editStart)
				Probe("lixivLastStep", c.stepMillis)
				Probe("lixivLastCharts", c.charts.Millis)
			}
			c.stepMillis, c.charts.Millis = 0, 0
			c.editStart = 0
		}
	}
}

// afterFirstPaint starts the page's workers and its service worker
// (boot.js) once the browser has painted the page's first render of a
// budget, and, when that render left cells
// for the next (rest), renders the page again, whole.
func (c *Root) afterFirstPaint(rest bool) {
	afterPaint()
	Mark("painted")
	if b := js.Global().Get("lixivBoot"); b.Truthy() && b.Get("painted").Truthy() {
		b.Call("painted") // the service worker and the workers start
	}
	if rest {
		c.env.Lock()
		c.env.UnlockRender()
	}
}

// OnBudgetTitle renames the budget.
func (c *Root) OnBudgetTitle(e vugu.DOMEvent) {
	c.S.SetBudgetTitle(e.PropString("target", "value"))
}

// OpenDemo reopens the demo budget (the current one stays reachable by undo).
func (c *Root) OpenDemo() {
	c.Loading = "Opening the demo budget…"
	go c.loadDemo(demoOpen)
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
