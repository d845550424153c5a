package notebook

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"unicode/utf8"
)

// FileError is a budget file that cannot be read at all. A problem confined
// to one cell does not give a FileError: that cell loads as a broken cell.
type FileError struct {
	File string // file name, for messages only
	Line int    // 1-based line, 0 when not known
	Msg  string
}

// Error implements error.
func (e *FileError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Msg)
	}
	return e.File + ": " + e.Msg
}

// Load reads a budget file. name is used in messages only.
func Load(r io.Reader, name string) (*Document, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxFileSize+1))
	if err != nil {
		return nil, &FileError{File: name, Msg: err.Error()}
	}
	return Parse(data, name)
}

// Parse reads a budget file from memory. It never runs anything the file
// holds: a file is data only. Results are not computed; call Recompute.
func Parse(data []byte, name string) (*Document, error) {
	if name == "" {
		name = "budget"
	}
	ferr := func(line int, format string, a ...any) error {
		return &FileError{File: name, Line: line, Msg: fmt.Sprintf(format, a...)}
	}
	if len(data) > MaxFileSize {
		return nil, ferr(0, "file is larger than %d MiB", MaxFileSize>>20)
	}
	if line, err := checkDepth(data); err != nil {
		return nil, ferr(line, "%v", err)
	}
	var top map[string]json.RawMessage
	if err := json.Unmarshal(data, &top); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			return nil, ferr(lineOf(data, se.Offset), "not valid JSON: %v", se)
		}
		return nil, ferr(0, "not a budget file: the file must hold one JSON object")
	}
	if top == nil {
		return nil, ferr(0, "not a budget file: the file must hold one JSON object")
	}
	version, err := fileVersion(top)
	if err != nil {
		return nil, ferr(0, "%v", err)
	}
	if version > FormatVersion {
		return nil, ferr(0, "written by a newer Lixiv (format version %d); this engine reads versions up to %d", version, FormatVersion)
	}
	for version < FormatVersion {
		m := migrations[version]
		if m == nil {
			return nil, ferr(0, "no migration from format version %d", version)
		}
		if top, err = m(top); err != nil {
			return nil, ferr(0, "migrating from format version %d: %v", version, err)
		}
		version++
	}
	d := &Document{}
	for k, v := range top {
		switch k {
		case "format", "version":
		case "engine":
			if json.Unmarshal(v, &d.Engine) != nil {
				return nil, ferr(0, `"engine" must be text`)
			}
		case "title":
			if json.Unmarshal(v, &d.Title) != nil {
				return nil, ferr(0, `"title" must be text`)
			}
		case "cells":
		case "results":
			s, err := parseSnapshot(v)
			if err != nil {
				return nil, ferr(0, "results: %v", err)
			}
			d.Stored = s
		default:
			if d.Extra == nil {
				d.Extra = map[string]json.RawMessage{}
			}
			d.Extra[k] = v
		}
	}
	var raws []json.RawMessage
	if v, ok := top["cells"]; !ok || json.Unmarshal(v, &raws) != nil {
		return nil, ferr(0, `"cells" must be a list of cells`)
	}
	if len(raws) > MaxCells {
		return nil, ferr(0, "a budget holds at most %d cells, this file has %d", MaxCells, len(raws))
	}
	ids := map[string]bool{}
	for i, raw := range raws {
		c, err := parseCell(raw)
		if err == nil && ids[c.ID] {
			err = fmt.Errorf("id %q is taken by an earlier cell", c.ID)
		}
		if err != nil {
			c = brokenCell(raw, i, err, ids)
		}
		ids[c.ID] = true
		d.Cells = append(d.Cells, c)
	}
	if _, err := d.order(); err != nil {
		return nil, ferr(0, "%v", err)
	}
	return d, nil
}

// fileVersion reads the header; a file without "format" but with the
// earlier "lixiv" header is version 0.
func fileVersion(top map[string]json.RawMessage) (int, error) {
	if _, ok := top["format"]; !ok {
		if _, ok := top["lixiv"]; ok {
			return 0, nil
		}
		return 0, fmt.Errorf(`not a budget file: no "format" field (want %q)`, FormatName)
	}
	var f string
	if json.Unmarshal(top["format"], &f) != nil || f != FormatName {
		return 0, fmt.Errorf(`not a budget file: "format" is %s, want %q`, top["format"], FormatName)
	}
	var v float64
	if json.Unmarshal(top["version"], &v) != nil || v != math.Trunc(v) || v < 1 || v > 1e6 {
		return 0, fmt.Errorf(`"version" must be a whole number from 1`)
	}
	return int(v), nil
}

