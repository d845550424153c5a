package notebook

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/internal/golden"
	"lixiv/engine/internal/watchdog"
)

func TestMigrateV0(t *testing.T) {
	data, err := os.ReadFile("testdata/v0-corrie.json")
	if err != nil {
		t.Fatal(err)
	}
	d, err := Parse(data, "v0-corrie.json")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, got, want string
	}{
		{"title", d.Title, "Corrie Vale, first draft"},
		{"first kind", string(d.Cells[0].Kind), "site"},
		{"rain renamed", string(d.Cells[2].Kind), "atmosphere"},
		{"comment renamed", string(d.Cells[3].Kind), "note"},
		{"note text", d.Cells[3].Settings.(*NoteSettings).Text, "Weir pool sampled at mid-depth."},
		{"units row", strings.Join(d.Cells[1].Table.Units, ","), ",,mg/L,mg/L,mg/L,mg/L,mg/L,mg/L,µeq/L"},
		{"censored kept", d.Cells[1].Table.Rows[1][7], "<0.5"},
		{"unknown field kept", string(d.Extra["reviewer"]), `"kept as an unknown field"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if tt.got != tt.want {
				t.Errorf("got %q, want %q", tt.got, tt.want)
			}
		})
	}
	if a := d.Cells[0].Settings.(*SiteSettings).AreaKm2; a != 12.1 {
		t.Errorf("area %g, want 12.1 (from v0 \"area\")", a)
	}
	for _, c := range d.Cells {
		if c.Broken() {
			t.Errorf("cell %s broken: %s", c.ID, c.Problem)
		}
	}
	golden.Check(t, "v0-corrie.migrated.lixiv.json", d.Marshal())
}

func TestUnknownFieldsSurvive(t *testing.T) {
	src := `{
  "format": "lixiv-budget",
  "version": 1,
  "engine": "0.0.9",
  "title": "Unknown fields",
  "future_top": {"a": [1, 2, {"b": null}]},
  "cells": [
    {
      "id": "site",
      "kind": "site",
      "title": "Site",
      "settings": {"name": "Corrie Vale", "area_km2": 12, "soil_depth_m": 1.5},
      "colour_hint": "slate"
    }
  ]
}
`
	d, err := Parse([]byte(src), "unknown.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	out := string(d.Marshal())
	for _, want := range []string{`"future_top": {`, `"soil_depth_m": 1.5`, `"colour_hint": "slate"`, `"b": null`} {
		if !strings.Contains(out, want) {
			t.Errorf("saved file lacks %s:\n%s", want, out)
		}
	}
	d2, err := Parse([]byte(out), "again")
	if err != nil {
		t.Fatal(err)
	}
	if out2 := string(d2.Marshal()); out2 != out {
		t.Errorf("second round trip differs:\n%s\n---\n%s", out, out2)
	}
	// An edit elsewhere in the cell keeps them too.
	if err := d2.SetParam("site", "area_km2", "13"); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(d2.Marshal()), `"soil_depth_m": 1.5`) {
		t.Errorf("edit dropped an unknown setting")
	}
}

func TestBrokenCellsKeepTheirText(t *testing.T) {
	src := `{"format": "lixiv-budget", "version": 1, "title": "b", "cells": [
 {"id": "site", "kind": "site", "settings": {"area_km2": 12}},
 {"id": "lab", "kind": "samples", "settings": {"below_detection": 7}},
 {"id": "x", "kind": "flux-capacitor"},
 {"id": "app", "kind": "apportionment", "settings": {"draws": 2000000}},
 {"id": "site", "kind": "note"},
 "not an object",
 {"id": "t", "kind": "samples", "table": {"columns": ["a"], "rows": [[{"deep": 1}]]}}
]}`
	d, err := Parse([]byte(src), "broken.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ id, problem string }{
		{"lab", `"below_detection" must be text`},
		{"x", `unknown kind "flux-capacitor"`},
		{"app", "draws: 2e+06 is outside"},
		{"broken-5", `id "site" is taken`},
		{"broken-6", "not a JSON object"},
		{"t", "row 1, column 1"},
	}
	for i, w := range want {
		c := d.Cells[i+1]
		if !c.Broken() || c.ID != w.id || !strings.Contains(c.Problem, w.problem) {
			t.Errorf("cell %d: got id %q broken=%v problem %q; want id %q and a problem containing %q",
				i+2, c.ID, c.Broken(), c.Problem, w.id, w.problem)
		}
	}
	out := string(d.Marshal())
	for _, raw := range []string{`"flux-capacitor"`, `"draws": 2000000`, `"not an object"`, `"deep": 1`} {
		if !strings.Contains(out, raw) {
			t.Errorf("saved file lost %s:\n%s", raw, out)
		}
	}
	if st, err := d.Status("x"); st == UpToDate || err != nil && st != Stale {
		t.Errorf("broken cell state %v %v", st, err)
	}
}

func TestParseRefusesBadFiles(t *testing.T) {
	deep := strings.Repeat("[", 100000) + strings.Repeat("]", 100000)
	tests := []struct {
		name, src, want string
	}{
		{"empty", "", "not valid JSON"},
		{"not json", "name,Na\nA,1\n", "not valid JSON"},
		{"array", "[1,2]", "must hold one JSON object"},
		{"null", "null", "must hold one JSON object"},
		{"no format", `{"cells": []}`, `no "format" field`},
		{"other format", `{"format": "something-else", "version": 1, "cells": []}`, `"format" is "something-else"`},
		{"newer", `{"format": "lixiv-budget", "version": 7, "cells": []}`, "newer Lixiv"},
		{"bad version", `{"format": "lixiv-budget", "version": 1.5, "cells": []}`, "whole number"},
		{"huge version", `{"format": "lixiv-budget", "version": 1e400, "cells": []}`, "whole number"},
		{"cells not list", `{"format": "lixiv-budget", "version": 1, "cells": {"a": 1}}`, `"cells" must be a list`},
		{"deep", `{"format": "lixiv-budget", "version": 1, "cells": ` + deep + `}`, "nested more than 64"},
		{"title type", `{"format": "lixiv-budget", "version": 1, "title": 5, "cells": []}`, `"title" must be text`},
		{"syntax line", "{\n\"format\": \"lixiv-budget\",\n\"version\": 1,,\n}", "bad.lixiv.json:3:"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse([]byte(tt.src), "bad.lixiv.json")
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("got %v, want an error containing %q", err, tt.want)
			}
		})
	}
}

func FuzzParse(f *testing.F) {
	seeds := []string{"testdata/v0-corrie.json"} // small seeds keep minimisation quick
	for _, s := range seeds {
		b, _ := os.ReadFile(s)
		f.Add(b)
	}
	f.Add([]byte(`{"format":"lixiv-budget","version":1,"cells":[{"id":"a","kind":"chart","settings":{"x":"a.b.c"}}]}`))
	f.Add([]byte(`{"format":"lixiv-budget","version":1,"cells":[{"id":"s","kind":"samples","table":{"columns":["a"],"units":["mg/L"],"rows":[[1e999,"x",null]]}}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		defer watchdog.Start(data)()
		d, err := Parse(data, "fuzz")
		if err != nil {
			return
		}
		b1 := d.Marshal()
		d2, err := Parse(b1, "fuzz-again")
		if err != nil {
			t.Fatalf("a saved file does not load: %v\n%s", err, b1)
		}
		if b2 := d2.Marshal(); !bytes.Equal(b1, b2) {
			t.Fatalf("save is not stable:\n%s\n---\n%s", b1, b2)
		}
	})
}

func loadFile(path string) (*Document, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	return Parse(b, filepath.Base(path))
}
