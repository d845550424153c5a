package notebook

import (
	"fmt"

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

func computeSamples(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*SamplesSettings)
	t := e.Cell.Table
	if t == nil || len(t.Columns) == 0 {
		return nil, fmt.Errorf("the sample table is empty: paste or open a table of water samples")
	}
	// Messages name the cell by its id, which (unlike the title) only an
	// edit that recomputes the cell can change.
	opt := sample.Options{Comma: '\t', Policy: policies[s.BelowDetection], DateOrder: sampleOrders[s.DateOrder]}
	if s.DefaultUnit != "" {
		opt.Units = map[string]string{"": s.DefaultUnit}
	}
	tab := sample.ParseText(t.TSV(), e.Cell.ID, opt)
	out := &Output{}
	for _, p := range tab.Problems {
		out.Warnings = append(out.Warnings, p.Error())
	}
	n := len(tab.Samples)
	if n == 0 {
		return nil, fmt.Errorf("no samples could be read: %v", tab.Problems.Err())
	}
	v := &Samples{Table: tab, Use: make([]bool, n), NICB: make([]float64, n), Days: make([]discharge.Day, n)}
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
	if left == n {
		return nil, fmt.Errorf("every sample was left out; see the flag column")
	}
	out.Value = v
	return out, nil
}
