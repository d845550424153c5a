// Package xlsxreader reads the sheets of an Office Open XML workbook
// (.xlsx) row by row.
//
// It is a copy of the general-purpose library github.com/thedatashed/xlsxreader
// v1.2.8 (MIT licence, see LICENSE in this directory), kept inside the
// engine with one change: whether a number format is a date is decided by
// a small scanner (isDateFormatCode) instead of a regular expression, so
// the page's WebAssembly module no longer carries Go's regexp package and
// the Unicode tables it pulls in (some 87 KB of the first load, compressed).
// engine/sample is its only user.
package xlsxreader
