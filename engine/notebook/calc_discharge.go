package notebook

import (
	"fmt"
	"math"

	"lixiv/engine/discharge"
)

// Flow is the value a discharge cell hands on: the daily record, gaps
// filled as the user chose.
type Flow struct {
	Record *discharge.Record
	Site   *Site // nil when the budget has no site cell
}

func init() { Register(KindDischarge, computeDischarge) }

// RecordRunoffFigure names the discharge cell's runoff: that of every day
// of the record with discharge, scaled to a year of 365.25 days. The
// fluxes cell's (RunoffFigure) covers the complete years of the budget
// period only.
const RecordRunoffFigure = "runoff of the whole record"

var dischargeOrders = map[string]discharge.DateOrder{"auto": discharge.AutoOrder, "day-first": discharge.DayFirst, "month-first": discharge.MonthFirst}

func computeDischarge(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*DischargeSettings)
	t := e.Cell.Table
	var site *Site
	if o, err := e.Input("site"); err != nil {
		return nil, err
	} else if o != nil {
		site = o.Value.(*Site)
	}
	unit, err := discharge.ParseUnit(s.Unit)
	if err != nil {
		return nil, settingErr("unit", "%v", err)
	}
	// Messages name the file the table was read from in this session, and
	// its lines, when there is one; else the cell and the table's lines.
	pl := newPlacer(e.Cell.ID, t)
	opt := discharge.Options{File: pl.name, Unit: unit, Delimiter: '\t', DateOrder: dischargeOrders[s.DateOrder], Line: pl.line()}
	if site != nil {
		opt.AreaKm2 = site.AreaKm2
	}
	im := discharge.ReadString(t.TSV(), opt)
	out := &Output{Messages: append(pl.fromDischarge(im.Problems), pl.fromDischarge(im.Notices)...)}
	out.Messages = append(out.Messages, pl.sourceNotes(t)...)
	sortMessages(out.Messages)
	out.Reading = dischargeReading(t, im)
	rec := im.Record
	if rec == nil || rec.Len() == 0 {
		return out, fmt.Errorf("no discharge could be read: %v", out.Messages.Err())
	}
	if s.GapFillDays > 0 {
		var rep discharge.FillReport
		rec, rep = rec.Fill(discharge.FillLinear, s.GapFillDays)
		if rep.Days > 0 {
			out.Warnings = append(out.Warnings, fmt.Sprintf("%d gap days filled by linear interpolation (%.1f %% of the record)", rep.Days, 100*rep.Fraction(rec.Len())))
		}
		for _, g := range rep.Left {
			out.Warnings = append(out.Warnings, "gap left open: "+g.String())
		}
	} else if m := rec.Missing(); m > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("%d days without discharge are left as gaps (set %q to fill short ones)", m, SettingLabel("gap_fill_days")))
	}
	days := make([]string, rec.Len())
	for i, d := range rec.Days {
		days[i] = d.String()
	}
	out.Tables = append(out.Tables, &ResultTable{Name: "daily", Title: "Daily discharge", Columns: []*Column{
		TextColumn("date", days), NumColumn("discharge", "m³/s", append([]float64(nil), rec.Q...))}})
	if site != nil {
		first := site.WaterYearStart
		var labels []string
		var runoff, cover []float64
		for _, y := range rec.Years(first) {
			mm, n := rec.Runoff(y.Start, y.End, site.AreaKm2)
			labels = append(labels, fmt.Sprint(y.Label))
			runoff = append(runoff, mm)
			cover = append(cover, float64(n)/float64(y.Days))
			if !y.Complete() {
				labels[len(labels)-1] += " (part)"
			}
		}
		out.Tables = append(out.Tables, &ResultTable{Name: "years", Title: "Runoff by year", Columns: []*Column{
			TextColumn("year", labels), NumColumn("runoff", "mm", runoff), NumColumn("days with data", "fraction", cover)}})
		mm, n := rec.Runoff(rec.First(), rec.Last(), site.AreaKm2)
		if n > 0 {
			r := mm / float64(n) * 365.25
			f := Point(RecordRunoffFigure, "mm/yr", r)
			f.Note = "from the record: every day with a value; no discharge or area errors"
			out.Figures = append(out.Figures, f)
			// Water balance: |P − ET − R| / P above 20 % is flagged (docs/methods.md
			// §1.3; common practice, no source).
			if site.P > 0 && site.ET > 0 {
				if gap := math.Abs(site.P-site.ET-r) / site.P; gap > 0.2 {
					out.Warnings = append(out.Warnings, fmt.Sprintf("water balance: P − ET = %.0f mm/yr but the record gives %.0f mm/yr of runoff (%.0f %% of P apart); check the area, P and ET", site.P-site.ET, r, 100*gap))
				}
			}
		}
	}
	out.Value = &Flow{Record: rec, Site: site}
	return out, nil
}
