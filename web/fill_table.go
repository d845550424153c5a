package web

import (
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/vugu/vugu/js"
)

// The input table of a cell (table.data) is mounted as HTML too: its
// fields are the bulk of the page's form fields. One listener on the
// mount element takes the changes of every field and the clicks on the
// row buttons, and hands them to the session as vugu's own handlers would.
// After an edit the fields are updated in place (value, class, label), so
// the field that has the focus keeps it; the table is written anew only
// when its shape (cell, rows, columns) changes.

// Field is one form field of an input table, in document order: the
// column names, then the units, then the values row by row.
type Field struct{ Value, Class string }

// DataTable is the input table of a cell as the page shows it.
type DataTable struct {
	Cell    string
	Columns int
	Widths  []int // fields in each shown row (rows longer than the header keep their extra values)
	Fields  []Field
}

// DataTable gathers the shown part of the cell's input table.
func (c *CellCard) DataTable() DataTable {
	cols := c.V.Table.Columns
	rows := c.Rows()
	t := DataTable{Cell: c.V.ID, Columns: len(cols), Widths: make([]int, len(rows))}
	t.Fields = make([]Field, 0, len(cols)*(len(rows)+2))
	width := columnWidths(cols, rows)
	for j, h := range cols {
		t.Fields = append(t.Fields, Field{h, withWidth(c.HeadClass(j), width, j)})
	}
	for j := range cols {
		t.Fields = append(t.Fields, Field{c.Unit(j), withWidth("unit", width, j)})
	}
	for i, r := range rows {
		cells := c.RowCells(r)
		t.Widths[i] = len(cells)
		for j, v := range cells {
			t.Fields = append(t.Fields, Field{v, withWidth(c.CellClass(i, j), width, j)})
		}
	}
	return t
}

// columnWidths gives each column of an input table the width class its
// longest shown text asks for: "" (a number's width), "wide" or "wider".
// Text longer than the widest field ends in "…" and shows whole on hover.
func columnWidths(cols []string, rows [][]string) []string {
	longest := make([]int, len(cols))
	for j, h := range cols {
		longest[j] = utf8.RuneCountInString(h)
	}
	for _, r := range rows {
		for j := 0; j < len(r) && j < len(cols); j++ {
			longest[j] = max(longest[j], utf8.RuneCountInString(r[j]))
		}
	}
	out := make([]string, len(cols))
	for j, n := range longest {
		switch {
		case n > 22:
			out[j] = "wider"
		case n > 11:
			out[j] = "wide"
		}
	}
	return out
}

// withWidth adds column j's width class to a field's class.
func withWidth(class string, width []string, j int) string {
	if j >= len(width) || width[j] == "" {
		return class
	}
	if class == "" {
		return width[j]
	}
	return class + " " + width[j]
}

// Labels names each field for screen readers, in the order of Fields, so
// that no two fields of a table share a name: "Name of column 3", "Unit
// of column Na", then "Row 3, Na". A column without a name of its own
// (empty, or the name of another) is called by its number.
func (t DataTable) Labels() []string {
	cols := make([]string, t.Columns)
	seen := map[string]int{}
	for j := range cols {
		seen[strings.TrimSpace(t.Fields[j].Value)]++
	}
	for j := range cols {
		name := strings.TrimSpace(t.Fields[j].Value)
		cols[j] = name
		if name == "" || seen[name] > 1 {
			cols[j] = "column " + strconv.Itoa(j+1)
		}
	}
	labels := make([]string, 0, len(t.Fields))
	for j := 0; j < t.Columns; j++ {
		labels = append(labels, "Name of column "+strconv.Itoa(j+1))
	}
	for j := 0; j < t.Columns; j++ {
		labels = append(labels, "Unit of "+cols[j])
	}
	for i, w := range t.Widths {
		row := "Row " + strconv.Itoa(i+1) + ", "
		for j := 0; j < w; j++ {
			name := "column " + strconv.Itoa(j+1)
			if j < t.Columns {
				name = cols[j]
			}
			labels = append(labels, row+name)
		}
	}
	return labels
}

// shape is the key of what the table's HTML holds besides its fields.
func (t DataTable) shape() string {
	var b strings.Builder
	b.WriteString(t.Cell + "|" + strconv.Itoa(t.Columns))
	for _, w := range t.Widths {
		b.WriteString("," + strconv.Itoa(w))
	}
	return b.String()
}

// key is a digest of the whole table, fields included (their labels
// follow from the shape and the column names).
func (t DataTable) key() string {
	d := newDigest()
	d.str(t.shape())
	for _, f := range t.Fields {
		d.str(f.Value)
		d.str(f.Class)
	}
	return d.key()
}

