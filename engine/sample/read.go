package sample

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"lixiv/engine/chem"
	"lixiv/engine/internal/dateorder"
	"lixiv/engine/internal/delimiter"
)

const peekSize = 64 << 10

// Read imports a sample table from CSV, TSV or text pasted from a
// spreadsheet. name is used only in messages. The returned error is non-nil
// only when r cannot be read; everything wrong with the content is in
// Table.Problems, and the rest of the table still loads.
func Read(r io.Reader, name string, opt Options) (*Table, error) {
	t := &Table{Name: name, Policy: opt.Policy}
	return t, newImporter(t, opt).read(r)
}

// read runs steps 1 to 8 of the package documentation on r (steps 1 to 3
// and the units row when the importer fills a Grid).
func (im *importer) read(r io.Reader) error {
	opt := im.opt
	size := 1 << 20
	if l, ok := r.(interface{ Len() int }); ok && l.Len() < size-16 {
		size = l.Len() + 16 // small input: a small buffer
	}
	br := bufio.NewReaderSize(r, size)
	peek, perr := br.Peek(min(peekSize, size))
	whole := perr != nil
	if perr != nil && perr != io.EOF && perr != bufio.ErrBufferFull {
		return perr
	}
	switch {
	case bytes.HasPrefix(peek, []byte("\xef\xbb\xbf")):
		br.Discard(3)
		peek = peek[3:]
	case bytes.HasPrefix(peek, []byte("\xff\xfe")), bytes.HasPrefix(peek, []byte("\xfe\xff")):
		all, err := io.ReadAll(br)
		if err != nil {
			return err
		}
		text := decodeUTF16(all[2:], all[0] == 0xfe)
		br = bufio.NewReaderSize(bytes.NewReader(text), 1<<20)
		peek, _ = br.Peek(peekSize)
		whole = len(text) <= peekSize
	}
	if bytes.HasPrefix(peek, []byte("PK\x03\x04")) {
		im.fileProblem(ErrNotTable, "this is a zip archive (an .xlsx workbook?); open it as a workbook, save the sheet as CSV or paste its cells")
		return nil
	}
	if bytes.IndexByte(peek, 0) >= 0 {
		im.fileProblem(ErrNotTable, "the file holds binary data, not text")
		return nil
	}
	if bytes.IndexByte(peek, '\n') < 0 && bytes.IndexByte(peek, '\r') >= 0 {
		br = bufio.NewReaderSize(crReader{br}, 1<<20)
		peek, _ = br.Peek(peekSize)
		peek = bytes.ReplaceAll(peek, []byte{'\r'}, []byte{'\n'})
	}
	check := peek
	if !whole && len(check) > 4 {
		check = check[:len(check)-4] // a rune may be cut at the end
	}
	lr := &lineReader{br: br, latin1: !utf8.Valid(check)}
	sample := sampleLines(peek, whole, 60)
	if len(sample) == 0 {
		im.fileProblem(ErrNotTable, "the file is empty")
		return lr.err
	}
	comma, ok := delimiter.Detect(sample, decimalMark(opt.Decimal))
	if !ok {
		comma = ',' // one column: the delimiter does not matter
	}
	switch opt.Comma {
	case ',', ';', '\t', '|':
		comma = byte(opt.Comma)
	}
	modal := typicalWidth(sample, comma)
	lr.comma = comma
	if st, ok := r.(interface{ Stat() (os.FileInfo, error) }); ok {
		if fi, err := st.Stat(); err == nil && !whole {
			im.sizeHint = int(fi.Size() / int64(max(1, len(peek)/max(1, bytes.Count(peek, []byte{'\n'})))))
		}
	}
	im.run(lr, comma, splitLines(sample, comma), modal)
	return lr.err
}

// decimalMark says what Options.Decimal tells the delimiter detector: a
// decimal comma rules out the comma as the delimiter.
func decimalMark(d rune) delimiter.Mark {
	switch d {
	case ',':
		return delimiter.CommaMark
	case '.':
		return delimiter.PointMark
	}
	return delimiter.AnyMark
}

// newImporter starts an import into t.
func newImporter(t *Table, opt Options) *importer {
	im := &importer{t: t, opt: opt, max: opt.MaxProblems}
	if im.max <= 0 {
		im.max = 10000
	}
	return im
}

// records is a source of rows of fields: the lines of a text file or the
// rows of a worksheet.
type records interface {
	// next returns the fields of the next record and the line (or
	// spreadsheet row) it starts on.
	next() (fields [][]byte, line int, ok bool)
	// unclosedQuote reports whether the last record ended inside quotes.
	unclosedQuote() bool
}

// splitLines cuts sample lines, joined into records, into fields, each line with its own scratch
// so that unquoted fields stay valid.
func splitLines(lines [][]byte, comma byte) [][][]byte {
	lines = delimiter.JoinRecords(lines, comma)
	out := make([][][]byte, len(lines))
	for i, l := range lines {
		var scratch []byte
		out[i] = delimiter.Split(l, comma, nil, &scratch)
	}
	return out
}

// ParseText imports a sample table from text, such as cells pasted from a
// spreadsheet (tab-separated). Problems are in Table.Problems.
func ParseText(text, name string, opt Options) *Table {
	t, _ := Read(strings.NewReader(text), name, opt)
	return t
}

