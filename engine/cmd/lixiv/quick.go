package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"lixiv/engine/notebook"
	"lixiv/engine/sample"
)

// quickBudget builds a budget with default settings from a samples file
// (text, or an .xlsx workbook whose sheet is named by sheet, "" for the
// first) and, when given, a discharge file and the area. Without discharge
// it stops at the per-sample apportionment and CO2 per litre.
func quickBudget(samplesPath, sheet, dischargePath string, area float64, set ...func(*notebook.SamplesSettings, *notebook.DischargeSettings)) (*notebook.Document, error) {
	name := strings.TrimSuffix(filepath.Base(samplesPath), filepath.Ext(samplesPath))
	d := notebook.NewBudget("Quick budget from " + filepath.Base(samplesPath))
	readTable := func(path, sheet string) (*notebook.Table, error) {
		b, err := os.ReadFile(path)
		if err != nil {
			return nil, err
		}
		if isWorkbook(path, b) {
			g, err := workbookGrid(b, path, sheet)
			if err != nil {
				return nil, err
			}
			return notebook.TableFromGrid(g)
		}
		return notebook.ReadTable(filepath.Base(path), string(b))
	}
	if dischargePath != "" && area <= 0 {
		return nil, usageError("quick: a discharge file needs -area (km², above zero)")
	}
	titles := map[string]string{"site": name, "samples": filepath.Base(samplesPath), "discharge": filepath.Base(dischargePath),
		"rain": "Sea-salt correction", "sources": "End-members (global preset)", "apportionment": "Sources of the cations",
		"fluxes": "Annual fluxes", "co2": "CO2 consumption"}
	for _, c := range d.Cells {
		c.Title = titles[c.ID]
	}
	d.Cell("site").Settings.(*notebook.SiteSettings).Name = name
	d.Cell("site").Settings.(*notebook.SiteSettings).AreaKm2 = area
	st, err := readTable(samplesPath, sheet)
	if err != nil {
		return nil, err
	}
	d.Cell("samples").Table = st
	if dischargePath == "" { // per-sample apportionment and CO2 per litre only
		for _, id := range []string{"site", "discharge", "fluxes"} {
			if err := d.Remove(id); err != nil {
				return nil, err
			}
		}
	} else {
		qt, err := readTable(dischargePath, "")
		if err != nil {
			return nil, err
		}
		d.Cell("discharge").Table = qt
	}
	ds := &notebook.DischargeSettings{}
	if c := d.Cell("discharge"); c != nil {
		ds = c.Settings.(*notebook.DischargeSettings)
	}
	for _, f := range set {
		f(d.Cell("samples").Settings.(*notebook.SamplesSettings), ds)
	}
	for _, id := range []string{"samples", "discharge"} {
		if c := d.Cell(id); c != nil {
			if err := c.Settings.Validate(); err != nil {
				return nil, usageError("quick: " + err.Error())
			}
		}
	}
	return d, nil
}

func runQuick(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("quick", flag.ContinueOnError)
	fs.SetOutput(stderr)
	samples := fs.String("samples", "", "samples table (CSV, TSV or .xlsx)")
	sheet := fs.String("sheet", "", "sheet of an .xlsx samples workbook (default the first)")
	dis := fs.String("discharge", "", "daily discharge table (CSV, TSV); optional")
	areaText := fs.String("area", "", "catchment area in km² (needed with -discharge)")
	save := fs.String("save", "", "write the budget, with its results, to this .lixiv.json file")
	asJSON := fs.Bool("json", false, "print the JSON report instead of the summary")
	order := fs.String("date-order", "auto", `how dates such as 03/04/2024 are read: auto, day-first or month-first (the "date order" setting)`)
	below := fs.String("below-detection", "half-limit", `what stands in for a value below detection: half-limit, zero, limit or leave-out (the "below detection limit" setting)`)
	unit := fs.String("default-unit", "", `unit of species columns that give none, such as mg/L (the "default unit" setting)`)
	var use columnList
	fs.Var(&use, "use-column", `header of the column to read where a species has two; repeat for several (the "columns to use" setting)`)
	if err := fs.Parse(args); err != nil {
		return usageError(err.Error())
	}
	if *samples == "" || fs.NArg() > 0 {
		return usageError("quick: give -samples FILE (and -discharge FILE -area KM2 for fluxes)")
	}
	area := 0.0
	if *areaText != "" {
		var err error
		if area, err = strconv.ParseFloat(*areaText, 64); err != nil || !(area > 0) {
			return usageError(fmt.Sprintf("quick: -area %q is not a positive number of km²", *areaText))
		}
	}
	d, err := quickBudget(*samples, *sheet, *dis, area, func(s *notebook.SamplesSettings, q *notebook.DischargeSettings) {
		s.DateOrder, s.BelowDetection, s.DefaultUnit, s.UseColumns = *order, *below, *unit, use
		q.DateOrder = *order
	})
	if err != nil {
		return err
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		return err
	}
	if *save != "" {
		if len(d.Pending()) == 0 {
			if err := d.Keep(); err != nil {
				return err
			}
		}
		if err := os.WriteFile(*save, d.Marshal(), 0o644); err != nil {
			return err
		}
	}
	if *asJSON {
		if _, err = stdout.Write(d.Report().JSON()); err != nil {
			return err
		}
	} else {
		summary(stdout, *samples, d)
		if *dis == "" {
			perSample(stdout, d)
		}
	}
	var bad, doubt []string
	if p := cellProblems(d); len(p) > 0 {
		bad = []string{filepath.Base(*samples) + ": " + strings.Join(p, ", ")}
	}
	if p := doubtfulCells(d); len(p) > 0 {
		doubt = []string{filepath.Base(*samples) + ": " + strings.Join(p, ", ")}
	}
	return problemsError(bad, doubt)
}

