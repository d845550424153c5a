package plot

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

func TestAxisMap(t *testing.T) {
	tests := []struct {
		name   string
		axis   Axis
		v, out float64
	}{
		{"linear middle", Axis{Min: 0, Max: 10, lo: 100, hi: 200}, 5, 150},
		{"linear reversed pixels", Axis{Min: 0, Max: 10, lo: 300, hi: 100}, 10, 100},
		{"log one decade of two", Axis{Log: true, Min: 1, Max: 100, lo: 0, hi: 200}, 10, 100},
		{"log bottom", Axis{Log: true, Min: 0.1, Max: 10, lo: 0, hi: 100}, 0.1, 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.axis.Map(tt.v); math.Abs(got-tt.out) > 1e-9 {
				t.Errorf("Map(%g): got %g, want %g", tt.v, got, tt.out)
			}
		})
	}
	t.Run("log of zero", func(t *testing.T) {
		a := Axis{Log: true, Min: 1, Max: 10}
		if got := a.Map(0); !math.IsNaN(got) {
			t.Errorf("Map(0) on a log axis: got %g, want NaN", got)
		}
	})
}

func TestLogTicksAreDecades(t *testing.T) {
	a := Axis{Log: true, Min: 0.1, Max: 1000}
	var labels []string
	for _, tk := range a.Ticks() {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if got, want := strings.Join(labels, " "), "0.1 1 10 100 1000"; got != want {
		t.Errorf("labels: got %q, want %q", got, want)
	}
}

func TestFinishPadsAndNeverEmpty(t *testing.T) {
	tests := []struct {
		name     string
		axis     Axis
		vals     []float64
		min, max float64
	}{
		{"empty linear", Axis{}, nil, 0, 1},
		{"one value", Axis{}, []float64{5}, 4, 6},
		{"positive snaps to zero", Axis{}, []float64{0.2, 11}, 0, 11.54},
		{"log quarter decades", Axis{Log: true}, []float64{2, 300}, math.Pow(10, 0.25), math.Pow(10, 2.5)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			a := tt.axis
			for _, v := range tt.vals {
				a.include(v)
			}
			a.finish()
			if math.Abs(a.Min-tt.min) > 1e-9 || math.Abs(a.Max-tt.max) > 1e-9 {
				t.Errorf("range: got [%g, %g], want [%g, %g]", a.Min, a.Max, tt.min, tt.max)
			}
		})
	}
}

func TestNumber(t *testing.T) {
	tests := []struct {
		v    float64
		want string
	}{
		{0, "0"}, {1, "1"}, {0.25, "0.25"}, {1234.6, "1235"}, {45.678, "45.68"}, {-3.9104, "-3.91"},
		{151300, "151,300"}, {112449, "112,400"}, {1.4351e6, "1.44 × 10⁶"}, {2.5e10, "2.50 × 10¹⁰"},
		{0.0001, "1.00 × 10⁻⁴"}, {-2e-5, "-2.00 × 10⁻⁵"}, {math.NaN(), "–"},
	}
	for _, tt := range tests {
		if got := Number(tt.v); got != tt.want {
			t.Errorf("Number(%g): got %q, want %q", tt.v, got, tt.want)
		}
	}
}

func TestColumnAndTickLabels(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		name   string
		format func([]float64) []string
		vs     []float64
		want   []string
	}{
		{"column: large values all scientific", Column, []float64{1.44e6, 380000, 0}, []string{"1.44 × 10⁶", "3.80 × 10⁵", "0"}},
		{"column: whole numbers", Column, []float64{78, 2021, 12000}, []string{"78", "2021", "12,000"}},
		{"column: narrow range, fixed decimals", Column, []float64{1.059, 0.3686, -3.91, -4.0012, nan}, []string{"1.059", "0.369", "-3.910", "-4.001", "–"}},
		{"column: large values rounded alike", Column, []float64{256012.4, 12913.2, 8851.7}, []string{"256,000", "12,900", "8900"}},
		{"column: small values keep two digits", Column, []float64{171.24, 8.514, 5.762}, []string{"171.2", "8.5", "5.8"}},
		{"column: two digits may ask for a fifth in the largest", Column, []float64{6.9, 0.041, -3.9099}, []string{"6.900", "0.041", "-3.910"}},
		{"column: wide range, value by value", Column, []float64{0.002, 25, 0.707}, []string{"0.002", "25", "0.707"}},
		{"column: nothing but zeros and gaps", Column, []float64{0, nan}, []string{"0", "–"}},
		{"ticks: plain", TickLabels, []float64{0, 0.2, 0.4, 0.6000000000000001}, []string{"0", "0.2", "0.4", "0.6"}},
		{"ticks: grouped", TickLabels, []float64{0, 50000, 100000, 150000}, []string{"0", "50,000", "100,000", "150,000"}},
		{"ticks: scientific", TickLabels, []float64{0, 5e5, 1e6, 1.5e6}, []string{"0", "5 × 10⁵", "10⁶", "1.5 × 10⁶"}},
		{"ticks: decades", TickLabels, []float64{0.1, 1, 10, 100}, []string{"0.1", "1", "10", "100"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := tt.format(tt.vs)
			if strings.Join(got, "|") != strings.Join(tt.want, "|") {
				t.Errorf("got %q, want %q", got, tt.want)
			}
		})
	}
}

