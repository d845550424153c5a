package discharge

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"lixiv/engine/internal/dateorder"
	"lixiv/engine/internal/delimiter"
	"lixiv/engine/problem"
)

// DecimalMark says how numbers write their decimal separator. The zero value
// detects it: a decimal comma is taken when the delimiter is not a comma and
// discharge cells hold commas but no points.
type DecimalMark int

// Decimal marks.
const (
	AutoDecimal  DecimalMark = iota // detect
	DecimalPoint                    // 1.25
	DecimalComma                    // 1,25
)

// Options control Read. The zero value detects everything it can and
// reports what it cannot.
type Options struct {
	File      string      // name used in problems and notes; purely for messages
	Unit      Unit        // discharge unit when the file does not state one
	AreaKm2   float64     // catchment area, needed for runoff in mm/day
	DateOrder DateOrder   // order of year-last dates; AutoOrder decides from the column
	Delimiter rune        // field delimiter; 0 detects tab, semicolon, comma or spaces
	Decimal   DecimalMark // decimal separator; AutoDecimal detects
	// Line, when set, maps the lines of the text read to the lines
	// problems should name (those of the file the text was taken from).
	Line func(int) int
}

// Import is what Read made of a table.
type Import struct {
	Record   *Record  // the daily record; empty (Len 0) when nothing could load
	Readings []int    // readings averaged into each day of Record (sub-daily input); nil for daily input
	Problems Problems // everything wrong, positioned; Problems.Err() is nil when all is well
	Notes    []string // what was detected and done (delimiter, date order, unit, averaging, sorting)
	// Notices are positioned like Problems but name no wrong cell: the
	// date order and the line that decided it, each day whose cell is
	// empty or a no-data code (left out as a gap), and the count of days
	// left out for any reason (the last entry, with no line).
	Notices      Problems
	Delimiter    rune      // delimiter used
	DecimalComma bool      // whether numbers were read with a decimal comma
	DateOrder    DateOrder // order used for year-last dates (AutoOrder if none occurred)
	Unit         Unit      // unit of the discharge column (the first row's, with a unit column)
	Gaps         []Span    // gaps in Record, as Record.Gaps
}

// ReadString reads a table held in a string, as pasted from a spreadsheet.
func ReadString(text string, opt Options) *Import {
	return Read(strings.NewReader(text), opt)
}

// MaxProblems is how many problems of one kind Read lists; beyond it one
// closing problem gives the count of the rest.
const MaxProblems = 50

// MaxDays is the longest span of days a record may cover (200 years); a
// table whose dates run further is refused as a likely typing error.
const MaxDays = 200 * 366

// missingCodes are cells read as "no value" rather than as numbers
// (docs/methods.md §1.1, common practice).
var missingCodes = map[string]bool{
	"": true, "na": true, "n/a": true, "n.a.": true, "nd": true, "n.d.": true, "-": true, "--": true,
	"nan": true, "null": true, "-999": true, "-9999": true, "missing": true,
}

type reading struct {
	day  Day
	sec  int
	q    float64 // m³/s, NaN if missing or rejected
	line int
}

// Read imports a discharge table (see the package documentation for the
// accepted forms). It never fails outright: what cannot be read is listed in
// the returned Import's Problems with its row and column, and the rest loads.
func Read(r io.Reader, opt Options) *Import {
	rd := &reader{imp: &Import{Record: &Record{Name: opt.File}}, opt: opt, perKind: map[error]int{}}
	defer rd.countRest()
	if !rd.split(r) || !rd.columns() {
		return rd.imp
	}
	rd.decimal()
	rd.dates()
	build(rd.imp, rd.readings(), opt, rd.add, rd.dName)
	rd.sortOut()
	return rd.imp
}

// reader holds what Read has found so far, step by step.
type reader struct {
	imp     *Import
	opt     Options
	perKind map[error]int // problems of each kind
	kinds   []error       // the kinds, in the order first met

	rows  [][]string
	lines []int // the line of each row, as the file counts it
	cols  columns
	start int // the first data row

	qName, dName string // the discharge and date columns' headers
	unit         Unit   // the file's unit (NoUnit: per row, or none)
	comma        bool   // a decimal comma

	stamps   []stamp // each row's date, before the order is settled
	okStamp  []bool
	reported []bool // the row's date or time was reported already
	order    DateOrder
}

