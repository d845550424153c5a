package notebook

import (
	"encoding/json"
	"math"
	"strings"

	"lixiv/engine/problem"
)

// Number is a float64 written to JSON as a number, or null when it is NaN
// or infinite (JSON has no NaN).
type Number float64

// MarshalJSON implements json.Marshaler.
func (n Number) MarshalJSON() ([]byte, error) {
	x := float64(n)
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return []byte("null"), nil
	}
	return json.Marshal(x)
}

// Range is a median with its 95 % bounds (2.5 % and 97.5 % quantiles).
type Range struct {
	Median Number `json:"median"`
	Low    Number `json:"low"`
	High   Number `json:"high"`
}

func rangeOf(f *Figure) Range {
	if f == nil {
		return Range{Number(math.NaN()), Number(math.NaN()), Number(math.NaN())}
	}
	return Range{Number(f.Median), Number(f.Low), Number(f.High)}
}

// Amount is a flux per catchment and per km², each as a Range.
type Amount struct {
	MolPerYr      Range `json:"mol_per_yr"`
	MolPerKm2PerY Range `json:"mol_per_km2_per_yr"`
}

// YearAmount is the Amount of one reporting year.
type YearAmount struct {
	Year string `json:"year"`
	Amount
}

// CO2Part is the CO2 consumption of one kind of weathering: the mean annual
// figure and each complete year.
type CO2Part struct {
	Mean  Amount       `json:"mean"`
	Years []YearAmount `json:"years"`
}

// SampleReport is the apportionment of one water sample: for each cation
// (Na, K, Ca, Mg) the share from each source (atmosphere, evaporite,
// silicate, carbonate), and the CO2 consumption per litre.
type SampleReport struct {
	Sample   string                      `json:"sample"`
	Date     string                      `json:"date"`
	Status   string                      `json:"status"`
	ESS      Number                      `json:"ess"`      // effective sample size of the sample's posterior
	Doubtful bool                        `json:"doubtful"` // no fit, or a poorly sampled posterior
	Shares   map[string]map[string]Range `json:"shares"`
	CO2PerL  map[string]Range            `json:"co2_umol_per_litre"`
	Warnings []string                    `json:"warnings,omitempty"`
}

// CellProblem is a cell that did not compute, or a message of a cell:
// a problem (under "problems") or any message, positioned in the input
// (under "messages"). State is set for a cell that did not compute;
// the other fields for a message.
type CellProblem struct {
	Cell     string `json:"cell"`
	State    string `json:"state,omitempty"`
	Severity string `json:"severity"`         // "problem", "warning" or "note"
	Effect   string `json:"effect,omitempty"` // "unread", "substituted", "left out", "inferred", "refused", "flagged"
	File     string `json:"file,omitempty"`
	Line     int    `json:"line,omitempty"` // as the file counts it (spreadsheet row for a workbook)
	Col      int    `json:"column_number,omitempty"`
	Column   string `json:"column,omitempty"` // header of the column
	Value    string `json:"value,omitempty"`  // the cell as written
	Sample   string `json:"sample,omitempty"`
	Message  string `json:"message"`
}

// messageEntry is a message as the report writes it.
func messageEntry(cell string, m *Message) CellProblem {
	return CellProblem{Cell: cell, Severity: m.Severity.String(), Effect: m.Effect.String(), File: m.File, Line: m.Line,
		Col: m.Col, Column: m.Column, Value: m.Value, Sample: m.Sample, Message: m.Text}
}

// Unapportioned is what the report says of the samples without a usable
// apportionment: how many, the share of the flow-weighted cation load they
// carried, and what the fluxes did with them.
type Unapportioned struct {
	Samples int    `json:"samples"`
	Share   Number `json:"share_of_load"`
	Policy  string `json:"policy"` // "leave-out" or "fill-shares"
}

// SulfateBracket is the CO2 consumption per km² under each origin of the
// sulfate above the rain share (the chosen one and the others that bracket
// it), and the span of their medians.
type SulfateBracket struct {
	Chosen  string                      `json:"chosen"`
	Origins map[string]map[string]Range `json:"origins"` // origin → "silicate"/"carbonate" → mol/km²/yr
	Span    map[string]Range            `json:"span"`    // "silicate"/"carbonate" → lowest and highest median (median null)
}

