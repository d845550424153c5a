package sample

import (
	"bufio"
	"bytes"
	"io"
	"unicode/utf16"
	"unicode/utf8"
)

// lineReader splits its input into records of fields. Fields are slices of
// an internal buffer, valid until the next call to next.
type lineReader struct {
	br      *bufio.Reader
	comma   byte
	latin1  bool   // input is not UTF-8: read bytes as Latin-1
	line    int    // lines consumed so far
	rec     []byte // a record spanning lines, or a line longer than the buffer
	scratch []byte // unquoted field text
	conv    []byte // Latin-1 to UTF-8
	fields  [][]byte
	badQ    bool // the last record ended inside quotes
	eof     bool
	err     error // a read error other than io.EOF
}

// readLine returns the next physical line without its line ending.
func (lr *lineReader) readLine(into []byte) ([]byte, bool) {
	if lr.eof {
		return nil, false
	}
	b, err := lr.br.ReadSlice('\n')
	if err == bufio.ErrBufferFull {
		into = append(into[:0], b...)
		for err == bufio.ErrBufferFull {
			b, err = lr.br.ReadSlice('\n')
			into = append(into, b...)
		}
		b = into
	}
	if err != nil {
		if err != io.EOF {
			lr.err = err
		}
		lr.eof = true
		if len(b) == 0 {
			return nil, false
		}
	}
	lr.line++
	b = bytes.TrimSuffix(b, []byte{'\n'})
	b = bytes.TrimSuffix(b, []byte{'\r'})
	if lr.latin1 && !utf8.Valid(b) {
		lr.conv = lr.conv[:0]
		for _, c := range b {
			lr.conv = utf8.AppendRune(lr.conv, rune(c))
		}
		b = lr.conv
	}
	return b, true
}

// next returns the fields of the next record and the line it starts on.
func (lr *lineReader) next() (fields [][]byte, line int, ok bool) {
	b, ok := lr.readLine(lr.rec)
	if !ok {
		return nil, 0, false
	}
	line = lr.line
	lr.badQ = false
	if bytes.IndexByte(b, '"') >= 0 {
		if q, _ := scanQuote(b, lr.comma, false, true); q {
			// A quoted field runs onto the next lines.
			lr.rec = append(lr.rec[:0], b...)
			for q {
				nb, ok := lr.readLine(nil)
				if !ok {
					lr.badQ = true
					break
				}
				lr.rec = append(lr.rec, '\n')
				lr.rec = append(lr.rec, nb...)
				q, _ = scanQuote(nb, lr.comma, true, false)
			}
			b = lr.rec
		}
	}
	lr.fields = split(b, lr.comma, lr.fields[:0], &lr.scratch)
	return lr.fields, line, true
}

// unclosedQuote reports whether the last record ended inside quotes.
func (lr *lineReader) unclosedQuote() bool { return lr.badQ }

