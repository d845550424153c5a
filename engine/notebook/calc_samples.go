package notebook

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/discharge"
	"lixiv/engine/problem"
	"lixiv/engine/qc"
	"lixiv/engine/sample"
)

// Samples is the value a samples cell hands on: the imported table and,
// per sample, whether it enters the budget.
type Samples struct {
	Table *sample.Table
	Use   []bool    // false for samples left out (charge balance beyond the reject limit, no date)
	NICB  []float64 // normalised inorganic charge balance, %
	Days  []discharge.Day
	// Precision is the analytical precision of the cell's settings;
	// IsoPrecision the 1σ of 87Sr/86Sr.
	Precision    correct.Precision
	IsoPrecision float64
	// own holds, per sample, a precision that columns of the table set
	// (nil where none does).
	own []*correct.Precision

	// File names the samples' source in messages: the file the table was
	// read from, else the id of the samples cell; lines in sample.Sample
	// count as it does.
	File string
	// Input is the samples cell's table as written and Rows the row of it
	// each sample comes from, so that messages of later cells can quote a
	// cell ("n.d.") as the user wrote it.
	Input *Table
	Rows  []int
}

// SamplePrecision returns the analytical precision of sample i: the
// settings', with the relative precision of any species that a column of
// the table gives for this sample ("Na rsd (%)"). nil means the settings'.
func (s *Samples) SamplePrecision(i int) *correct.Precision {
	if s.own == nil {
		return nil
	}
	return s.own[i]
}

// Cell returns the text the user wrote for species sp of sample i, or "".
func (s *Samples) Cell(i int, sp chem.Species) string {
	if s.Input == nil || i >= len(s.Rows) {
		return ""
	}
	for _, c := range s.Table.Columns {
		if c.Kind == sample.Concentration && c.Species == sp {
			return strings.TrimSpace(s.Input.Cell(s.Rows[i], c.Index))
		}
	}
	return ""
}

// column returns the header and number (from 1) of the column of species
// sp, or "" and 0.
func (s *Samples) column(sp chem.Species) (string, int) {
	for _, c := range s.Table.Columns {
		if c.Kind == sample.Concentration && c.Species == sp {
			return c.Header, c.Index + 1
		}
	}
	return "", 0
}

// leftOut is the message that sample i is left out of a cell for want of
// species sp: its line, the column and the cell as written.
func (s *Samples) leftOut(i int, sp chem.Species, text string) *Message {
	sm := s.Table.Samples[i]
	h, col := s.column(sp)
	if col == 0 {
		h = sp.Symbol()
	}
	return &Message{Severity: problem.Warning, Effect: problem.LeftOut, File: s.File, Line: sm.Line, Col: col, Column: h,
		Value: s.Cell(i, sp), Sample: sampleName(sm), Text: text, Row: -1, Err: ErrMissingIon}
}

// sampleName names a sample in messages: its id, else its line.
func sampleName(sm *sample.Sample) string {
	if sm.ID != "" {
		return sm.ID
	}
	return "on line " + strconv.Itoa(sm.Line)
}

// ErrMissingIon is the sentinel of messages that leave a sample out of a
// cell for want of an ion the cell needs.
var ErrMissingIon = errors.New("ion missing")

// ErrChargeBalance is the sentinel of messages about a sample's charge
// balance (flagged or left out).
var ErrChargeBalance = errors.New("charge balance")

// ErrTakenAs is the sentinel of messages that say a quantity was read as
// another (HCO3 taken as alkalinity).
var ErrTakenAs = errors.New("taken as")

// Used returns the indices of the samples that enter the budget.
func (s *Samples) Used() []int {
	var idx []int
	for i, u := range s.Use {
		if u {
			idx = append(idx, i)
		}
	}
	return idx
}

func init() { Register(KindSamples, computeSamples) }