// Report is the summary of a computed budget that the command line prints
// as JSON (documented in SCHEMA.md). Figures the budget lacks (no fluxes
// cell, say) are null or left out.
type Report struct {
	Format  string `json:"format"`  // "lixiv-report"
	Version int    `json:"version"` // 1
	Engine  string `json:"engine"`
	Budget  string `json:"budget"`
	AreaKm2 Number `json:"area_km2"`
	// RunoffMM is the runoff over the complete years of the budget period
	// (the discharge record's own, with the interval of the discharge and
	// area errors); RecordRunoffMM that of the whole record.
	RunoffMM       Range             `json:"runoff_mm_per_yr"`
	RecordRunoffMM Number            `json:"runoff_whole_record_mm_per_yr"`
	CationFluxes   map[string]Amount `json:"cation_fluxes,omitempty"` // "silicate", "carbonate"
	// FluxMethod says how the apportioned fluxes were computed.
	FluxMethod string `json:"flux_method,omitempty"`
	// Estimators holds the cation fluxes with each estimator: "silicate
	// cations"/"carbonate cations" → estimator → amount.
	Estimators    map[string]map[string]Amount `json:"estimators,omitempty"`
	Unapportioned *Unapportioned               `json:"unapportioned,omitempty"`
	TimeScale     string                       `json:"co2_time_scale,omitempty"` // "short" or "long"
	// Convention names the long-term accounting when TimeScale is "long"
	// (LongTermConventionOf).
	Convention string             `json:"co2_long_term_convention,omitempty"`
	CO2        map[string]CO2Part `json:"co2_consumption,omitempty"` // "silicate", "carbonate"
	// CO2Estimators holds the CO2 consumption per km² with each estimator:
	// "silicate"/"carbonate" → estimator → mol/km²/yr.
	CO2Estimators map[string]map[string]Range `json:"co2_estimators,omitempty"`
	Sulfate       *SulfateBracket             `json:"sulfate_bracket,omitempty"`
	Samples       []SampleReport              `json:"samples"`
	Problems      []CellProblem               `json:"problems"`
	// Doubtful lists the cells that computed but whose results are
	// doubtful, with the reasons.
	Doubtful map[string][]string       `json:"doubtful"`
	Warnings map[string][]string       `json:"warnings"`
	Messages []CellProblem             `json:"messages"`
	Snapshot *SnapshotCheck            `json:"snapshot"`
	Figures  map[string][]ReportFigure `json:"figures"`

	// Carbonate and Minerals report the first carbonate and minerals
	// cells; left out when the budget has none.
	Carbonate *CarbonateReport `json:"carbonate_system,omitempty"`
	Minerals  *MineralReport   `json:"mineral_balance,omitempty"`

	// Sections reports each section of a budget with sections (the
	// fields above then describe the first budget in the document), and
	// Comparison its first comparison cell (report_compare.go).
	Sections   []SectionReport   `json:"sections,omitempty"`
	Comparison *ComparisonReport `json:"comparison,omitempty"`
}

// ReportFigure is a headline figure as the report writes it.
type ReportFigure struct {
	Name string `json:"name"`
	Unit string `json:"unit"`
	Range
	Note string `json:"note,omitempty"`
}

// SnapshotCheck compares the rerun with the results stored in the file.
type SnapshotCheck struct {
	Stored string `json:"stored_sha256"`
	Rerun  string `json:"rerun_sha256"`
	Match  bool   `json:"match"`
}

// firstOf returns the id of the first cell of kind k with an output.
func (d *Document) firstOf(k Kind) (string, *Output) {
	for _, c := range d.Cells {
		if c.Kind == k {
			if o := d.Output(c.ID); o != nil {
				return c.ID, o
			}
		}
	}
	return "", nil
}