// importer holds the state of one Read.
type importer struct {
	t     *Table
	opt   Options
	max   int
	extra int // problems beyond max
	dec   byte
	cols  []plan
	block []Sample
	sites map[string]string
	grid  *Grid // when set, the text is only split into cells (ReadGrid)

	dateCol  int // index into cols of the date column, or -1
	order    DateOrder
	pending  []pendingDate
	clocks   []pendingClock
	nMapped  int
	sizeHint int // expected number of rows, from the file size
	header   int // header line
	unitLine int

	orderSeen         dateorder.Evidence // the dates written as three numbers
	censored, missing []tally            // per column: cells below detection, cells read as missing
	decAt             int                // line of the first number read with a decimal comma (detected)
	decRaw            string
}

// tally counts cells of one kind in a column, with the first few as
// examples for the message.
type tally struct {
	n       int
	noLimit int // censored cells that give no limit ("<DL", "bdl")
	nd      bool
	ex      []example
}

type example struct {
	line int
	raw  string
}

// maxExamples is how many cells a message about a column quotes.
const maxExamples = 5

func (t *tally) add(line int, raw []byte) {
	t.n++
	if len(t.ex) < maxExamples {
		t.ex = append(t.ex, example{line, string(raw)})
	}
}

// list writes the examples as `line 4 "<0.05", line 9 "bdl"` and how many
// more there are.
func (t *tally) list() string {
	var b strings.Builder
	for i, e := range t.ex {
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "line %d %q", e.line, e.raw)
	}
	if t.n > len(t.ex) {
		fmt.Fprintf(&b, " and %d more", t.n-len(t.ex))
	}
	return b.String()
}

// plan is how to read one column.
type plan struct {
	Column
	metaKey string
}

type pendingDate struct {
	s    *Sample
	d    dateVal
	raw  string
	line int
}

type pendingClock struct {
	s         *Sample
	c         *plan
	sec, nsec int
	raw       string
}

func (im *importer) add(p *Problem) {
	p.File = im.t.Name
	p.classify()
	if len(im.t.Problems) >= im.max {
		im.extra++
		return
	}
	im.t.Problems = append(im.t.Problems, p)
}

// note adds to Table.Notes: what the importer read in place of what the
// file wrote, or inferred.
func (im *importer) note(p *Problem) {
	p.File = im.t.Name
	p.classify()
	im.t.Notes = append(im.t.Notes, p)
}

func (im *importer) fileProblem(err error, detail string) {
	im.add(&Problem{Err: err, Detail: detail})
}

func (im *importer) cellProblem(line int, c *plan, value []byte, err error, detail string) {
	if len(im.t.Problems) >= im.max {
		im.extra++
		return
	}
	im.add(&Problem{Line: line, Col: c.Index + 1, Header: c.Header, Value: string(value), Err: err, Detail: detail})
}

// replay gives the records it holds (copies), then those of rest.
type replay struct {
	recs  []heldRecord
	rest  records
	quote bool // the last record given ended inside quotes
}

// heldRecord is a record read ahead: its fields, line and whether it
// ended inside quotes.
type heldRecord struct {
	fs    [][]byte
	line  int
	quote bool
}

// hold keeps a copy of a record.
func (r *replay) hold(fs [][]byte, line int, quote bool) {
	c := make([][]byte, len(fs))
	for i, f := range fs {
		c[i] = append([]byte(nil), f...)
	}
	r.recs = append(r.recs, heldRecord{c, line, quote})
}

func (r *replay) next() ([][]byte, int, bool) {
	if len(r.recs) > 0 {
		h := r.recs[0]
		r.recs = r.recs[1:]
		r.quote = h.quote
		return h.fs, h.line, true
	}
	r.quote = false
	if r.rest == nil {
		return nil, 0, false
	}
	fs, l, ok := r.rest.next()
	r.quote = ok && r.rest.unclosedQuote()
	return fs, l, ok
}

func (r *replay) unclosedQuote() bool { return r.quote }

// mappedLines renames the lines of a record source (Options.Line).
type mappedLines struct {
	records
	line func(int) int
}

func (m mappedLines) next() ([][]byte, int, bool) {
	fs, l, ok := m.records.next()
	if ok {
		l = m.line(l)
	}
	return fs, l, ok
}

// commentLine reports a line above the header that starts with "#", which
// labs and loggers use for notes (common practice): it stays in the
// preamble however many fields its commas make.
func commentLine(fs [][]byte) bool {
	return len(fs) > 0 && bytes.HasPrefix(bytes.TrimSpace(fs[0]), []byte("#"))
}