var policies = map[string]sample.Policy{"half-limit": sample.HalfLimit, "zero": sample.Zero, "limit": sample.AtLimit, "leave-out": sample.LeaveOut}
var sampleOrders = map[string]sample.DateOrder{"auto": sample.DateAuto, "day-first": sample.DayFirst, "month-first": sample.MonthFirst}

// computeSamples reads the cell's table with engine/sample. When no sample
// can enter the budget it returns its output (the samples table with its
// flag column, and the import warnings) together with the error that says
// why, so that cells reading it wait while the table stays inspectable.
func computeSamples(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*SamplesSettings)
	t := e.Cell.Table
	// Messages name the cell by its id, which (unlike the title) only an
	// edit that recomputes the cell can change; a table read from a file
	// this session (Table.Source) is named by the file, its lines counted
	// as in the file.
	pl := newPlacer(e.Cell.ID, t)
	opt := sample.Options{Comma: '\t', Policy: policies[s.BelowDetection], DateOrder: sampleOrders[s.DateOrder], Use: s.UseColumns,
		Line: pl.line()}
	if s.DefaultUnit != "" {
		opt.Units = map[string]string{"": s.DefaultUnit}
	}
	tab := sample.ParseText(t.TSV(), pl.name, opt)
	if tab.Problems.Count(sample.ErrNotTable) == 0 {
		tab.Problems = append(tab.Problems, tab.Require(sample.Date)...)
	}
	out := &Output{Messages: append(pl.fromSample(tab.Problems), pl.fromSample(tab.Notes)...)}
	out.Messages = append(out.Messages, pl.sourceNotes(t)...)
	out.Reading = samplesReading(t, tab)
	n := len(tab.Samples)
	rows := make([]int, n)
	for i, smp := range tab.Samples {
		rows[i] = pl.row(smp.Line)
	}
	if pl.file != nil {
		tab.Preamble = t.Source.Preamble
	}
	if n == 0 {
		sortMessages(out.Messages)
		return out, fmt.Errorf("no samples could be read: %v", tab.Problems.Err())
	}
	v := &Samples{Table: tab, Use: make([]bool, n), NICB: make([]float64, n), Days: make([]discharge.Day, n),
		File: pl.name, Input: t, Rows: rows}
	if m := alkFromHCO3(tab, pl); m != nil {
		out.Messages = append(out.Messages, m)
	}
	ids, dates, flags := make([]string, n), make([]string, n), make([]string, n)
	species := []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.NO3, chem.Alk, chem.SiO2, chem.Sr}
	conc := make([][]float64, len(species))
	// The charge balance is engine/qc's, with the cell's thresholds, so the
	// notebook and the quality-control report agree sample by sample.
	reports := qc.Check(tab.Samples, qc.Options{Thresholds: qc.Thresholds{OK: s.NICBFlag, Reject: s.NICBReject}})
	flagged, left := 0, 0
	for i, smp := range tab.Samples {
		ids[i] = smp.ID
		if smp.HasTime {
			y, m, d := smp.Time.Date()
			v.Days[i] = discharge.Date(y, int(m), d)
			dates[i] = v.Days[i].String()
		}
		for k, sp := range species {
			conc[k] = append(conc[k], smp.C[sp])
		}
		v.NICB[i] = reports[i].Balance.NICB
		v.Use[i] = true
		msg := &Message{Severity: problem.Warning, Effect: problem.LeftOut, File: pl.name, Line: smp.Line,
			Sample: sampleName(smp), Row: rows[i], Err: ErrChargeBalance}
		nicb := strconv.FormatFloat(v.NICB[i], 'f', 2, 64) + " %"
		switch st := reports[i].Status; {
		case !smp.HasTime:
			v.Use[i], flags[i] = false, "left out: no date"
			msg.Err, msg.Text = ErrMissingIon, fmt.Sprintf("sample %s has no date: left out of the budget, which takes each sample's day from the discharge record; give its date", msg.Sample)
		case !smp.C.Has(chem.Na) || smp.C[chem.Na] <= 0:
			v.Use[i], flags[i] = false, "left out: no Na"
			msg = v.leftOut(i, chem.Na, fmt.Sprintf("sample %s has no Na value: left out of the budget, whose apportionment rests on Na; it stays in this table", sampleName(smp)))
			msg.Row = rows[i]
		case st == qc.Unknown:
			v.Use[i], flags[i] = false, "left out: no charge balance (no anion measured)"
			msg.Text = fmt.Sprintf("sample %s has no anion (Cl, SO4, NO3, alkalinity): no charge balance, so it is left out of the budget", msg.Sample)
		case st == qc.Rejected:
			v.Use[i], flags[i] = false, fmt.Sprintf("left out: |NICB| above %g %%", s.NICBReject)
			msg.Value, msg.Column = nicb, "NICB"
			msg.Text = fmt.Sprintf("sample %s: charge balance (NICB) %s, beyond the reject limit of %g %% (setting %s): left out of the budget; check its analyses, or raise the limit",
				msg.Sample, nicb, s.NICBReject, quoteSetting("nicb_reject_percent"))
		case st == qc.Flagged:
			flags[i] = fmt.Sprintf("|NICB| above %g %%", s.NICBFlag)
			flagged++
			msg.Effect, msg.Value, msg.Column = problem.Flagged, nicb, "NICB"
			msg.Text = fmt.Sprintf("sample %s: charge balance (NICB) %s, beyond the flag limit of %g %% (setting %s): kept and flagged; check its analyses",
				msg.Sample, nicb, s.NICBFlag, quoteSetting("nicb_flag_percent"))
		case st == qc.Incomplete: // kept, without a charge balance
			flags[i] = reports[i].Flag()
			flagged++
			msg.Effect, msg.Text = problem.Flagged, fmt.Sprintf("sample %s: %s; kept and flagged", msg.Sample, flags[i])
		default:
			msg = nil
		}
		if msg != nil {
			out.Messages = append(out.Messages, msg)
		}
		if !v.Use[i] {
			left++
		}
	}
	cols := []*Column{TextColumn("sample", ids), TextColumn("date", dates)}
	for k, sp := range species {
		unit := "µmol/L"
		if sp == chem.Alk {
			unit = "µeq/L"
		}
		cols = append(cols, NumColumn(sp.Symbol(), unit, conc[k]))
	}
	cols = append(cols, NumColumn("NICB", "%", v.NICB), TextColumn("flag", flags))
	out.Tables = append(out.Tables, &ResultTable{Name: "samples", Title: "Samples in µmol/L with charge balance", Columns: cols})
	out.Figures = append(out.Figures, Point("samples read", "", float64(n)), Point("samples flagged", "", float64(flagged)),
		Point("samples left out", "", float64(left)))
	sortMessages(out.Messages)
	if left == n {
		return out, noneUsed(tab, flags)
	}
	if err := v.readPrecision(s); err != nil {
		return out, err
	}
	out.Value = v
	return out, nil
}