// Report summarises the computed budget.
func (d *Document) Report() *Report {
	r := &Report{Format: "lixiv-report", Version: 1, Engine: EngineVersion, Budget: d.Title, AreaKm2: Number(math.NaN()),
		Samples: []SampleReport{}, Problems: []CellProblem{}, Warnings: map[string][]string{}, Messages: []CellProblem{},
		Figures: map[string][]ReportFigure{}, Doubtful: map[string][]string{}, RecordRunoffMM: Number(math.NaN())}
	for _, c := range d.Cells {
		st, err := d.Status(c.ID)
		if st == Doubtful {
			r.Doubtful[c.ID] = d.Output(c.ID).Doubtful
		} else if st != UpToDate {
			msg := ""
			if err != nil {
				msg = err.Error()
			}
			r.Problems = append(r.Problems, CellProblem{Cell: c.ID, State: st.String(), Severity: problem.Error.String(), Message: msg})
		}
		if o := d.Output(c.ID); o != nil {
			// Positioned messages: problems under "problems", the rest
			// as text under "warnings"; all of them under "messages".
			var warn []string
			for _, m := range o.Messages {
				e := messageEntry(c.ID, m)
				r.Messages = append(r.Messages, e)
				switch m.Severity {
				case problem.Error:
					r.Problems = append(r.Problems, e)
				case problem.Note:
					warn = append(warn, "note: "+m.Error())
				default:
					warn = append(warn, m.Error())
				}
			}
			if w := append(warn, o.Warnings...); len(w) > 0 {
				r.Warnings[c.ID] = w
			}
		}
		if o := d.Output(c.ID); o != nil {
			for i := range o.Figures {
				r.Figures[c.ID] = append(r.Figures[c.ID], ReportFigure{Name: o.Figures[i].Name, Unit: o.Figures[i].Unit, Range: rangeOf(&o.Figures[i]), Note: o.Figures[i].Note})
			}
		}
	}
	if _, o := d.firstOf(KindSite); o != nil {
		r.AreaKm2 = Number(o.Value.(*Site).AreaKm2)
	}
	r.RunoffMM = rangeOf(nil)
	if _, o := d.firstOf(KindDischarge); o != nil {
		if f := o.Figure(RecordRunoffFigure); f != nil {
			r.RecordRunoffMM = Number(f.Median)
		}
	}
	if _, o := d.firstOf(KindFluxes); o != nil {
		r.RunoffMM = rangeOf(o.Figure(RunoffFigure))
		r.CationFluxes = map[string]Amount{}
		for _, src := range []string{"silicate", "carbonate"} {
			f := o.Figure(src + " cations flux")
			r.CationFluxes[src] = Amount{rangeOf(f), rangeOf(o.Figure(src + " cations yield"))}
			if f != nil && r.FluxMethod == "" {
				r.FluxMethod = f.Note
			}
		}
		r.Estimators = estimatorAmounts(o.Table("estimators"), "series", "flux", "yield")
		if f := o.Figure("samples without a usable apportionment"); f != nil {
			r.Unapportioned = &Unapportioned{Samples: int(f.Median), Share: Number(math.NaN())}
			if sh := o.Figure("share of the flow-weighted cation load in samples without a usable apportionment"); sh != nil {
				r.Unapportioned.Share = Number(sh.Median)
			}
			if v, ok := o.Value.(*Fluxes); ok {
				r.Unapportioned.Policy = v.Policy
			}
		}
	}
	id, co := d.firstOf(KindCO2)
	if co != nil {
		cs := d.Cell(id).Settings.(*CO2Settings)
		r.TimeScale = cs.TimeScale
		if r.TimeScale == "long" {
			r.Convention = LongTermConventionOf(cs)
		}
		if co.Figure("silicate CO2 consumption") != nil {
			r.CO2 = map[string]CO2Part{}
			yt := co.Table("years")
			for _, src := range []string{"silicate", "carbonate"} {
				p := CO2Part{Mean: Amount{rangeOf(co.Figure(src + " CO2 consumption")), rangeOf(co.Figure(src + " CO2 consumption per km²"))},
					Years: []YearAmount{}}
				for i := 0; yt != nil && i < yt.Len(); i++ {
					if yt.Column("source").Text[i] != src {
						continue
					}
					n := func(c string) Number { return Number(yt.Column(c).Num[i]) }
					p.Years = append(p.Years, YearAmount{Year: yt.Column("year").Text[i], Amount: Amount{
						Range{n("consumption"), n("consumption_low"), n("consumption_high")},
						Range{n("per_km2"), n("per_km2_low"), n("per_km2_high")}}})
				}
				r.CO2[src] = p
			}
		}
		if t := co.Table("estimators"); t != nil {
			r.CO2Estimators = map[string]map[string]Range{}
			for src, m := range estimatorAmounts(t, "source", "", "per_km2") {
				r.CO2Estimators[src] = map[string]Range{}
				for est, a := range m {
					r.CO2Estimators[src][est] = a.MolPerKm2PerY
				}
			}
		}
		r.Sulfate = sulfateReport(co.Table("sulfate"))
	}
	if _, ao := d.firstOf(KindApportionment); ao != nil {
		a := ao.Value.(*Apportioned)
		st := ao.Table("shares").Column("status").Text
		var pl *ResultTable
		if co != nil {
			pl = co.Table("per-litre")
		}
		for i := range a.Names {
			s := SampleReport{Sample: a.Names[i], Date: a.Days[i].String(), Status: st[i], ESS: Number(a.ESS[i]),
				Doubtful: a.Doubtful(i), Shares: map[string]map[string]Range{}}
			for k, sp := range cationsOrder {
				m := map[string]Range{}
				for src := 0; src < 4; src++ {
					in := a.Corrected[i].Input[sp]
					m[sourceNames[src]] = Range{Number(a.Median[i][src][k] / in), Number(a.Lo[i][src][k] / in), Number(a.Hi[i][src][k] / in)}
				}
				s.Shares[sp.Symbol()] = m
			}
			if pl != nil {
				n := func(c string) Number { return Number(pl.Column(c).Num[i]) }
				s.CO2PerL = map[string]Range{
					"silicate":  {n("silicate"), n("silicate_low"), n("silicate_high")},
					"carbonate": {n("carbonate"), n("carbonate_low"), n("carbonate_high")}}
			}
			r.Samples = append(r.Samples, s)
		}
	}
	r.Carbonate, r.Minerals = d.carbonateReport(), d.mineralReport()
	r.Sections, r.Comparison = d.sectionReports(), d.comparisonReport()
	if d.Stored != nil {
		if v, err := d.Verify(); err == nil {
			r.Snapshot = &SnapshotCheck{Stored: v.Stored, Rerun: v.Rerun, Match: v.Match}
		}
	}
	return r
}

