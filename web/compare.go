package web

import (
	"math"
	"slices"
	"strings"

	"lixiv/engine/notebook"
	"lixiv/web/plot"
)

// Sections and the comparison cell on the page: each section's first cell
// carries the section's heading, a shared cell is marked as such, and the
// comparison's charts draw what its output tables hold (the engine
// computes every number).

// markSections sets the section heading of each cell that starts a run of
// cells of another section than the cell above it, and marks the shared
// cells of a budget with sections.
func markSections(cells []CellView, d *notebook.Document) {
	if !d.HasSections() {
		return
	}
	prev := "\x00"
	for i := range cells {
		c := d.Cell(cells[i].ID)
		if c == nil {
			continue
		}
		cells[i].Section, cells[i].Shared = c.Section, c.Section == ""
		if c.Section != prev {
			cells[i].SectionHead = c.Section
			if c.Section == "" {
				cells[i].SectionHead = "Shared by every section"
			}
			prev = c.Section
		}
	}
}

// roleDefault says what an input of cell c left to the document reads, when
// that is not simply the nearest cell above: a comparison's budgets come
// from the sections its settings name; in a budget with sections, a cell
// reads the nearest above in its own section, else a shared one.
func roleDefault(d *notebook.Document, c *notebook.Cell) string {
	switch {
	case c.Kind == notebook.KindCompare:
		return "from the section set below"
	case c.Section != "":
		return "nearest above in its section, else shared"
	case d.HasSections():
		return "nearest shared cell above"
	}
	return ""
}

// sectionChoices offers the document's sections for a comparison's section
// settings (with the value set, when it names none of them, and none).
func sectionChoices(d *notebook.Document, c *notebook.Cell, pv *ParamView) {
	if c.Kind != notebook.KindCompare || !strings.HasSuffix(pv.Key, "_section") {
		return
	}
	pv.Options = append([]string{""}, d.Sections()...)
	if pv.Value != "" && !slices.Contains(pv.Options, pv.Value) {
		pv.Options = append(pv.Options, pv.Value)
	}
	pv.OptionLabels = append([]string(nil), pv.Options...)
	pv.OptionLabels[0] = "(none)"
}

// SetSection puts a cell in a section ("" makes it shared).
func (s *Session) SetSection(cell, name string) error {
	if c := s.Doc.Cell(cell); c != nil && c.Section == name {
		return nil
	}
	return s.Do(cell, func(d *notebook.Document) error { return d.SetSection(cell, name) })
}

// differenceChart draws the differences of a comparison table as bars from
// zero with their 95 % intervals, one per quantity of the given names.
func differenceChart(id, title, unit string, o *notebook.Output, tableName string, names []string) *plot.Chart {
	t := o.Table(tableName)
	q, med, lo, hi := t.Column("quantity"), t.Column("difference"), t.Column("difference_low"), t.Column("difference_high")
	if q == nil || med == nil || q.Text == nil {
		return nil
	}
	var cats []string
	var m, l, h []float64
	for _, n := range names {
		for i, x := range q.Text {
			if x == n {
				cats = append(cats, notebook.ColumnLabel(notebook.KindCompare, tableName, x))
				m, l, h = append(m, med.Num[i]), append(l, at(lo, i)), append(h, at(hi, i))
			}
		}
	}
	if len(cats) == 0 {
		return nil
	}
	ch := plot.New(id, title, "", "difference ("+unit+")") // no axis title: the labels may take two rows
	ch.Height = 300
	ch.StaggerLabels = true
	ch.DivergingBars(cats, []plot.Segment{{Name: "median with 95 % interval of the paired replicates", Style: plot.StyleN(3), Value: m, Lo: l, Hi: h}})
	return ch
}

// at returns c.Num[i], or NaN.
func at(c *notebook.Column, i int) float64 {
	if c == nil || i >= len(c.Num) {
		return math.NaN()
	}
	return c.Num[i]
}

// designChart draws the monitoring design's detectable increase against
// samples a year, the design's own frequency marked, with the increase the
// cell is asked about as a dashed line.
func designChart(id string, c *notebook.Cell, o *notebook.Output) *plot.Chart {
	t := o.Table("design")
	n, inc, mark := t.Column("samples_per_year"), t.Column("detectable_increase"), t.Column("design")
	if n == nil || inc == nil {
		return nil
	}
	ch := plot.New(id, "Smallest increase detectable with 80 % power against samples a year", "samples a year", "detectable increase (% of the flux)")
	ch.X.Log, ch.Y.Log = true, true
	ch.Height = 300
	ch.Line("simulated on the control's own data", plot.StyleN(0), n.Num, inc.Num)
	var xs, ys []float64
	for i := range n.Num {
		if mark != nil && i < len(mark.Text) && mark.Text[i] == "chosen" {
			xs, ys = append(xs, n.Num[i]), append(ys, inc.Num[i])
		}
	}
	if len(xs) > 0 {
		ch.Points("the design's own frequency", plot.Style{Colour: "#b5651d", Marker: "triangle"}, xs, ys, nil)
	}
	if target := numSetting(c, "target_increase_percent"); target > 0 && len(n.Num) > 0 {
		lo, hi := n.Num[0], n.Num[len(n.Num)-1]
		ch.Line("increase asked about ("+plot.Number(target)+" %)", plot.Style{Colour: "#6b6b6b", Dash: "6 3"}, []float64{lo, hi}, []float64{target, target})
	}
	return ch
}

// compareCharts are the comparison cell's charts: the differences per km²
// and per mm of runoff, and the monitoring design.
func compareCharts(id string, c *notebook.Cell, o *notebook.Output) []*plot.Chart {
	names := []string{"silicate cations", "carbonate cations", "silicate CO2", "carbonate CO2", "total CO2"}
	return []*plot.Chart{
		differenceChart(id+"-diff", "Difference per km² of catchment (median and 95 % interval)", "mol/km²/yr", o, "difference", names),
		differenceChart(id+"-mm", "Difference per mm of runoff (median and 95 % interval)", "mol/km²/mm", o, "per-mm", names),
		designChart(id+"-design", c, o),
	}
}
