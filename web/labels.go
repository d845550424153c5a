package web

import (
	"strconv"
	"strings"

	"lixiv/engine/notebook"
)

// The page shows what the engine names by the engine's labels: settings by
// notebook.SettingLabel, output columns by notebook.ColumnLabel (from the
// kind's descriptor). Files written by the page (CSV, SVG) keep the
// engine's names.

// ColumnLabel labels an output column of table, of a cell of kind k, with
// its unit: "atmospheric share of Na (fraction)".
func ColumnLabel(k notebook.Kind, table string, col *notebook.Column) string {
	return notebook.ColumnUnitLabel(k, table, col)
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
	return title + ": " + ColumnLabel(c.Kind, parts[1], col)
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