// run reads the header, the units row if any, and every data row. comma
// joins preamble fields and is recorded in the table; sample holds the
// first rows, split into fields, for the decimal mark.
func (im *importer) run(lr records, comma byte, sample [][][]byte, modal int) {
	if im.opt.Line != nil {
		lr = mappedLines{lr, im.opt.Line}
	}
	if g := im.grid; g != nil {
		g.Comma = rune(comma)
		if g.raw {
			g.rows(lr)
			return
		}
	}
	need := 1
	if modal >= 2 {
		need = max(2, (modal+1)/2)
	}
	var header []string
	// The header is the first line, not a comment, with at least need
	// fields; when none has, the first line, not a comment, with any (a
	// header that names fewer columns than its rows fill): the lines read
	// after it are then held and read again as its rows.
	var held *replay
	preamble := len(im.t.Preamble)
	for {
		fs, line, ok := lr.next()
		if !ok && held != nil {
			held.rest = lr
			lr, fs, line = held, held.recs[0].fs, held.recs[0].line
			held.recs = held.recs[1:]
			im.t.Preamble = im.t.Preamble[:preamble]
			need = 0
		} else if !ok {
			im.fileProblem(ErrNotTable, "no header row was found")
			return
		}
		n := trimmedLen(fs)
		if n == 0 && need > 0 {
			if held != nil {
				held.hold(fs, line, lr.unclosedQuote())
			}
			continue
		}
		if n >= need && !commentLine(fs) {
			im.header, im.t.Header = line, line
			header = make([]string, len(fs))
			for i, f := range fs {
				header[i] = strings.TrimSpace(string(trimSpace(f)))
			}
			break
		}
		if held == nil && !commentLine(fs) {
			held, preamble = &replay{}, len(im.t.Preamble)
		}
		if held != nil {
			held.hold(fs, line, lr.unclosedQuote())
		}
		im.t.Preamble = append(im.t.Preamble, string(joinFields(fs, comma)))
	}
	heads := make([]heading, len(header))
	for i, h := range header {
		if m, ok := im.opt.Map[h]; ok {
			if m == "" {
				heads[i] = heading{kind: Meta}
			} else {
				heads[i] = classify(m)
			}
			continue
		}
		heads[i] = classify(h)
	}
	// A units row: cells that read as units, and no number under a numeric column.
	var units []string
	fs, line, ok := lr.next()
	for ok && trimmedLen(fs) == 0 {
		fs, line, ok = lr.next()
	}
	first := false
	if ok && isUnitsRow(fs, heads) {
		units = make([]string, len(header))
		for i := range units {
			if i < len(fs) {
				units[i] = strings.TrimSpace(string(trimSpace(fs[i])))
			}
		}
		im.unitLine = line
		first = true
	}
	if g := im.grid; g != nil {
		g.HeaderLine, g.Header, g.Units, g.UnitsLine = im.header, header, units, im.unitLine
		if ok && !first {
			g.row(fs, line)
		}
		if ok {
			g.rows(lr)
		}
		return
	}
	im.mapColumns(header, heads, units)
	im.detectDecimal(sample, comma)
	im.t.Comma, im.t.Decimal = rune(comma), rune(im.dec)
	for ; ok; fs, line, ok = lr.next() {
		if first {
			first = false
			continue // the units row
		}
		if lr.unclosedQuote() {
			im.add(&Problem{Line: line, Err: ErrQuote, Detail: "a quoted field is not closed before the end of the file"})
		}
		if commentLine(fs) {
			im.note(&Problem{Line: line, Col: 1, Header: im.cols[0].Header, Value: string(trimSpace(fs[0])), Err: ErrComment,
				Detail: "the line starts with # and is read as a comment, not as a sample; remove the # if it is data"})
			continue
		}
		im.row(fs, line)
	}
	im.finish()
}

func joinFields(fs [][]byte, comma byte) []byte {
	return bytes.Join(fs, []byte{comma})
}

func isUnitsRow(fs [][]byte, heads []heading) bool {
	unitLike, metaUnits, numbers := 0, 0, 0
	for i, f := range fs {
		s := string(trimSpace(f))
		if s == "" || i >= len(heads) {
			continue
		}
		k := heads[i].kind
		if k == Concentration || k == Discharge || k == PH || k == Temperature || k == Conductivity || k == SrRatio {
			if _, cls := classifyCell(f, ','); cls == cellNumber || cls == cellCensored {
				numbers++
			}
		}
		switch {
		case k == Meta:
			// A unit under an unknown column supports a units row but
			// cannot make one alone: a data row holding only "g/L" in a
			// metadata column is data.
			if _, err := chem.ParseUnit(s); err == nil {
				metaUnits++
			}
		case k == PH || k == SrRatio:
			if isNoUnit(s) && s != "" && s != "-" {
				unitLike++
			}
		default:
			if _, fok := dateFormat(s); fok && (k == Date || k == Clock) || k != Date && k != Clock && isUnitText(k, s) {
				unitLike++
			}
		}
	}
	return unitLike >= 1 && numbers == 0 || unitLike == 0 && metaUnits >= 2 && numbers == 0
}

// detectDecimal chooses the decimal mark from the numeric cells of the
// sample lines, unless Options.Decimal sets it.
func (im *importer) detectDecimal(sample [][][]byte, comma byte) {
	im.dec = '.'
	switch im.opt.Decimal {
	case ',':
		if comma != ',' {
			im.dec = ','
		}
		return
	case '.':
		return
	}
	if comma == ',' {
		return
	}
	commas, dots := 0, 0
	for _, fs := range sample {
		for i, f := range fs {
			if i >= len(im.cols) || !numericKind(im.cols[i].Kind) {
				continue
			}
			f = trimSpace(f)
			f = bytes.TrimLeft(f, "<≤ ")
			if bytes.IndexByte(f, ',') >= 0 {
				if _, ok := parseNumber(f, ','); ok {
					commas++
				}
			} else if bytes.IndexByte(f, '.') >= 0 {
				if _, ok := parseNumber(f, '.'); ok {
					dots++
				}
			}
		}
	}
	if commas > dots {
		im.dec = ','
	}
}