// add lists a problem of kind at row and column (at most MaxProblems of
// each kind; countRest counts the rest).
func (r *reader) add(row, col int, column string, kind error, format string, args ...any) {
	if r.perKind[kind]++; r.perKind[kind] > MaxProblems {
		return
	}
	if r.perKind[kind] == 1 {
		r.kinds = append(r.kinds, kind)
	}
	p := &Problem{File: r.opt.File, Row: row, Col: col, Column: column, Err: kind, Detail: fmt.Sprintf(format, args...)}
	p.classify()
	r.imp.Problems = append(r.imp.Problems, p)
}

// value sets the cell text of the problem just added.
func (r *reader) value(v string) {
	if n := len(r.imp.Problems); n > 0 {
		r.imp.Problems[n-1].Value = strings.TrimSpace(v)
	}
}

// countRest closes the list with the count of the problems of each kind
// beyond MaxProblems.
func (r *reader) countRest() {
	for _, k := range r.kinds {
		if n := r.perKind[k] - MaxProblems; n > 0 {
			p := &Problem{File: r.opt.File, Err: k, Detail: fmt.Sprintf("%d more rows like the above are not listed", n)}
			p.classify()
			r.imp.Problems = append(r.imp.Problems, p)
		}
	}
}

// split reads the input and splits it into rows; false when there are
// none.
func (r *reader) split(in io.Reader) bool {
	data, err := io.ReadAll(in)
	if err != nil {
		r.add(0, 0, "", ErrNotTable, "reading failed: %v", err)
		return false
	}
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	r.rows, r.lines = splitRows(data, r.opt, r.imp, r.add)
	if r.opt.Line != nil {
		for i, l := range r.lines {
			r.lines[i] = r.opt.Line(l)
		}
		for _, p := range r.imp.Problems { // syntax errors, met while splitting
			if p.Row > 0 {
				p.Row = r.opt.Line(p.Row)
			}
		}
	}
	if len(r.rows) == 0 {
		r.add(0, 0, "", ErrNotTable, "no rows")
		return false
	}
	return true
}

// columns finds the date and discharge columns, a units row and the unit;
// false when the table lacks one of them.
func (r *reader) columns() bool {
	rows, lines, opt := r.rows, r.lines, r.opt
	cols := findColumns(rows[0])
	start := 1
	if cols.headerless {
		start = 0
	}
	if cols.date < 0 {
		r.add(lines[0], 0, "", ErrNoDateColumn, "the header names no date column (Date, Day, DateTime, Timestamp)")
		return false
	}
	if cols.q < 0 {
		r.add(lines[0], 0, "", ErrNoQColumn, "the header names no discharge column (Q, Discharge, Flow, Runoff, cms, cfs, L/s)")
		return false
	}
	qName := cols.name(rows[0], cols.q)
	// A units row under the names.
	if !cols.headerless && len(rows) > 1 && cols.q < len(rows[1]) {
		if _, ok := parseStamp(cell(rows[1], cols.date)); !ok {
			if u, err := ParseUnit(rows[1][cols.q]); err == nil {
				if cols.unit != NoUnit && cols.unit != u {
					r.add(lines[1], cols.q+1, qName, ErrMixedUnits, "units row says %s but the header says %s; the units row is used", u, cols.unit)
				}
				cols.unit = u
				start = 2
			}
		}
	}
	fileUnit := cols.unit
	if fileUnit != NoUnit && opt.Unit != NoUnit && opt.Unit != fileUnit {
		r.add(lines[0], cols.q+1, qName, ErrMixedUnits, "the file says %s but the options say %s; the file's unit is used", fileUnit, opt.Unit)
	}
	if fileUnit == NoUnit {
		fileUnit = opt.Unit
	}
	if fileUnit == NoUnit && cols.unitCol < 0 {
		r.add(lines[0], cols.q+1, qName, ErrNoUnit, "state it in the header, as \"Q (m3/s)\", or in the options; nothing was loaded")
		return false
	}
	r.cols, r.start, r.unit, r.qName = cols, start, fileUnit, qName
	r.dName = cols.name(rows[0], cols.date)
	return true
}

