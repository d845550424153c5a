package synth

import (
	"strings"

	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// Goldens are small budgets kept under testdata/budgets/ that exercise
// settings the examples leave at their defaults: the forward model, a
// critical chloride, an exact rain correction, measured rain (with the
// uncertainty of its ratios and ET factor), human excess chloride, a
// budget period, sulfide sulfate, the long time scale and a chart.
var Goldens = []Example{
	{"testdata/budgets/small-forward.lixiv.json", smallForward},
	{"testdata/budgets/small-rain.lixiv.json", smallRain},
}

func smallTruth(seed uint64) *Truth {
	t := MarlowFen()
	t.Name, t.Code, t.Title, t.Seed = "Marlow Fen (short)", "MS", "Marlow Fen, one year", seed
	t.Days, t.SampleEvery = 365, 30
	return t
}

func smallForward() (*notebook.Document, error) {
	d, err := smallTruth(5).Budget("global", "forward", 200, 100,
		"A short golden budget: the forward model, Cl* of 400 µmol/L, sulfide sulfate and the long time scale.")
	if err != nil {
		return nil, err
	}
	for _, e := range [][3]string{
		{"rain", "critical_chloride_umol", "400"},
		// An exact rain correction: this budget's results stay those of
		// the engine before the rain uncertainty was propagated.
		{"rain", "rain_ratio_uncertainty_percent", "0"},
		{"rain", "et_factor_uncertainty_percent", "0"},
		{"apportionment", "sulfate", "sulfide"},
		{"fluxes", "estimator", "interpolation"},
		{"co2", "time_scale", "long"},
	} {
		if err := d.SetParam(e[0], e[1], e[2]); err != nil {
			return nil, err
		}
	}
	c := notebook.NewCell(notebook.KindChart, "cq", "Silicate share of Na against date")
	s := c.Settings.(*notebook.ChartSettings)
	s.X, s.Y, s.Style = "apportionment.shares.date", "apportionment.shares.Na_silicate", "line"
	return d, d.Insert(c, -1)
}

func smallRain() (*notebook.Document, error) {
	t := CorrieVale()
	t.Name, t.Code, t.Title, t.Seed = "Corrie Vale (short)", "CS", "Corrie Vale, measured rain", 9
	t.Days, t.SampleEvery = 400, 20
	d, err := t.Budget("granite", "inverse", 300, 100)
	if err != nil {
		return nil, err
	}
	rain := &notebook.Table{Columns: []string{"period", "precipitation", "Na", "K", "Ca", "Mg", "Cl", "SO4"},
		Units: []string{"", "mm", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L"},
		Rows: [][]string{
			{"winter", "820", "52", "1.4", "2.1", "6.0", "60", "5.5"},
			{"spring", "310", "30", "1.1", "2.6", "3.4", "35", "4.8"},
			{"summer", "280", "21", "0.9", "2.9", "2.5", "24", "4.1"},
			{"autumn", "440", "44", "1.2", "2.2", "5.1", "51", "5.0"},
		}}
	for _, e := range [][3]string{
		{"rain", "method", "rain"},
		// Measured rain: its X/Cl ratios carry 10 % (1σ), drawn in the
		// apportionment's Monte Carlo.
		{"rain", "rain_ratio_uncertainty_percent", "10"},
		{"rain", "excess_chloride", "human"},
		{"rain", "dry_deposition_factor", "1.5"},
		{"apportionment", "tracers", "Ca/Na, Mg/Na"},
		{"site", "period_start", (t.Start + 30).String()},
		{"site", "period_end", (t.Start + discharge.Day(t.Days-6)).String()},
		{"fluxes", "estimator", "discharge-weighted"},
	} {
		if err := d.SetParam(e[0], e[1], e[2]); err != nil {
			return nil, err
		}
	}
	return d, d.SetTable("rain", rain)
}

// QuickCSV returns the samples and discharge files the command-line tests
// feed to "lixiv quick": two years of a Corrie Vale-like burn, sampled every
// three weeks, with units in the headers ("Na (mg/L)") as many laboratories
// write them.
func QuickCSV() (samples, flow string) {
	t := CorrieVale()
	t.Name, t.Code, t.Seed, t.Days, t.SampleEvery = "Corrie Vale (quick)", "CQ", 31, 730, 21
	q := t.Discharge()
	st := SampleTable(t.Samples(q))
	var b strings.Builder
	for i, c := range st.Columns {
		if i > 0 {
			b.WriteByte(',')
		}
		if st.Units[i] != "" {
			c += " (" + st.Units[i] + ")"
		}
		b.WriteString(c)
	}
	b.WriteByte('\n')
	for _, r := range st.Rows {
		b.WriteString(strings.Join(r, ","))
		b.WriteByte('\n')
	}
	samples = b.String()
	b.Reset()
	b.WriteString("date,Q (m3/s)\n")
	for _, r := range DischargeTable(t.Start, q).Rows {
		b.WriteString(strings.Join(r, ","))
		b.WriteByte('\n')
	}
	return samples, b.String()
}

// QuickFiles are where QuickCSV's files live, from the repository root.
var QuickFiles = [2]string{"engine/cmd/lixiv/testdata/quick-samples.csv", "engine/cmd/lixiv/testdata/quick-discharge.csv"}
