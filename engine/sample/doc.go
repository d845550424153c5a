// Package sample holds tables of water samples and reads them from the
// files laboratories send: CSV, TSV and cells pasted from a spreadsheet.
//
// # Units
//
// Every concentration in a Sample is in µmol/L, except alkalinity (chem.Alk),
// which is in µeq/L. Discharge at sampling is in m³/s, temperature in °C,
// conductivity in µS/cm; pH and 87Sr/86Sr have no unit. A quantity that was
// not measured is NaN, never 0. ppm and ppb are read as mg/L and µg/L, which
// holds for fresh water (density within 0.5 % of 1 kg/L from 0 to 30 °C;
// common practice); the page states this assumption.
//
// # Pipeline
//
// Read and ParseText go through these steps:
//
//  1. Decode: a UTF-8 byte order mark is dropped, UTF-16 text (spreadsheet
//     "Unicode text") is converted, a file that is not valid UTF-8 is read
//     as Latin-1, and lone carriage returns end lines. Binary files and
//     .xlsx workbooks are reported as ErrNotTable.
//  2. Delimiter: the one of tab, semicolon and comma that gives the most
//     records (lines, joined where a quoted field holds a line break) with
//     the same number of fields in the first 64 KiB, among those that leave
//     the fewest quotes inside unquoted fields, unless Options.Comma sets
//     it; a comma is not a candidate when Options.Decimal is a comma
//     (engine/internal/delimiter, shared with the discharge importer).
//     Fields may be quoted ("a, b"), with "" for a quote and line breaks
//     inside quotes.
//  3. Header: the first line with at least half as many non-empty fields
//     (trailing empty fields and white space are not counted) as the
//     typical record that does not start with "#"; lines above it are kept
//     in Table.Preamble.
//  4. Columns: each header is read as a species with its unit ("Ca (mg/L)",
//     "Ca2+ [µmol/L]", "Calcium mg/l", "Ca_umol_L", "NO3-N (mg/L)",
//     "Alkalinity as CaCO3"), or as sample, site, date, time of day,
//     discharge, pH (field pH preferred over lab pH), temperature,
//     conductivity or 87Sr/86Sr. A units row under the names is recognised
//     when its cells read as units and none holds a number. Options.Map
//     overrides a header; Options.Units gives a unit the file lacks. A
//     column that cannot be used (no unit, an unknown unit, conflicting
//     header and units-row units, a duplicated species) is reported and
//     kept as text. Unknown columns are kept as text in Sample.Meta; a table
//     with no species column is reported (ErrNoColumn) with the headers not
//     recognised, and Table.Require does the same for other columns a
//     caller needs (a date).
//  5. Decimal mark: a comma when the delimiter is not a comma and the
//     numeric cells use it ("0,25"), unless Options.Decimal sets it. In a
//     decimal-comma file a point is read as a decimal mark too; in a
//     decimal-point file "1,234" is not a number and is reported.
//  6. Rows: numbers are converted to the internal units. "<0.01", "< DL",
//     "<LOD", "bdl" are censored: the limit is kept in Sample.Censored and
//     C holds the substitute chosen by Options.Policy (half the limit by
//     default; Table.Substitute reruns with another). Empty cells, "NA",
//     "n.a.", "N/A", "n.d.", "-", "--", -999 and -9999 are missing (NaN).
//     A negative concentration or discharge, text in a numeric column, or
//     a value out of range is reported and left missing.
//  7. Dates: ISO 8601 (2024-03-05, 2024-03-05T10:30:00Z), 05-Mar-2024,
//     Excel serial days, and three-number dates such as 05/03/2024. The
//     order of a three-number date comes from Options.DateOrder, a format
//     in the units row or header ("dd/mm/yyyy"), or the column itself (a
//     first number above 12 means day first). A column where every date
//     could be read either way is reported as ErrAmbiguousDate and its
//     dates are kept as text until the user chooses the date order; it is
//     never guessed.
//  8. Problems: each is a *Problem with file, line, column number and
//     header, unwrapping to one of the Err* sentinels, collected in
//     Table.Problems in file order; Table.Problems.Err() is nil when there
//     are none. The rest of the table always loads, and nothing the file
//     held is dropped: unusable cells stay as text in Sample.Meta or in the
//     problem's Value. A species in two or more columns is refused, naming
//     them all, unless Options.Use names the one to read.
//  9. Notes: Table.Notes names, with file, line, column and an example
//     value, everything read in place of what the file wrote or inferred
//     from it: per column the values below detection (count, lines, the
//     substitute and its setting) and the cells read as missing ("n.d.",
//     -999), the date order and the line that decided it, the decimal
//     comma, the unit of each column and where it came from (header, units
//     row, Options.Units), a cell that gives its own unit, comment lines.
//     Every Problem carries a Severity and an Effect (engine/problem), and
//     messages name settings by the page's labels (SettingLabels).
//
// ReadXLSX reads one sheet of an .xlsx workbook (Sheets lists them)
// through the same steps from step 3, row by row: Line is then the
// spreadsheet row and Col the column (A = 1). A header written over rows
// of merged cells is joined into one row (a column takes the unit of a
// merged heading above it), and reading the first of several sheets is a
// note naming the others. Number cells keep their
// value; cells formatted as dates or times arrive as ISO 8601 text, read
// from the serial day the workbook stores (to the millisecond). A file
// that is not a workbook, or a sheet it lacks, is an error (ErrNotWorkbook,
// ErrNoSheet) naming the file and the sheet. SheetText gives a sheet as
// tab-separated text, for callers that keep the cells as typed.
//
// ReadGrid and SplitText stop after the units row of step 4 and return the
// cells as text (a Grid), with the line each row starts on; SheetGrid does
// the same for a worksheet. Callers that keep a table as the user wrote it
// read through them, so that they split a file as Read does.
//
// Table.WriteCSV writes the normalised table (µmol/L, µeq/L for
// alkalinity, "<limit" for censored values), which Read reads back to the
// same table.
package sample
