// Package notebook is the budget document of Lixiv: an ordered list of
// cells, each a step of a catchment weathering budget, with the graph of
// which cell reads which, recomputation of only what an edit touches, and
// the budget file format.
//
// # Document
//
// A Document holds Cells in order. A cell has a Kind (site, samples,
// discharge, carbonate, atmosphere, sources, apportionment, fluxes, co2,
// minerals, comparison, note, chart),
// an id that other cells name it by, a title the user chooses, Settings
// (one struct per kind; every field has a JSON key), an optional data Table
// kept as the text the user typed, an optional Section, and a "uses" map
// from input roles to cell ids. A role missing from "uses" is filled by the
// nearest cell above of the role's kind in the cell's own section, else by
// the nearest shared (section-less) cell above, so a plain top-to-bottom
// budget needs no "uses" at all. A chart names the columns it plots as
// "cell.table.column".
//
// # Sections and comparisons
//
// Several catchments, or one catchment over several periods, share one
// document through sections (section.go): each catchment's cells carry its
// section's name, cells shared by every section (an end-member table,
// notes) carry none. A comparison cell (calc_compare.go) reads the co2
// cells of the sections its settings name — treated and control, and for a
// before-after-control-impact design both before — and gives, through
// engine/compare, the difference of their cation fluxes by source and CO2
// consumption per km² and per mm of runoff with intervals from paired
// replicates, the feedstock's CO2 potential and the share of it the extra
// uptake represents, and the monitoring design.
//
// Edits go through the Document (SetParam, SetTable, SetValue, SetUses,
// SetTitle, Add, Insert, Remove, Move, or Edit for anything else). Each
// edit is checked (settings ranges, table shape, no cycle in the graph),
// applied to a copy and only then installed; a refused edit leaves the
// document as it was. Every accepted edit changes Revision and marks the
// cell and everything downstream of it stale. Recompute computes the stale
// cells in dependency order and reuses every other cell's cached Output;
// Step computes one cell at a time, so a page can yield between cells; a
// context cancels and a callback reports Progress. Runs counts how often
// each cell has computed, which tests use to prove an edit reruns only
// what it must. A cell's computation failing gives that cell the Problem
// state, with the message naming the row and column where it can; cells
// below it wait. A panic inside a computation becomes a Problem, never a
// crash.
//
// A cell that lacks what it cannot compute without — the site's area, the
// samples or discharge table, the end-members — waits (a *NeedError, state
// Waiting), and so do the cells that must read it; a cell for which it is
// an optional input computes without it and says so in a warning. Needs
// lists what a cell waits for, through the cells it reads, without
// computing. NewBudget gives a budget of the usual cells that waits for
// exactly those. Messages about a setting name it by its label
// (SettingLabel, *SettingError), as the page shows it; a budget file's
// problems name its key. The samples and discharge cells say in
// Output.Reading what they took each column of their table as.
//
// A cell's Output.Messages say, typed and positioned (severity, effect,
// file, line as the file counts it, column, value, sample, row of the
// cell's table), how it read its input: what it could not read or refused,
// what it substituted or left out, what it inferred. A sample without an
// ion a cell needs is left out of that cell, and the cells that read it,
// by name (no Cl: the atmosphere cell; no Ca for gypsum sulfate: the
// apportionment) and kept everywhere else. The report lists the messages
// under "problems", "warnings" and "messages".
//
// The computation of each kind is a ComputeFunc registered with Register;
// the built-in ones call the engine packages sample, discharge, correct,
// mix, flux, co2, carbonate and mineral. Their typed results (Site,
// Samples, Flow, Atmosphere, []mix.EndMember, Apportioned, Fluxes,
// CarbonateSystem, MineralBalance) travel in Output.Value to the cells
// below; the tables and figures in Output are what the page shows, the
// command line writes and charts plot.
//
// # Reproducibility
//
// Results depend on the document alone: every seed (apportionment draws,
// bootstrap) and option is a setting stored in the file, and the engine
// version is written in its header. Keep stores a Snapshot of the results —
// the headline figures and a SHA-256 checksum over every output table,
// figure and warning (numbers rounded to 10 significant digits of the
// largest value in their column, so that native and WebAssembly runs, and
// sums merely reordered, agree) — and Verify compares a rerun with it.
//
// # File format
//
// A budget file (extension .lixiv.json) is one JSON object written with
// two-space indentation and a stable key order: "format" ("lixiv-budget"),
// "version" (2 when the budget has sections or a comparison, else 1),
// "engine", "title", "cells" (in document order), the
// optional "results" snapshot, then any unknown top-level fields in sorted
// order. A cell is written as "id", "kind", "title", "section" (when it
// has one), "uses", "settings"
// (fields in declaration order, then unknown settings), "table" and unknown
// cell fields. A table is "columns" and "units" (one line each) and "rows",
// one row per line, each cell a JSON number when its text is exactly one
// and a string otherwise, so "<0.01", "n.d." and "0,25" survive unchanged.
// Unknown fields at every level survive a load and save. The full schema is
// in SCHEMA.md beside this file.
//
// Parse refuses what cannot be a budget with a *FileError naming the file
// and line: text that is not JSON, nesting deeper than MaxDepth, a missing
// or foreign "format", a version newer than FormatVersion, cells that form a
// loop (*CycleError). Older versions load through explicit migrations (v0,
// the first draft layout, migrates to v1; v1 to v2, which adds sections). A cell that cannot be read — an
// unknown kind, a value of the wrong type, a setting out of range, a
// malformed table — loads as a broken cell that keeps its raw JSON and the
// reason, is written back unchanged and computes to a Problem; the rest of
// the budget still opens. Loading never runs anything the file holds.
//
// # Limits
//
// Limits (limits.go, listed in SCHEMA.md) keep a file, a paste or a setting
// from asking for unbounded work or memory: table sizes, samples × draws,
// bootstrap replicates × (samples + days of discharge). An input beyond one
// is refused with a message naming the setting as the page labels it
// (SettingName), and every long loop honours the run's context.
package notebook