func brokenCell(raw json.RawMessage, i int, err error, ids map[string]bool) *Cell {
	id := fmt.Sprintf("broken-%d", i+1)
	var probe struct {
		ID string `json:"id"`
	}
	if json.Unmarshal(raw, &probe) == nil && validID(probe.ID) == nil && !ids[probe.ID] {
		id = probe.ID
	}
	for ids[id] {
		id += "x"
	}
	return &Cell{ID: id, Kind: KindBroken, Settings: &BrokenSettings{},
		Raw: append(json.RawMessage(nil), raw...), Problem: fmt.Sprintf("cell %d: %v", i+1, err)}
}

// parseCell reads one cell object; any problem makes the caller keep it as
// a broken cell.
func parseCell(raw json.RawMessage) (*Cell, error) {
	var m map[string]json.RawMessage
	if err := json.Unmarshal(raw, &m); err != nil || m == nil {
		return nil, fmt.Errorf("not a JSON object")
	}
	c := &Cell{}
	var kind string
	if err := want(m, "id", &c.ID, true); err != nil {
		return nil, err
	}
	if err := validID(c.ID); err != nil {
		return nil, err
	}
	if err := want(m, "kind", &kind, true); err != nil {
		return nil, err
	}
	c.Kind = Kind(kind)
	if !c.Kind.Valid() {
		return nil, fmt.Errorf("unknown kind %q", kind)
	}
	if err := want(m, "title", &c.Title, false); err != nil {
		return nil, err
	}
	if err := want(m, "section", &c.Section, false); err != nil {
		return nil, err
	}
	if err := validSection(c.Section); err != nil {
		return nil, err
	}
	if err := want(m, "uses", &c.Uses, false); err != nil {
		return nil, err
	}
	for role := range c.Uses {
		ok := false
		for _, r := range c.Kind.Roles() {
			ok = ok || r.Name == role
		}
		if !ok {
			return nil, fmt.Errorf("uses: a %s cell has no input %q", c.Kind, role)
		}
	}
	c.Settings = DefaultSettings(c.Kind)
	if v, ok := m["settings"]; ok {
		extra, err := decodeSettings(c.Settings, v)
		if err != nil {
			return nil, err
		}
		c.SettingsExtra = extra
	}
	if err := validate(c.Settings); err != nil {
		return nil, fmt.Errorf("settings: %s", fileText(err))
	}
	if v, ok := m["table"]; ok {
		if !c.Kind.hasTable() {
			return nil, fmt.Errorf("a %s cell holds no table", c.Kind)
		}
		t, err := parseTable(v)
		if err != nil {
			return nil, fmt.Errorf("table: %w", err)
		}
		c.Table = t
	} else if c.Kind.hasTable() {
		c.Table = &Table{}
	}
	for k, v := range m {
		switch k {
		case "id", "kind", "title", "section", "uses", "settings", "table":
		default:
			if c.Extra == nil {
				c.Extra = map[string]json.RawMessage{}
			}
			c.Extra[k] = v
		}
	}
	return c, nil
}

func want(m map[string]json.RawMessage, key string, dst any, required bool) error {
	v, ok := m[key]
	if !ok {
		if required {
			return fmt.Errorf("%q is missing", key)
		}
		return nil
	}
	if err := json.Unmarshal(v, dst); err != nil {
		return fmt.Errorf("%q has the wrong type: %s", key, shorten(v))
	}
	return nil
}

func shorten(v json.RawMessage) string {
	if len(v) > 40 {
		return string(v[:40]) + "…"
	}
	return string(v)
}

// decodeSettings fills s from a JSON object, field by field, and returns the
// keys it does not know.
func decodeSettings(s Settings, raw json.RawMessage) (map[string]json.RawMessage, error) {
	var m map[string]json.RawMessage
	if err := json.Unmarshal(raw, &m); err != nil || m == nil {
		return nil, fmt.Errorf("settings must be an object")
	}
	known := map[string]bool{}
	for _, f := range fields(s) {
		known[f.key] = true
		v, ok := m[f.key]
		if !ok {
			continue
		}
		if err := json.Unmarshal(v, f.v.Addr().Interface()); err != nil {
			want := map[reflect.Kind]string{reflect.Float64: "a number", reflect.Int: "a whole number",
				reflect.Int64: "a whole number", reflect.Bool: "true or false", reflect.String: "text",
				reflect.Slice: "a list of text"}[f.v.Kind()]
			return nil, fmt.Errorf("settings: %q must be %s, not %s", f.key, want, shorten(v))
		}
	}
	var extra map[string]json.RawMessage
	for k, v := range m {
		if !known[k] {
			if extra == nil {
				extra = map[string]json.RawMessage{}
			}
			extra[k] = v
		}
	}
	return extra, nil
}

