package notebook

import "strings"

// NewBudget returns a budget of the usual cells in order, with default
// settings: site ("site"), samples ("samples"), discharge ("discharge"),
// the sea-salt rain correction ("rain"), end-members filled from the
// global preset ("sources"), apportionment ("apportionment"), fluxes
// ("fluxes") and CO2 ("co2"). Until the user gives the catchment area,
// the samples and the discharge record, its cells wait, and Needs says
// for what.
func NewBudget(title string) *Document {
	d := New(title)
	for _, c := range []struct {
		k  Kind
		id string
	}{{KindSite, "site"}, {KindSamples, "samples"}, {KindDischarge, "discharge"}, {KindAtmosphere, "rain"},
		{KindSources, "sources"}, {KindApportionment, "apportionment"}, {KindFluxes, "fluxes"}, {KindCO2, "co2"}} {
		cell := NewCell(c.k, c.id, "")
		if c.k == KindSources {
			cell.Table, _ = SourcesTable("global") // a built-in preset: it exists
		}
		d.Cells = append(d.Cells, cell)
	}
	return d
}

// TableKind says which kind of cell takes a table read from a file: a
// discharge record (a date column and a discharge column, and no major
// ion) or, otherwise, samples.
func TableKind(t *Table) Kind {
	hasQ, hasIon := false, false
	for _, col := range t.Columns {
		l := strings.ToLower(strings.TrimSpace(col))
		f := strings.FieldsFunc(l, func(r rune) bool { return r == ' ' || r == '(' || r == '[' || r == '_' })
		first := ""
		if len(f) > 0 {
			first = f[0]
		}
		switch first {
		case "q", "discharge", "flow", "runoff":
			hasQ = true
		case "ca", "na", "mg", "k", "cl", "so4", "hco3", "alkalinity", "calcium", "sodium":
			hasIon = true
		}
	}
	if hasQ && !hasIon {
		return KindDischarge
	}
	return KindSamples
}

// PresetOf returns the name of the preset whose end-member table t is, or
// "" when it is none of them (edited, or typed).
func PresetOf(t *Table) string {
	if t == nil {
		return ""
	}
	for _, p := range Presets {
		if pt, err := SourcesTable(p); err == nil && pt.CSV() == t.CSV() {
			return p
		}
	}
	return ""
}