func numericKind(k Kind) bool {
	return k == Concentration || k == Discharge || k == PH || k == Temperature || k == Conductivity || k == SrRatio
}

// mapColumns turns headings and units into column plans, reporting
// duplicates, conflicts and missing units.
func (im *importer) mapColumns(header []string, heads []heading, units []string) {
	if im.sizeHint > 0 {
		im.t.Samples = make([]*Sample, 0, im.sizeHint+im.sizeHint/20+16)
	}
	im.cols = make([]plan, len(header))
	im.dateCol = -1
	im.order = im.opt.DateOrder
	seen := map[string]int{}
	var species [chem.NSpecies][]int // the columns of each species
	var kinds [len(kindNames)]int
	im.censored, im.missing = make([]tally, len(header)), make([]tally, len(header))
	for i := range kinds {
		kinds[i] = -1
	}
	// The pH column: field pH first, then unspecified, then lab.
	phBest := -1
	for i, h := range heads {
		if h.kind == PH && (phBest < 0 || h.field > heads[phBest].field) {
			phBest = i
		}
	}
	for i, h := range header {
		c := &im.cols[i]
		c.Index, c.Header, c.Scale = i, h, 1
		if units != nil {
			c.UnitText = units[i]
		}
		hd := heads[i]
		c.Kind = hd.kind
		at := im.header
		if units != nil && c.UnitText != "" {
			at = im.unitLine
		}
		bad := func(err error, detail string) {
			c.Note = detail
			im.add(&Problem{Line: at, Col: i + 1, Header: h, Value: c.UnitText, Err: err, Detail: detail})
			c.Kind = Meta
		}
		unitText, from := hd.unit, "header"
		if c.UnitText != "" && !isNoUnit(c.UnitText) {
			from = "units row"
			if unitText != "" && !sameUnit(hd.kind, unitText, c.UnitText) {
				bad(ErrUnitConflict, fmt.Sprintf("the header says %q but the units row says %q; values kept as text", unitText, c.UnitText))
			} else if !isUnitText(hd.kind, c.UnitText) && hd.kind != Meta {
				bad(ErrUnknownUnit, fmt.Sprintf("%q is not a unit for %s; values kept as text", c.UnitText, hd.kind))
			}
			unitText = c.UnitText
		}
		if c.Kind == PH && i != phBest {
			if heads[phBest].field == hd.field {
				bad(ErrDuplicateColumn, fmt.Sprintf("a second pH column; column %d is used", phBest+1))
			} else {
				c.Kind = Meta
				c.Note = fmt.Sprintf("pH of column %d is used (field pH is preferred)", phBest+1)
			}
		}
		if c.Kind != Meta && (unitText == "" || isNoUnit(unitText)) {
			if u, ok := im.opt.Units[h]; ok {
				unitText, from = u, "setting"
			} else if u, ok := im.opt.Units[""]; ok && (c.Kind == Concentration || c.Kind == Discharge) {
				unitText, from = u, "setting"
			}
		}
		switch c.Kind {
		case Concentration:
			if unitText == "" {
				bad(ErrNoUnit, fmt.Sprintf("no unit for %s in the header or a units row; values kept as text: give the unit in the header, as in %q, or set %s", hd.species, h+" (mg/L)", setting("default_unit")))
				break
			}
			u, err := chem.ParseUnit(unitText)
			if err != nil {
				bad(ErrUnknownUnit, fmt.Sprintf("%q is not a concentration unit; values kept as text", unitText))
				break
			}
			if u.Basis == "" {
				u.Basis = hd.basis
			}
			f, err := chem.Factor(hd.species, u)
			if err != nil {
				bad(ErrUnitMismatch, fmt.Sprintf("%s cannot be in %s; values kept as text", hd.species, u))
				break
			}
			species[hd.species] = append(species[hd.species], i)
			c.Species, c.Unit, c.Scale, c.Label, c.UnitFrom = hd.species, u, f, u.String(), from
		case Discharge:
			if unitText == "" {
				bad(ErrNoUnit, "no unit for discharge (m3/s, L/s or cfs); values kept as text (give one in the header, such as \"Q (L/s)\")")
				break
			}
			f, ok := dischargeUnit(unitText)
			if !ok {
				bad(ErrUnknownUnit, fmt.Sprintf("%q is not a discharge unit; values kept as text", unitText))
				break
			}
			c.Scale, c.Label = f, unitText
		case Temperature:
			if unitText == "" {
				unitText = "°C"
				c.Note = "no unit given; read as °C"
			}
			s, o, ok := temperatureUnit(unitText)
			if !ok {
				bad(ErrUnknownUnit, fmt.Sprintf("%q is not a temperature unit; values kept as text", unitText))
				break
			}
			c.Scale, c.Offset, c.Label = s, o, unitText
		case Conductivity:
			if unitText == "" {
				unitText = "µS/cm"
				c.Note = "no unit given; read as µS/cm"
			}
			f, ok := conductivityUnit(unitText)
			if !ok {
				bad(ErrUnknownUnit, fmt.Sprintf("%q is not a conductivity unit; values kept as text", unitText))
				break
			}
			c.Scale, c.Label = f, unitText
		case Date, Clock:
			if o, ok := dateFormat(unitText); ok && o != DateAuto && c.Kind == Date && im.opt.DateOrder == DateAuto {
				im.order = o
				c.Label = unitText
				c.Note = "date order " + o.String() + ", as the column's format " + strconv.Quote(unitText) + " says"
				im.note(&Problem{Line: at, Col: i + 1, Header: h, Value: unitText, Err: ErrDateOrder,
					Detail: fmt.Sprintf("dates read %s, as the column's format %q says; set %s if they are not", orderWord(o), unitText, setting("date_order"))})
			}
		}
		if c.Kind != Meta && c.Kind != Concentration {
			if j := kinds[c.Kind]; j >= 0 {
				if numericKind(c.Kind) {
					bad(ErrDuplicateColumn, fmt.Sprintf("%s is also in column %d, which is used; values kept as text", c.Kind, j+1))
				} else {
					c.Kind = Meta
					c.Note = fmt.Sprintf("%s is taken from column %d", im.cols[j].Kind, j+1)
				}
			} else {
				kinds[c.Kind] = i
			}
		}
		if c.Kind == Date {
			im.dateCol = i
		}
		if c.Kind != Meta {
			im.nMapped++
		}
		key := h
		if key == "" {
			key = "column " + strconv.Itoa(i+1)
		}
		if n := seen[key]; n > 0 {
			key += " (" + strconv.Itoa(n+1) + ")"
		}
		seen[h]++
		c.metaKey = key
	}
	for sp, idx := range species {
		if len(idx) > 1 {
			im.repeated(chem.Species(sp), idx)
		}
	}
	for _, c := range im.cols {
		im.t.Columns = append(im.t.Columns, c.Column)
	}
	im.unitsNote()
	switch {
	case im.nMapped == 0:
		im.add(&Problem{Line: im.header, Err: ErrNotTable, Detail: "no column names a species, date, site or sample; every column is kept as text" +
			unrecognisedNote(im.t.Unrecognised())})
	case len(im.t.Species()) == 0:
		if p := im.t.Require(Concentration); p != nil {
			im.add(p[0])
		}
	}
}

