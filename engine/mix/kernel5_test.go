package mix

import (
	"math"
	"slices"
	"testing"
)

// TestDraws5MatchesDrawsN checks that the five-end-member kernel keeps the
// same draws with the same misfits and fractions, bit for bit, as the loop
// kernel drawsN, for several tracer sets, noise levels and both bounds.
func TestDraws5MatchesDrawsN(t *testing.T) {
	truth, prior := catchment()
	prior = append(prior, PresetBasaltic())
	cases := []struct {
		tracers []Tracer
		noise   float64
	}{
		{allTracers, 0.02},
		{allTracers, 0.2},
		{[]Tracer{CaNa, MgNa, HCO3Na, ClNa}, 0.02},
		{[]Tracer{CaNa, MgNa, HCO3Na}, 0.2},
		{[]Tracer{CaNa, MgNa, KNa, HCO3Na, ClNa, SrNa}, 0.02},
	}
	const draws = 1500
	for _, c := range cases {
		ws, _ := catchmentWaters(truth, 10, c.noise, 3)
		r, err := NewRun(Problem{EndMembers: prior, Tracers: c.tracers, Waters: ws}, &Options{Draws: draws, Seed: 7})
		if err != nil {
			t.Fatal(err)
		}
		kept := 0
		for s := range ws {
			pr := &r.res.Samples[s].prep
			if pr.skip {
				continue
			}
			for _, bound := range []float64{pr.thresh, maxWeightChi2} {
				var want, got SampleResult
				r.drawsN(&want, pr, 0, draws, bound)
				r.draws5(&got, pr, 0, draws, bound)
				kept += len(want.kept)
				if !sameBits(want.chi2, got.chi2) || !sameBits(want.alpha, got.alpha) || !slices.Equal(want.kept, got.kept) {
					t.Fatalf("%d tracers, noise %g, sample %d, bound %g: draws5 differs from drawsN", len(c.tracers), c.noise, s, bound)
				}
			}
		}
		if kept == 0 {
			t.Errorf("%d tracers, noise %g: no draw kept, nothing compared", len(c.tracers), c.noise)
		}
	}
}

// sameBits reports whether x and y hold the same float64 bits.
func sameBits(x, y []float64) bool {
	if len(x) != len(y) {
		return false
	}
	for i := range x {
		if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
			return false
		}
	}
	return true
}
