package web

import (
	"context"
	"os"
	"strings"
	"testing"

	"lixiv/engine/notebook"
)

// TestChartsOfTheDemo computes the demo budget natively and checks that
// every chart the page promises is drawn from the engine's outputs: a
// renamed output table or column shows up here rather than as a chart
// that silently goes missing.
func TestChartsOfTheDemo(t *testing.T) {
	d := demoBudget(t)
	want := map[notebook.Kind][]string{
		notebook.KindSamples:       {"Charge balance"},
		notebook.KindDischarge:     {"Hydrograph"},
		notebook.KindSources:       {"Mixing diagram: Ca/Na against Mg/Na", "Mixing diagram: Ca/Na against HCO3/Na"},
		notebook.KindApportionment: {"Sources of Ca", "Sources of Na"},
		notebook.KindFluxes:        {"Concentration against discharge", "Mean annual yield of each cation", "Mean annual cation yield"},
		notebook.KindCO2:           {"CO2 consumption by source"},
	}
	var cc ChartCache
	for _, c := range d.Cells {
		titles, ok := want[c.Kind]
		if !ok {
			continue
		}
		t.Run(string(c.Kind), func(t *testing.T) {
			o := d.Output(c.ID)
			if o == nil {
				t.Fatalf("cell %s not computed", c.ID)
			}
			views := cc.For(d, c, o)
			if len(views) != len(titles) {
				var got []string
				for _, v := range views {
					got = append(got, v.Title)
				}
				t.Fatalf("charts: got %q, want %d: %q", got, len(titles), titles)
			}
			for i, v := range views {
				if !strings.HasPrefix(v.Title, titles[i]) {
					t.Errorf("chart %d: got %q, want %q", i, v.Title, titles[i])
				}
				if !strings.HasPrefix(v.SVG, "<svg") || strings.Count(v.SVG, "<path")+strings.Count(v.SVG, "<rect")+strings.Count(v.SVG, "<circle") < 10 {
					t.Errorf("chart %q draws almost nothing", v.Title)
				}
			}
			if again := cc.For(d, c, o); len(again) > 0 && &again[0] != &views[0] {
				t.Errorf("charts redrawn with no change of their inputs")
			}
		})
	}
}

// TestMixingDiagramRatios checks that the mixing diagrams plot the ratios
// after rain correction when the budget has an atmosphere cell, and the
// measured ratios, labelled as such, when it has none.
func TestMixingDiagramRatios(t *testing.T) {
	d := demoBudget(t)
	tests := []struct {
		name   string
		remove bool // remove the atmosphere cell first
		label  string
	}{
		{"with atmosphere cell", false, "samples after rain correction"},
		{"without atmosphere cell", true, "samples (measured, before rain correction)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.remove {
				for _, c := range d.Cells {
					if c.Kind == notebook.KindAtmosphere {
						if err := d.Remove(c.ID); err != nil {
							t.Fatal(err)
						}
						break
					}
				}
				d.Recompute(context.Background(), nil) // cells below lose their input; the samples cell stays
			}
			for _, ratio := range []string{"Mg/Na", "HCO3/Na"} {
				x, y, names, label := notebook.SampleRatios(d, ratio)
				if label != tc.label {
					t.Errorf("%s: label %q, want %q", ratio, label, tc.label)
				}
				if len(x) < 10 || len(x) != len(y) || len(names) != len(x) {
					t.Errorf("%s: %d x, %d y, %d names; want equal lengths, at least 10", ratio, len(x), len(y), len(names))
				}
			}
		})
	}
}

