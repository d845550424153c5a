package web

import (
	"math"
	"reflect"
	"strings"
	"testing"

	"lixiv/engine/notebook"
)

// TestResultHTML checks the HTML of an output table: its id and class, a
// heading with its unit, and every text escaped, so that a sample name
// holding markup shows as text.
func TestResultHTML(t *testing.T) {
	name := &notebook.Column{Name: "sample", Text: []string{`<b>CV-1</b>`, "CV-2 & 3"}}
	na := &notebook.Column{Name: "Na", Unit: "µmol/L", Num: []float64{210, 195}}
	tab := &notebook.ResultTable{Name: "samples", Columns: []*notebook.Column{name, na}}
	got := ResultHTML("samples", notebook.KindSamples, tab, tab.Columns, [][]string{{`<b>CV-1</b>`, "210"}, {"CV-2 & 3", "195"}})
	tests := []struct{ name, want string }{
		{"table", `<table class="out" id="out-samples-samples"><thead><tr>`},
		{"headings", `<th>sample</th><th>Na (µmol/L)</th>`},
		{"markup as text", `<td class="text">&lt;b&gt;CV-1&lt;/b&gt;</td><td>210</td>`},
		{"ampersand", `<td class="text">CV-2 &amp; 3</td>`},
		{"end", `</tr></tbody></table>`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if !strings.Contains(got, tt.want) {
				t.Errorf("got %s\nwant it to hold %s", got, tt.want)
			}
		})
	}
	if n := strings.Count(got, "<tr>"); n != 3 {
		t.Errorf("rows: got %d <tr>, want 3 (heading and two rows)", n)
	}
	if strings.Contains(got, "<b>") {
		t.Errorf("markup from a cell became a tag: %s", got)
	}
}

// TestOptionsHTML checks the options of a choice field: the current one is
// selected, and values and labels are escaped.
func TestOptionsHTML(t *testing.T) {
	tests := []struct {
		name    string
		choices []Choice
		current string
		want    string
	}{
		{"current selected", []Choice{{"m3/s", "m3/s"}, {"L/s", "L/s"}}, "L/s",
			`<option value="m3/s">m3/s</option><option value="L/s" selected>L/s</option>`},
		{"empty value", []Choice{{"", "nearest above"}, {"samples", "samples"}}, "",
			`<option value="" selected>nearest above</option><option value="samples">samples</option>`},
		{"none current", []Choice{{"a", "a"}}, "b", `<option value="a">a</option>`},
		{"escaped", []Choice{{`x"><i>`, `<i>y</i>`}}, "",
			`<option value="x&#34;&gt;&lt;i&gt;">&lt;i&gt;y&lt;/i&gt;</option>`},
		{"no choices", nil, "", ``},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := OptionsHTML(tt.choices, tt.current); got != tt.want {
				t.Errorf("got  %s\nwant %s", got, tt.want)
			}
		})
	}
}

// TestDigest checks that the key of a mounted block tells apart what it is
// made from: texts split differently, numbers, and their order.
func TestDigest(t *testing.T) {
	key := func(add func(d *digest)) string {
		d := newDigest()
		add(&d)
		return d.key()
	}
	tests := []struct {
		name string
		a, b func(d *digest)
	}{
		{"split", func(d *digest) { d.str("ab"); d.str("c") }, func(d *digest) { d.str("a"); d.str("bc") }},
		{"empty text", func(d *digest) { d.str("") }, func(d *digest) {}},
		{"numbers", func(d *digest) { d.num(1) }, func(d *digest) { d.num(1.0000000000000002) }},
		{"order", func(d *digest) { d.num(1); d.num(2) }, func(d *digest) { d.num(2); d.num(1) }},
		{"NaN", func(d *digest) { d.num(math.NaN()) }, func(d *digest) { d.num(0) }},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if key(tt.a) == key(tt.b) {
				t.Errorf("both give the key %s", key(tt.a))
			}
			if key(tt.a) != key(tt.a) {
				t.Errorf("the key is not stable")
			}
		})
	}
}

// TestHTMLKey checks that the key of a mounted block tells texts apart.
func TestHTMLKey(t *testing.T) {
	texts := []string{"", "<td>1</td>", "<td>2</td>", "<td>1</td><td>1</td>"}
	seen := map[string]string{}
	for _, s := range texts {
		k := htmlKey(s)
		if o, ok := seen[k]; ok {
			t.Errorf("%q and %q share the key %s", o, s, k)
		}
		seen[k] = s
		if htmlKey(s) != k {
			t.Errorf("%q: the key is not stable", s)
		}
	}
}

