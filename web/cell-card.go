package web

import (
	"fmt"
	"strings"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
	"lixiv/web/plot"
)

// CellCard shows one cell: its header and state, its inputs (settings,
// input cells, data table) above its outputs (figures, tables, charts).
type CellCard struct {
	R *Root     // the page, which routes every edit
	V *CellView // what to show
}

// pageRows is how many table rows show before "show more".
const pageRows = 20

// Rows returns the rows of the input table that are shown.
func (c *CellCard) Rows() [][]string {
	t := c.V.Table
	n := c.R.shown(c.V.ID)
	if n > len(t.Rows) {
		n = len(t.Rows)
	}
	return t.Rows[:n]
}

// MoreRows reports how many rows are hidden.
func (c *CellCard) MoreRows() int { return len(c.V.Table.Rows) - len(c.Rows()) }

// Unit returns the unit of column j of the input table.
func (c *CellCard) Unit(j int) string {
	if j < len(c.V.Table.Units) {
		return c.V.Table.Units[j]
	}
	return ""
}

// RowCells pads a row to the table's width.
func (c *CellCard) RowCells(r []string) []string {
	if len(r) >= len(c.V.Table.Columns) {
		return r
	}
	return pad(r, len(c.V.Table.Columns))
}

// Folded output tables show at most this many rows and columns.
const (
	foldedRows    = 10
	foldedColumns = 14
)

// ResultColumns returns the columns of output table ti that are shown.
func (c *CellCard) ResultColumns(ti int) []*notebook.Column {
	cols := c.V.Results[ti].Columns
	if !c.R.S.expanded(c.V.ID, ti) && len(cols) > foldedColumns {
		cols = cols[:foldedColumns]
	}
	return cols
}

// ResultRows returns the rows of output table ti that are shown, formatted.
func (c *CellCard) ResultRows(ti int) [][]string {
	cols := c.ResultColumns(ti)
	rows := make([][]string, c.resultLen(ti))
	for i := range rows {
		rows[i] = make([]string, len(cols))
	}
	for j, col := range cols {
		text := col.Text
		if text == nil {
			text = plot.Column(col.Num) // the whole column: folding does not change its notation
		} else if col.Name == "year" && c.V.YearStart > 1 {
			text = make([]string, min(len(col.Text), len(rows)))
			for i := range text {
				text[i] = WaterYear(col.Text[i], c.V.YearStart)
			}
		}
		for i := range rows {
			if i < len(text) {
				rows[i][j] = text[i]
			}
		}
	}
	return rows
}

// resultLen is how many rows of output table ti are shown.
func (c *CellCard) resultLen(ti int) int {
	n := c.V.Results[ti].Len()
	if !c.R.S.expanded(c.V.ID, ti) && n > foldedRows {
		n = foldedRows
	}
	return n
}

// ResultHidden says whether output table ti has rows or columns folded away.
func (c *CellCard) ResultHidden(ti int) bool {
	t := c.V.Results[ti]
	return !c.R.S.expanded(c.V.ID, ti) && (t.Len() > foldedRows || len(t.Columns) > foldedColumns)
}

// ResultExpanded reports whether output table ti shows all its rows.
func (c *CellCard) ResultExpanded(ti int) bool { return c.R.S.expanded(c.V.ID, ti) }

// Header formats a result column heading with its unit.
func Header(col *notebook.Column) string {
	if col.Unit != "" {
		return col.Name + " (" + col.Unit + ")"
	}
	return col.Name
}

// IsNote reports a note cell.
func (c *CellCard) IsNote() bool { return c.V.Kind == string(notebook.KindNote) }

// NoteLines splits a note into paragraphs, shown as text.
func (c *CellCard) NoteLines() []string {
	var out []string
	for _, p := range strings.Split(c.V.NoteText, "\n") {
		if strings.TrimSpace(p) != "" {
			out = append(out, p)
		}
	}
	return out
}