// TestChartMarks checks the marks the demo's charts must carry: the
// charge-balance thresholds of the samples cell (5 and 10 % in the demo),
// and per-sample bars that keep their width at 78 samples.
func TestChartMarks(t *testing.T) {
	d := demoBudget(t)
	tests := []struct {
		kind  notebook.Kind
		chart int
		want  []string
	}{
		{notebook.KindSamples, 0, []string{"±5 % (flag)", "±10 % (left out)", `stroke-dasharray="6 3"`}},
		{notebook.KindApportionment, 0, []string{`class="chart wide"`}},
	}
	for _, tt := range tests {
		t.Run(string(tt.kind), func(t *testing.T) {
			for _, c := range d.Cells {
				if c.Kind != tt.kind {
					continue
				}
				charts := Charts(d, c, d.Output(c.ID))
				if len(charts) <= tt.chart {
					t.Fatalf("got %d charts", len(charts))
				}
				svg := charts[tt.chart].SVG()
				for _, w := range tt.want {
					if !strings.Contains(svg, w) {
						t.Errorf("the chart lacks %s", w)
					}
				}
				return
			}
			t.Fatalf("no %s cell", tt.kind)
		})
	}
}

// demoBudget reads and computes the demo budget.
func demoBudget(t *testing.T) *notebook.Document {
	t.Helper()
	b, err := os.ReadFile("../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Skip("no demo budget:", err)
	}
	d, err := notebook.Parse(b, "corrie-vale")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestMixingDiagramMarks checks that the mixing diagrams draw what the
// apportionment decides to mark: the samples it cannot fit, and the edge
// of an end-member's prior box that posteriors press against.
func TestMixingDiagramMarks(t *testing.T) {
	d := demoBudget(t)
	var a *notebook.Apportioned
	var src *notebook.Cell
	for _, c := range d.Cells {
		switch c.Kind {
		case notebook.KindApportionment:
			a, _ = d.Output(c.ID).Value.(*notebook.Apportioned)
		case notebook.KindSources:
			src = c
		}
	}
	if a == nil || src == nil {
		t.Fatal("the demo has no apportionment or no end-member cell")
	}
	_, _, names, _ := notebook.SampleRatios(d, "Mg/Na")
	if len(names) == 0 {
		t.Fatal("no samples in the mixing diagram")
	}
	a.Diagram = notebook.Marks{
		Names:  []string{names[0]},
		Misfit: []string{"Mg/Na"},
		Edges:  []notebook.BoxEdge{{EndMember: "carbonate", Ratio: "Ca/Na", Upper: true, Value: 60, Samples: []string{names[0]}}},
		Shared: []notebook.SharedMark{{EndMember: "carbonate", Ratio: "Ca/Na", Lo: 40, Median: 50, Hi: 60}, {EndMember: "carbonate", Ratio: "Mg/Na", Lo: 12, Median: 14, Hi: 16}},
	}
	ch := mixingChart("m", d, src, d.Output(src.ID), "Mg/Na")
	if ch == nil {
		t.Fatal("no mixing diagram")
	}
	svg := ch.SVG()
	for _, w := range []string{
		"samples the apportionment cannot fit",
		names[0] + ": does not fit Mg/Na",
		"carbonate Ca/Na: upper edge the fit presses against (1 sample)",
		"carbonate: shared ratios the samples taught (95 %)",
	} {
		if !strings.Contains(svg, w) {
			t.Errorf("the diagram lacks %q", w)
		}
	}
}

// TestCO2BarsNameEveryBar: the CO2 cell's bars, the chosen sulfate origin's
// and the other's, each carry a label of their own in the drawn chart.
func TestCO2BarsNameEveryBar(t *testing.T) {
	d := demoBudget(t)
	for _, c := range d.Cells {
		if c.Kind != notebook.KindCO2 {
			continue
		}
		ch := figureBars("co2-bars", "CO2 consumption by source", d.Output(c.ID), "mol/km²/yr", "CO2 consumption per km²")
		if ch == nil {
			t.Fatal("no CO2 bars")
		}
		want := []string{"silicate", "carbonate", "silicate, SO4 from sulfide", "carbonate, SO4 from sulfide"}
		if strings.Join(ch.X.Names, "|") != strings.Join(want, "|") {
			t.Fatalf("bars %q, want %q", ch.X.Names, want)
		}
		svg := ch.SVG()
		for _, w := range want {
			if !strings.Contains(svg, ">"+w+"</text>") {
				t.Errorf("the chart does not label the bar %q", w)
			}
		}
		return
	}
	t.Fatal("the demo has no CO2 cell")
}
