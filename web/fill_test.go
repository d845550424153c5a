package web

import (
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
	got := ResultHTML("samples", tab, tab.Columns, [][]string{{`<b>CV-1</b>`, "210"}, {"CV-2 & 3", "195"}})
	tests := []struct{ name, want string }{
		{"table", `<table class="out" id="out-samples-samples"><thead><tr>`},
		{"headings", `<th>sample</th><th>Na (µmol/L)</th>`},
		{"markup as text", `<td>&lt;b&gt;CV-1&lt;/b&gt;</td><td>210</td>`},
		{"ampersand", `<td>CV-2 &amp; 3</td>`},
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