func TestTextIsEscaped(t *testing.T) {
	c := New("t", `<script>x</script>`, "x <b>", "y")
	c.Points(`<img src=x onerror=1>`, StyleN(0), []float64{1}, []float64{2}, []string{`"><b>name`})
	svg := c.SVG()
	for _, bad := range []string{"<script>", "<img", "<b>"} {
		if strings.Contains(svg, bad) {
			t.Errorf("SVG holds markup %q from text", bad)
		}
	}
	if !strings.Contains(svg, "&lt;img src=x onerror=1&gt;") {
		t.Errorf("the series name is not shown as text")
	}
}

func TestEveryStyleDiffersBeyondColour(t *testing.T) {
	seen := map[string]bool{}
	for i, s := range Styles {
		key := s.Marker + "|" + s.Hatch + "|" + s.Dash
		if seen[key] {
			t.Errorf("style %d repeats marker, hatch and dash of another", i)
		}
		seen[key] = true
		if s.Hatch == "" || s.Marker == "" {
			t.Errorf("style %d has no hatch or marker", i)
		}
	}
}

func TestBarsCutRunawayInterval(t *testing.T) {
	c := New("b", "bars", "", "y")
	c.Bars([]string{"a", "b"}, []Segment{{Name: "s", Style: StyleN(1),
		Value: []float64{10, 20}, Lo: []float64{5, 15}, Hi: []float64{12, 1e9}}})
	svg := c.SVG()
	if c.Y.Max > 20*wideInterval {
		t.Errorf("y axis: got max %g, want at most %g (the runaway bound is cut)", c.Y.Max, 20*wideInterval)
	}
	if !strings.Contains(svg, "off the plot") {
		t.Errorf("the cut interval is not marked")
	}
}

func TestThinLabels(t *testing.T) {
	var ticks []Tick
	for i := 0; i < 40; i++ {
		ticks = append(ticks, Tick{Value: float64(i), Label: "CV-00"})
	}
	got := thinLabels(ticks, 12)
	n := 0
	for _, tk := range got {
		if tk.Label != "" {
			n++
		}
	}
	if n == 0 || n >= 40 {
		t.Errorf("labels kept: got %d of 40, want some but not all", n)
	}
}

// TestDivergingBars: values below zero stack downwards from zero and widen
// the axis; plain Bars leaves them out as before.
func TestDivergingBars(t *testing.T) {
	segs := []Segment{{Name: "dissolved", Style: StyleN(0), Value: []float64{10, 5}}, {Name: "formed", Style: StyleN(1), Value: []float64{-4, -8}}}
	c := New("d", "t", "x", "y")
	c.DivergingBars([]string{"a", "b"}, segs)
	svg := c.SVG()
	if c.Y.Min > -8 || c.Y.Max < 10 {
		t.Errorf("axis %g..%g does not hold -8..10", c.Y.Min, c.Y.Max)
	}
	if !strings.Contains(svg, "b formed: -8") || !strings.Contains(svg, "a dissolved: 10") {
		t.Error("bars missing")
	}
	// The bar below zero starts at zero: its top edge is the zero line.
	zero := c.Y.Map(0)
	if !strings.Contains(svg, fmt.Sprintf(`y="%.1f" width`, zero)) {
		t.Errorf("no bar hangs from zero (y %.1f)", zero)
	}
	p := New("p", "t", "x", "y")
	p.Bars([]string{"a", "b"}, segs)
	if svg := p.SVG(); strings.Contains(svg, "formed: -") || p.Y.Min < 0 {
		t.Error("plain bars drew values below zero")
	}
}

// TestStaggerLabels: long category labels that one row would thin take two
// rows, every one shown, when the chart asks for it.
func TestStaggerLabels(t *testing.T) {
	cats := []string{"plagioclase An30", "K-feldspar", "biotite", "magnesian calcite", "kaolinite"}
	draw := func(stagger bool) string {
		c := New("s", "t", "", "y")
		c.StaggerLabels = stagger
		c.Bars(cats, []Segment{{Name: "v", Style: StyleN(0), Value: []float64{1, 2, 3, 4, 5}}})
		return c.SVG()
	}
	plain, two := draw(false), draw(true)
	if strings.Contains(plain, ">K-feldspar<") {
		t.Error("one row kept every long label (the test needs thinning to happen)")
	}
	for _, l := range cats {
		if !strings.Contains(two, ">"+l+"<") {
			t.Errorf("staggered labels lack %q", l)
		}
	}
}