// decimal settles the decimal mark from the discharge column.
func (r *reader) decimal() {
	rows, cols, start, imp, opt := r.rows, r.cols, r.start, r.imp, r.opt
	delim := imp.Delimiter
	comma := opt.Decimal == DecimalComma
	if opt.Decimal == AutoDecimal && delim != ',' {
		sawComma, sawPoint := false, false
		for _, row := range rows[start:] {
			c := strings.TrimSpace(cell(row, cols.q))
			if _, err := strconv.ParseFloat(strings.Replace(c, ",", ".", 1), 64); err != nil {
				continue // text and missing codes such as "n.a." say nothing
			}
			sawComma = sawComma || strings.Contains(c, ",")
			sawPoint = sawPoint || strings.Contains(c, ".")
		}
		comma = sawComma && !sawPoint
	}
	imp.DecimalComma = comma
	if comma {
		imp.Notes = append(imp.Notes, "numbers read with a decimal comma")
	}
	r.comma = comma
}

// dates reads every row's date and settles the order of dates written with
// the year last over the whole column.
func (r *reader) dates() {
	rows, lines, cols, start, imp, opt := r.rows, r.lines, r.cols, r.start, r.imp, r.opt
	stamps := make([]stamp, len(rows))
	okStamp := make([]bool, len(rows))
	reported := make([]bool, len(rows))
	var seen dateorder.Evidence // the dates written with the year last
	for i := start; i < len(rows); i++ {
		st, ok := parseStamp(cell(rows[i], cols.date))
		if ok && cols.time >= 0 {
			if sec, ok2 := parseClock(cell(rows[i], cols.time)); ok2 {
				st.sec = sec
			} else if strings.TrimSpace(cell(rows[i], cols.time)) != "" {
				r.add(lines[i], cols.time+1, cols.name(rows[0], cols.time), ErrBadDate, "%q is not a time of day (hh:mm or hh:mm:ss); the row was left out", cell(rows[i], cols.time))
				reported[i] = true
				continue
			}
		}
		stamps[i], okStamp[i] = st, ok
		if ok && st.form == 'l' {
			seen.Add(dateorder.Witness{Line: lines[i], Raw: strings.TrimSpace(cell(rows[i], cols.date)), A: st.a, B: st.b})
		}
	}
	order := opt.DateOrder
	dName := r.dName
	if order == AutoOrder {
		df, mf := seen.DayFirst, seen.MonthFirst
		switch seen.Verdict() {
		case dateorder.Conflict:
			last := df
			if mf.Line > df.Line {
				last = mf
			}
			r.add(last.Line, cols.date+1, dName, ErrAmbiguousDate, "line %d %q reads only day-first but line %d %q only month-first; set \"date order\" to day-first or month-first; the %d dates written with the year last were not loaded",
				df.Line, df.Raw, mf.Line, mf.Raw, seen.N)
			r.value(last.Raw)
		case dateorder.DayFirst:
			order = DayFirst
			imp.Notes = append(imp.Notes, fmt.Sprintf("dates read day-first (line %d has a day above 12)", df.Line))
			r.add(df.Line, cols.date+1, dName, ErrDateOrder, "dates read day-first, as this one shows (its first number cannot be a month)")
			r.value(df.Raw)
		case dateorder.MonthFirst:
			order = MonthFirst
			imp.Notes = append(imp.Notes, fmt.Sprintf("dates read month-first (line %d has a day above 12)", mf.Line))
			r.add(mf.Line, cols.date+1, dName, ErrDateOrder, "dates read month-first, as this one shows (its second number cannot be a month)")
			r.value(mf.Raw)
		case dateorder.Either:
			r.add(lines[start], cols.date+1, dName, ErrAmbiguousDate, "every date, such as this one, reads both day-first and month-first; set \"date order\" to day-first or month-first; %d rows were not loaded", seen.N)
			r.value(cell(rows[start], cols.date))
		}
	}
	imp.DateOrder = order
	r.stamps, r.okStamp, r.reported, r.order = stamps, okStamp, reported, order
}

