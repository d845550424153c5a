package notebook

import (
	"fmt"
	"slices"
)

// inputCell returns the cell that fills role of cell c, or nil.
func (d *Document) inputCell(c *Cell, role string) *Cell {
	for _, r := range c.Kind.Roles() {
		if r.Name == role {
			if id, err := d.resolve(c, r); err == nil && id != "" {
				return d.Cell(id)
			}
		}
	}
	return nil
}

// drawSource is what makes an apportionment's draw d: its model, draws and
// seed, its end-member table and its rain correction.
type drawSource struct {
	app     ApportionmentSettings
	sources string // the end-member table as CSV
	atm     AtmosphereSettings
	rain    string // the rain table as CSV (rain method)
}

// drawSourceOf finds the draw source of a budget's co2 cell; ok is false
// when a cell of the chain is missing.
func drawSourceOf(d *Document, co2ID string) (ds drawSource, ok bool) {
	app := d.inputCell(d.Cell(co2ID), "apportionment")
	if app == nil {
		return ds, false
	}
	src, atm := d.inputCell(app, "sources"), d.inputCell(app, "atmosphere")
	if src == nil || atm == nil {
		return ds, false
	}
	ds.app = *app.Settings.(*ApportionmentSettings)
	ds.sources = src.Table.CSV()
	ds.atm = *atm.Settings.(*AtmosphereSettings)
	ds.atm.RatioSource = "" // text for readers only
	if ds.atm.Method == "rain" && atm.Table != nil {
		ds.rain = atm.Table.CSV()
	}
	return ds, true
}

// sharedDraws returns "" when draw d of every compared budget's
// apportionment stands for the same end-member ratios, and the same rain
// ratios and ET factor, in every sample of every budget — the forward
// model with one number of draws and seed, one end-member table and one
// rain correction — and otherwise says why not, as the end of a sentence.
// The inverse model never shares its draws: each sample's weighted draws
// are its own.
func sharedDraws(d *Document, bs []compared) string {
	var first drawSource
	for k, c := range bs {
		ds, ok := drawSourceOf(d, c.cell)
		if !ok {
			return fmt.Sprintf("the %s budget's apportionment could not be traced", roleWords[c.role])
		}
		switch ds.app.Model {
		case "forward":
		case "inverse":
			return fmt.Sprintf("the %s budget apportions with the inverse model, whose draws belong to their sample (each sample's weighted draws are its own; draw d of one sample is not draw d of another)", roleWords[c.role])
		case "catchment":
			return fmt.Sprintf("the %s budget apportions with the catchment-wide model, which learns its end-member ratios from its own samples (draw d of one budget is not draw d of another)", roleWords[c.role])
		default:
			return fmt.Sprintf("the %s budget apportions with the %s model, whose draws are not shared between budgets", roleWords[c.role], ds.app.Model)
		}
		if k == 0 {
			first = ds
			continue
		}
		pair := fmt.Sprintf("the %s and %s budgets", roleWords[bs[0].role], roleWords[c.role])
		a, b := first.app, ds.app
		switch {
		case a.Model != b.Model:
			return fmt.Sprintf("%s apportion with different models (%s and %s)", pair, a.Model, b.Model)
		case a.Draws != b.Draws:
			return fmt.Sprintf("%s apportion with different numbers of draws (%d and %d)", pair, a.Draws, b.Draws)
		case a.Seed != b.Seed:
			return fmt.Sprintf("%s apportion with different seeds (%d and %d)", pair, a.Seed, b.Seed)
		case a.Model == "inverse" && !slices.Equal(a.Tracers, b.Tracers):
			return fmt.Sprintf("%s fit different tracers", pair)
		case first.sources != ds.sources:
			return fmt.Sprintf("%s read different end-member tables", pair)
		case first.atm != ds.atm || first.rain != ds.rain:
			return fmt.Sprintf("%s correct for rain differently", pair)
		}
	}
	return ""
}
