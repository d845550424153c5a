package synth

import (
	"strings"

	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// The paired example: two fictional neighbouring farmland catchments of our
// own on a basalt till, Lintmoor Beck (treated) and Whinlaw Beck (control),
// two water years before and two after crushed basalt was spread on part of
// Lintmoor Beck. Each catchment-period is a Truth of its own: the after
// period is wetter for both (a common change a before-after design
// removes), and Lintmoor Beck's silicate weathering after spreading is
// AddedSilicate times higher (the added flux, with the till's own
// silicate ratios: the feedstock is a basalt much like it). Nothing here is
// measured.

// AddedSilicate is the invented rise of Lintmoor Beck's silicate weathering
// after spreading, as a fraction of its silicate water.
const AddedSilicate = 0.30

// PairedPeriod is one catchment over one period of the paired example.
type PairedPeriod struct {
	Prefix, Section string // cell-id prefix and section name
	Truth           *Truth
}

// pairedTruth invents a catchment-period of the paired example.
func pairedTruth(name, code string, area float64, start discharge.Day, p float64, seed uint64, naSil float64) *Truth {
	y, _, _ := start.Civil()
	days := int(discharge.Date(y+2, 10, 1) - start) // two water years from 1 October
	return &Truth{Name: name, Code: code, Title: name, AreaKm2: area, P: p, ET: 460, Start: start, Days: days, SampleEvery: 14,
		Seed: seed, BaseQ: 0.08, Storminess: 3, Cl: 190, NaSil: naSil, CaNaSil: 1.0, MgNaSil: 0.9, KNaSil: 0.1,
		CaCarb: 95, MgCarb: 24, NO3: 30, SiPerNa: 2.4, Slope: -0.2, Noise: 0.03}
}

// PairedPeriods are the four catchment-periods of the paired example, in
// document order: the treated catchment before and after spreading, then
// the control over the same years.
func PairedPeriods() []PairedPeriod {
	before, after := discharge.Date(2020, 10, 1), discharge.Date(2022, 10, 1)
	const lint, whin = 52.0, 46.0 // silicate Na at mean flow, µmol/L
	return []PairedPeriod{
		{"tb", "Lintmoor Beck, before spreading", pairedTruth("Lintmoor Beck", "LB", 4.2, before, 1080, 61, lint)},
		{"ta", "Lintmoor Beck, after spreading", pairedTruth("Lintmoor Beck", "LA", 4.2, after, 1320, 62, lint*(1+AddedSilicate))},
		{"cb", "Whinlaw Beck, before", pairedTruth("Whinlaw Beck", "WB", 3.6, before, 1060, 63, whin)},
		{"ca", "Whinlaw Beck, after", pairedTruth("Whinlaw Beck", "WA", 3.6, after, 1290, 64, whin)},
	}
}

// PairedTruthDifference returns the difference of the true mean annual
// silicate CO2 consumption (mol/km²/yr) that the paired example's
// before-after-control-impact design should find: (after − before) of
// Lintmoor Beck less (after − before) of Whinlaw Beck.
func PairedTruthDifference() float64 {
	ps := PairedPeriods()
	v := map[string]float64{}
	for _, p := range ps {
		v[p.Prefix] = p.Truth.TrueSilicateCO2(p.Truth.Discharge())
	}
	return (v["ta"] - v["tb"]) - (v["ca"] - v["cb"])
}

// pairedSources is the example's end-member table: the basalt preset with
// the silicate Ca/Na and Mg/Na narrowed to what a survey of the till's own
// streams might give (invented for the example).
func pairedSources() (*notebook.Table, error) {
	t, err := notebook.SourcesTable("basalt")
	if err != nil {
		return nil, err
	}
	for _, r := range t.Rows {
		if !strings.HasPrefix(r[0], "silicate") {
			continue
		}
		switch r[2] {
		case "Ca/Na":
			r[3], r[4], r[5] = "0.8", "1", "1.25"
		case "Mg/Na":
			r[3], r[4], r[5] = "0.7", "0.9", "1.15"
		default:
			continue
		}
		r[6], r[7] = "log-uniform", "invented for this fictional example: the till's basalt water, as a survey of its own streams might give it"
	}
	return t, nil
}

// pairedBudget is the paired example: a shared end-member table, a section
// for each catchment-period with the usual cells, and a comparison.
func pairedBudget() (*notebook.Document, error) {
	d := notebook.New("Lintmoor Beck against Whinlaw Beck: basalt spread on farmland")
	add := func(k notebook.Kind, id, title, section string) (*notebook.Cell, error) {
		c := notebook.NewCell(k, id, title)
		c.Section = section
		return c, d.Insert(c, -1)
	}
	note, err := add(notebook.KindNote, "about", "", "")
	if err != nil {
		return nil, err
	}
	note.Settings.(*notebook.NoteSettings).Text = "Lintmoor Beck and Whinlaw Beck are fictional neighbouring farmland catchments of our own on a basalt till. " +
		"Crushed basalt was spread on 150 ha of Lintmoor Beck at the start of the 2023 water year; Whinlaw Beck was left as it was. " +
		"Each catchment has a section for the two water years before and the two after; the end-member table above the sections serves all four, " +
		"and the comparison at the end takes the before-after-control-impact difference. The samples and discharge are invented from a known truth (examples/synth), not measured."
	src, err := add(notebook.KindSources, "sources", "End-members of the till (shared by every section)", "")
	if err != nil {
		return nil, err
	}
	if src.Table, err = pairedSources(); err != nil {
		return nil, err
	}
	src.Settings.(*notebook.SourcesSettings).Preset = "custom"
	for _, p := range PairedPeriods() {
		t := p.Truth
		q := t.Discharge()
		ss := t.Samples(q)
		id := func(k string) string { return p.Prefix + "-" + k }
		site, err := add(notebook.KindSite, id("site"), t.Name+" above its gauge", p.Section)
		if err != nil {
			return nil, err
		}
		st := site.Settings.(*notebook.SiteSettings)
		st.Name, st.AreaKm2, st.Precipitation, st.Evapotranspiration = t.Name, t.AreaKm2, t.P, t.ET
		for _, c := range []struct {
			k     notebook.Kind
			name  string
			title string
		}{
			{notebook.KindSamples, "samples", "Fortnightly stream samples"},
			{notebook.KindDischarge, "discharge", "Daily discharge"},
			{notebook.KindAtmosphere, "rain", "Sea-salt correction"},
			{notebook.KindApportionment, "apportionment", "Sources of the cations"},
			{notebook.KindFluxes, "fluxes", "Annual fluxes"},
			{notebook.KindCO2, "co2", "CO2 consumption"},
		} {
			cell, err := add(c.k, id(c.name), c.title, p.Section)
			if err != nil {
				return nil, err
			}
			switch c.k {
			case notebook.KindSamples:
				cell.Table = SampleTable(ss)
			case notebook.KindDischarge:
				cell.Table = DischargeTable(t.Start, q)
			case notebook.KindApportionment:
				a := cell.Settings.(*notebook.ApportionmentSettings)
				a.Model, a.Draws = "forward", 1000
			case notebook.KindFluxes:
				cell.Settings.(*notebook.FluxSettings).Bootstrap = 500
			}
		}
	}
	cmp, err := add(notebook.KindCompare, "comparison", "Did weathering rise where the basalt was spread?", "")
	if err != nil {
		return nil, err
	}
	cs := cmp.Settings.(*notebook.CompareSettings)
	cs.Design = "before-after-control-impact"
	for _, p := range PairedPeriods() {
		*map[string]*string{"ta": &cs.Treated, "ca": &cs.Control, "tb": &cs.TreatedBefore, "cb": &cs.ControlBefore}[p.Prefix] = p.Section
	}
	cs.Replicates = 500
	// The basalt of docs/methods.md §17's check values, 40 t/ha over 150 ha.
	cs.TonnesPerHa, cs.AreaHa = 40, 150
	cs.CaO, cs.MgO, cs.Na2O, cs.K2O = 10, 7, 2.5, 0.8
	return d, nil
}