// JSON returns the report as indented JSON.
func (r *Report) JSON() []byte {
	b, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		panic("notebook: report: " + err.Error()) // every field marshals
	}
	return append(b, '\n')
}

// estimatorAmounts reads an estimators table: rows named by the column
// key, one per estimator, with mol/yr columns flux (and _low, _high) when
// flux is not "", and mol/km²/yr columns yield.
func estimatorAmounts(t *ResultTable, key, flux, yield string) map[string]map[string]Amount {
	if t == nil {
		return nil
	}
	out := map[string]map[string]Amount{}
	num := func(c string, i int) Number {
		if col := t.Column(c); col != nil {
			return Number(col.Num[i])
		}
		return Number(math.NaN())
	}
	for i := 0; i < t.Len(); i++ {
		k, est := t.Column(key).Text[i], t.Column("estimator").Text[i]
		if out[k] == nil {
			out[k] = map[string]Amount{}
		}
		a := Amount{MolPerYr: Range{Number(math.NaN()), Number(math.NaN()), Number(math.NaN())}}
		if flux != "" {
			a.MolPerYr = Range{num(flux, i), num(flux+"_low", i), num(flux+"_high", i)}
		}
		a.MolPerKm2PerY = Range{num(yield, i), num(yield+"_low", i), num(yield+"_high", i)}
		out[k][est] = a
	}
	return out
}

// sulfateReport reads the CO2 cell's sulfate table.
func sulfateReport(t *ResultTable) *SulfateBracket {
	if t == nil {
		return nil
	}
	b := &SulfateBracket{Origins: map[string]map[string]Range{}, Span: map[string]Range{}}
	for i := 0; i < t.Len(); i++ {
		o, src := t.Column("origin").Text[i], t.Column("source").Text[i]
		rg := Range{Number(t.Column("per_km2").Num[i]), Number(t.Column("per_km2_low").Num[i]), Number(t.Column("per_km2_high").Num[i])}
		switch {
		case o == "span of the origins":
			b.Span[src] = rg
			continue
		case strings.HasSuffix(o, " (chosen)"):
			o = strings.TrimSuffix(o, " (chosen)")
			b.Chosen = o
		}
		if b.Origins[o] == nil {
			b.Origins[o] = map[string]Range{}
		}
		b.Origins[o][src] = rg
	}
	return b
}
