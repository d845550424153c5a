package web

import (
	"html"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/vugu/vugu/js"

	"lixiv/engine/notebook"
)

// Large read-only parts of the page (output tables, the option lists of
// choice fields, charts) are written as HTML text and mounted into an
// element that has no children in the template, so vugu's DOM sync, which
// rewrites every node it knows on every render, never visits them. They are
// written again only when their text changes.

// mountKey is the JS property, set on the first node of a mounted block,
// that holds the key of the HTML it was made from.
const mountKey = "__lixivKey"

// mountHTML puts the HTML that text makes into el unless el already holds
// the HTML of that key. The key sits on the first node mounted, not on el:
// vugu syncs by position and may reuse el for another element, and then
// the children are no longer ours. text is called only when the HTML is
// written, so a render that changes nothing costs the key alone.
func mountHTML(el js.Value, key string, text func() string) {
	if first := el.Get("firstChild"); first.Truthy() {
		if k := first.Get(mountKey); k.Type() == js.TypeString && k.String() == key {
			return
		}
	}
	el.Set("innerHTML", text())
	if first := el.Get("firstChild"); first.Truthy() {
		first.Set(mountKey, key)
	}
}

// digest is a 64-bit FNV-1a hash of what a mounted block is made from.
type digest uint64

const (
	fnvOffset digest = 14695981039346656037
	fnvPrime  digest = 1099511628211
)

func newDigest() digest { return fnvOffset }

// str adds a text and its end.
func (d *digest) str(s string) {
	for i := 0; i < len(s); i++ {
		*d = (*d ^ digest(s[i])) * fnvPrime
	}
	*d = (*d ^ 0xff) * fnvPrime // no UTF-8 byte is 0xff: texts cannot run into each other
}

// num adds a number's bits.
func (d *digest) num(f float64) {
	b := math.Float64bits(f)
	for i := 0; i < 64; i += 8 {
		*d = (*d ^ digest(byte(b>>i))) * fnvPrime
	}
}

// key is the digest as a short text.
func (d digest) key() string { return strconv.FormatUint(uint64(d), 36) }

// htmlKey is the key of a block of HTML.
func htmlKey(text string) string {
	d := newDigest()
	d.str(text)
	return d.key()
}

// esc escapes text for HTML content and attribute values.
func esc(s string) string { return html.EscapeString(s) }

// ResultHTML writes an output table as the HTML of
// <table class="out" id="out-<cell>-<table>">, with one header row (the
// labels of the columns of a cell of kind) and the given rows, every text
// escaped.
func ResultHTML(cell string, kind notebook.Kind, t *notebook.ResultTable, cols []*notebook.Column, rows [][]string) string {
	var b strings.Builder
	b.WriteString(`<table class="out" id="`)
	b.WriteString(esc("out-" + cell + "-" + t.Name))
	b.WriteString(`"><thead><tr>`)
	for _, col := range cols {
		b.WriteString("<th>")
		b.WriteString(esc(ColumnLabel(kind, t.Name, col)))
		b.WriteString("</th>")
	}
	b.WriteString("</tr></thead><tbody>")
	for _, r := range rows {
		b.WriteString("<tr>")
		for j, v := range r {
			switch {
			case j < len(cols) && cols[j].Text != nil && utf8.RuneCountInString(v) > wrapText:
				b.WriteString(`<td class="text long">`) // long text wraps
			case j < len(cols) && cols[j].Text != nil:
				b.WriteString(`<td class="text">`)
			default:
				b.WriteString("<td>")
			}
			b.WriteString(esc(v))
			b.WriteString("</td>")
		}
		b.WriteString("</tr>")
	}
	b.WriteString("</tbody></table>")
	return b.String()
}

// wrapText is the length of text above which a table cell wraps it onto
// more lines (short texts, dates and names, stay on one).
const wrapText = 24

// Choice is one option of a choice field: the value sent and its label.
type Choice struct{ Value, Label string }

// OptionsHTML writes the options of a select, the current one selected.
func OptionsHTML(choices []Choice, current string) string {
	var b strings.Builder
	for _, c := range choices {
		b.WriteString(`<option value="`)
		b.WriteString(esc(c.Value))
		if c.Value == current {
			b.WriteString(`" selected>`)
		} else {
			b.WriteString(`">`)
		}
		b.WriteString(esc(c.Label))
		b.WriteString("</option>")
	}
	return b.String()
}

// mountOptions fills a select with its options and shows the current
// choice (again after a rejected change), when it is one of them.
func mountOptions(el js.Value, choices []Choice, current string) {
	d := newDigest()
	d.str(current)
	found := false
	for _, c := range choices {
		d.str(c.Value)
		d.str(c.Label)
		found = found || c.Value == current
	}
	mountHTML(el, d.key(), func() string { return OptionsHTML(choices, current) })
	if found && el.Get("value").String() != current {
		el.Set("value", current)
	}
}