// repeated settles a species found in several columns (idx): the column
// named in Options.Use is read and the others kept as text; without a
// choice every one is kept as text and the repetition reported, naming
// them all. Nothing is read from the first silently.
func (im *importer) repeated(sp chem.Species, idx []int) {
	chosen := -1
	for _, k := range idx {
		for _, u := range im.opt.Use {
			if chosen < 0 && strings.EqualFold(strings.TrimSpace(u), im.cols[k].Header) {
				chosen = k
			}
		}
	}
	var names []string
	for _, k := range idx {
		names = append(names, fmt.Sprintf("column %d %q", k+1, im.cols[k].Header))
	}
	for _, k := range idx {
		if k == chosen {
			continue
		}
		c := &im.cols[k]
		c.Kind, c.Label, c.UnitFrom = Meta, "", ""
		im.nMapped--
		if chosen >= 0 {
			c.Note = fmt.Sprintf("%s is read from column %d %q, as chosen", sp, chosen+1, im.cols[chosen].Header)
			im.note(&Problem{Line: im.header, Col: k + 1, Header: c.Header, Err: ErrChosenColumn,
				Detail: fmt.Sprintf("%s is read from column %d %q, as chosen in %s; this column is kept as text", sp, chosen+1, im.cols[chosen].Header, setting("use_columns"))})
			continue
		}
		c.Note = fmt.Sprintf("%s is in %s; none is read", sp, joinAnd(names))
	}
	if chosen < 0 {
		first := &im.cols[idx[0]]
		im.add(&Problem{Line: im.header, Col: idx[0] + 1, Header: first.Header, Err: ErrDuplicateColumn,
			Detail: fmt.Sprintf("%s is in %s; none is read: remove all but one of the %s columns, or name the one to read in %s",
				sp, joinAnd(names), sp, setting("use_columns"))})
	}
}

