package notebook

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"lixiv/engine/carbonate"
	"lixiv/engine/chem"
	"lixiv/engine/problem"
	"lixiv/engine/sample"
)

// CarbonateSettings choose the carbonate cell's activity model and when it
// flags a sample.
type CarbonateSettings struct {
	ActivityModel string  `json:"activity_model"`        // how activities are computed
	SIFlag        float64 `json:"si_calcite_flag"`       // SI of calcite above this is flagged
	AtmPCO2       float64 `json:"atmospheric_pco2_uatm"` // pCO2 of the air, µatm
	PCO2Flag      float64 `json:"pco2_flag_factor"`      // pCO2 above this many times the air's is flagged
}

// defaultCarbonateSettings: Davies activities (valid to I ≈ 0.5 mol/L,
// which covers fresh water); SI of calcite flagged above 0.5, the lower
// end of the 0.5–1 at which streams are held to precipitate calcite
// (docs/methods.md §12, common practice); the air at 420 µatm (NOAA global
// mean for 2024, from memory; docs/methods.md §10.3), which the user sets
// for the sampling years; pCO2 flagged above ten times the air's (common
// practice, no source).
func defaultCarbonateSettings() *CarbonateSettings {
	return &CarbonateSettings{ActivityModel: "davies", SIFlag: 0.5, AtmPCO2: 420, PCO2Flag: 10}
}

// Kind implements Settings.
func (*CarbonateSettings) Kind() Kind { return KindCarbonate }

// Validate implements Settings.
func (s *CarbonateSettings) Validate() error {
	return firstErr(
		inRange("si_calcite_flag", s.SIFlag, -5, 5),
		inRange("atmospheric_pco2_uatm", s.AtmPCO2, 1, 1e5),
		inRange("pco2_flag_factor", s.PCO2Flag, 1, 1e4),
	)
}

// CarbonateSystem is the value a carbonate cell hands on: per computed
// sample, its carbonate system, and the samples left out with why.
type CarbonateSystem struct {
	Settings CarbonateSettings
	Names    []string
	Days     []string
	Q        []float64 // discharge at sampling, m³/s (NaN when not known)
	PH       []float64 // as measured
	Ca       []float64 // µmol/L, as measured
	Results  []carbonate.Result
	Flags    []string
	// LeftOut names each sample left out of this cell, with the reason.
	LeftOut []LeftOut
}

// LeftOut is a sample a cell leaves out, and why.
type LeftOut struct {
	Sample string `json:"sample"`
	Reason string `json:"reason"`
}

// supersaturated reports whether sample i is above the SI flag.
func (c *CarbonateSystem) supersaturated(i int) bool {
	return c.Results[i].SICalcite > c.Settings.SIFlag
}

func init() { Register(KindCarbonate, computeCarbonate) }

