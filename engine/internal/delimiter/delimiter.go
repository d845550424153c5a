// Package delimiter decides the field delimiter of a text table, for both
// importers (engine/sample and engine/discharge), and splits records at it
// with the quoting spreadsheets write: a field that starts with a quote
// runs to the closing quote, a doubled quote inside it stands for one, and
// a quoted field may hold delimiters and line breaks.
//
// Detect judges the first lines of a file: the candidate (tab, semicolon,
// comma) that gives the most records of one width, at least two fields,
// wins among those that leave the fewest quotes inside unquoted fields; a
// tie goes to the wider records, then to tab, semicolon and comma in that
// order. A comma is no candidate when the numbers are known to write a
// decimal comma, and loses every tie otherwise, so "2021-01-01;1,5" reads
// as two fields split at the semicolon.
package delimiter

import "bytes"

// Mark is what the caller knows of the decimal mark of the table's
// numbers.
type Mark int

// Decimal marks.
const (
	// AnyMark: not known; a comma may be a delimiter or a decimal mark.
	AnyMark Mark = iota
	// PointMark: numbers write 1.5.
	PointMark
	// CommaMark: numbers write 1,5, so a comma between fields would cut
	// them; the comma is not a candidate.
	CommaMark
)

// Candidates are the delimiters Detect chooses among, in the order that
// breaks ties.
var Candidates = []byte{'\t', ';', ','}

// Detect returns the delimiter of the records in lines (a file's first
// lines, without their line endings). ok is false when no candidate splits
// any record into two fields or more; the caller then reads the table its
// own way (a single column, or fields separated by spaces).
func Detect(lines [][]byte, mark Mark) (delim byte, ok bool) {
	bestN, bestModal, bestBare := -1, 1, 0
	for _, c := range Candidates {
		if c == ',' && mark == CommaMark {
			continue
		}
		m, n := ModalWidth(lines, c, func(fs [][]byte) int { return len(fs) })
		if m < 2 {
			continue
		}
		bare := bareQuotes(lines, c)
		if bestN < 0 || bare < bestBare || bare == bestBare && (n > bestN || n == bestN && m > bestModal) {
			delim, bestN, bestModal, bestBare = c, n, m, bare
		}
	}
	return delim, bestN >= 0
}

// bareQuotes counts the records in which, split at delim, a quote stands
// inside an unquoted field.
func bareQuotes(lines [][]byte, delim byte) int {
	n := 0
	for _, l := range JoinRecords(lines, delim) {
		if _, bare := ScanQuote(l, delim, false, true); bare {
			n++
		}
	}
	return n
}

// ModalWidth returns the most common width (at least two) of the records of
// lines split at delim, and how many records have it; 1, 0 when none is
// two wide. width measures a record's fields.
func ModalWidth(lines [][]byte, delim byte, width func([][]byte) int) (modal, count int) {
	var scratch []byte
	var fs [][]byte
	counts := map[int]int{}
	for _, l := range JoinRecords(lines, delim) {
		fs = Split(l, delim, fs[:0], &scratch)
		counts[width(fs)]++
	}
	m, n := 0, 0
	for k, v := range counts {
		if k >= 2 && (v > n || v == n && k > m) {
			m, n = k, v
		}
	}
	if m < 2 {
		return 1, 0
	}
	return m, n
}

// JoinRecords joins the lines of a quoted field that holds line breaks
// into one record, so that records are judged whole, not by the pieces of
// one.
func JoinRecords(lines [][]byte, delim byte) [][]byte {
	out := make([][]byte, 0, len(lines))
	for i := 0; i < len(lines); i++ {
		l := lines[i]
		if bytes.IndexByte(l, '"') >= 0 {
			if q, _ := ScanQuote(l, delim, false, true); q {
				rec := append([]byte(nil), l...)
				for q && i+1 < len(lines) {
					i++
					rec = append(append(rec, '\n'), lines[i]...)
					q, _ = ScanQuote(lines[i], delim, true, false)
				}
				l = rec
			}
		}
		out = append(out, l)
	}
	return out
}

// ScanQuote follows the quoting through b, starting inside a quoted field
// when q is true and at the start of a field when start is true, and
// returns whether b ends inside quotes, and whether a quote stands inside
// an unquoted field (bare). A quote opens a quoted field only at the start
// of a field.
func ScanQuote(b []byte, delim byte, q, start bool) (quoted, bare bool) {
	for i := 0; i < len(b); i++ {
		c := b[i]
		switch {
		case q:
			if c == '"' {
				if i+1 < len(b) && b[i+1] == '"' {
					i++
				} else {
					q = false
				}
			}
		case c == delim:
			start = true
		case c == '"' && start:
			q, start = true, false
		case c == '"':
			bare = true
		case c != ' ':
			start = false
		}
	}
	return q, bare
}

// Split cuts a record into fields, appended to dst. Quoted fields are
// unquoted into scratch; the others are slices of b.
func Split(b []byte, delim byte, dst [][]byte, scratch *[]byte) [][]byte {
	if bytes.IndexByte(b, '"') < 0 {
		for {
			i := bytes.IndexByte(b, delim)
			if i < 0 {
				return append(dst, b)
			}
			dst = append(dst, b[:i])
			b = b[i+1:]
		}
	}
	if cap(*scratch) < len(b) {
		*scratch = make([]byte, 0, 2*len(b))
	}
	s := (*scratch)[:0]
	for {
		// Skip spaces before an opening quote.
		j := 0
		for j < len(b) && b[j] == ' ' {
			j++
		}
		if j < len(b) && b[j] == '"' {
			start := len(s)
			i := j + 1
			for i < len(b) {
				if b[i] == '"' {
					if i+1 < len(b) && b[i+1] == '"' {
						s = append(s, '"')
						i += 2
						continue
					}
					i++
					break
				}
				s = append(s, b[i])
				i++
			}
			// Text after the closing quote, up to the delimiter, is kept.
			k := bytes.IndexByte(b[i:], delim)
			if k < 0 {
				s = append(s, b[i:]...)
				dst = append(dst, s[start:len(s):len(s)])
				*scratch = s
				return dst
			}
			s = append(s, b[i:i+k]...)
			dst = append(dst, s[start:len(s):len(s)])
			b = b[i+k+1:]
			continue
		}
		i := bytes.IndexByte(b, delim)
		if i < 0 {
			*scratch = s
			return append(dst, b)
		}
		dst = append(dst, b[:i])
		b = b[i+1:]
	}
}