func parseTable(raw json.RawMessage) (*Table, error) {
	var m struct {
		Columns []string            `json:"columns"`
		Units   []string            `json:"units"`
		Rows    [][]json.RawMessage `json:"rows"`
	}
	if err := json.Unmarshal(raw, &m); err != nil {
		return nil, fmt.Errorf("want columns and units as lists of text and rows as a list of lists")
	}
	if len(m.Columns) > MaxColumns {
		return nil, fmt.Errorf("more than %d columns", MaxColumns)
	}
	if len(m.Rows) > MaxRows {
		return nil, fmt.Errorf("more than %d rows", MaxRows)
	}
	t := &Table{Columns: m.Columns, Units: m.Units, Rows: make([][]string, len(m.Rows))}
	for i, r := range m.Rows {
		row := make([]string, len(r))
		for j, v := range r {
			s, err := cellText(v)
			if err != nil {
				return nil, fmt.Errorf("row %d, column %d: %v", i+1, j+1, err)
			}
			row[j] = s
		}
		t.Rows[i] = row
	}
	if err := t.check(); err != nil {
		return nil, err
	}
	return t, nil
}

// cellText turns a table cell back into the text it stands for: a string,
// a number literal exactly as written, or "" for null.
func cellText(v json.RawMessage) (string, error) {
	v = bytes.TrimSpace(v)
	switch {
	case len(v) == 0:
		return "", fmt.Errorf("empty value")
	case v[0] == '"':
		if s, ok := plainString(v); ok {
			return s, nil
		}
		var s string
		err := json.Unmarshal(v, &s)
		return s, err
	case string(v) == "null":
		return "", nil
	case isJSONNumber(string(v)):
		return string(v), nil
	}
	return "", fmt.Errorf("want text or a number, not %s", shorten(v))
}

// plainString returns the text of a JSON string that needs no decoding
// (no escape, no control character, valid UTF-8), as json.Unmarshal would
// give it, without its cost: a budget's tables hold many thousands of them.
func plainString(v []byte) (string, bool) {
	if len(v) < 2 || v[len(v)-1] != '"' {
		return "", false
	}
	in := v[1 : len(v)-1]
	for _, c := range in {
		if c < 0x20 || c == '\\' || c == '"' {
			return "", false
		}
	}
	if !utf8.Valid(in) {
		return "", false
	}
	return string(in), true
}

func parseSnapshot(raw json.RawMessage) (*Snapshot, error) {
	var m struct {
		Engine  string `json:"engine"`
		SHA     string `json:"sha256"`
		Figures struct {
			Rows [][]json.RawMessage `json:"rows"`
		} `json:"figures"`
	}
	if err := json.Unmarshal(raw, &m); err != nil {
		return nil, fmt.Errorf("want an object with engine, sha256 and figures")
	}
	s := &Snapshot{Engine: m.Engine, Checksum: m.SHA}
	for i, r := range m.Figures.Rows {
		if len(r) != 6 {
			return nil, fmt.Errorf("figure row %d has %d values, want 6", i+1, len(r))
		}
		var f StoredFigure
		vals := []*float64{&f.Median, &f.Low, &f.High}
		if json.Unmarshal(r[0], &f.Cell) != nil || json.Unmarshal(r[1], &f.Name) != nil || json.Unmarshal(r[2], &f.Unit) != nil {
			return nil, fmt.Errorf("figure row %d: cell, figure and unit must be text", i+1)
		}
		for j, p := range vals {
			if string(bytes.TrimSpace(r[3+j])) == "null" {
				*p = math.NaN()
				continue
			}
			if json.Unmarshal(r[3+j], p) != nil {
				return nil, fmt.Errorf("figure row %d, value %d must be a number or null", i+1, j+4)
			}
		}
		s.Figures = append(s.Figures, f)
	}
	return s, nil
}

// checkDepth rejects nesting deeper than MaxDepth before any decoding.
func checkDepth(data []byte) (line int, err error) {
	depth, inStr, esc := 0, false, false
	for i, b := range data {
		switch {
		case inStr:
			if esc {
				esc = false
			} else if b == '\\' {
				esc = true
			} else if b == '"' {
				inStr = false
			}
		case b == '"':
			inStr = true
		case b == '{' || b == '[':
			depth++
			if depth > MaxDepth {
				return lineOf(data, int64(i)), fmt.Errorf("nested more than %d levels deep", MaxDepth)
			}
		case b == '}' || b == ']':
			depth--
		}
	}
	return 0, nil
}

func lineOf(data []byte, off int64) int {
	if off > int64(len(data)) {
		off = int64(len(data))
	}
	return bytes.Count(data[:off], []byte("\n")) + 1
}
