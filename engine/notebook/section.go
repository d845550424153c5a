package notebook

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"unicode"
)

// Sections put several catchments, or one catchment over several periods,
// in one document: each cell may carry the name of its section (a
// catchment's site, samples, discharge and the cells computed from them),
// and a cell without one is shared by every section (an end-member table
// that serves all catchments, notes, charts, a comparison).
//
// A role a cell does not name in "uses" is filled by the nearest cell above
// it of the role's kind in its own section, else by the nearest shared cell
// above it; a shared cell reads shared cells only. A budget without
// sections is one shared section, and reads as it always has. A comparison
// cell looks for each budget it compares in the section its settings name
// (the nearest co2 cell above it there), never among the shared cells.

// MaxSectionLength is the longest section name, in characters.
const MaxSectionLength = 64

// validSection reports whether name can name a section ("" is none).
func validSection(name string) error {
	if name == "" {
		return nil
	}
	if len([]rune(name)) > MaxSectionLength {
		return fmt.Errorf("a section name has at most %d characters", MaxSectionLength)
	}
	if strings.TrimSpace(name) != name {
		return fmt.Errorf("section %q: a section name neither starts nor ends with a space", name)
	}
	for _, r := range name {
		if !unicode.IsPrint(r) {
			return fmt.Errorf("section %q: a section name holds only printable characters", name)
		}
	}
	return nil
}

// SetSection puts the cell with the given id in section name ("" makes it
// shared). Every cell whose inputs change with it becomes stale.
func (d *Document) SetSection(id, name string) error {
	if err := validSection(name); err != nil {
		return err
	}
	return d.Edit(id, func(c *Cell) error {
		c.Section = name
		return nil
	})
}

// Sections lists the names of the document's sections in the order of
// their first cell.
func (d *Document) Sections() []string {
	var out []string
	seen := map[string]bool{}
	for _, c := range d.Cells {
		if c.Section != "" && !seen[c.Section] {
			seen[c.Section] = true
			out = append(out, c.Section)
		}
	}
	return out
}

// HasSections reports whether any cell belongs to a section.
func (d *Document) HasSections() bool {
	for _, c := range d.Cells {
		if c.Section != "" {
			return true
		}
	}
	return false
}

// roleSection says where role r of cell c is looked for when "uses" does
// not name a cell: the section, and whether a shared cell may fill it.
func roleSection(c *Cell, r Role) (section string, shared bool) {
	if s, ok := c.Settings.(*CompareSettings); ok {
		return s.sectionOf(r.Name), false
	}
	return c.Section, true
}

// nearest returns the id of the nearest cell above c of the kind of role r
// where roleSection says to look: in the section, then among the shared
// cells. It returns "" when there is none and the role is optional.
func (d *Document) nearest(c *Cell, r Role) (string, error) {
	sec, shared := roleSection(c, r)
	if sec == "" && !shared {
		if r.Optional {
			return "", nil
		}
		return "", settingErr(sectionKeys[r.Name], "name the section of the budget to read (or point input %q at a %s cell)", r.Name, r.Kind)
	}
	above := d.Cells[:max(d.index(c.ID), 0)]
	for j := len(above) - 1; j >= 0; j-- {
		if above[j].Kind == r.Kind && above[j].Section == sec {
			return above[j].ID, nil
		}
	}
	if shared && sec != "" {
		for j := len(above) - 1; j >= 0; j-- {
			if above[j].Kind == r.Kind && above[j].Section == "" {
				return above[j].ID, nil
			}
		}
	}
	switch {
	case r.Optional:
		return "", nil
	case sec == "":
		return "", fmt.Errorf("needs a %s cell above it", r.Kind)
	case shared:
		return "", fmt.Errorf("needs a %s cell above it in section %q, or a shared one", r.Kind, sec)
	}
	return "", fmt.Errorf("input %q: section %q has no %s cell above this one", r.Name, sec, r.Kind)
}

// fileVersion returns the format version a file of the document needs:
// 2 when it uses sections or a comparison cell, which version 1 cannot
// say, and 1 otherwise, so that a budget of one catchment stays readable by
// an engine that knows only version 1.
func (d *Document) fileVersion() int {
	for _, c := range d.Cells {
		if c.Section != "" || c.Kind == KindCompare {
			return FormatVersion
		}
	}
	return 1
}

// migrate1to2 turns version 1 into version 2. Version 2 adds the cell key
// "section"; a version-1 file can hold a cell field of that name only as
// an unknown field, which meant nothing, so it is kept under
// "section_v1" and the cell stays shared: the budget computes as before.
func migrate1to2(old map[string]json.RawMessage) (map[string]json.RawMessage, error) {
	var cells []json.RawMessage
	if v, ok := old["cells"]; ok {
		if err := json.Unmarshal(v, &cells); err != nil {
			return old, nil // Parse reports the malformed list
		}
	}
	changed := false
	for i, raw := range cells {
		if !bytes.Contains(raw, []byte("section")) && !bytes.Contains(raw, []byte(`\u`)) {
			continue // no key of that name, even escaped: nothing to move (and no second parse)
		}
		var m map[string]json.RawMessage
		if json.Unmarshal(raw, &m) != nil || m == nil {
			continue // a broken cell stays as it is
		}
		v, ok := m["section"]
		if !ok {
			continue
		}
		delete(m, "section")
		m["section_v1"] = v
		b, err := json.Marshal(m)
		if err != nil {
			return nil, err
		}
		cells[i], changed = b, true
	}
	out := map[string]json.RawMessage{}
	for k, v := range old {
		out[k] = v
	}
	out["version"] = json.RawMessage(`2`)
	if changed {
		b, err := json.Marshal(cells)
		if err != nil {
			return nil, err
		}
		out["cells"] = b
	}
	return out, nil
}