// columnList collects the repeated -use-column flag.
type columnList []string

func (c *columnList) String() string { return strings.Join(*c, ", ") }

func (c *columnList) Set(v string) error {
	*c = append(*c, v)
	return nil
}

// isWorkbook reports whether a file is an .xlsx workbook, by its name or
// its zip signature.
func isWorkbook(path string, b []byte) bool {
	return strings.EqualFold(filepath.Ext(path), ".xlsx") || bytes.HasPrefix(b, []byte("PK\x03\x04"))
}

// workbookGrid returns a sheet of a workbook split into cells, its rows
// numbered as in the spreadsheet. Rows the workbook reader cannot read are
// an error, so that none is lost silently.
func workbookGrid(b []byte, path, sheet string) (*sample.Grid, error) {
	g, err := sample.SheetGrid(b, filepath.Base(path), sheet)
	if err != nil {
		return nil, err
	}
	if len(g.Problems) > 0 {
		return nil, g.Problems
	}
	return g, nil
}

// perSample prints the silicate share of each cation and the CO2 per litre
// of every sample; a sample without them says so and gives its status.
func perSample(w io.Writer, d *notebook.Document) {
	r := d.Report()
	fmt.Fprintln(w, "  per sample: silicate share of Na, K, Ca, Mg; CO2 consumption per litre (µmol/L, silicate and carbonate)")
	for _, s := range r.Samples {
		fmt.Fprintf(w, "    %s %s %s:", s.Sample, s.Date, s.Status)
		some := false
		for _, c := range []string{"Na", "K", "Ca", "Mg"} {
			if x := s.Shares[c]["silicate"]; finite(x.Median) {
				fmt.Fprintf(w, " %s %s", c, fmtShare(x))
				some = true
			}
		}
		if !some {
			fmt.Fprintf(w, " no value: the sample was not apportioned (status %s; see the apportionment warnings)", s.Status)
		}
		if sil, carb := s.CO2PerL["silicate"].Median, s.CO2PerL["carbonate"].Median; s.CO2PerL != nil && (finite(sil) || finite(carb)) {
			fmt.Fprintf(w, "; CO2 %s / %s", fmtNumber(sil), fmtNumber(carb))
		}
		fmt.Fprintln(w)
	}
}

// finite reports whether x is a number (not NaN or infinite).
func finite(x notebook.Number) bool {
	return !math.IsNaN(float64(x)) && !math.IsInf(float64(x), 0)
}

// fmtShare writes a share with its interval, leaving out bounds it lacks.
func fmtShare(x notebook.Range) string {
	if !finite(x.Low) || !finite(x.High) {
		return fmt.Sprintf("%.2f", float64(x.Median))
	}
	return fmt.Sprintf("%.2f [%.2f, %.2f]", float64(x.Median), float64(x.Low), float64(x.High))
}

// fmtNumber writes x to 4 significant digits, or "no value".
func fmtNumber(x notebook.Number) string {
	if !finite(x) {
		return "no value"
	}
	return fmt.Sprintf("%.4g", float64(x))
}
