package carbonate

import (
	"math"
	"testing"
)

// TestConstantsAgainstPublishedValues checks the constants at 0, 10 and
// 25 °C against the values the docs/methods.md §10.1 and §13 item 12 give,
// computed there from the Plummer & Busenberg (1982, Geochim. Cosmochim.
// Acta 46, Table 1 equations) fits; the 25 °C values 6.352, 10.329, −1.468
// and −8.48 are the ones commonly quoted from that paper. Tolerance 5e-4
// (docs/methods.md §13 item 12).
func TestConstantsAgainstPublishedValues(t *testing.T) {
	for _, c := range []struct {
		name  string
		tC    float64
		got   func(float64) float64
		want  float64
		check string
	}{
		{"pK1", 0, func(t float64) float64 { return -LogK1(t) }, 6.5786, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"pK2", 0, func(t float64) float64 { return -LogK2(t) }, 10.6286, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"log KH", 0, LogKH, -1.1084, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"log Kcal", 0, LogKcal, -8.3814, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"pK1", 10, func(t float64) float64 { return -LogK1(t) }, 6.4633, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"pK2", 10, func(t float64) float64 { return -LogK2(t) }, 10.4879, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"log KH", 10, LogKH, -1.2694, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"log Kcal", 10, LogKcal, -8.4105, "Plummer & Busenberg 1982, via docs/methods.md §10.1"},
		{"pK1", 25, func(t float64) float64 { return -LogK1(t) }, 6.3519, "Plummer & Busenberg 1982 (6.352 commonly quoted)"},
		{"pK2", 25, func(t float64) float64 { return -LogK2(t) }, 10.3289, "Plummer & Busenberg 1982 (10.329 commonly quoted)"},
		{"log KH", 25, LogKH, -1.4679, "Plummer & Busenberg 1982 (−1.468 commonly quoted)"},
		{"log Kcal", 25, LogKcal, -8.4798, "Plummer & Busenberg 1982 (−8.48 commonly quoted)"},
		{"log Karg", 25, LogKarg, -8.3361, "Plummer & Busenberg 1982 equation, from memory (docs/methods.md §10.1)"},
		{"log Kw", 25, LogKw, -13.9947, "Stumm & Morgan 1996 fit, from memory (docs/methods.md §10.1)"},
		{"log Kdol", 25, LogKdol, -17.09, "Nordstrom et al. 1990, ordered dolomite, from memory"},
	} {
		if got := c.got(c.tC); math.Abs(got-c.want) > 5e-4 {
			t.Errorf("%s at %g °C = %.5f, want %.4f (%s)", c.name, c.tC, got, c.want, c.check)
		}
	}
}

// TestConstantsTrends checks what the trade knows of how the constants move
// with temperature (common practice): CO2 is less soluble and calcite less
// soluble in warmer water (retrograde solubility), and dolomite, whose
// dissolution releases heat (ΔH < 0, Nordstrom et al. 1990, from memory),
// likewise.
func TestConstantsTrends(t *testing.T) {
	prev := At(0)
	for tC := 5.0; tC <= 90; tC += 5 {
		k := At(tC)
		for _, c := range []struct {
			name     string
			now, was float64
		}{{"log KH", k.LogKH, prev.LogKH}, {"log Kcal", k.LogKcal, prev.LogKcal}, {"log Kdol", k.LogKdol, prev.LogKdol}} {
			if !(c.now < c.was) {
				t.Errorf("%s does not fall from %g to %g °C: %.4f → %.4f", c.name, tC-5, tC, c.was, c.now)
			}
		}
		if !(k.LogKarg > k.LogKcal) {
			t.Errorf("aragonite is not more soluble than calcite at %g °C", tC)
		}
		prev = k
	}
}
