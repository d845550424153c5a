package web

import (
	"context"
	"reflect"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/examples/synth"
)

func newTestSession(t *testing.T) *Session {
	t.Helper()
	d := notebook.New("Corrie Vale test")
	if _, err := d.Add(notebook.KindSite, -1); err != nil {
		t.Fatal(err)
	}
	if _, err := d.Add(notebook.KindNote, -1); err != nil {
		t.Fatal(err)
	}
	s := NewSession(d, "test.lixiv.json", Origin{})
	return s
}

func TestUndoRedo(t *testing.T) {
	s := newTestSession(t)
	changes := 0
	s.OnChange(func() { changes++ })
	if err := s.SetParam("site", "area_km2", "12.5"); err != nil {
		t.Fatal(err)
	}
	if err := s.SetParam("site", "area_km2", "14"); err != nil {
		t.Fatal(err)
	}
	area := func() string {
		for _, p := range notebook.Params(s.Doc.Cell("site").Settings) {
			if p.Key == "area_km2" {
				return p.Value
			}
		}
		return ""
	}
	steps := []struct {
		name string
		do   func() error
		want string
	}{
		{"after edits", func() error { return nil }, "14"},
		{"undo", s.Undo, "12.5"},
		{"undo again", s.Undo, ""},
		{"undo with nothing left", s.Undo, ""},
		{"redo", s.Redo, "12.5"},
		{"redo again", s.Redo, "14"},
	}
	for _, st := range steps {
		if err := st.do(); err != nil {
			t.Fatalf("%s: %v", st.name, err)
		}
		if got := area(); got != st.want {
			t.Errorf("%s: area got %s, want %s", st.name, got, st.want)
		}
	}
	if changes != 6 {
		t.Errorf("change announcements: got %d, want 6 (2 edits, 2 undos, 2 redos)", changes)
	}
}

func TestRejectedEditKeepsDocument(t *testing.T) {
	s := newTestSession(t)
	before := string(s.Doc.Marshal())
	if err := s.SetParam("site", "area_km2", "twelve"); err == nil {
		t.Fatal("a word for the area was accepted")
	}
	if got := string(s.Doc.Marshal()); got != before {
		t.Errorf("the document changed after a rejected edit")
	}
	if msg := s.CellErr["site"]; !strings.Contains(msg, "twelve") {
		t.Errorf("cell message: got %q, want it to name the value", msg)
	}
	if s.CanUndo() {
		t.Errorf("a rejected edit went on the undo stack")
	}
}

func TestPasteIntoSamples(t *testing.T) {
	s := newTestSession(t)
	id, err := s.Add(notebook.KindSamples, "site")
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Doc.Cells[1].ID; got != id {
		t.Errorf("new cell position: got %s second, want %s", got, id)
	}
	n, err := s.Paste(id, "sample\tdate\tNa\n\t\tmg/L\nCV-1\t2021-01-01\t3.1\nCV-2\t2021-01-15\t2.9\n")
	if err != nil || n != 2 {
		t.Fatalf("paste: got %d rows, %v; want 2", n, err)
	}
	tab := s.Doc.Cell(id).Table
	if len(tab.Rows) != 2 || tab.Units[2] != "mg/L" {
		t.Errorf("table: got %d rows, units %q", len(tab.Rows), tab.Units)
	}
	if err := s.Undo(); err != nil {
		t.Fatal(err)
	}
	if got := len(s.Doc.Cell(id).Table.Rows); got != 0 {
		t.Errorf("rows after undo: got %d, want 0", got)
	}
}

func TestMoveAndRemove(t *testing.T) {
	s := newTestSession(t)
	if err := s.Move("note", -1); err != nil {
		t.Fatal(err)
	}
	if got := s.Doc.Cells[0].ID; got != "note" {
		t.Errorf("first cell after moving the note up: got %s", got)
	}
	if err := s.Move("note", -1); err != nil {
		t.Errorf("moving the first cell up: %v", err)
	}
	if err := s.Remove("site"); err != nil {
		t.Fatal(err)
	}
	if len(s.Doc.Cells) != 1 {
		t.Errorf("cells after remove: got %d, want 1", len(s.Doc.Cells))
	}
}

func TestHeadlineOrder(t *testing.T) {
	cells := []CellView{{Kind: "discharge", Figures: []FigureView{{Name: notebook.RecordRunoffFigure, Unit: "mm/yr"}}},
		{Kind: "fluxes", Figures: []FigureView{{Name: notebook.RunoffFigure, Unit: "mm/yr", Interval: "95 %: 1 to 2"}}},
		{Kind: "samples", Figures: []FigureView{{Name: "samples read"}}},
		{Kind: "co2", Figures: []FigureView{{Name: "median silicate CO2 consumption per litre", Unit: "µmol/L"},
			{Name: "carbonate CO2 consumption per km²", Unit: "mol/km²/yr"}, {Name: "silicate CO2 consumption per km²", Unit: "mol/km²/yr"}}}}
	got := Headline(cells, 4)
	want := []string{"silicate CO2 consumption per km²", "carbonate CO2 consumption per km²", notebook.RunoffFigure, "median silicate CO2 consumption per litre"}
	for i := range want {
		if i >= len(got) || got[i].Name != want[i] {
			t.Fatalf("headline: got %v, want %v", got, want)
		}
	}
	if got[2].Interval == "" {
		t.Errorf("runoff: got the figure without an interval, want the one with")
	}
}

