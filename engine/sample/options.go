package sample

import "math"

var nan = math.NaN()

// Policy says what number stands in for a value reported below detection
// when it enters arithmetic. The zero value is HalfLimit, the common default
// (common practice; Helsel 2005, Nondetects and Data Analysis, warns that
// any substitution biases statistics, so the count of censored values is
// always reported with a result).
type Policy int

// Substitution policies.
const (
	HalfLimit Policy = iota // half the detection limit (default)
	Zero                    // zero
	AtLimit                 // the detection limit itself
	LeaveOut                // NaN: the value is treated as missing
)

// String names the policy.
func (p Policy) String() string {
	switch p {
	case HalfLimit:
		return "half the limit"
	case Zero:
		return "zero"
	case AtLimit:
		return "the limit"
	case LeaveOut:
		return "left out"
	}
	return "unknown policy"
}

// Value returns the substitute for a value below the detection limit lim.
// An unknown limit (NaN) gives NaN except under Zero.
func (p Policy) Value(lim float64) float64 {
	switch p {
	case Zero:
		return 0
	case AtLimit:
		return lim
	case LeaveOut:
		return nan
	}
	return lim / 2
}

// DateOrder says how to read dates written as three numbers such as
// 03/04/2024. The zero value, DateAuto, reads ISO dates and dates whose order
// the column itself proves (a first number above 12 means day first, a
// second number above 12 means month first); a column where every date
// could be either is reported as ErrAmbiguousDate and left unread until the
// caller sets DayFirst or MonthFirst.
type DateOrder int

// Date orders.
const (
	DateAuto   DateOrder = iota // decide from the column, never guess
	DayFirst                    // dd/mm/yyyy
	MonthFirst                  // mm/dd/yyyy
)

// String names the order.
func (o DateOrder) String() string {
	switch o {
	case DayFirst:
		return "day first"
	case MonthFirst:
		return "month first"
	}
	return "auto"
}

// Options control Read. The zero value detects the delimiter and decimal
// mark, substitutes half the limit for censored values and refuses to guess
// an ambiguous date order.
type Options struct {
	// Comma is the field delimiter: ',', ';' or '\t'. 0 detects it.
	Comma rune
	// Decimal is the decimal mark: '.' or ','. 0 detects it (a comma is taken
	// only when the delimiter is not a comma and numbers use it).
	Decimal rune
	// Policy is the substitute for values below detection.
	Policy Policy
	// DateOrder resolves dates such as 03/04/2024.
	DateOrder DateOrder
	// Units gives the unit of species columns whose header and units row
	// name none, keyed by header text (or "" for every such column), for
	// example {"": "mg/L"}. Without it such columns are kept as metadata and
	// reported as ErrNoUnit.
	Units map[string]string
	// Map assigns a meaning to a header the importer does not recognise or
	// reads differently, keyed by header text; the value is read as a header
	// would be ("Ca (mg/L)", "Alkalinity as CaCO3 mg/L", "date", "site",
	// "Q (L/s)"). An empty value keeps the column as metadata.
	Map map[string]string
	// Use names, by header text, the column to read when a species has
	// more than one column (two Ca columns); the others are kept as text.
	// Without it every column of a repeated species is refused (kept as
	// text) and reported as ErrDuplicateColumn naming them all.
	Use []string
	// Line, when set, maps the lines of the text given to Read to the
	// lines messages should name: those of the file the text was taken
	// from. Every line the importer writes (Problem.Line, the lines quoted
	// in details, Sample.Line, Table.Header) goes through it.
	Line func(int) int
	// MaxProblems caps the problems kept in Table.Problems; the rest are
	// counted in a final entry. 0 means 10000.
	MaxProblems int
}
