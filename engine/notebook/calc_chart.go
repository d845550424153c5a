package notebook

import (
	"fmt"
	"strings"
)

func init() { Register(KindChart, computeChart) }

// ColumnRef finds the output column named by a chart reference
// "cell.table.column" (the column name may itself hold dots).
func (d *Document) ColumnRef(ref string) (*Column, error) {
	parts := strings.SplitN(ref, ".", 3)
	if len(parts) != 3 || parts[0] == "" || parts[1] == "" || parts[2] == "" {
		return nil, fmt.Errorf("%q: name a column as cell.table.column", ref)
	}
	o, err := d.outputOf(parts[0])
	if err != nil {
		return nil, err
	}
	t := o.Table(parts[1])
	if t == nil {
		return nil, fmt.Errorf("%q: cell %s has no table %q", ref, parts[0], parts[1])
	}
	c := t.Column(parts[2])
	if c == nil {
		return nil, fmt.Errorf("%q: table %s.%s has no column %q", ref, parts[0], parts[1], parts[2])
	}
	return c, nil
}

func computeChart(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*ChartSettings)
	if s.X == "" || s.Y == "" {
		return nil, fmt.Errorf("choose the columns to plot: x and y, each written cell.table.column")
	}
	x, err := e.doc.ColumnRef(s.X)
	if err != nil {
		return nil, settingErr("x", "%v", err)
	}
	y, err := e.doc.ColumnRef(s.Y)
	if err != nil {
		return nil, settingErr("y", "%v", err)
	}
	if y.Num == nil {
		return nil, settingErr("y", "column %s holds text, not numbers", s.Y)
	}
	if x.Len() != y.Len() {
		return nil, fmt.Errorf("x has %d values and y %d; choose columns of the same table or of tables with one row per sample", x.Len(), y.Len())
	}
	xc, yc := *x, *y
	xc.Name, yc.Name = "x", "y"
	out := &Output{Tables: []*ResultTable{{Name: "points", Title: s.Y + " against " + s.X, Columns: []*Column{&xc, &yc}}}}
	if s.LogX && x.Num != nil || s.LogY {
		bad := 0
		for i := 0; i < x.Len(); i++ {
			if s.LogX && x.Num != nil && !(x.Num[i] > 0) || s.LogY && !(y.Num[i] > 0) {
				bad++
			}
		}
		if bad > 0 {
			out.Warnings = append(out.Warnings, fmt.Sprintf("%d points with values at or below zero cannot be shown on a log axis", bad))
		}
	}
	return out, nil
}