// HTML writes the table: <table class="data" id="table-<cell>"> with a row
// of column names, a row of units, the value rows, and a remove button at
// the end of each row. Each field and button says what it edits in its
// data-edit, data-row and data-col attributes.
func (t DataTable) HTML() string {
	var b strings.Builder
	labels := t.Labels()
	k := 0
	field := func(f Field, edit string, row, col int) {
		b.WriteString(`<input tabindex="`)
		if k == 0 { // one tab stop for the table: arrow keys move inside it
			b.WriteString(`0" class="`)
		} else {
			b.WriteString(`-1" class="`)
		}
		b.WriteString(esc(f.Class))
		b.WriteString(`" aria-label="`)
		b.WriteString(esc(labels[k]))
		if utf8.RuneCountInString(f.Value) > longField {
			b.WriteString(`" title="`)
			b.WriteString(esc(f.Value))
		}
		b.WriteString(`" value="`)
		b.WriteString(esc(f.Value))
		b.WriteString(`" data-edit="` + edit + `" data-row="` + strconv.Itoa(row) + `" data-col="` + strconv.Itoa(col) + `">`)
	}
	b.WriteString(`<table class="data" id="`)
	b.WriteString(esc("table-" + t.Cell))
	b.WriteString(`"><thead><tr><th class="rownum">row</th>`)
	for j := 0; j < t.Columns; j++ {
		b.WriteString("<th>")
		field(t.Fields[k], "column", -1, j)
		b.WriteString("</th>")
		k++
	}
	b.WriteString(`<th></th></tr><tr class="units"><th class="rownum">unit</th>`)
	for j := 0; j < t.Columns; j++ {
		b.WriteString("<th>")
		field(t.Fields[k], "unit", -1, j)
		b.WriteString("</th>")
		k++
	}
	b.WriteString(`<th></th></tr></thead><tbody>`)
	for i, w := range t.Widths {
		b.WriteString(`<tr><td class="rownum">` + strconv.Itoa(i+1) + "</td>")
		for j := 0; j < w; j++ {
			b.WriteString("<td>")
			field(t.Fields[k], "value", i, j)
			b.WriteString("</td>")
			k++
		}
		b.WriteString(`<td><button class="row-remove" tabindex="-1" title="Remove row" aria-label="Remove row ` + strconv.Itoa(i+1) +
			`" data-edit="remove" data-row="` + strconv.Itoa(i) + `">×</button></td></tr>`)
	}
	b.WriteString("</tbody></table>")
	return b.String()
}

// longField is the length of text above which a field carries its whole
// text as a tooltip: the widest field shows about this much.
const longField = 48

// shapeKey is the JS property, beside mountKey, that holds a mounted
// table's shape.
const shapeKey = "__lixivShape"

// mountTable puts the input table into el: the whole table when its shape
// changed, else only the fields that changed.
func mountTable(el js.Value, t DataTable) {
	key, shape := t.key(), t.shape()
	first := el.Get("firstChild")
	if first.Truthy() && first.Get(mountKey).Type() == js.TypeString {
		if first.Get(mountKey).String() == key {
			return
		}
		if s := first.Get(shapeKey); s.Type() == js.TypeString && s.String() == shape && updateFields(first, t) {
			first.Set(mountKey, key)
			return
		}
	}
	el.Set("innerHTML", t.HTML())
	if first = el.Get("firstChild"); first.Truthy() {
		first.Set(mountKey, key)
		first.Set(shapeKey, shape)
	}
}

// updateFields sets the value, class and label of each input of table
// that differs from t's fields. It reports false when the inputs do not
// match the fields one for one.
func updateFields(table js.Value, t DataTable) bool {
	inputs := table.Call("querySelectorAll", "input")
	if inputs.Length() != len(t.Fields) {
		return false
	}
	labels := t.Labels()
	for i, f := range t.Fields {
		in := inputs.Index(i)
		if in.Get("defaultValue").String() != f.Value { // the applied value: undo in a field returns to it
			in.Set("defaultValue", f.Value)
		}
		if in.Get("value").String() != f.Value {
			in.Set("value", f.Value)
		}
		if in.Get("className").String() != f.Class {
			in.Set("className", f.Class)
		}
		if utf8.RuneCountInString(f.Value) > longField && in.Get("title").String() != f.Value {
			in.Set("title", f.Value)
		}
		if in.Call("getAttribute", "aria-label").String() != labels[i] {
			in.Call("setAttribute", "aria-label", labels[i])
		}
	}
	return true
}

// tableListener is the one listener of every mounted input table.
var tableListener struct {
	root *Root
	fn   js.Func
}