// TestDataTableHTML checks the HTML of an input table: the id and classes
// the page's style and tests rely on, one field per column name, unit and
// value, each saying what it edits under a name of its own, one tab stop,
// and every text escaped.
func TestDataTableHTML(t *testing.T) {
	tab := DataTable{Cell: "samples", Columns: 2, Widths: []int{2, 3}, Fields: []Field{
		{"sample", "colname"}, {"Na", "colname bad"},
		{"", "unit"}, {"µmol/L", "unit"},
		{`<b>CV-1</b>`, ""}, {"210", "bad"},
		{"CV-2", ""}, {"195", ""}, {"extra", ""},
	}}
	got := tab.HTML()
	tests := []struct{ name, want string }{
		{"table", `<table class="data" id="table-samples"><thead><tr><th class="rownum">row</th><th><input tabindex="0" class="colname"`},
		{"column name", `<input tabindex="-1" class="colname bad" aria-label="Name of column 2" value="Na" data-edit="column" data-row="-1" data-col="1">`},
		{"units row", `<tr class="units"><th class="rownum">unit</th><th><input tabindex="-1" class="unit" aria-label="Unit of sample" value="" data-edit="unit" data-row="-1" data-col="0">`},
		{"markup as text", `value="&lt;b&gt;CV-1&lt;/b&gt;" data-edit="value" data-row="0" data-col="0">`},
		{"bad value", `<input tabindex="-1" class="bad" aria-label="Row 1, Na" value="210" data-edit="value" data-row="0" data-col="1">`},
		{"row number", `<tr><td class="rownum">2</td>`},
		{"extra value kept", `<input tabindex="-1" class="" aria-label="Row 2, column 3" value="extra" data-edit="value" data-row="1" data-col="2">`},
		{"remove button", `<td><button class="row-remove" tabindex="-1" title="Remove row" aria-label="Remove row 2" data-edit="remove" data-row="1">×</button></td></tr></tbody></table>`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if !strings.Contains(got, tt.want) {
				t.Errorf("got %s\nwant it to hold %s", got, tt.want)
			}
		})
	}
	if n := strings.Count(got, "<input"); n != len(tab.Fields) {
		t.Errorf("inputs: got %d, want one per field (%d)", n, len(tab.Fields))
	}
}

// TestDataTableKeys checks what makes an input table be written anew
// (its shape) and what only updates its fields (its key).
func TestDataTableKeys(t *testing.T) {
	base := DataTable{Cell: "samples", Columns: 1, Widths: []int{1}, Fields: []Field{{"Na", "colname"}, {"", "unit"}, {"210", ""}}}
	with := func(f func(*DataTable)) DataTable {
		t := base
		t.Widths = append([]int(nil), base.Widths...)
		t.Fields = append([]Field(nil), base.Fields...)
		f(&t)
		return t
	}
	tests := []struct {
		name               string
		t                  DataTable
		sameShape, sameKey bool
	}{
		{"unchanged", with(func(*DataTable) {}), true, true},
		{"value", with(func(t *DataTable) { t.Fields[2].Value = "211" }), true, false},
		{"class", with(func(t *DataTable) { t.Fields[2].Class = "bad" }), true, false},
		{"column name", with(func(t *DataTable) { t.Fields[0].Value = "K" }), true, false},
		{"other cell", with(func(t *DataTable) { t.Cell = "rain" }), false, false},
		{"more rows", with(func(t *DataTable) { t.Widths = append(t.Widths, 1); t.Fields = append(t.Fields, Field{}) }), false, false},
		{"wider row", with(func(t *DataTable) { t.Widths[0] = 2; t.Fields = append(t.Fields, Field{}) }), false, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.t.shape() == base.shape(); got != tt.sameShape {
				t.Errorf("same shape: got %v, want %v", got, tt.sameShape)
			}
			if got := tt.t.key() == base.key(); got != tt.sameKey {
				t.Errorf("same key: got %v, want %v", got, tt.sameKey)
			}
		})
	}
}

// TestDataTableLabels checks that no two fields of a table share a name,
// with columns that have no name or the same name.
func TestDataTableLabels(t *testing.T) {
	tab := DataTable{Cell: "t", Columns: 3, Widths: []int{3}, Fields: []Field{
		{"Na", ""}, {"Na", ""}, {"", ""}, {"", ""}, {"", ""}, {"", ""}, {"1", ""}, {"2", ""}, {"3", ""}}}
	want := []string{"Name of column 1", "Name of column 2", "Name of column 3",
		"Unit of column 1", "Unit of column 2", "Unit of column 3", "Row 1, column 1", "Row 1, column 2", "Row 1, column 3"}
	if got := tab.Labels(); !reflect.DeepEqual(got, want) {
		t.Errorf("labels:\n got %q\nwant %q", got, want)
	}
}
