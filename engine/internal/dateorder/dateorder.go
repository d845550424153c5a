// Package dateorder settles, from a whole column, how dates written as
// three numbers with the year last (03/04/2021) are to be read: a first
// number above 12 proves the day comes first, a second number above 12
// proves the month does (common practice). The sample and discharge
// importers both decide through Evidence, so a table reads the same in
// either.
package dateorder

// Verdict is what a column proves about the order of its year-last dates.
type Verdict int

// Verdicts.
const (
	None       Verdict = iota // no year-last date in the column
	Either                    // every date reads both ways: the user must choose
	DayFirst                  // some date reads only day-first, none only month-first
	MonthFirst                // some date reads only month-first, none only day-first
	Conflict                  // some date reads only day-first and another only month-first
)

// Witness is a date cell: where it stands, its text and its first two
// numbers as written.
type Witness struct {
	Line int    // line as the file counts it
	Raw  string // the cell as written
	A, B int    // the first and second of the three numbers
}

// Evidence gathers the year-last dates of a column. The zero value is
// ready to use.
type Evidence struct {
	N          int     // year-last dates seen
	First      Witness // the first of them
	DayFirst   Witness // the first that reads only day-first (Line 0: none)
	MonthFirst Witness // the first that reads only month-first (Line 0: none)
}

// Add records the year-last date w.
func (e *Evidence) Add(w Witness) {
	if e.N == 0 {
		e.First = w
	}
	e.N++
	if w.A > 12 && e.DayFirst.Line == 0 {
		e.DayFirst = w
	}
	if w.B > 12 && e.MonthFirst.Line == 0 {
		e.MonthFirst = w
	}
}

// Verdict returns what the dates added prove.
func (e *Evidence) Verdict() Verdict {
	df, mf := e.DayFirst.Line > 0, e.MonthFirst.Line > 0
	switch {
	case e.N == 0:
		return None
	case df && mf:
		return Conflict
	case df:
		return DayFirst
	case mf:
		return MonthFirst
	}
	return Either
}

// DayMonth reads the first two numbers a and b of a date written with the
// year last as day and month: day first when dayFirst, month first when
// monthFirst; ok is false when neither is chosen.
func DayMonth(a, b int, dayFirst, monthFirst bool) (day, month int, ok bool) {
	switch {
	case dayFirst:
		return a, b, true
	case monthFirst:
		return b, a, true
	}
	return 0, 0, false
}