// readings reads each row's discharge, in m³/s, with its unit.
func (r *reader) readings() []reading {
	rows, lines, cols, start, imp := r.rows, r.lines, r.cols, r.start, r.imp
	stamps, okStamp, reported, order := r.stamps, r.okStamp, r.reported, r.order
	qName, dName, fileUnit := r.qName, r.dName, r.unit
	rd := make([]reading, 0, len(rows))
	var bad leftOutCount
	leftOut, what, whats := "the day is left out (a gap)", "day", "days"
	if cols.time >= 0 {
		leftOut, what, whats = "the reading is left out", "reading", "readings"
	}
	firstUnit := Unit(-1)
	unitName := ""
	if cols.unitCol >= 0 {
		unitName = cols.name(rows[0], cols.unitCol)
	}
	for i := start; i < len(rows); i++ {
		row, line := rows[i], lines[i]
		if blankRow(row) {
			continue
		}
		if !okStamp[i] {
			if !reported[i] {
				r.add(line, cols.date+1, dName, ErrBadDate, "%q is not a date (use 2021-10-01, 01/10/2021 or 10/01/2021)", cell(row, cols.date))
			}
			continue
		}
		st := stamps[i]
		d, ok := st.day(order)
		if !ok {
			if st.form == 'l' && order == AutoOrder {
				continue // reported once above
			}
			r.add(line, cols.date+1, dName, ErrBadDate, "%q is not a valid %s date", cell(row, cols.date), orderOr(order, st))
			continue
		}
		u := fileUnit
		if cols.unitCol >= 0 {
			uc := strings.TrimSpace(cell(row, cols.unitCol))
			if uc != "" {
				ru, err := ParseUnit(uc)
				if err != nil {
					r.add(line, cols.unitCol+1, unitName, ErrUnknownUnit, "%q is not a discharge unit; the value was left out", uc)
					rd = append(rd, reading{d, st.sec, math.NaN(), line})
					continue
				}
				u = ru
			}
			if u == NoUnit {
				r.add(line, cols.unitCol+1, unitName, ErrNoUnit, "no unit for this row; the value was left out")
				rd = append(rd, reading{d, st.sec, math.NaN(), line})
				continue
			}
			if firstUnit < 0 {
				firstUnit = u
			} else if u != firstUnit {
				r.add(line, cols.unitCol+1, unitName, ErrMixedUnits, "%s here but %s above; the value was converted with its own unit %s", u, firstUnit, u)
			}
		} else if firstUnit < 0 {
			firstUnit = u
		}
		raw := cell(row, cols.q)
		if cols.q >= len(row) {
			r.add(line, 0, "", ErrShortRow, "%d cells, but discharge is in column %d; the day is a gap", len(row), cols.q+1)
			rd = append(rd, reading{d, st.sec, math.NaN(), line})
			continue
		}
		rd = append(rd, reading{d, st.sec, r.discharge(raw, d, line, u, leftOut, &bad), line})
	}
	if n := bad.neg + bad.code + bad.empty + bad.text; n > 0 {
		var parts []string
		for _, k := range []struct {
			n    int
			what string
		}{{bad.neg, "below zero"}, {bad.code, "with a no-data code"}, {bad.empty, "empty"}, {bad.text, "not a number"}} {
			if k.n > 0 {
				parts = append(parts, fmt.Sprintf("%d %s", k.n, k.what))
			}
		}
		r.add(0, cols.q+1, qName, ErrBadDays, "%d %s left out (%s), each named at its line", n, plural(n, what, whats), strings.Join(parts, ", "))
	}
	if firstUnit >= 0 {
		imp.Unit = firstUnit
		imp.Notes = append(imp.Notes, "discharge unit "+firstUnit.String())
	}
	return rd
}

// leftOutCount counts the days (readings) left out, by reason.
type leftOutCount struct{ neg, code, empty, text int }

// discharge reads the discharge cell raw of day d on line, in unit u, as
// m³/s: NaN, reported and counted in bad, when it is missing, not a
// number or below zero.
func (r *reader) discharge(raw string, d Day, line int, u Unit, leftOut string, bad *leftOutCount) float64 {
	col, qName := r.cols.q+1, r.qName
	v, perr := parseNumber(raw, r.comma)
	switch {
	case perr == errMissing:
		bad.empty++
		what := "is empty"
		if t := strings.TrimSpace(raw); t != "" {
			what = fmt.Sprintf("holds %q, a no-data code read as missing", t)
			bad.code++
			bad.empty--
		}
		r.add(line, col, qName, ErrMissingDay, "%s: the discharge %s; %s", d, what, leftOut)
	case perr != nil:
		r.add(line, col, qName, ErrNotNumber, "%s: %q is not a number; %s", d, strings.TrimSpace(raw), leftOut)
		bad.text++
	case v < 0:
		r.add(line, col, qName, ErrNegative, "%s: %s is below zero; %s", d, strings.TrimSpace(raw), leftOut)
		bad.neg++
	default:
		q, err := ToM3s(v, u, r.opt.AreaKm2)
		if err == nil {
			return q
		}
		r.add(line, col, qName, err, "%s: the value was left out", d)
		bad.text++
	}
	r.value(raw)
	return math.NaN()
}

