package web

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
	"lixiv/web/plot"
)

// CellView is what the page shows of one cell, gathered from the document.
type CellView struct {
	ID, Kind, KindLabel, Title string
	State                      string // css class: ok, stale, running, waiting, problem, doubtful
	StateText                  string
	Problem                    string     // why the cell waits or failed
	Doubtful                   string     // why its results are doubtful ("" when they are not)
	Needs                      []NeedView // what the cell waits for, when it lacks inputs
	TableOrigin                string     // where the input table's values come from when not the user ("the demo", "the global preset")
	EditErr                    string     // last rejected edit
	Collapsed                  bool
	Deferred                   bool // its body is drawn in the render after the page's first (Root.Compute)
	Params                     []ParamView
	Roles                      []RoleView
	HasTable                   bool
	TableUnread                bool // an empty table the settings do not read
	Table                      *notebook.Table
	Notes                      []string // what an import or paste did
	Warnings                   []string // the engine's warnings
	TableProblems              []TableProblem
	bad                        map[[2]int]bool // table cells named by a problem
	Figures                    []FigureView
	Results                    []*notebook.ResultTable
	Charts                     []ChartView
	NoteText                   string
	Progress                   float64 // 0..1 while running
	OldOutputs                 bool    // outputs shown are from before the last edit
	YearStart                  int     // first month of the reporting years of its tables (1: calendar years)
	Section                    string  // the cell's section ("" shared, or in a budget without sections)
	Shared                     bool    // a cell shared by every section of a budget with sections
	SectionHead                string  // the heading of the section this cell starts ("" when it starts none; compare.go)
}

// ParamView is one setting as a form field.
type ParamView struct {
	Key, Label, Value, Type string
	Options                 []string // choices, for a select
	OptionLabels            []string // what the select shows of each choice, when not the choice itself
	Blank                   string   // what an empty field means ("unknown"); "" when it may not be empty
	FromDemo                bool     // the value is still the demo's
}

// NeedView is one thing a cell waits for (notebook.Need), with the cell
// that lacks it and the field to fill when it is a setting.
type NeedView struct {
	Cell, CellTitle, What, Field string
}

// RoleView is one input of a cell and the cells that can fill it.
type RoleView struct {
	Name, Current string
	Choices       []string // ids of cells of the role's kind
	Default       string   // what the empty choice reads ("" for "nearest above"; compare.go)
}

// FigureView is a headline figure formatted for the page.
type FigureView struct {
	Cell, Name, Value, Interval, Unit string
	Note                              string // how the figure was formed, shown beside it
	Old                               bool   // from before the last change
	Doubtful                          bool   // from a cell whose results are doubtful
}

// Class is the figure's css class: dimmed when it is from before the last
// change, marked when its cell is doubtful.
func (f FigureView) Class() string {
	c := "figure"
	if f.Old {
		c += " old"
	}
	if f.Doubtful {
		c += " doubtful"
	}
	return c
}

// ChartView is a drawn chart: its id on the page, title and SVG text, and
// the key (htmlKey) of that text.
type ChartView struct {
	ID, Title, SVG, Key string
	Wide                bool // wider than the page: it scrolls sideways
}

// KindLabel is the page's name for a cell kind: its descriptor's label.
func KindLabel(k notebook.Kind) string {
	if d := notebook.DescriptorOf(k); d != nil && d.Label != "" {
		return d.Label
	}
	if k == notebook.KindBroken {
		return "Unreadable cell"
	}
	return string(k)
}

// options returns the values a setting of kind k offers and, when any
// differs from its value, what the page shows of each; nil for a setting
// without choices.
func options(k notebook.Kind, key string) (values, labels []string) {
	d := notebook.DescriptorOf(k)
	if d == nil {
		return nil, nil
	}
	cs := d.Choices(key)
	labelled := false
	for _, c := range cs {
		values = append(values, c.Value)
		labelled = labelled || c.Label != ""
	}
	if labelled {
		for _, c := range cs {
			labels = append(labels, c.Text())
		}
	}
	return values, labels
}

// FormatFigure formats a figure's median and its 95 % interval, the three
// numbers in one notation.
func FormatFigure(f notebook.Figure) (value, interval string) {
	if math.IsNaN(f.Low) || math.IsNaN(f.High) {
		return plot.Column([]float64{f.Median})[0], ""
	}
	s := plot.Column([]float64{f.Median, f.Low, f.High})
	return s[0], fmt.Sprintf("95 %%: %s to %s", s[1], s[2])
}