// listenTable makes el hand the edits of its input table to the session of
// root, once.
func listenTable(el js.Value, root *Root) {
	if tableListener.root != root {
		tableListener.root = root
		tableListener.fn = js.FuncOf(func(_ js.Value, args []js.Value) any {
			if len(args) > 0 {
				onTableEvent(root, args[0])
			}
			return nil
		})
	}
	if el.Get("__lixivListener").Truthy() {
		return
	}
	for _, ev := range []string{"change", "click", "keydown", "focusin"} {
		el.Call("addEventListener", ev, tableListener.fn.Value)
	}
	el.Set("__lixivListener", true)
}

// The fields of an input table are one tab stop: the field last in focus
// (at first the first column's name) takes the Tab key, and the arrow keys
// move between fields (left and right once the caret is at the end of the
// text), so that Tab leaves a long table at once.

// onTableKey moves the focus by an arrow key.
func onTableKey(ev js.Value) {
	key := ev.Get("key").String()
	if ev.Get("ctrlKey").Bool() || ev.Get("altKey").Bool() || ev.Get("metaKey").Bool() || ev.Get("shiftKey").Bool() {
		return
	}
	target := ev.Get("target")
	td := target.Call("closest", "td, th")
	if !td.Truthy() {
		return
	}
	tr := td.Get("parentElement")
	col, row := td.Get("cellIndex").Int(), tr.Get("rowIndex").Int()
	isInput := strings.EqualFold(target.Get("tagName").String(), "input")
	var next js.Value
	switch key {
	case "ArrowUp", "ArrowDown":
		step := 1
		if key == "ArrowUp" {
			step = -1
		}
		rows := target.Call("closest", "table").Get("rows")
		for r := row + step; r >= 0 && r < rows.Length() && !next.Truthy(); r += step {
			if cells := rows.Index(r).Get("cells"); col < cells.Length() {
				next = focusable(cells.Index(col))
			}
		}
	case "ArrowLeft", "ArrowRight":
		if isInput {
			at, end, n := target.Get("selectionStart").Int(), target.Get("selectionEnd").Int(), len([]rune(target.Get("value").String()))
			if at != end || key == "ArrowLeft" && at > 0 || key == "ArrowRight" && end < n {
				return // the caret moves within the text
			}
		}
		step := 1
		if key == "ArrowLeft" {
			step = -1
		}
		cells := tr.Get("cells")
		for c := col + step; c >= 0 && c < cells.Length() && !next.Truthy(); c += step {
			next = focusable(cells.Index(c))
		}
	default:
		return
	}
	if next.Truthy() {
		ev.Call("preventDefault")
		next.Call("focus")
	}
}

// focusable returns the field or button of a table cell, or a falsy value.
func focusable(td js.Value) js.Value {
	return td.Call("querySelector", "input, button")
}

// onTableFocus makes the field in focus the table's one tab stop.
func onTableFocus(ev js.Value) {
	target := ev.Get("target")
	table := target.Call("closest", "table.data")
	if !table.Truthy() {
		return
	}
	old := table.Call("querySelectorAll", `[tabindex="0"]`)
	for i := 0; i < old.Length(); i++ {
		old.Index(i).Call("setAttribute", "tabindex", "-1")
	}
	target.Call("setAttribute", "tabindex", "0")
}

// onTableEvent applies a change of a field, or a click on a row's remove
// button, of a mounted input table.
func onTableEvent(root *Root, ev js.Value) {
	switch ev.Get("type").String() {
	case "keydown":
		onTableKey(ev)
		return
	case "focusin":
		onTableFocus(ev)
		return
	}
	target := ev.Get("target")
	ds := target.Get("dataset")
	if !ds.Truthy() || ds.Get("edit").Type() != js.TypeString {
		return
	}
	edit, kind := ds.Get("edit").String(), ev.Get("type").String()
	if (kind == "click") != (edit == "remove") {
		return
	}
	table := target.Call("closest", "table.data")
	if !table.Truthy() {
		return
	}
	cell := strings.TrimPrefix(table.Get("id").String(), "table-")
	row, _ := strconv.Atoi(ds.Get("row").String())
	col, _ := strconv.Atoi(ds.Get("col").String())
	value := ""
	if edit != "remove" {
		value = target.Get("value").String()
	}
	root.env.Lock()
	defer root.env.UnlockRender()
	defer root.guard()
	switch edit {
	case "value":
		root.S.SetValue(cell, row, col, value)
	case "column":
		root.S.SetColumn(cell, col, value)
	case "unit":
		root.S.SetUnit(cell, col, value)
	case "remove":
		root.S.RemoveRow(cell, row)
	}
}
