// Package problem names how serious a message about the user's input is
// and what the engine did about it. The importers (engine/sample,
// engine/discharge) and the budget (engine/notebook) tag each of their
// positioned messages with a Severity and an Effect, so that the page, the
// command-line summary and the JSON report sort them alike without reading
// their text.
package problem

import "lixiv/engine/internal/enum"

// Severity says how much a message matters to the results.
type Severity int

// Severities. The zero value is Warning.
const (
	// Warning: a rule changed or left out part of the input (a value
	// below detection substituted, a no-data code read as missing, a sample
	// left out of a cell for lack of an ion it needs).
	Warning Severity = iota
	// Error: the input holds something that could not be read or was
	// refused (a cell that is not a number, two columns of one species, a
	// date column whose order cannot be told); the user has to act.
	Error
	// Note: something was inferred (the date order, a unit, the decimal
	// mark, HCO3 taken as alkalinity) and is said so that it can be checked.
	Note
)

var severityNames = [...]string{"warning", "problem", "note"}

// String names the severity as the page and the report write it:
// "problem", "warning" or "note".
func (s Severity) String() string { return enum.Name(s, severityNames[:], "warning") }

// MarshalText writes the severity's name.
func (s Severity) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// Effect says what was done to the input.
type Effect int

// Effects. The zero value is Unread.
const (
	// Unread: a cell, row or column was not read (kept as text).
	Unread Effect = iota
	// Substituted: a value stands in for one the file did not give (half
	// the detection limit, a unit from the settings).
	Substituted
	// LeftOut: a value, day or sample was left out of a calculation.
	LeftOut
	// Inferred: the reading rests on an inference from the file (date
	// order, unit, decimal mark, a species read as another).
	Inferred
	// Refused: the input was refused until the user chooses (two columns
	// of one species, an ambiguous date column).
	Refused
	// Flagged: kept, and marked for the user to check (a charge balance
	// above the flag limit).
	Flagged
)

var effectNames = [...]string{"unread", "substituted", "left out", "inferred", "refused", "flagged"}

// String names the effect.
func (e Effect) String() string { return enum.Name(e, effectNames[:], "unread") }

// MarshalText writes the effect's name.
func (e Effect) MarshalText() ([]byte, error) { return []byte(e.String()), nil }