// readPrecision sets the analytical precision from the settings and from
// any precision columns of the table ("Na rsd (%)": relative 1σ in percent
// for that species, row by row). A value that is not a number from 0 to
// 100 stops the cell with its row and column.
func (v *Samples) readPrecision(s *SamplesSettings) error {
	v.Precision = correct.UniformPrecision(s.PrecisionPercent/100, s.PrecisionFloor, s.SrFloor)
	v.Precision.Floor[chem.Alk], v.Precision.Floor[chem.HCO3] = s.AlkFloor, s.AlkFloor
	v.IsoPrecision = s.IsoPrecision
	for i, smp := range v.Table.Samples {
		for h, text := range smp.Meta {
			sp, ok := precisionColumn(h)
			if !ok || strings.TrimSpace(text) == "" {
				continue
			}
			x, err := parseNum(text)
			if err != nil || x < 0 || x > 100 {
				return fmt.Errorf("%s, line %d, column %q: sample %s: %q is not a relative precision in percent (0 to 100)", v.File, smp.Line, h, sampleName(smp), text)
			}
			if v.own == nil {
				v.own = make([]*correct.Precision, len(v.Table.Samples))
			}
			if v.own[i] == nil {
				p := v.Precision
				v.own[i] = &p
			}
			v.own[i].Rel[sp] = x / 100
		}
	}
	return nil
}