// CanPaste reports a table that takes pasted rows.
func (c *CellCard) CanPaste() bool {
	return c.V.Kind == string(notebook.KindSamples) || c.V.Kind == string(notebook.KindDischarge) ||
		c.V.Kind == string(notebook.KindSources) || c.V.Kind == string(notebook.KindAtmosphere)
}

// Fill mounts a chart's SVG into its element when it changed (the
// external-DOM pattern: vugu never touches the element's children).
func (c *CellCard) Fill(el js.Value, ch ChartView) {
	mountHTML(el, ch.Key, func() string { return ch.SVG })
}

// MountClass is the class of a chart's mount: "svg-mount wide" scrolls a
// wide chart sideways.
func (c *CellCard) MountClass(ch ChartView) string {
	if ch.Wide {
		return "svg-mount wide"
	}
	return "svg-mount"
}

// FillResult mounts output table ti into its element when its text changed.
func (c *CellCard) FillResult(el js.Value, ti int) {
	t, cols, n := c.V.Results[ti], c.ResultColumns(ti), c.resultLen(ti)
	d := newDigest()
	d.str(c.V.ID)
	d.str(t.Name)
	d.num(float64(n))
	d.num(float64(c.V.YearStart))
	for _, col := range cols {
		d.str(col.Name)
		d.str(col.Unit)
		for i := 0; i < n; i++ {
			if col.Text != nil {
				if i < len(col.Text) {
					d.str(col.Text[i])
				}
			} else if i < len(col.Num) {
				d.num(col.Num[i])
			}
		}
	}
	mountHTML(el, d.key(), func() string { return ResultHTML(c.V.ID, notebook.Kind(c.V.Kind), t, cols, c.ResultRows(ti)) })
}

// FillTable mounts the input table into its element and takes its edits.
func (c *CellCard) FillTable(el js.Value) {
	listenTable(el, c.R)
	mountTable(el, c.DataTable())
}

// FillParam fills the select of a setting with its choices.
func (c *CellCard) FillParam(el js.Value, p ParamView) {
	choices := make([]Choice, len(p.Options))
	for i, o := range p.Options {
		choices[i] = Choice{o, o}
		if i < len(p.OptionLabels) {
			choices[i].Label = p.OptionLabels[i]
		}
	}
	mountOptions(el, choices, p.Value)
}

// FillRole fills the select of an input role with the cells it can read.
func (c *CellCard) FillRole(el js.Value, r RoleView) {
	choices := make([]Choice, 0, len(r.Choices)+1)
	def := "nearest above"
	if r.Default != "" {
		def = r.Default
	}
	choices = append(choices, Choice{"", def})
	for _, id := range r.Choices {
		choices = append(choices, Choice{id, id})
	}
	mountOptions(el, choices, r.Current)
}

// OnParam sets a setting from its field.
func (c *CellCard) OnParam(key string, e vugu.DOMEvent) {
	defer c.R.guard()
	c.R.S.SetParam(c.V.ID, key, e.PropString("target", "value"))
}

// OnCheck sets a yes/no setting from its box.
func (c *CellCard) OnCheck(key string, e vugu.DOMEvent) {
	defer c.R.guard()
	v := "no"
	if e.PropBool("target", "checked") {
		v = "yes"
	}
	c.R.S.SetParam(c.V.ID, key, v)
}

// OnSection puts the cell in the section typed ("" makes it shared).
func (c *CellCard) OnSection(e vugu.DOMEvent) {
	defer c.R.guard()
	c.R.S.SetSection(c.V.ID, strings.TrimSpace(e.PropString("target", "value")))
}

// OnTitle renames the cell.
func (c *CellCard) OnTitle(e vugu.DOMEvent) { c.R.S.SetTitle(c.V.ID, e.PropString("target", "value")) }

// OnPaste adds rows pasted into the paste box at once.
func (c *CellCard) OnPaste(e vugu.DOMEvent) {
	defer c.R.guard()
	cd := e.JSEvent().Get("clipboardData")
	if !cd.Truthy() {
		return
	}
	text := cd.Call("getData", "text/plain").String()
	if strings.TrimSpace(text) == "" {
		return
	}
	e.PreventDefault()
	if _, err := c.R.S.Paste(c.V.ID, text); err == nil {
		c.R.Banner = &Banner{Cell: c.V.ID, Verb: "pasted"}
	}
}