// computeCarbonate speciates the carbonate system of every sample the
// budget uses that has pH, temperature and alkalinity (docs/methods.md §10),
// and flags calcite supersaturation and CO2 far above the air's. A sample
// lacking pH, temperature or alkalinity is named and left out of this cell
// only. A cell with no sample to compute says so in a warning rather than
// failing, so that the fluxes cell, which reads it for its caution, does
// not wait on it.
func computeCarbonate(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*CarbonateSettings)
	model, err := carbonate.ParseModel(s.ActivityModel)
	if err != nil {
		return nil, settingErr("activity_model", "%v", err)
	}
	smp, err := inputOf[*Samples](e, "samples")
	if err != nil {
		return nil, err
	}
	var flow *Flow
	if fo, err := e.Input("discharge"); err != nil {
		return nil, err
	} else if fo != nil {
		flow = fo.Value.(*Flow)
	}
	v := &CarbonateSystem{Settings: *s}
	out := &Output{Value: v}
	missing := map[chem.Species]int{}
	warn := map[string]int{}
	for _, i := range smp.Used() {
		if err := e.Ctx.Err(); err != nil {
			return nil, err
		}
		sm := smp.Table.Samples[i]
		bg, miss := carbonate.Background(sm.C)
		for _, sp := range miss {
			missing[sp]++
		}
		w := carbonate.Water{TempC: sm.Temp, PH: sm.PH, Alk: sm.C[chem.Alk] * 1e-6, Ca: sm.C[chem.Ca] * 1e-6,
			Mg: sm.C[chem.Mg] * 1e-6, Background: bg}
		r, err := carbonate.Analyse(w, model)
		if err != nil {
			reason := err.Error()
			switch {
			case errors.Is(err, carbonate.ErrNoAlkalinity) && sm.C.Has(chem.Alk):
				reason = "alkalinity not above zero"
			case !math.IsNaN(sm.PH) && (sm.PH < 0 || sm.PH > 14):
				reason = fmt.Sprintf("pH %g, outside 0–14", sm.PH)
			case !math.IsNaN(sm.Temp) && (sm.Temp < -5 || sm.Temp > 100):
				reason = fmt.Sprintf("a temperature of %g °C, outside −5 to 100 °C", sm.Temp)
			}
			v.LeftOut = append(v.LeftOut, LeftOut{sampleName(sm), reason})
			out.Messages = append(out.Messages, smp.notSpeciated(i, err, reason))
			continue
		}
		// The engine's range warnings, grouped across samples.
		if sm.Temp < carbonate.ValidMinC || sm.Temp > carbonate.ValidMaxC {
			warn[fmt.Sprintf("temperature outside the 0–90 °C of the Plummer & Busenberg (1982) constants: %s at %g °C", sm.ID, sm.Temp)]++
		}
		if r.I > model.Validity() {
			warn[fmt.Sprintf("ionic strength above the %g mol/L to which the %s model holds: %s at %.3g mol/L", model.Validity(), model, sm.ID, r.I)]++
		}
		q := sm.Q
		if math.IsNaN(q) && flow != nil {
			if k := flow.Record.Index(smp.Days[i]); k >= 0 {
				q = flow.Record.Q[k]
			}
		}
		var flags []string
		if r.SICalcite > s.SIFlag {
			flags = append(flags, fmt.Sprintf("SI calcite above %g", s.SIFlag))
		}
		if r.PCO2*1e6 > s.PCO2Flag*s.AtmPCO2 {
			flags = append(flags, fmt.Sprintf("pCO2 above %g × the air's", s.PCO2Flag))
		}
		v.Names, v.Days = append(v.Names, sm.ID), append(v.Days, smp.Days[i].String())
		v.Q, v.Results, v.Flags = append(v.Q, q), append(v.Results, r), append(v.Flags, strings.Join(flags, "; "))
		v.PH, v.Ca = append(v.PH, sm.PH), append(v.Ca, sm.C[chem.Ca])
	}
	n := len(v.Results)
	out.Warnings = append(out.Warnings, countedWarnings(warn)...)
	if len(missing) > 0 {
		var parts []string
		for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4} {
			if c := missing[sp]; c > 0 {
				parts = append(parts, fmt.Sprintf("%s in %s", sp, plural(c, "sample")))
			}
		}
		out.Warnings = append(out.Warnings, "the ionic strength leaves out ions not measured: "+strings.Join(parts, ", "))
	}
	if n == 0 {
		out.Warnings = append(out.Warnings, "no sample has pH, temperature and alkalinity: nothing to compute")
	}
	col := func(f func(r *carbonate.Result) float64) []float64 {
		x := make([]float64, n)
		for i := range v.Results {
			x[i] = f(&v.Results[i])
		}
		return x
	}
	temp := col(func(r *carbonate.Result) float64 { return r.Constants.TempC })
	pco2 := col(func(r *carbonate.Result) float64 { return r.PCO2 * 1e6 })
	excess := make([]float64, n)
	for i := range pco2 {
		excess[i] = pco2[i] / s.AtmPCO2
	}
	sical := col(func(r *carbonate.Result) float64 { return r.SICalcite })
	umol := func(f func(r *carbonate.Result) float64) []float64 {
		return col(func(r *carbonate.Result) float64 { return f(r) * 1e6 })
	}
	title := fmt.Sprintf("Carbonate system of each sample: %s activities (valid to I ≈ %g mol/L), ion pairs neglected, constants of Plummer & Busenberg (1982)",
		model, model.Validity())
	out.Tables = append(out.Tables, &ResultTable{Name: "carbonate", Title: title, Columns: []*Column{
		TextColumn("sample", v.Names), TextColumn("date", v.Days), NumColumn("discharge", "m³/s", v.Q),
		NumColumn("temperature", "°C", temp), NumColumn("pH", "", v.PH),
		NumColumn("ionic_strength", "mol/L", col(func(r *carbonate.Result) float64 { return r.I })),
		NumColumn("HCO3", "µmol/L", umol(func(r *carbonate.Result) float64 { return r.HCO3 })),
		NumColumn("CO3", "µmol/L", umol(func(r *carbonate.Result) float64 { return r.CO3 })),
		NumColumn("H2CO3", "µmol/L", umol(func(r *carbonate.Result) float64 { return r.H2CO3 })),
		NumColumn("DIC", "µmol/L", umol(func(r *carbonate.Result) float64 { return r.DIC })),
		NumColumn("pCO2", "µatm", pco2), NumColumn("pCO2_excess", "× air", excess),
		NumColumn("SI_calcite", "", sical),
		NumColumn("SI_aragonite", "", col(func(r *carbonate.Result) float64 { return r.SIAragonite })),
		NumColumn("SI_dolomite", "", col(func(r *carbonate.Result) float64 { return r.SIDolomite })),
		TextColumn("flag", v.Flags)}})
	above, high := 0, 0
	for i := range v.Results {
		if v.supersaturated(i) {
			above++
		}
		if excess[i] > s.PCO2Flag {
			high++
		}
	}
	out.Figures = append(out.Figures, Point("samples computed", "", float64(n)), Point("samples left out of this cell", "", float64(len(v.LeftOut))),
		Point("median SI of calcite", "", median(sical)), Point(fmt.Sprintf("samples with SI of calcite above %g", s.SIFlag), "", float64(above)),
		Point("median pCO2", "µatm", median(pco2)), Point("median pCO2 over the air's", "× air", median(excess)),
		Point(fmt.Sprintf("samples with pCO2 above %g × the air's", s.PCO2Flag), "", float64(high)))
	if share := v.loadShare(nil); !math.IsNaN(share) {
		out.Figures = append(out.Figures, Point(fmt.Sprintf("share of the sampled Ca load in samples with SI of calcite above %g", s.SIFlag), "fraction", share))
	}
	if above > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("%s of %d with SI of calcite above %g: calcite may precipitate in the channel, removing Ca and alkalinity, "+
			"which biases carbonate weathering and its CO2 consumption low (docs/methods.md §12)", plural(above, "sample"), n, s.SIFlag))
	}
	if high > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("%s of %d with pCO2 above %g × the air's (%g µatm): the water is degassing CO2",
			plural(high, "sample"), n, s.PCO2Flag, s.AtmPCO2))
	}
	return out, nil
}