// alkFromHCO3 takes HCO3 as alkalinity (µmol/L of HCO3 are µeq/L) in
// every sample of a table that gives HCO3 and no alkalinity column, and
// returns the note that says so; nil when there is nothing to do. Values
// below detection keep their limit.
func alkFromHCO3(tab *sample.Table, pl *placer) *Message {
	col := -1
	for _, c := range tab.Columns {
		if c.Kind == sample.Concentration && c.Species == chem.Alk {
			return nil
		}
		if c.Kind == sample.Concentration && c.Species == chem.HCO3 {
			col = c.Index
		}
	}
	if col < 0 {
		return nil
	}
	n := 0
	for _, smp := range tab.Samples {
		if smp.C.Has(chem.HCO3) || smp.IsCensored(chem.HCO3) {
			smp.C[chem.Alk] = smp.C[chem.HCO3]
			if l, ok := smp.Limit(chem.HCO3); ok {
				smp.Censored[chem.Alk] = l
			}
			n++
		}
	}
	c := tab.Columns[col]
	return &Message{Severity: problem.Note, Effect: problem.Inferred, File: pl.name, Line: tab.Header, Col: col + 1, Column: c.Header, Row: -1, Err: ErrTakenAs,
		Text: fmt.Sprintf("HCO3 taken as alkalinity in %s (1 µmol/L of HCO3 is 1 µeq/L): the file gives HCO3 and no alkalinity column; the Alk column shows it, and the charge balance and CO2 use it", plural(n, "sample"))}
}

// noneUsed says why no sample enters the budget: how many samples were left
// out for each reason, then the import problems that explain it (an
// ambiguous date order, a column not recognised, a missing Na column).
func noneUsed(tab *sample.Table, flags []string) error {
	var reasons []string
	count := map[string]int{}
	for _, f := range flags {
		r := strings.TrimPrefix(f, "left out: ")
		if count[r]++; count[r] == 1 {
			reasons = append(reasons, r)
		}
	}
	for i, r := range reasons {
		reasons[i] = r + " (" + plural(count[r], "sample") + ")"
	}
	msg := "no sample enters the budget; left out: " + strings.Join(reasons, ", ")
	var why []string
	for _, p := range tab.Problems {
		if errors.Is(p, sample.ErrAmbiguousDate) || errors.Is(p, sample.ErrNoColumn) || errors.Is(p, sample.ErrNotTable) {
			why = append(why, p.Error())
		}
	}
	hasNa := false
	for _, sp := range tab.Species() {
		hasNa = hasNa || sp == chem.Na
	}
	if count["no Na"] > 0 && !hasNa {
		for _, p := range tab.Problems {
			if p.Line == tab.Header && p.Col > 0 && (errors.Is(p, sample.ErrNoUnit) || errors.Is(p, sample.ErrUnknownUnit) || errors.Is(p, sample.ErrUnitMismatch)) {
				why = append(why, p.Error())
			}
		}
		w := "no column was read as Na, which the budget needs"
		if u := tab.Unrecognised(); len(u) > 0 {
			q := make([]string, len(u))
			for i, h := range u {
				q[i] = strconv.Quote(h)
			}
			w += "; headers not recognised: " + strings.Join(q, ", ")
		}
		why = append(why, w)
	}
	if len(why) > 0 {
		msg += ". " + strings.Join(why, ". ")
	}
	return errors.New(msg)
}

// plural returns "1 sample" or "n samples".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}
