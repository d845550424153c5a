package notebook

import (
	"bytes"
	"encoding/json"
	"io"
	"math"
	"reflect"
	"sort"
)

// FormatName is the value of the "format" field that opens every budget file.
const FormatName = "lixiv-budget"

// FormatVersion is the newest version of the file layout, which this
// engine reads and writes; a budget that needs nothing of version 2 is
// written as version 1 (Document.fileVersion).
const FormatVersion = 2

// Extension is the file-name ending of budget files.
const Extension = ".lixiv.json"

// Marshal returns the budget file: the header, the cells in order and, when
// the document holds one, the results snapshot.
func (d *Document) Marshal() []byte {
	var top object
	top.add("format", FormatName)
	top.add("version", d.fileVersion())
	top.add("engine", EngineVersion)
	top.add("title", d.Title)
	cells := array{}
	for _, c := range d.Cells {
		cells = append(cells, cellTree(c))
	}
	top.add("cells", cells)
	if d.Stored != nil {
		top.add("results", snapshotTree(d.Stored))
	}
	top.addExtra(d.Extra)
	var b bytes.Buffer
	writeValue(&b, top, "")
	b.WriteByte('\n')
	return b.Bytes()
}

// Save writes the budget file to w.
func (d *Document) Save(w io.Writer) error {
	_, err := w.Write(d.Marshal())
	return err
}

func cellTree(c *Cell) any {
	if c.Broken() {
		return json.RawMessage(c.Raw)
	}
	var o object
	o.add("id", c.ID)
	o.add("kind", string(c.Kind))
	o.add("title", c.Title)
	if c.Section != "" {
		o.add("section", c.Section)
	}
	if len(c.Uses) > 0 {
		keys := make([]string, 0, len(c.Uses))
		for k := range c.Uses {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		var u object
		for _, k := range keys {
			u.add(k, c.Uses[k])
		}
		o.add("uses", u)
	}
	var s object
	for _, f := range fields(c.Settings) {
		if f.omitEmpty && f.v.IsZero() {
			continue
		}
		s.add(f.key, fieldValue(f.v))
	}
	s.addExtra(c.SettingsExtra)
	o.add("settings", s)
	if c.Table != nil {
		o.add("table", tableTree(c.Table))
	}
	o.addExtra(c.Extra)
	return o
}

func fieldValue(v reflect.Value) any {
	switch v.Kind() {
	case reflect.Float64:
		return v.Float()
	case reflect.Int, reflect.Int64:
		return v.Int()
	case reflect.Bool:
		return v.Bool()
	case reflect.String:
		return v.String()
	case reflect.Slice:
		a := array{}
		for _, s := range v.Interface().([]string) {
			a = append(a, s)
		}
		return a
	}
	return nil
}

func tableTree(t *Table) any {
	var o object
	cols := array{}
	for _, c := range t.Columns {
		cols = append(cols, c)
	}
	o.add("columns", cols)
	units := array{}
	for _, u := range t.Units {
		units = append(units, u)
	}
	o.add("units", units)
	rows := array{}
	for _, r := range t.Rows {
		row := array{}
		for _, c := range r {
			row = append(row, cellValue(c))
		}
		rows = append(rows, row)
	}
	o.add("rows", rows)
	return o
}

func snapshotTree(s *Snapshot) any {
	var o object
	o.add("engine", s.Engine)
	o.add("sha256", s.Checksum)
	o.add("digits", SnapshotDigits)
	var f object
	f.add("columns", array{"cell", "figure", "unit", "median", "low", "high"})
	rows := array{}
	for _, x := range s.Figures {
		rows = append(rows, array{x.Cell, x.Name, x.Unit, num(x.Median), num(x.Low), num(x.High)})
	}
	f.add("rows", rows)
	o.add("figures", f)
	return o
}

func num(x float64) any {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return x
}
