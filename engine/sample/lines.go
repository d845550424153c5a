package sample

import (
	"bufio"
	"bytes"
	"io"
	"unicode/utf16"
	"unicode/utf8"

	"lixiv/engine/internal/delimiter"
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
	// Every carriage return before the line's end goes, not only a CRLF's:
	// one left at the end of a line inside a quoted field would be taken
	// for the line end when the table is written out and read again.
	b = bytes.TrimRight(b, "\r")
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
		if q, _ := delimiter.ScanQuote(b, lr.comma, false, true); q {
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
				q, _ = delimiter.ScanQuote(nb, lr.comma, true, false)
			}
			b = lr.rec
		}
	}
	lr.fields = delimiter.Split(b, lr.comma, lr.fields[:0], &lr.scratch)
	return lr.fields, line, true
}

// unclosedQuote reports whether the last record ended inside quotes.
func (lr *lineReader) unclosedQuote() bool { return lr.badQ }

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

// typicalWidth is the most common width of the records (at least two),
// not counting trailing empty fields, as the header row is judged
// (importer.run): the width the header row must reach about half of.
func typicalWidth(lines [][]byte, comma byte) int {
	m, _ := delimiter.ModalWidth(lines, comma, trimmedLen)
	return m
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
