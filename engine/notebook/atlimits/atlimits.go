// Package atlimits builds the costliest budget the limits of engine/notebook
// allow, for the benchmark that shows it computes in bounded time
// (BenchmarkWorstAllowed) and for the page's timing harness, which loads
// it in the browser. It is made from the demo budget (a fictional
// catchment): its samples repeated under new names and dates, its daily
// discharge repeated over the longest record allowed, with a carbonate and
// a minerals cell added, so that every kind of cell that computes is there.
package atlimits

import (
	"fmt"

	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// The shape of the budget. Every cost is at its limit at once:
//   - Samples × Draws is notebook.MaxSampleDraws (the inverse model, whose
//     first stage takes every draw a sample may: draws = max_draws);
//   - Days is the longest record discharge.Read accepts (discharge.MaxDays);
//   - Replicates × (Samples + Days), for both bootstrap settings, is at
//     most notebook.MaxBootstrapWork;
//   - the rating curve takes seasonal terms, whose bootstrap replicates
//     evaluate the curve on every day (the costliest estimator), and the
//     rain ratios vary, so every draw of every sample redoes its rain
//     correction;
//   - the minerals cell balances every sample and fluxes each of its five
//     minerals with the same bootstrap.
const (
	Samples    = 4000
	Draws      = notebook.MaxSampleDraws / Samples
	Days       = discharge.MaxDays
	Replicates = notebook.MaxBootstrapWork / (Samples + Days)
)

// Budget returns the budget at the limits built from demo, the demo
// budget's file (examples/corrie-vale/corrie-vale.lixiv.json).
func Budget(demo []byte) (*notebook.Document, error) {
	d, err := notebook.Parse(demo, "corrie-vale")
	if err != nil {
		return nil, err
	}
	sc, dc := d.Cell("samples"), d.Cell("discharge")
	if sc == nil || dc == nil || sc.Table == nil || dc.Table == nil || len(sc.Table.Rows) == 0 || len(dc.Table.Rows) == 0 {
		return nil, fmt.Errorf("the demo budget has no samples or discharge table")
	}
	first := discharge.Date(1800, 10, 1)
	st := &notebook.Table{Columns: sc.Table.Columns, Units: sc.Table.Units}
	for i := range Samples {
		r := append([]string(nil), sc.Table.Rows[i%len(sc.Table.Rows)]...)
		r[0] = fmt.Sprintf("AL-%04d", i+1)
		r[1] = (first + discharge.Day(i*(Days-1)/(Samples-1))).String()
		st.Rows = append(st.Rows, r)
	}
	dt := &notebook.Table{Columns: dc.Table.Columns, Units: dc.Table.Units}
	for k := range Days {
		dt.Rows = append(dt.Rows, []string{(first + discharge.Day(k)).String(), dc.Table.Rows[k%len(dc.Table.Rows)][1]})
	}
	d.Title = "At the limits (from Corrie Vale)"
	for _, k := range []notebook.Kind{notebook.KindCarbonate, notebook.KindMinerals} {
		if _, err := d.Add(k, -1); err != nil {
			return nil, err
		}
	}
	for _, err := range []error{
		d.SetTable("samples", st), d.SetTable("discharge", dt),
		d.SetParam("apportionment", "model", "inverse"),
		d.SetParam("apportionment", "draws", fmt.Sprint(Draws)),
		d.SetParam("apportionment", "target_ess", fmt.Sprint(Draws)),
		d.SetParam("apportionment", "max_draws", fmt.Sprint(Draws)),
		d.SetParam("rain", "rain_ratio_uncertainty_percent", "10"),
		d.SetParam("fluxes", "estimator", "rating-curve"),
		d.SetParam("fluxes", "seasonal_terms", "true"),
		d.SetParam("fluxes", "bootstrap", fmt.Sprint(Replicates)),
		d.SetParam("fluxes", "series_bootstrap", fmt.Sprint(Replicates)),
	} {
		if err != nil {
			return nil, err
		}
	}
	return d, nil
}