// OnPasteBox adds rows typed into the paste box when the button is pressed.
func (c *CellCard) OnPasteBox(e vugu.DOMEvent) {
	defer c.R.guard()
	box := js.Global().Get("document").Call("getElementById", "paste-"+c.V.ID)
	if !box.Truthy() {
		return
	}
	text := box.Get("value").String()
	if _, err := c.R.S.Paste(c.V.ID, text); err == nil {
		box.Set("value", "")
		c.R.Banner = &Banner{Cell: c.V.ID, Verb: "pasted"}
	}
}

// OnUses points an input role at another cell.
func (c *CellCard) OnUses(role string, e vugu.DOMEvent) {
	defer c.R.guard()
	c.R.S.SetUses(c.V.ID, role, e.PropString("target", "value"))
}

// OnNote sets the text of a note cell.
func (c *CellCard) OnNote(e vugu.DOMEvent) {
	defer c.R.guard()
	c.R.S.SetParam(c.V.ID, "text", e.PropString("target", "value"))
}

// ShowMore shows more rows of the input table.
func (c *CellCard) ShowMore() { c.R.showMore(c.V.ID) }

// ToggleResult folds or unfolds an output table.
func (c *CellCard) ToggleResult(ti int) { c.R.S.toggleExpanded(c.V.ID, ti) }

// ExportInput offers the input table as CSV.
func (c *CellCard) ExportInput() {
	defer c.R.guard()
	download(c.V.ID+"-table.csv", "text/csv", []byte(c.V.Table.CSV()))
}

// ExportResult offers output table ti as CSV.
func (c *CellCard) ExportResult(ti int) {
	defer c.R.guard()
	t := c.V.Results[ti]
	download(c.V.ID+"-"+t.Name+".csv", "text/csv", []byte(ResultCSV(t)))
}

// ExportSVG offers a chart as an SVG file.
func (c *CellCard) ExportSVG(ch ChartView) {
	defer c.R.guard()
	download(ch.ID+".svg", "image/svg+xml", []byte(ch.SVG))
}

// ExportPNG offers a chart as a PNG picture.
func (c *CellCard) ExportPNG(ch ChartView) {
	defer c.R.guard()
	svg := ch.SVG
	go func() {
		w, h := svgSize(svg)
		if err := downloadPNG(ch.ID+".png", svg, w, h); err != nil {
			c.R.env.Lock()
			c.R.S.Message = err.Error()
			c.R.env.UnlockRender()
		}
	}()
}

// svgSize reads the width and height attributes of an SVG made by package plot.
func svgSize(svg string) (w, h float64) {
	w, h = 640, 380
	fmt.Sscanf(attr(svg, "width"), "%g", &w)
	fmt.Sscanf(attr(svg, "height"), "%g", &h)
	return w, h
}

func attr(s, name string) string {
	i := strings.Index(s, " "+name+`="`)
	if i < 0 {
		return ""
	}
	s = s[i+len(name)+3:]
	j := strings.IndexByte(s, '"')
	if j < 0 {
		return ""
	}
	return s[:j]
}

// ResultCSV renders an output table as CSV with a header row carrying the
// units, numbers at full precision.
func ResultCSV(t *notebook.ResultTable) string {
	tab := &notebook.Table{}
	for _, col := range t.Columns {
		tab.Columns = append(tab.Columns, Header(col))
	}
	for i := 0; i < t.Len(); i++ {
		row := make([]string, len(t.Columns))
		for j, col := range t.Columns {
			switch {
			case col.Text != nil && i < len(col.Text):
				row[j] = col.Text[i]
			case col.Num != nil && i < len(col.Num):
				row[j] = fmt.Sprint(col.Num[i])
			}
		}
		tab.Rows = append(tab.Rows, row)
	}
	return tab.CSV()
}

// FoldMark is the fold button's sign.
func (c *CellCard) FoldMark() string { return pick(c.V.Collapsed, "▸", "▾") }