// ErrNotSpeciated is the sentinel of messages that leave a sample out of
// the carbonate cell (no pH, temperature or alkalinity, or a value no
// water has).
var ErrNotSpeciated = errors.New("not speciated")

// notSpeciated is the message that sample i is left out of the carbonate
// cell, and of it only, because carbonate.Analyse refused it with err:
// its line, and the column and cell as written of the value missing or
// out of range.
func (s *Samples) notSpeciated(i int, err error, reason string) *Message {
	sm := s.Table.Samples[i]
	var kind sample.Kind = -1
	switch {
	case errors.Is(err, carbonate.ErrNoPH) || !math.IsNaN(sm.PH) && (sm.PH < 0 || sm.PH > 14):
		kind = sample.PH
	case errors.Is(err, carbonate.ErrNoTemperature) || !math.IsNaN(sm.Temp) && (sm.Temp < -5 || sm.Temp > 100):
		kind = sample.Temperature
	}
	m := &Message{Severity: problem.Warning, Effect: problem.LeftOut, File: s.File, Line: sm.Line, Sample: sampleName(sm),
		Text: fmt.Sprintf("sample %s has %s: left out of this carbonate cell only; it stays in the rest of the budget", sampleName(sm), reason),
		Row:  -1, Err: ErrNotSpeciated}
	if errors.Is(err, carbonate.ErrNoAlkalinity) {
		m.Column, m.Col = s.column(chem.Alk)
		m.Value = s.Cell(i, chem.Alk)
	}
	for _, c := range s.Table.Columns {
		if c.Kind == kind {
			m.Column, m.Col = c.Header, c.Index+1
			if s.Input != nil && i < len(s.Rows) {
				m.Value = strings.TrimSpace(s.Input.Cell(s.Rows[i], c.Index))
			}
			break
		}
	}
	return m
}

// loadShare returns the share of the sampled Ca load, Σ Q × Ca over the
// computed samples, carried by those above the SI flag; NaN without
// discharge at sampling. q, when given, overrides the discharge of the
// samples it names.
func (c *CarbonateSystem) loadShare(q map[string]float64) float64 {
	total, above := 0.0, 0.0
	for i, r := range c.Results {
		qi := c.Q[i]
		if x, ok := q[c.Names[i]]; ok {
			qi = x
		}
		if math.IsNaN(qi) || math.IsNaN(c.Ca[i]) || math.IsNaN(r.SICalcite) {
			continue
		}
		l := qi * c.Ca[i]
		total += l
		if c.supersaturated(i) {
			above += l
		}
	}
	if !(total > 0) {
		return math.NaN()
	}
	return above / total
}

