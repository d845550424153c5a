package notebook

import (
	"bytes"
	"encoding/json"
	"fmt"
	"sort"
	"strconv"
)

// The writer builds an ordered tree and prints it with two-space
// indentation, putting arrays of plain values (a table row, a units row, a
// tracer list) on one line, so that a budget file diffs row by row.

type kv struct {
	k string
	v any
}

type object []kv // keys in writing order

type array []any

// literal is text written verbatim as a JSON number.
type literal string

func (o *object) add(k string, v any) { *o = append(*o, kv{k, v}) }

// addExtra appends unknown fields in sorted key order.
func (o *object) addExtra(m map[string]json.RawMessage) {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		o.add(k, m[k])
	}
}

// isJSONNumber reports whether s is exactly a JSON number literal:
// -?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)? (RFC 8259 §6).
func isJSONNumber(s string) bool {
	i, n := 0, len(s)
	digits := func() int {
		j := i
		for i < n && s[i] >= '0' && s[i] <= '9' {
			i++
		}
		return i - j
	}
	if i < n && s[i] == '-' {
		i++
	}
	switch {
	case i < n && s[i] == '0':
		i++
	case digits() == 0:
		return false
	}
	if i < n && s[i] == '.' {
		i++
		if digits() == 0 {
			return false
		}
	}
	if i < n && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < n && (s[i] == '+' || s[i] == '-') {
			i++
		}
		if digits() == 0 {
			return false
		}
	}
	return i == n
}

// cellValue writes table text as a JSON number when it is one, so that a
// row reads [ "CV-01", "2021-10-04", 0.42, "<0.01" ]; the text is kept exactly.
func cellValue(s string) any {
	if len(s) < 40 && isJSONNumber(s) {
		return literal(s)
	}
	return s
}

func flat(v any) bool {
	switch v.(type) {
	case object, array, json.RawMessage:
		return false
	}
	return true
}

func writeString(b *bytes.Buffer, s string) {
	var e bytes.Buffer
	enc := json.NewEncoder(&e)
	enc.SetEscapeHTML(false)
	_ = enc.Encode(s) // a string always encodes
	b.Write(bytes.TrimRight(e.Bytes(), "\n"))
}

func writeValue(b *bytes.Buffer, v any, indent string) {
	switch x := v.(type) {
	case nil:
		b.WriteString("null")
	case string:
		writeString(b, x)
	case literal:
		b.WriteString(string(x))
	case bool:
		b.WriteString(strconv.FormatBool(x))
	case int:
		b.WriteString(strconv.Itoa(x))
	case int64:
		b.WriteString(strconv.FormatInt(x, 10))
	case float64:
		writeFloat(b, x)
	case json.RawMessage:
		var out bytes.Buffer
		if json.Indent(&out, x, indent, "  ") != nil {
			b.WriteString("null")
			return
		}
		b.Write(out.Bytes())
	case object:
		if len(x) == 0 {
			b.WriteString("{}")
			return
		}
		writeBlock(b, indent, '{', '}', len(x), func(i int, in string) {
			writeString(b, x[i].k)
			b.WriteString(": ")
			writeValue(b, x[i].v, in)
		})
	case array:
		if len(x) == 0 {
			b.WriteString("[]")
			return
		}
		oneLine := true
		for _, e := range x {
			oneLine = oneLine && flat(e)
		}
		if oneLine {
			b.WriteByte('[')
			for i, e := range x {
				if i > 0 {
					b.WriteString(", ")
				}
				writeValue(b, e, indent)
			}
			b.WriteByte(']')
			return
		}
		writeBlock(b, indent, '[', ']', len(x), func(i int, in string) { writeValue(b, x[i], in) })
	default:
		panic(fmt.Sprintf("notebook: cannot write a %T", v))
	}
}

// writeBlock writes n members between open and close, one a line, each
// indented one step further than indent and written by member, which gets
// its index and that indent.
func writeBlock(b *bytes.Buffer, indent string, open, close byte, n int, member func(i int, in string)) {
	b.WriteByte(open)
	b.WriteByte('\n')
	in := indent + "  "
	for i := 0; i < n; i++ {
		b.WriteString(in)
		member(i, in)
		if i < n-1 {
			b.WriteByte(',')
		}
		b.WriteByte('\n')
	}
	b.WriteString(indent)
	b.WriteByte(close)
}

// writeFloat writes the shortest text that reads back as the same float64;
// NaN and infinities, which JSON lacks, are written as null.
func writeFloat(b *bytes.Buffer, x float64) {
	t, err := json.Marshal(x)
	if err != nil {
		b.WriteString("null")
		return
	}
	b.Write(t)
}