// FoldTitle is the fold button's tooltip.
func (c *CellCard) FoldTitle() string {
	return pick(c.V.Collapsed, "Unfold this cell", "Fold this cell")
}

// TableLine sums up the input table.
func (c *CellCard) TableLine() string {
	t := c.V.Table
	return fmt.Sprintf("%d rows, %d columns", len(t.Rows), len(t.Columns))
}

// MoreLine labels the "show more" button.
func (c *CellCard) MoreLine() string { return fmt.Sprintf("Show more rows (%d hidden)", c.MoreRows()) }

// HasOutputs reports whether the cell has anything to show below its inputs.
func (c *CellCard) HasOutputs() bool {
	v := c.V
	return c.IsNote() || len(v.Warnings) > 0 || len(v.Figures) > 0 || len(v.Charts) > 0 || len(v.Results) > 0
}

// ResultTitle heads output table ti.
func (c *CellCard) ResultTitle(ti int) string {
	t := c.V.Results[ti]
	title := t.Title
	if title == "" {
		title = t.Name
	}
	if cs := c.chartSettings(); cs != nil && t.Name == "points" {
		_, y := lookupRef(c.R.S.Doc, cs.Y)
		_, x := lookupRef(c.R.S.Doc, cs.X)
		title = y + " against " + x
	}
	return fmt.Sprintf("%s (%d rows)", title, t.Len())
}

// chartSettings returns the settings of a chart cell, else nil.
func (c *CellCard) chartSettings() *notebook.ChartSettings {
	if cell := c.R.S.Doc.Cell(c.V.ID); cell != nil {
		if cs, ok := cell.Settings.(*notebook.ChartSettings); ok {
			return cs
		}
	}
	return nil
}

// ResultToggleLine labels the fold button of output table ti.
func (c *CellCard) ResultToggleLine(ti int) string {
	if c.ResultExpanded(ti) {
		return "Fold the table"
	}
	t := c.V.Results[ti]
	var more []string
	if n := t.Len() - foldedRows; n > 0 {
		more = append(more, fmt.Sprintf("%d more rows", n))
	}
	if n := len(t.Columns) - foldedColumns; n > 0 {
		more = append(more, fmt.Sprintf("%d more columns", n))
	}
	return "Show the whole table (" + strings.Join(more, ", ") + ")"
}

// IsSources reports an end-member cell.
func (c *CellCard) IsSources() bool { return c.V.Kind == string(notebook.KindSources) }

// FillPreset replaces the end-member table with the chosen preset's, with
// the published sources the engine gives for it.
func (c *CellCard) FillPreset() {
	defer c.R.guard()
	preset := "global"
	for _, p := range c.V.Params {
		if p.Key == "preset" {
			preset = p.Value
		}
	}
	t, err := notebook.SourcesTable(preset)
	if err != nil {
		c.R.S.CellErr[c.V.ID] = err.Error()
		return
	}
	c.R.S.LoadTable(c.V.ID, t, "the "+preset+" preset")
}

// EmptyTableHint says what an empty table is for and how to fill it.
func (c *CellCard) EmptyTableHint() string {
	switch notebook.Kind(c.V.Kind) {
	case notebook.KindAtmosphere:
		return "No rain chemistry yet. The rain method needs it: paste a table of rain samples below, or open a CSV/TSV file. The sea-salt method does without."
	case notebook.KindDischarge:
		return "No discharge record yet: drop a CSV/TSV or .xlsx file of dates and daily discharge on the page, or paste one below."
	case notebook.KindSamples:
		return "No samples yet: drop a CSV/TSV or .xlsx file of stream samples on the page, or paste rows copied from a spreadsheet below (with the header row)."
	}
	return "The table is empty: paste rows below, or use \"Fill from preset\"."
}

// TableUnused reports an empty input table that the cell's current
// settings do not read (notebook.ReadsTable).
func (c *CellCard) TableUnused() bool { return c.V.TableUnread }

