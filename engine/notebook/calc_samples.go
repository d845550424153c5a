package notebook

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
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
}

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
	name, src := e.Cell.ID, t.Source != nil && t.Source.File != "" && len(t.Source.Lines) == len(t.Rows)
	if src {
		name = t.Source.File
	}
	opt := sample.Options{Comma: '\t', Policy: policies[s.BelowDetection], DateOrder: sampleOrders[s.DateOrder]}
	if s.DefaultUnit != "" {
		opt.Units = map[string]string{"": s.DefaultUnit}
	}
	tab := sample.ParseText(t.TSV(), name, opt)
	if tab.Problems.Count(sample.ErrNotTable) == 0 {
		tab.Problems = append(tab.Problems, tab.Require(sample.Date)...)
	}
	out := &Output{Marks: samplesMarks(t, tab.Problems, 0)} // before the lines become the file's
	if src {
		toFileLines(tab, t)
	}
	for _, p := range tab.Problems {
		out.Warnings = append(out.Warnings, p.Error())
	}
	n := len(tab.Samples)
	if n == 0 {
		out.Reading = samplesReading(t, tab, s, nil, len(out.Marks))
		return out, fmt.Errorf("no samples could be read: %v", tab.Problems.Err())
	}
	v := &Samples{Table: tab, Use: make([]bool, n), NICB: make([]float64, n), Days: make([]discharge.Day, n)}
	ids, dates, flags := make([]string, n), make([]string, n), make([]string, n)
	species := []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.NO3, chem.Alk, chem.SiO2, chem.Sr}
	for _, sp := range tab.Species() {
		if sp == chem.HCO3 { // a lab's HCO3 is shown as it was given, beside Alk
			species = append(species[:8:8], append([]chem.Species{chem.HCO3}, species[8:]...)...)
		}
	}
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
		switch st := reports[i].Status; {
		case !smp.HasTime:
			v.Use[i], flags[i] = false, "left out: no date"
		case !smp.C.Has(chem.Na) || smp.C[chem.Na] <= 0:
			v.Use[i], flags[i] = false, "left out: no Na"
		case st == qc.Unknown:
			v.Use[i], flags[i] = false, "left out: no charge balance (no anion measured)"
		case st == qc.Rejected:
			v.Use[i], flags[i] = false, fmt.Sprintf("left out: |NICB| above %g %%", s.NICBReject)
		case st == qc.Flagged:
			flags[i] = fmt.Sprintf("|NICB| above %g %%", s.NICBFlag)
			flagged++
		case st == qc.Incomplete: // kept, without a charge balance
			flags[i] = reports[i].Flag()
			flagged++
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
	out.Reading = samplesReading(t, tab, s, flags, len(out.Marks))
	if left == n {
		return out, noneUsed(tab, flags)
	}
	out.Value = v
	return out, nil
}

// toFileLines moves the line numbers of tab, read from t's TSV text, to the
// lines of the file t was read from.
func toFileLines(tab *sample.Table, t *Table) {
	m := t.fileLines()
	if m == nil {
		return
	}
	for _, p := range tab.Problems {
		if l, ok := m[p.Line]; ok {
			p.Line = l
		}
	}
	for _, s := range tab.Samples {
		if l, ok := m[s.Line]; ok {
			s.Line = l
		}
	}
	if l, ok := m[tab.Header]; ok {
		tab.Header = l
	}
	tab.Preamble = t.Source.Preamble
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