// TestEdited follows whether the budget still is the file as opened: an
// edit makes it edited, undo back to the opened state does not, and
// opening another file starts afresh.
func TestEdited(t *testing.T) {
	s := newTestSession(t)
	if s.Edited() {
		t.Fatal("a budget just opened counts as edited")
	}
	if err := s.SetParam("site", "area_km2", "12.5"); err != nil {
		t.Fatal(err)
	}
	if !s.Edited() {
		t.Fatal("an edit is not seen")
	}
	if err := s.Undo(); err != nil {
		t.Fatal(err)
	}
	if s.Edited() {
		t.Fatal("undo back to the opened state still counts as edited")
	}
	if err := s.Redo(); err != nil {
		t.Fatal(err)
	}
	s.Replace(notebook.New("Another"), "another.lixiv.json", Origin{Checked: true})
	if s.Edited() {
		t.Fatal("a file opened after an edit counts as edited")
	}
}

// TestDoubtfulCellView: a doubtful cell shows its state, its reasons under
// its head, its figures marked (in the summary strip too) and each
// figure's note (synth.DoubtfulDemo).
func TestDoubtfulCellView(t *testing.T) {
	d, err := synth.DoubtfulDemo()
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	s := NewSession(d, "corrie.lixiv.json", Origin{})
	cells := s.Cells("", 0, &ChartCache{})
	found := false
	for _, c := range cells {
		if c.ID != "fluxes" {
			continue
		}
		found = true
		if c.State != "doubtful" || c.StateText != "doubtful" || !strings.Contains(c.Doubtful, "of the flow passed before the first or after the last apportioned sample (above 1 %)") || c.Problem != "" {
			t.Errorf("fluxes view: state %q %q, doubtful %q, problem %q", c.State, c.StateText, c.Doubtful, c.Problem)
		}
		for _, fv := range c.Figures {
			if fv.Name == "silicate cations flux" && (!fv.Doubtful || fv.Note == "" || !strings.Contains(fv.Class(), "doubtful")) {
				t.Errorf("silicate cations flux: %+v, class %q", fv, fv.Class())
			}
		}
	}
	if !found {
		t.Fatal("no fluxes cell")
	}
	for _, h := range Headline(cells, 6) {
		if h.Cell == "co2" && !h.Doubtful {
			t.Errorf("summary strip: %q from the doubtful CO2 cell is not marked", h.Name)
		}
	}
}

// TestDemoMarks follows the marks of values that are still the demo's: none
// on the demo itself; once the budget grows from it, the settings and
// tables it still shares with the demo, and not the ones the user changed.
func TestDemoMarks(t *testing.T) {
	demo := func() *notebook.Document {
		d := notebook.NewBudget("demo")
		d.Cell("site").Settings.(*notebook.SiteSettings).AreaKm2 = 12.1
		d.Cell("site").Settings.(*notebook.SiteSettings).Precipitation = 1850
		d.Cell("discharge").Table = &notebook.Table{Columns: []string{"date", "Q"}, Rows: [][]string{{"2021-01-01", "1.2"}}}
		return d
	}
	s := NewSession(demo(), "demo.lixiv.json", Origin{Demo: true})
	s.SetDemo(demo())
	marks := func() (params []string, tables []string) {
		var cc ChartCache
		for _, v := range s.Cells("", 0, &cc) {
			for _, p := range v.Params {
				if p.FromDemo {
					params = append(params, v.ID+"."+p.Key)
				}
			}
			if v.TableOrigin != "" {
				tables = append(tables, v.ID+": "+v.TableOrigin)
			}
		}
		return params, tables
	}
	if p, tabs := marks(); len(p) != 0 || !reflect.DeepEqual(tabs, []string{"sources: the global preset"}) {
		t.Errorf("the demo itself: got marks %v and %v, want only the preset named", p, tabs)
	}
	if err := s.SetParam("site", "precipitation_mm", "900"); err != nil {
		t.Fatal(err)
	}
	p, tabs := marks()
	if !reflect.DeepEqual(p, []string{"site.area_km2"}) {
		t.Errorf("settings marked after an edit: got %v, want the area alone", p)
	}
	if !reflect.DeepEqual(tabs, []string{"discharge: the demo", "sources: the global preset"}) {
		t.Errorf("tables marked after an edit: got %v", tabs)
	}
	s.Replace(notebook.NewBudget("mine"), "", Origin{})
	if p, _ := marks(); len(p) != 0 {
		t.Errorf("a new budget: got %v marked as the demo's", p)
	}
}