// Cells gathers the views of every cell. running names the cell being
// computed and progress its share done.
func (s *Session) Cells(running string, progress float64, charts *ChartCache) []CellView {
	d := s.Doc
	out := make([]CellView, 0, len(d.Cells))
	for _, c := range d.Cells {
		v := CellView{ID: c.ID, Kind: string(c.Kind), KindLabel: KindLabel(c.Kind), Title: c.Title,
			EditErr: s.CellErr[c.ID], Collapsed: s.Collapsed[c.ID], Notes: s.Notes[c.ID]}
		if v.Title == "" {
			v.Title = v.KindLabel
		}
		st, err := d.Status(c.ID)
		switch {
		case c.ID == running && st == notebook.Refining:
			v.State, v.StateText, v.Progress = "running", "computing intervals", progress
		case c.ID == running:
			v.State, v.StateText, v.Progress = "running", "recomputing", progress
		case st == notebook.Refining:
			v.State, v.StateText = "refining", "point values; intervals to follow"
		case st == notebook.UpToDate:
			v.State, v.StateText = "ok", "up to date"
		case st == notebook.Doubtful:
			v.State, v.StateText = "doubtful", "doubtful"
		case st == notebook.Stale:
			v.State, v.StateText = "stale", "waiting to recompute"
		case st == notebook.Waiting:
			v.State, v.StateText = "waiting", "waiting for inputs"
		default: // a problem, or a state the engine has added: shown by its name
			v.State, v.StateText = strings.ReplaceAll(st.String(), " ", "-"), st.String()
		}
		var de *notebook.DoubtfulError
		switch {
		case errors.As(err, &de):
			v.Doubtful = "Doubtful: " + strings.Join(de.Reasons, "; ") + "."
		case err != nil:
			v.Problem = userText(err)
		}
		if c.Broken() {
			v.Problem = c.Problem
		}
		if st == notebook.Waiting || st == notebook.Stale {
			v.Needs = s.needs(c.ID)
			if len(v.Needs) > 0 {
				v.Problem = ""
			}
		}
		demo := s.demoCell(c)
		if c.Settings != nil && !c.Broken() {
			params := notebook.Params(c.Settings)
			for _, p := range params {
				if c.Kind == notebook.KindNote && p.Key == "text" {
					v.NoteText = p.Value
					continue
				}
				if notebook.Idle(c.Settings, p.Key) {
					continue
				}
				pv := ParamView{Key: p.Key, Label: notebook.SettingLabel(p.Key), Value: p.Value, Type: p.Type,
					Blank: p.Blank, FromDemo: demo != nil && fromDemo(demo, c, p)}
				pv.Options, pv.OptionLabels = options(c.Kind, p.Key)
				sectionChoices(d, c, &pv) // compare.go
				if c.Kind == notebook.KindChart && (p.Key == "x" || p.Key == "y") {
					pv.Options = columnRefs(d, c.ID, p.Value)
					pv.OptionLabels = make([]string, len(pv.Options))
					for i, r := range pv.Options {
						pv.OptionLabels[i] = RefLabel(d, r)
					}
				}
				v.Params = append(v.Params, pv)
			}
		}
		for _, r := range c.Kind.Roles() {
			rv := RoleView{Name: r.Name, Current: c.Uses[r.Name], Default: roleDefault(d, c)}
			for _, o := range d.Cells {
				if o.Kind == r.Kind && o.ID != c.ID {
					rv.Choices = append(rv.Choices, o.ID)
				}
			}
			v.Roles = append(v.Roles, rv)
		}
		if c.Table != nil {
			v.HasTable, v.Table = true, c.Table
			v.TableUnread = len(c.Table.Rows) == 0 && c.Settings != nil && !c.Broken() && !notebook.ReadsTable(c.Settings)
			switch {
			case c.Kind == notebook.KindSources && notebook.PresetOf(c.Table) != "":
				v.TableOrigin = "the " + notebook.PresetOf(c.Table) + " preset"
			case demo != nil && demo.Table != nil && len(c.Table.Rows) > 0 && demo.Table.CSV() == c.Table.CSV():
				v.TableOrigin = "the demo"
			}
		}
		o := d.Output(c.ID)
		if o != nil {
			s.lastOut[c.ID] = o
		} else if v.State == "stale" || v.State == "running" {
			// Keep showing the previous results, marked as such, so the
			// page does not jump while the cell recomputes.
			o, v.OldOutputs = s.lastOut[c.ID], s.lastOut[c.ID] != nil
		}
		if o != nil {
			var rest []string
			v.TableProblems, rest = TableProblems(c.ID, c.Table, o.Messages)
			v.Warnings = append(rest, o.Warnings...)
			for _, p := range v.TableProblems {
				if p.Severity == problem.Error {
					if v.bad == nil {
						v.bad = map[[2]int]bool{}
					}
					v.bad[[2]int{p.Row, p.Col}] = true
				}
			}
			for _, f := range o.Figures {
				val, iv := FormatFigure(f)
				key := c.ID + "\x00" + f.Name
				switch {
				case iv != "":
					s.hadInterval[key] = true
				case o.Rough && s.hadInterval[key]: // the quick pass: the interval follows
					iv = "95 %: computing…"
				}
				v.Figures = append(v.Figures, FigureView{Cell: c.ID, Name: f.Name, Value: val, Interval: iv, Unit: f.Unit, Note: f.Note,
					Old: v.OldOutputs, Doubtful: st == notebook.Doubtful})
			}
			v.Results = o.Tables
			v.YearStart = waterYearStart(d, c.ID)
			v.Charts = charts.For(d, c, o)
		}
		out = append(out, v)
	}
	markSections(out, d)
	return out
}

