// Package discharge holds daily river discharge records: import from CSV,
// TSV or text pasted from a spreadsheet, gaps and their filling, calendar and
// water years, runoff, and the look-up of a sample day's discharge.
//
// # Units
//
// Discharge is held in m³/s as the daily mean. Importers accept m³/s, L/s,
// m³/day, ft³/s (1 ft³/s = 0.028316846592 m³/s exactly, since 1 ft = 0.3048 m)
// and runoff depth in mm/day, which needs the catchment area A in km²
// (Q m³/s = mm/day × A / 86.4). Runoff over a period is reported in mm:
// R = Σ Q_d × 86.4 / A, since 1 m³/s for a day over 1 km² is 86.4 mm.
//
// # Pipeline
//
//  1. Read detects the UTF-8 byte-order mark, the delimiter (tab, semicolon or
//     comma, judged as the sample importer judges it by engine/internal/
//     delimiter, never a comma when Options.Decimal sets a decimal comma;
//     spaces when none of them splits the lines) and a decimal comma, finds
//     the date, time, discharge and unit
//     columns from the header (or takes date, discharge for a table with no
//     header), and settles the date order (ISO, day-first or month-first)
//     over the whole column. An order the column cannot settle is reported,
//     never guessed; Options.DateOrder decides it.
//  2. Every row is converted to m³/s with its unit. Sub-daily readings (rows
//     with a time of day) are averaged to daily means, and the number of
//     readings per day is stated in the notes.
//  3. Days are sorted. Unsorted rows, duplicated days, negative or non-numeric
//     discharge, mixed units and dates that do not parse each give a
//     Problem naming file, row and column; the rest of the table loads.
//     Import.Notices name each day whose cell is empty or a no-data code
//     (-999, n.a.) by date and line, the count of days left out for any
//     reason, and the date order with the line that decided it.
//  4. Days between the first and last that have no value are gaps (NaN).
//     Record.Gaps lists them; Record.Fill fills them only by a method the
//     caller chooses (linear interpolation over gaps of at most N days).
//  5. Record.Years splits the record into calendar years or water years that
//     start on a month the user picks; Record.Runoff gives runoff in mm.
//
// # Accepted input
//
// A header row names the columns; recognised names are, case-insensitively,
// "date", "day", "datetime", "timestamp" and "sample date" for the date,
// "time" and "hour" for a separate time of day, "Q", "discharge", "flow",
// "runoff", "cms", "cfs" and "l/s" for discharge, and "unit" or "units" for a
// per-row unit. The discharge unit may be written in the header ("Q (m3/s)",
// "Flow [L/s]"), in a units row under the names, in a unit column, or given by
// Options.Unit. For example
//
//	Date;Q (m3/s)
//	01.10.2020;1,25
//	02.10.2020;1,31
//
// loads two days at 1.25 and 1.31 m³/s; its date order is day-first only if
// the column shows it (a day above 12) or Options.DateOrder says so.
package discharge