// joinAnd joins "a", "b" and "c" as "a, b and c".
func joinAnd(s []string) string {
	if len(s) < 2 {
		return strings.Join(s, "")
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

// unitsNote says in which unit each concentration column was read and
// where the unit came from; units taken from Options.Units are a separate
// warning, since the file did not give them.
func (im *importer) unitsNote() {
	type group struct {
		unit, from string
		species    []string
		first      int
	}
	var groups []*group
	ppm, line := false, im.header
	if im.unitLine > 0 {
		line = im.unitLine
	}
	var fromSetting []string
	setUnit, setCol := "", 0
	for _, c := range im.cols {
		if c.Kind != Concentration {
			continue
		}
		if c.UnitFrom == "setting" {
			if setCol == 0 {
				setCol = c.Index + 1
			}
			fromSetting, setUnit = append(fromSetting, c.Species.Symbol()), c.Label
			continue
		}
		k := strings.ToLower(c.UnitText + " " + c.Header)
		ppm = ppm || strings.Contains(k, "ppm") || strings.Contains(k, "ppb")
		var g *group
		for _, x := range groups {
			if x.unit == c.Label && x.from == c.UnitFrom {
				g = x
			}
		}
		if g == nil {
			g = &group{unit: c.Label, from: c.UnitFrom, first: c.Index + 1}
			groups = append(groups, g)
		}
		g.species = append(g.species, c.Species.Symbol())
	}
	if len(groups) > 0 {
		parts := make([]string, len(groups))
		for i, g := range groups {
			parts[i] = fmt.Sprintf("%s in %s (from the %s)", joinAnd(g.species), g.unit, g.from)
		}
		d := "units read: " + strings.Join(parts, "; ")
		if ppm {
			d += "; ppm is read as mg/L and ppb as µg/L, which holds for fresh water (density within 0.5 % of 1 kg/L)"
		}
		im.note(&Problem{Line: line, Err: ErrUnits, Detail: d})
	}
	if len(fromSetting) > 0 {
		im.note(&Problem{Line: im.header, Col: setCol, Err: ErrDefaultUnit,
			Detail: fmt.Sprintf("the file gives no unit for %s: read in %s, the %s setting; give the unit in the header, as %q, if that is not the lab's unit",
				joinAnd(fromSetting), setUnit, setting("default_unit"), fromSetting[0]+" (mg/L)")})
	}
}

// orderWord names a date order as the date order setting's choices do.
func orderWord(o DateOrder) string {
	switch o {
	case DayFirst:
		return "day-first"
	case MonthFirst:
		return "month-first"
	}
	return "auto"
}

// sameUnit reports whether two unit texts mean the same unit for kind k.
func sameUnit(k Kind, a, b string) bool {
	switch k {
	case Concentration:
		ua, ea := chem.ParseUnit(a)
		ub, eb := chem.ParseUnit(b)
		return ea == nil && eb == nil && ua.Dim == ub.Dim && ua.Scale == ub.Scale && ua.Basis == ub.Basis
	case Discharge:
		fa, _ := dischargeUnit(a)
		fb, _ := dischargeUnit(b)
		return fa == fb
	case Temperature:
		sa, _, _ := temperatureUnit(a)
		sb, _, _ := temperatureUnit(b)
		return sa == sb
	case Conductivity:
		fa, _ := conductivityUnit(a)
		fb, _ := conductivityUnit(b)
		return fa == fb
	}
	return unitKey(a) == unitKey(b)
}

// newSample hands out a sample from a block, to keep allocations few.
func (im *importer) newSample() *Sample {
	if len(im.block) == 0 {
		n := min(1024, 16+len(im.t.Samples))
		im.block = make([]Sample, n)
	}
	s := &im.block[0]
	im.block = im.block[1:]
	s.reset()
	return s
}

// row reads one data row.
func (im *importer) row(fs [][]byte, line int) {
	if trimmedLen(fs) == 0 {
		return
	}
	s := im.newSample()
	s.Line = line
	pol := im.t.Policy
	for i := range im.cols {
		c := &im.cols[i]
		var f []byte
		if i < len(fs) {
			f = fs[i]
		}
		switch c.Kind {
		case Concentration:
			v, cls := classifyCell(f, im.dec)
			switch cls {
			case cellNumber:
				im.sawDecimal(f, line)
				if v < 0 {
					im.cellProblem(line, c, f, ErrNegative, "a concentration cannot be negative; left missing")
					continue
				}
				s.C[c.Species] = v * c.Scale
			case cellCensored:
				lim := v * c.Scale
				if s.Censored == nil {
					s.Censored = make(map[chem.Species]float64, 2)
				}
				s.Censored[c.Species] = lim
				s.C[c.Species] = pol.Value(lim)
				im.censored[i].add(line, trimSpace(f))
				if math.IsNaN(lim) {
					im.censored[i].noLimit++
				}
			case cellMissing:
				im.missed(i, f, line)
			case cellText:
				if x, ok := im.cellUnit(c, f, line); ok {
					s.C[c.Species] = x
					continue
				}
				im.cellProblem(line, c, f, ErrNotNumber, "left missing; write a number, a value below detection such as \"<0.05\", or leave the cell blank")
			}
		case Discharge, PH, Temperature, Conductivity, SrRatio:
			v, cls := classifyCell(f, im.dec)
			switch cls {
			case cellMissing:
				im.missed(i, f, line)
			case cellNumber:
				im.sawDecimal(f, line)
				v = v*c.Scale + c.Offset
				if msg := rangeCheck(c.Kind, v); msg != "" {
					err := ErrOutOfRange
					if v < 0 && c.Kind != Temperature {
						err = ErrNegative
					}
					im.cellProblem(line, c, f, err, msg)
					continue
				}
				switch c.Kind {
				case Discharge:
					s.Q = v
				case PH:
					s.PH = v
				case Temperature:
					s.Temp = v
				case Conductivity:
					s.Cond = v
				case SrRatio:
					s.Sr87Sr86 = v
				}
			case cellCensored, cellText:
				im.cellProblem(line, c, f, ErrNotNumber, "left missing")
			}
		case ID:
			s.ID = string(trimSpace(f))
		case Site:
			s.Site = im.site(trimSpace(f))
		case Date:
			im.date(s, c, f, line)
		case Clock:
			f = trimSpace(f)
			if len(f) == 0 {
				continue
			}
			sec, nsec, ok := parseClock(f)
			if !ok {
				im.cellProblem(line, c, f, ErrBadDate, "not a time of day (hh:mm); kept as text")
				im.meta(s, c, f)
				continue
			}
			im.clocks = append(im.clocks, pendingClock{s, c, sec, nsec, string(f)})
		default:
			im.meta(s, c, f)
		}
	}
	if len(fs) > len(im.cols) {
		for i := len(im.cols); i < len(fs); i++ {
			f := trimSpace(fs[i])
			if len(f) == 0 {
				continue
			}
			key := "column " + strconv.Itoa(i+1)
			im.add(&Problem{Line: line, Col: i + 1, Value: string(f), Err: ErrFieldCount,
				Detail: fmt.Sprintf("the row has more fields than the header (%d); kept as text under %q", len(im.cols), key)})
			if s.Meta == nil {
				s.Meta = map[string]string{}
			}
			s.Meta[key] = string(f)
		}
	}
	im.t.Samples = append(im.t.Samples, s)
}

// missed counts a cell read as missing that was not blank ("n.d.",
// "-999"), for the column's note.
func (im *importer) missed(i int, f []byte, line int) {
	f = trimSpace(f)
	if len(f) == 0 {
		return
	}
	im.missing[i].add(line, f)
	if l := strings.ToLower(string(f)); l == "nd" || l == "n.d." || l == "n.d" {
		im.missing[i].nd = true
	}
}

// sawDecimal remembers the first number read with a detected decimal
// comma, for the note that says so.
func (im *importer) sawDecimal(f []byte, line int) {
	if im.dec == ',' && im.opt.Decimal == 0 && im.decAt == 0 && bytes.IndexByte(f, ',') >= 0 {
		im.decAt, im.decRaw = line, string(trimSpace(f))
	}
}

// cellUnit reads a concentration cell that carries its own unit ("25
// µmol/L", "1.2mg/l") in the internal unit, noting it when the unit is not
// the column's.
func (im *importer) cellUnit(c *plan, f []byte, line int) (float64, bool) {
	f = trimSpace(f)
	i := 0
	for i < len(f) && (f[i] >= '0' && f[i] <= '9' || f[i] == '.' || f[i] == im.dec || i == 0 && (f[i] == '-' || f[i] == '+')) {
		i++
	}
	v, ok := parseNumber(f[:i], im.dec)
	rest := strings.TrimSpace(string(f[i:]))
	if !ok || rest == "" {
		return 0, false
	}
	u, err := chem.ParseUnit(rest)
	if err != nil {
		return 0, false
	}
	if u.Basis == "" {
		u.Basis = c.Unit.Basis
	}
	k, err := chem.Factor(c.Species, u)
	if err != nil {
		return 0, false
	}
	if v < 0 {
		im.cellProblem(line, c, f, ErrNegative, "a concentration cannot be negative; left missing")
		return nan, true
	}
	if k != c.Scale {
		im.note(&Problem{Line: line, Col: c.Index + 1, Header: c.Header, Value: string(f), Err: ErrCellUnit,
			Detail: fmt.Sprintf("read in %s, the unit the cell gives, although the column is in %s", u, c.Label)})
	}
	return v * k, true
}

func rangeCheck(k Kind, v float64) string {
	switch k {
	case Discharge:
		if v < 0 {
			return "discharge cannot be negative; left missing"
		}
	case Conductivity:
		if v < 0 {
			return "conductivity cannot be negative; left missing"
		}
	case PH:
		if v < 0 || v > 14 {
			return "pH must lie between 0 and 14; left missing"
		}
	case Temperature:
		if v < -5 || v > 100 {
			return "water temperature must lie between -5 and 100 °C; left missing"
		}
	case SrRatio:
		if v <= 0 || v >= 2 {
			return "87Sr/86Sr must lie between 0 and 2; left missing"
		}
	}
	return ""
}

func (im *importer) meta(s *Sample, c *plan, f []byte) {
	f = trimSpace(f)
	if len(f) == 0 {
		return
	}
	if s.Meta == nil {
		s.Meta = make(map[string]string, 2)
	}
	s.Meta[c.metaKey] = string(f)
}

func (im *importer) site(b []byte) string {
	if im.sites == nil {
		im.sites = map[string]string{}
	}
	if s, ok := im.sites[string(b)]; ok {
		return s
	}
	s := string(b)
	im.sites[s] = s
	return s
}

func (im *importer) date(s *Sample, c *plan, f []byte, line int) {
	f = trimSpace(f)
	if len(f) == 0 {
		return
	}
	d, ok := parseDate(f)
	if !ok {
		im.cellProblem(line, c, f, ErrBadDate, "not a date this importer reads (ISO 8601 yyyy-mm-dd, dd/mm/yyyy, mm/dd/yyyy, 5-Mar-2024 or an Excel serial day); kept as text")
		im.meta(s, c, f)
		return
	}
	if d.dmy && im.order == DateAuto {
		p := pendingDate{s, d, string(f), line}
		im.pending = append(im.pending, p)
		im.orderSeen.Add(dateorder.Witness{Line: line, Raw: p.raw, A: d.a, B: d.b})
		return
	}
	im.setTime(s, c, d, f, line)
}

func (im *importer) setTime(s *Sample, c *plan, d dateVal, f []byte, line int) {
	tm, ok := d.resolve(im.order)
	if !ok {
		im.cellProblem(line, c, f, ErrBadDate, fmt.Sprintf("not a valid date read %s; kept as text", im.order))
		im.meta(s, c, f)
		return
	}
	s.Time, s.HasTime, s.DateOnly = tm, true, !d.clock
}

// finish resolves dates whose order the whole column decides, joins the
// time-of-day column, and sorts the problems.
func (im *importer) finish() {
	if len(im.pending) > 0 {
		c := &im.cols[im.dateCol]
		choose := fmt.Sprintf("set %s to day-first or month-first", setting("date_order"))
		df, mf := im.orderSeen.DayFirst, im.orderSeen.MonthFirst
		switch im.orderSeen.Verdict() {
		case dateorder.Conflict:
			last := max(df.Line, mf.Line)
			raw := df.Raw
			if last == mf.Line {
				raw = mf.Raw
			}
			im.add(&Problem{Line: last, Col: c.Index + 1, Header: c.Header, Value: raw, Err: ErrAmbiguousDate,
				Detail: fmt.Sprintf("line %d %q reads only day-first but line %d %q only month-first; %s (the dates that disagree with it are then reported); the %d dates written as three numbers are kept as text until then",
					df.Line, df.Raw, mf.Line, mf.Raw, choose, len(im.pending))})
		case dateorder.DayFirst:
			im.order = DayFirst
			im.note(&Problem{Line: df.Line, Col: c.Index + 1, Header: c.Header, Value: df.Raw, Err: ErrDateOrder,
				Detail: fmt.Sprintf("dates read day-first, as this one shows (%d cannot be a month); %d dates read so", df.A, len(im.pending))})
		case dateorder.MonthFirst:
			im.order = MonthFirst
			im.note(&Problem{Line: mf.Line, Col: c.Index + 1, Header: c.Header, Value: mf.Raw, Err: ErrDateOrder,
				Detail: fmt.Sprintf("dates read month-first, as this one shows (%d cannot be a month); %d dates read so", mf.B, len(im.pending))})
		default:
			p := im.pending[0]
			im.add(&Problem{Line: p.line, Col: c.Index + 1, Header: c.Header, Value: p.raw, Err: ErrAmbiguousDate,
				Detail: fmt.Sprintf("all %d dates, such as this one, read both day-first and month-first; %s; the dates are kept as text until then", len(im.pending), choose)})
		}
		if im.order != DateAuto {
			c.Note = "date order " + im.order.String() + " (read from the column)"
			im.t.Columns[c.Index].Note = c.Note
		}
		for _, p := range im.pending {
			if im.order == DateAuto {
				im.meta(p.s, c, []byte(p.raw))
				continue
			}
			im.setTime(p.s, c, p.d, []byte(p.raw), p.line)
		}
		im.pending = nil
	}
	for _, k := range im.clocks {
		if k.s.HasTime && k.s.DateOnly {
			k.s.Time = k.s.Time.Add(timeOfDay(k.sec, k.nsec))
			k.s.DateOnly = false
			continue
		}
		im.meta(k.s, k.c, []byte(k.raw)) // no date to join it to: keep the text
	}
	im.columnNotes()
	if len(im.t.Samples) == 0 && im.nMapped > 0 {
		im.add(&Problem{Line: im.header, Err: ErrNotTable, Detail: "the header has no data rows below it"})
	}
	sortProblems(im.t.Problems)
	sortProblems(im.t.Notes)
	if im.extra > 0 {
		im.t.Problems = append(im.t.Problems, &Problem{File: im.t.Name, Err: ErrTooMany,
			Detail: fmt.Sprintf("%d more problems not listed", im.extra)})
	}
}

// sortProblems orders a list by line, then column, keeping the order of
// problems at one place.
func sortProblems(l ProblemList) {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i], l[j]
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// columnNotes adds the notes the rows gave: the decimal comma, and per
// column the values below detection and the cells read as missing.
func (im *importer) columnNotes() {
	if im.decAt > 0 {
		im.note(&Problem{Line: im.decAt, Value: im.decRaw, Err: ErrDecimalComma,
			Detail: "numbers read with a decimal comma, as the numeric cells use it"})
	}
	pol := im.t.Policy
	for i := range im.cols {
		c := &im.cols[i]
		if t := &im.censored[i]; t.n > 0 {
			var d string
			switch pol {
			case LeaveOut:
				d = "each is left missing"
			case Zero:
				d = "zero stands in for each"
			case AtLimit:
				d = "the limit stands in for each"
			default:
				d = "half the limit stands in for each"
			}
			d = fmt.Sprintf("%s below detection (%s): %s (setting %s); the limits are kept", plural(t.n, "value"), t.list(), d, setting("below_detection"))
			if t.noLimit > 0 && pol != Zero && pol != LeaveOut {
				if t.noLimit == 1 {
					d += "; 1 gives no limit and is left missing: write its limit, as \"<0.05\", to use it"
				} else {
					d += fmt.Sprintf("; %d give no limit and are left missing: write their limits, as \"<0.05\", to use them", t.noLimit)
				}
			}
			im.note(&Problem{Line: t.ex[0].line, Col: i + 1, Header: c.Header, Value: t.ex[0].raw, Err: ErrCensored, Detail: d})
		}
		if t := &im.missing[i]; t.n > 0 {
			d := fmt.Sprintf("%s read as missing, not as zero (%s)", plural(t.n, "cell"), t.list())
			if t.nd {
				d += "; \"n.d.\" is read as not determined: if the laboratory means not detected, write its detection limit, as \"<0.05\""
			}
			im.note(&Problem{Line: t.ex[0].line, Col: i + 1, Header: c.Header, Value: t.ex[0].raw, Err: ErrMissingValue, Detail: d})
		}
	}
}

// plural returns "1 value" or "n values".
func plural(n int, one string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + one + "s"
}