// SupersaturatedLoadShare is the share of the sampled Ca load above which
// the fluxes cell cautions that the samples carrying most of the load are
// supersaturated with calcite: a half (common practice, no source).
const SupersaturatedLoadShare = 0.5

// supersaturationCaution returns the fluxes cell's caution when the
// samples it fluxes that carry most of the sampled Ca load (discharge ×
// Ca) are above the carbonate cell's SI flag, or "".
func supersaturationCaution(v *Fluxes, co *Output) string {
	c, ok := co.Value.(*CarbonateSystem)
	if !ok || c == nil || v.App == nil {
		return ""
	}
	a := v.App
	q := map[string]float64{}
	used := map[string]bool{}
	for i, name := range a.Names {
		used[name] = true
		x := math.NaN()
		if i < len(a.Q) {
			x = a.Q[i]
		}
		if math.IsNaN(x) {
			if k := v.Record.Index(a.Days[i]); k >= 0 {
				x = v.Record.Q[k]
			}
		}
		q[name] = x
	}
	sub := &CarbonateSystem{Settings: c.Settings}
	for i, n := range c.Names {
		if used[n] {
			sub.Names, sub.Q, sub.Results = append(sub.Names, n), append(sub.Q, c.Q[i]), append(sub.Results, c.Results[i])
			sub.Ca = append(sub.Ca, c.Ca[i])
		}
	}
	share := sub.loadShare(q)
	if !(share > SupersaturatedLoadShare) {
		return ""
	}
	return fmt.Sprintf("samples carrying %.0f %% of the sampled Ca load (discharge × Ca) have SI of calcite above %g (carbonate cell): "+
		"calcite may precipitate in the channel, so the carbonate fluxes and the CO2 consumption of carbonate weathering may be biased low (docs/methods.md §12)",
		100*share, c.Settings.SIFlag)
}

// CarbonateReport is the carbonate cell in the JSON report.
type CarbonateReport struct {
	Cell          string            `json:"cell"`
	ActivityModel string            `json:"activity_model"`
	ValidToI      Number            `json:"valid_to_ionic_strength_mol_per_l"`
	SIFlag        Number            `json:"si_calcite_flag"`
	AtmPCO2       Number            `json:"atmospheric_pco2_uatm"`
	Samples       []CarbonateSample `json:"samples"`
	LeftOut       []LeftOut         `json:"left_out"`
}

// CarbonateSample is one sample's carbonate system in the JSON report.
type CarbonateSample struct {
	Sample      string `json:"sample"`
	Date        string `json:"date"`
	TempC       Number `json:"temperature_c"`
	PH          Number `json:"ph"`
	I           Number `json:"ionic_strength_mol_per_l"`
	DIC         Number `json:"dic_umol_per_l"`
	PCO2        Number `json:"pco2_uatm"`
	SICalcite   Number `json:"si_calcite"`
	SIAragonite Number `json:"si_aragonite"`
	SIDolomite  Number `json:"si_dolomite"`
	Flag        string `json:"flag,omitempty"`
}

// carbonateReport reports the first computed carbonate cell, or nil.
func (d *Document) carbonateReport() *CarbonateReport {
	id, o := d.firstOf(KindCarbonate)
	if o == nil {
		return nil
	}
	v := o.Value.(*CarbonateSystem)
	m, _ := carbonate.ParseModel(v.Settings.ActivityModel)
	r := &CarbonateReport{Cell: id, ActivityModel: v.Settings.ActivityModel, ValidToI: Number(m.Validity()),
		SIFlag: Number(v.Settings.SIFlag), AtmPCO2: Number(v.Settings.AtmPCO2), Samples: []CarbonateSample{}, LeftOut: v.LeftOut}
	if r.LeftOut == nil {
		r.LeftOut = []LeftOut{}
	}
	for i, x := range v.Results {
		r.Samples = append(r.Samples, CarbonateSample{Sample: v.Names[i], Date: v.Days[i], TempC: Number(x.Constants.TempC), PH: Number(v.PH[i]),
			I: Number(x.I), DIC: Number(x.DIC * 1e6), PCO2: Number(x.PCO2 * 1e6), SICalcite: Number(x.SICalcite),
			SIAragonite: Number(x.SIAragonite), SIDolomite: Number(x.SIDolomite), Flag: v.Flags[i]})
	}
	return r
}