// UnusedTableHint stands in for an unused empty table.
func (c *CellCard) UnusedTableHint() string {
	return "The sea-salt method needs no rain chemistry; choose the rain method to enter rain samples."
}

// CellClass marks a table cell that a problem names.
func (c *CellCard) CellClass(row, col int) string { return pick(c.V.bad[[2]int{row, col}], "bad", "") }

// HeadClass marks a column whose header (or unit) a problem names.
func (c *CellCard) HeadClass(col int) string {
	return pick(c.V.bad[[2]int{-1, col}], "colname bad", "colname")
}

// OutputsClass dims outputs that are from before the last change.
func (c *CellCard) OutputsClass() string { return pick(c.V.OldOutputs, "outputs old", "outputs") }

// Expanded is the fold button's aria-expanded value.
func (c *CellCard) Expanded() string { return pick(c.V.Collapsed, "false", "true") }

// NeedHref links what the cell waits for: the field to fill, the paste
// box of a table, or the cell that lacks it.
func (c *CellCard) NeedHref(n NeedView) string {
	switch {
	case n.Field != "":
		return "#" + n.Field
	case n.Cell == c.V.ID:
		return "#paste-" + n.Cell
	}
	return "#cell-" + n.Cell
}

// NeedLink is the text of that link.
func (c *CellCard) NeedLink(n NeedView) string {
	switch {
	case n.Cell == c.V.ID && n.Field != "":
		return "(the field below)"
	case n.Cell == c.V.ID:
		return "(the paste box below)"
	}
	return "in the " + n.CellTitle + " cell"
}

// FieldClass marks a setting whose value is still the demo's.
func (c *CellCard) FieldClass(p ParamView) string {
	if p.FromDemo {
		return "from-demo"
	}
	return ""
}

// ChartName names a chart in its buttons' accessible names: its title, in
// quotes, numbered when another chart of the cell has the same title.
func (c *CellCard) ChartName(ch ChartView) string {
	n, at := 0, 0
	for _, o := range c.V.Charts {
		if o.Title == ch.Title {
			n++
			if o.ID == ch.ID {
				at = n
			}
		}
	}
	if n > 1 {
		return fmt.Sprintf("“%s” (%d of %d)", ch.Title, at, n)
	}
	return "“" + ch.Title + "”"
}

// ResultName names output table ti in its buttons' accessible names.
func (c *CellCard) ResultName(ti int) string {
	t := c.V.Results[ti]
	if t.Title != "" {
		return t.Title
	}
	return t.Name
}

// NeedsOwnTable reports a cell that waits for its own table: the line
// saying so stands in for the empty table's hint.
func (c *CellCard) NeedsOwnTable() bool {
	for _, n := range c.V.Needs {
		if n.Cell == c.V.ID && n.Field == "" {
			return true
		}
	}
	return false
}

// ShowProblem brings the field a table problem names into view, with the
// focus (the column's name for a problem of a whole column): its rows are
// shown first when they are folded away.
func (c *CellCard) ShowProblem(e vugu.DOMEvent, p TableProblem) {
	e.PreventDefault()
	if p.Row >= c.R.shown(c.V.ID) {
		c.R.rows[c.V.ID] = p.Row + 1
	}
	edit, col := "value", max(p.Col, 0)
	if p.Row < 0 {
		edit = "column"
	}
	c.R.focusAfter = fmt.Sprintf(`#table-%s input[data-edit="%s"][data-row="%d"][data-col="%d"]`, c.V.ID, edit, max(p.Row, -1), col)
}

// HasMarked reports a table with problems marked in its fields.
func (c *CellCard) HasMarked() bool { return len(c.V.bad) > 0 }

// DemoValues reports a cell that still holds values of the demo (settings
// or its table) in a budget grown from it.
func (c *CellCard) DemoValues() bool {
	if c.V.TableOrigin == "the demo" {
		return true
	}
	for _, p := range c.V.Params {
		if p.FromDemo {
			return true
		}
	}
	return false
}

// pick returns yes when cond holds, else no: the two texts of a
// template's getter.
func pick(cond bool, yes, no string) string {
	if cond {
		return yes
	}
	return no
}