// sortOut moves inferences, days without a value and their count to their
// own list, so that Problems.Err() stays nil for a table without a wrong
// cell, and sorts both lists.
func (r *reader) sortOut() {
	imp := r.imp
	kept := imp.Problems[:0]
	for _, p := range imp.Problems {
		if p.Severity == problem.Note || errors.Is(p, ErrMissingDay) || errors.Is(p, ErrBadDays) {
			imp.Notices = append(imp.Notices, p)
			continue
		}
		kept = append(kept, p)
	}
	imp.Problems = kept
	sortProblems(imp.Problems)
	sortProblems(imp.Notices)
	if n := len(imp.Notices); n > 0 && errors.Is(imp.Notices[0], ErrBadDays) {
		imp.Notices = append(imp.Notices[1:], imp.Notices[0]) // the count closes the list
	}
}

func orderOr(o DateOrder, st stamp) string {
	if st.form == 'l' {
		return o.String()
	}
	return "calendar"
}

// build sorts the readings, reports order and duplicates, averages sub-daily
// readings and lays the days out as a record.
func build(imp *Import, rd []reading, opt Options, add func(int, int, string, error, string, ...any), dName string) {
	if len(rd) == 0 {
		return
	}
	less := func(a, b reading) bool {
		if a.day != b.day {
			return a.day < b.day
		}
		return a.sec < b.sec
	}
	var outOfOrder []int
	for i := 1; i < len(rd); i++ {
		if less(rd[i], rd[i-1]) {
			outOfOrder = append(outOfOrder, rd[i].line)
		}
	}
	if len(outOfOrder) > 0 {
		list := outOfOrder
		more := ""
		if len(list) > 5 {
			list, more = list[:5], fmt.Sprintf(" and %d more", len(outOfOrder)-5)
		}
		verb := "comes"
		if len(outOfOrder) > 1 {
			verb = "come"
		}
		add(outOfOrder[0], 0, dName, ErrUnsorted, "%s %s%s %s before a row above %s; the table was loaded in date order",
			plural(len(outOfOrder), "row", "rows"), joinInts(list), more, verb, plural(len(outOfOrder), "it", "them"))
		sort.SliceStable(rd, func(i, j int) bool { return less(rd[i], rd[j]) })
	}
	subDaily := false
	for _, r := range rd {
		if r.sec >= 0 {
			subDaily = true
			break
		}
	}
	// Duplicates: the same day (daily input) or the same time (sub-daily).
	kept := make([]reading, 0, len(rd))
	for i, r := range rd {
		if i > 0 && rd[i-1].day == r.day && (rd[i-1].sec == r.sec || !subDaily) {
			prev := kept[len(kept)-1]
			what := "day " + r.day.String()
			if subDaily {
				what = fmt.Sprintf("reading %s %02d:%02d", r.day, r.sec/3600, r.sec/60%60)
			}
			add(r.line, 0, dName, ErrDuplicateDay, "%s is also in row %d; row %d is kept and this row left out", what, prev.line, prev.line)
			continue
		}
		kept = append(kept, r)
	}
	rd = kept
	first, last := rd[0].day, rd[len(rd)-1].day
	n := int(last-first) + 1
	if n > MaxDays {
		add(rd[len(rd)-1].line, 0, dName, ErrBadDate, "the dates run from %s (row %d) to %s, more than %d years; check the years; nothing was loaded",
			first, rd[0].line, last, MaxDays/366)
		return
	}
	q := make([]float64, n)
	cnt := make([]int, n)
	for _, r := range rd {
		if !math.IsNaN(r.q) {
			k := int(r.day - first)
			q[k] += r.q
			cnt[k]++
		}
	}
	lo, hi, loDay := math.MaxInt, 0, Day(0)
	for i := range q {
		if cnt[i] == 0 {
			q[i] = math.NaN()
			continue
		}
		q[i] /= float64(cnt[i])
		if cnt[i] < lo {
			lo, loDay = cnt[i], first+Day(i)
		}
		hi = max(hi, cnt[i])
	}
	imp.Record = NewRecord(opt.File, first, q)
	if subDaily {
		imp.Readings = cnt
		if lo == hi {
			imp.Notes = append(imp.Notes, fmt.Sprintf("sub-daily readings averaged to daily means: %d readings per day", hi))
		} else if hi > 0 {
			imp.Notes = append(imp.Notes, fmt.Sprintf("sub-daily readings averaged to daily means: %d to %d readings per day (fewest on %s)", lo, hi, loDay))
		}
	}
	imp.Gaps = imp.Record.Gaps()
	if len(imp.Gaps) > 0 {
		m := imp.Record.Missing()
		imp.Notes = append(imp.Notes, fmt.Sprintf("%d gap %s in %d %s, not filled", m, plural(m, "day", "days"), len(imp.Gaps), plural(len(imp.Gaps), "gap", "gaps")))
	}
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func joinInts(v []int) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.Itoa(x)
	}
	if len(s) == 1 {
		return s[0]
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

var errMissing = errors.New("missing")

// parseNumber reads a discharge cell. Missing-value codes return errMissing.
func parseNumber(s string, comma bool) (float64, error) {
	t := strings.TrimSpace(s)
	if missingCodes[strings.ToLower(t)] {
		return 0, errMissing
	}
	if comma {
		if strings.Contains(t, ".") && strings.Contains(t, ",") {
			return 0, ErrNotNumber
		}
		t = strings.Replace(t, ",", ".", 1)
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, ErrNotNumber
	}
	return v, nil
}

func cell(row []string, i int) string {
	if i < 0 || i >= len(row) {
		return ""
	}
	return row[i]
}

func blankRow(row []string) bool {
	for _, c := range row {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// splitRows detects the delimiter and splits the input into non-blank rows,
// returning each row's line number.
func splitRows(data []byte, opt Options, imp *Import, add func(int, int, string, error, string, ...any)) ([][]string, []int) {
	delim := opt.Delimiter
	if delim == 0 {
		delim = detectDelimiter(data, opt.Decimal)
	}
	imp.Delimiter = delim
	var rows [][]string
	var lines []int
	if delim == ' ' {
		for i, ln := range strings.Split(string(data), "\n") {
			f := strings.Fields(ln)
			if len(f) == 0 {
				continue
			}
			rows = append(rows, f)
			lines = append(lines, i+1)
		}
		imp.Notes = append(imp.Notes, "columns separated by spaces")
		return rows, lines
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = delim
	cr.FieldsPerRecord = -1
	cr.LazyQuotes = true
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				add(pe.Line, pe.Column, "", ErrSyntax, "%v", pe.Err)
				if pe.Err == csv.ErrFieldCount {
					continue
				}
			} else {
				add(0, 0, "", ErrSyntax, "%v", err)
			}
			break
		}
		line, _ := cr.FieldPos(0)
		if blankRow(rec) {
			continue
		}
		rows = append(rows, rec)
		lines = append(lines, line)
	}
	names := map[rune]string{'\t': "tabs", ';': "semicolons", ',': "commas"}
	if nm, ok := names[delim]; ok {
		imp.Notes = append(imp.Notes, "columns separated by "+nm)
	}
	return rows, lines
}

// detectDelimiter returns the delimiter of data's first lines
// (engine/internal/delimiter), a space when none of tab, semicolon and
// comma splits them; a decimal comma set in the options rules out the
// comma.
func detectDelimiter(data []byte, dec DecimalMark) rune {
	var lines [][]byte
	for rest := data; len(lines) < headLines && len(rest) > 0; {
		ln := rest
		if i := bytes.IndexByte(rest, '\n'); i >= 0 {
			ln, rest = rest[:i], rest[i+1:]
		} else {
			rest = nil
		}
		if ln = bytes.TrimSuffix(ln, []byte{'\r'}); len(bytes.TrimSpace(ln)) > 0 {
			lines = append(lines, ln)
		}
	}
	mark := delimiter.AnyMark
	switch dec {
	case DecimalComma:
		mark = delimiter.CommaMark
	case DecimalPoint:
		mark = delimiter.PointMark
	}
	if d, ok := delimiter.Detect(lines, mark); ok {
		return rune(d)
	}
	return ' '
}

// headLines is how many non-blank lines the delimiter is judged on.
const headLines = 50