// needs gathers what cell id waits for, with the titles of the cells that
// lack it.
func (s *Session) needs(id string) []NeedView {
	var out []NeedView
	for _, n := range s.Doc.Needs(id) {
		nv := NeedView{Cell: n.Cell, What: n.What, CellTitle: n.Cell}
		if c := s.Doc.Cell(n.Cell); c != nil {
			nv.CellTitle = c.Title
			if nv.CellTitle == "" {
				nv.CellTitle = KindLabel(c.Kind)
			}
		}
		if n.Key != "" {
			nv.Field = "p-" + n.Cell + "-" + n.Key
		}
		out = append(out, nv)
	}
	return out
}

// demoCell returns the demo's cell of c's id and kind while the budget
// grew from the demo (the demo itself needs no marks), else nil.
func (s *Session) demoCell(c *notebook.Cell) *notebook.Cell {
	if !s.Origin.Demo || s.Demo == nil {
		return nil
	}
	if s.demoText == nil {
		s.demoText = s.Demo.Marshal()
	}
	if bytes.Equal(s.Current(), s.demoText) {
		return nil
	}
	if d := s.Demo.Cell(c.ID); d != nil && d.Kind == c.Kind && d.Settings != nil {
		return d
	}
	return nil
}

// fromDemo reports a setting of c that still holds the demo's value, where
// that value is the demo's own choice (not the kind's default).
func fromDemo(demo, c *notebook.Cell, p notebook.Param) bool {
	var dv, def string
	for _, q := range notebook.Params(demo.Settings) {
		if q.Key == p.Key {
			dv = q.Value
		}
	}
	for _, q := range notebook.Params(notebook.DefaultSettings(c.Kind)) {
		if q.Key == p.Key {
			def = q.Value
		}
	}
	return p.Value == dv && dv != def
}

// Headline picks the budget's headline figures for the summary strip, in
// the rank the cells' descriptors give them (notebook.FigureRank: CO2
// consumption, weathering rates and runoff first), then any others, at
// most max.
func Headline(cells []CellView, max int) []FigureView {
	type ranked struct {
		f    FigureView
		rank int
	}
	var all []ranked
	for _, c := range cells {
		for _, f := range c.Figures {
			all = append(all, ranked{f, notebook.FigureRank(notebook.Kind(c.Kind), f.Name)})
		}
	}
	// Within a rank, a figure with an interval comes first, and a name
	// shown once (runoff is reported by more than one cell).
	sort.SliceStable(all, func(i, j int) bool {
		if all[i].rank != all[j].rank {
			return all[i].rank < all[j].rank
		}
		return all[i].f.Interval != "" && all[j].f.Interval == ""
	})
	seen := map[string]bool{}
	var kept []FigureView
	for _, r := range all {
		if !seen[r.f.Name] {
			seen[r.f.Name] = true
			kept = append(kept, r.f)
		}
	}
	if len(kept) > max {
		kept = kept[:max]
	}
	return kept
}

// columnRefs lists every output column of the other cells as a chart
// reference "cell.table.column", with current first when it is not among
// them (so a select never shows another value than the setting's).
func columnRefs(d *notebook.Document, self, current string) []string {
	var refs []string
	found := current == ""
	if current == "" {
		refs = append(refs, "")
	}
	for _, c := range d.Cells {
		if c.ID == self {
			continue
		}
		o := d.Output(c.ID)
		if o == nil {
			continue
		}
		for _, t := range o.Tables {
			for _, col := range t.Columns {
				r := c.ID + "." + t.Name + "." + col.Name
				refs = append(refs, r)
				found = found || r == current
			}
		}
	}
	if !found {
		refs = append([]string{current}, refs...)
	}
	return refs
}
