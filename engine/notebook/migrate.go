package notebook

import (
	"encoding/json"
	"fmt"
	"strings"
)

// A migration rewrites the top-level object of a file from one format
// version to the next. migrations[v] turns version v into version v+1.
type migration func(map[string]json.RawMessage) (map[string]json.RawMessage, error)

var migrations = map[int]migration{0: migrate0to1, 1: migrate1to2}

// Version 0 was the first draft layout:
//
//	{"lixiv": 0, "name": "…", "steps": [
//	  {"step": "site", "label": "…", "options": {"area": 12}},
//	  {"step": "samples", "label": "…", "csv": "name,Na\nmg/L\nA,1.2\n", "options": {…}},
//	  {"step": "rain", …}, {"step": "endmembers", …}, {"step": "mixing", …}, …]}
//
// Version 1 renames the header to "format"/"version", "name" to "title",
// "steps" to "cells", "step" to "kind" (rain → atmosphere, endmembers →
// sources, mixing → apportionment, comment → note), "label" to "title",
// "options" to "settings" (area → area_km2, draws and seed kept), gives each
// cell an id (its kind, numbered when repeated) and turns the "csv" text
// (header line, then a units line, then rows) into a table.
func migrate0to1(old map[string]json.RawMessage) (map[string]json.RawMessage, error) {
	var steps []map[string]json.RawMessage
	if v, ok := old["steps"]; ok {
		if err := json.Unmarshal(v, &steps); err != nil {
			return nil, fmt.Errorf(`"steps" must be a list of objects`)
		}
	}
	kinds := map[string]string{"rain": "atmosphere", "endmembers": "sources", "mixing": "apportionment", "comment": "note"}
	keys := map[string]string{"area": "area_km2", "precip": "precipitation_mm", "et": "evapotranspiration_mm", "text": "text"}
	used := map[string]int{}
	var cells []json.RawMessage
	for i, s := range steps {
		var step string
		if json.Unmarshal(s["step"], &step) != nil {
			return nil, fmt.Errorf("step %d has no \"step\" name", i+1)
		}
		kind := step
		if k, ok := kinds[step]; ok {
			kind = k
		}
		used[kind]++
		id := kind
		if used[kind] > 1 {
			id = fmt.Sprintf("%s-%d", kind, used[kind])
		}
		c := map[string]any{"id": id, "kind": kind}
		if v, ok := s["label"]; ok {
			c["title"] = v
		}
		if v, ok := s["options"]; ok {
			var opts map[string]json.RawMessage
			if json.Unmarshal(v, &opts) != nil {
				return nil, fmt.Errorf("step %d: \"options\" must be an object", i+1)
			}
			set := map[string]json.RawMessage{}
			for k, x := range opts {
				if nk, ok := keys[k]; ok {
					k = nk
				}
				set[k] = x
			}
			c["settings"] = set
		}
		if v, ok := s["csv"]; ok {
			var text string
			if json.Unmarshal(v, &text) != nil {
				return nil, fmt.Errorf("step %d: \"csv\" must be text", i+1)
			}
			c["table"] = csvTable(text)
		}
		b, err := json.Marshal(c)
		if err != nil {
			return nil, err
		}
		cells = append(cells, b)
	}
	out := map[string]json.RawMessage{
		"format":  json.RawMessage(`"` + FormatName + `"`),
		"version": json.RawMessage(`1`),
	}
	if v, ok := old["name"]; ok {
		out["title"] = v
	}
	cb, err := json.Marshal(cells)
	if err != nil {
		return nil, err
	}
	if cells == nil {
		cb = []byte("[]")
	}
	out["cells"] = cb
	for k, v := range old { // anything else is kept as an unknown field
		switch k {
		case "lixiv", "name", "steps":
		default:
			out[k] = v
		}
	}
	return out, nil
}

// csvTable splits version-0 table text: the header line, a units line, rows.
// Version 0 allowed no quoting, so a plain split is exact.
func csvTable(text string) *tableJSON {
	lines := strings.Split(strings.TrimRight(strings.ReplaceAll(text, "\r\n", "\n"), "\n"), "\n")
	t := &tableJSON{Columns: []string{}, Units: []string{}, Rows: [][]string{}}
	if len(lines) > 0 && lines[0] != "" {
		t.Columns = strings.Split(lines[0], ",")
	}
	if len(lines) > 1 {
		t.Units = strings.Split(lines[1], ",")
	}
	for _, l := range lines[min(2, len(lines)):] {
		t.Rows = append(t.Rows, strings.Split(l, ","))
	}
	return t
}

type tableJSON struct {
	Columns []string   `json:"columns"`
	Units   []string   `json:"units"`
	Rows    [][]string `json:"rows"`
}