// scanQuote follows the quoting through b, starting inside a quoted field
// when q is true and at the start of a field when start is true, and
// returns whether b ends inside quotes, and whether a quote stands inside
// an unquoted field (bare). A quote opens a quoted field only at the start
// of a field.
func scanQuote(b []byte, comma byte, q, start bool) (quoted, bare bool) {
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
		case c == comma:
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

// split cuts a record into fields. Quoted fields are unquoted into scratch.
func split(b []byte, comma byte, dst [][]byte, scratch *[]byte) [][]byte {
	if bytes.IndexByte(b, '"') < 0 {
		for {
			i := bytes.IndexByte(b, comma)
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
			k := bytes.IndexByte(b[i:], comma)
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
		i := bytes.IndexByte(b, comma)
		if i < 0 {
			*scratch = s
			return append(dst, b)
		}
		dst = append(dst, b[:i])
		b = b[i+1:]
	}
}

// decodeUTF16 turns UTF-16 text (after its byte order mark) into UTF-8.
func decodeUTF16(b []byte, bigEndian bool) []byte {
	u := make([]uint16, len(b)/2)
	for i := range u {
		if bigEndian {
			u[i] = uint16(b[2*i])<<8 | uint16(b[2*i+1])
		} else {
			u[i] = uint16(b[2*i+1])<<8 | uint16(b[2*i])
		}
	}
	var out []byte
	for _, r := range utf16.Decode(u) {
		out = utf8.AppendRune(out, r)
	}
	return out
}

// crReader turns lone carriage returns (old spreadsheet exports) into
// newlines.
type crReader struct{ r io.Reader }

func (c crReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	for i := 0; i < n; i++ {
		if p[i] == '\r' {
			p[i] = '\n'
		}
	}
	return n, err
}

// detectComma picks the delimiter that gives the most lines with the same
// number (at least two) of fields in the sample text, among those that
// leave the fewest quotes inside unquoted fields (a delimiter that cuts
// through quoted fields leaves such quotes); ties go to the larger number
// of fields, then to tab, then semicolon, then comma.
func detectComma(lines [][]byte) byte {
	best, bestN, bestModal, bestBare := byte(','), -1, 1, 0
	for _, c := range []byte{'\t', ';', ','} {
		m, n := modalFields(lines, c)
		if m < 2 {
			continue
		}
		bare := bareQuotes(lines, c)
		if bestN < 0 || bare < bestBare || bare == bestBare && (n > bestN || n == bestN && m > bestModal) {
			best, bestN, bestModal, bestBare = c, n, m, bare
		}
	}
	return best
}

// bareQuotes counts the records in which, split at comma, a quote stands
// inside an unquoted field.
func bareQuotes(lines [][]byte, comma byte) int {
	n := 0
	for _, l := range joinRecords(lines, comma) {
		if _, bare := scanQuote(l, comma, false, true); bare {
			n++
		}
	}
	return n
}

// modalFields returns the most common number of fields (at least two) of
// the lines, joined into records and split at comma, and how many records
// have it; 1, 0 when none has two fields.
func modalFields(lines [][]byte, comma byte) (modal, count int) {
	return modalWidth(lines, comma, func(fs [][]byte) int { return len(fs) })
}

// typicalWidth is modalFields not counting trailing empty fields, as the
// header row is judged (importer.run): the width the header row must
// reach about half of.
func typicalWidth(lines [][]byte, comma byte) int {
	m, _ := modalWidth(lines, comma, trimmedLen)
	return m
}

// modalWidth returns the most common width (at least two) of the records of
// lines split at comma, and how many records have it; 1, 0 when none is
// two wide.
func modalWidth(lines [][]byte, comma byte, width func([][]byte) int) (modal, count int) {
	var scratch []byte
	var fs [][]byte
	counts := map[int]int{}
	for _, l := range joinRecords(lines, comma) {
		fs = split(l, comma, fs[:0], &scratch)
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

// joinRecords joins the lines of a quoted field that holds line breaks
// into one record, as the line reader does (lineReader.next), so that the
// delimiter and the typical number of fields are judged on records, not
// on the pieces of one.
func joinRecords(lines [][]byte, comma byte) [][]byte {
	out := make([][]byte, 0, len(lines))
	for i := 0; i < len(lines); i++ {
		l := lines[i]
		if bytes.IndexByte(l, '"') >= 0 {
			if q, _ := scanQuote(l, comma, false, true); q {
				rec := append([]byte(nil), l...)
				for q && i+1 < len(lines) {
					i++
					rec = append(append(rec, '\n'), lines[i]...)
					q, _ = scanQuote(lines[i], comma, true, false)
				}
				l = rec
			}
		}
		out = append(out, l)
	}
	return out
}

// trimmedLen is the number of fields without trailing empty ones. A field
// of white space alone (any Unicode space, as a header cell is trimmed)
// counts as empty.
func trimmedLen(fs [][]byte) int {
	n := len(fs)
	for n > 0 && len(bytes.TrimSpace(trimSpace(fs[n-1]))) == 0 {
		n--
	}
	return n
}

// sampleLines returns the non-empty complete lines of a peeked prefix.
func sampleLines(peek []byte, whole bool, max int) [][]byte {
	if !whole {
		if i := bytes.LastIndexByte(peek, '\n'); i >= 0 {
			peek = peek[:i]
		}
	}
	var out [][]byte
	for _, l := range bytes.Split(peek, []byte{'\n'}) {
		l = bytes.TrimSuffix(l, []byte{'\r'})
		if len(trimSpace(l)) == 0 {
			continue
		}
		out = append(out, l)
		if len(out) == max {
			break
		}
	}
	return out
}
