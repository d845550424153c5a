package web

import (
	"strconv"
	"strings"

	"lixiv/engine/notebook"
)

// The page labels what the engine names: output columns ("Na_atm_share")
// and chart references ("co2.per-litre.silicate"). The labels live here,
// keyed by the engine's name; a name without a label is shown as it is.
// Settings are labelled by the engine (notebook.SettingLabel), which names
// them so in its messages too. Files written by the page (CSV, SVG) keep
// the engine's names.

// columnLabels labels output columns, by "table.column" first, then by
// the column name alone.
var columnLabels = map[string]string{
	"per-litre.silicate":   "silicate CO2 consumption",
	"per-litre.carbonate":  "carbonate CO2 consumption",
	"years.consumption":    "CO2 consumption",
	"years.per_km2":        "CO2 consumption per km²",
	"years.days with data": "share of days with data",
	"Cl_atm":               "atmospheric Cl",
	"Na_atm":               "atmospheric Na",
	"K_atm":                "atmospheric K",
	"Ca_atm":               "atmospheric Ca",
	"Mg_atm":               "atmospheric Mg",
	"SO4_atm":              "atmospheric SO4",
	"Cl_excess":            "Cl above the rain input",
	"Na_atm_share":         "atmospheric share of Na",
	"SO4_sulfide":          "SO4 from sulfide",
	"shares.ESS":           "effective sample size",
	"mass_flux":            "mass flux",
	"mass_yield":           "mass yield",
	"bias_factor":          "bias factor",
	"R2":                   "R²",
	"s":                    "s (residual)",
	"relative_width":       "interval width ÷ median",
}

// sourceWords name the sources in column names such as "Na_silicate".
var sourceWords = map[string]string{
	"atmosphere": "from the atmosphere", "evaporite": "from evaporite",
	"silicate": "from silicate", "carbonate": "from carbonate",
}

// boundWords name the interval bounds of "_low" and "_high" columns.
var boundWords = []struct{ suffix, words string }{{"_low", ", 2.5 %"}, {"_high", ", 97.5 %"}}

// ColumnName labels output column name of table (without its unit).
func ColumnName(table, name string) string {
	for _, b := range boundWords {
		if base := strings.TrimSuffix(name, b.suffix); base != name && base != "" {
			return ColumnName(table, base) + b.words
		}
	}
	if l, ok := columnLabels[table+"."+name]; ok {
		return l
	}
	if l, ok := columnLabels[name]; ok {
		return l
	}
	if i := strings.IndexByte(name, '_'); i > 0 {
		if w, ok := sourceWords[name[i+1:]]; ok {
			return name[:i] + " " + w
		}
	}
	if name == "per_km2" {
		return "per km²"
	}
	return name
}

// ColumnLabel labels an output column of table with its unit:
// "atmospheric share of Na (fraction)".
func ColumnLabel(table string, col *notebook.Column) string {
	l := ColumnName(table, col.Name)
	if col.Unit != "" {
		l += " (" + col.Unit + ")"
	}
	return l
}

// RefLabel labels a chart reference "cell.table.column" with the title of
// the cell and the column's label and unit.
func RefLabel(d *notebook.Document, ref string) string {
	parts := strings.SplitN(ref, ".", 3)
	if len(parts) != 3 {
		return ref
	}
	c := d.Cell(parts[0])
	col := d.Output(parts[0]).Table(parts[1]).Column(parts[2])
	if c == nil || col == nil {
		return ref
	}
	title := c.Title
	if title == "" {
		title = KindLabel(c.Kind)
	}
	return title + ": " + ColumnLabel(parts[1], col)
}

// months are the short names of the months, January first.
var months = [...]string{"Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"}

// WaterYear says what a year label of a table means when years start in
// month first (1-12) rather than January: "2021" becomes
// "2021 (water year Oct 2020–Sep 2021)". Other labels are returned as
// they are.
func WaterYear(label string, first int) string {
	y, err := strconv.Atoi(strings.TrimSpace(label))
	if err != nil || first < 2 || first > 12 {
		return label
	}
	return label + " (water year " + months[first-1] + " " + strconv.Itoa(y-1) + "–" + months[first-2] + " " + strconv.Itoa(y) + ")"
}

// waterYearStart returns the first month of the reporting year of cell id:
// that of the site cell it reads, else of the nearest site cell above it,
// else of the first site cell; 1 when there is none.
func waterYearStart(d *notebook.Document, id string) int {
	var above, first *notebook.Cell
	site := (*notebook.Cell)(nil)
	for _, c := range d.Cells {
		if c.Kind == notebook.KindSite {
			if first == nil {
				first = c
			}
			if site == nil {
				above = c
			}
		}
		if c.ID == id && site == nil {
			site = above
			if u := c.Uses["site"]; u != "" && d.Cell(u) != nil {
				site = d.Cell(u)
			}
			if site == nil {
				site = first
			}
		}
	}
	if site == nil {
		site = first
	}
	if site == nil || site.Settings == nil {
		return 1
	}
	for _, p := range notebook.Params(site.Settings) {
		if p.Key == "water_year_start_month" {
			if m, err := strconv.Atoi(p.Value); err == nil && m >= 1 && m <= 12 {
				return m
			}
		}
	}
	return 1
}
