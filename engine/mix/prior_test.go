package mix

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"
)

func TestPriorSampling(t *testing.T) {
	tests := []struct {
		name    string
		p       Prior
		lo, hi  float64 // expected 2.5 % and 97.5 % quantiles of the draws
		med     float64 // expected median
		bounded bool    // draws must lie in [Lo, Hi]
	}{
		// log-uniform on [0.2, 0.5]: quantiles 0.2 (0.5/0.2)^p (common practice)
		{"log-uniform", Range(0.2, 0.35, 0.5), 0.2 * math.Pow(2.5, 0.025), 0.2 * math.Pow(2.5, 0.975), 0.2 * math.Sqrt(2.5), true},
		// log-normal, median 50, 95 % range is [Lo, Hi] by construction
		{"log-normal", Spread(50, 0.2), 50 / math.Exp(1.959964*0.2), 50 * math.Exp(1.959964*0.2), 50, false},
		{"fixed", FixedRatio(0.7092), 0.7092, 0.7092, 0.7092, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if err := tc.p.Validate(); err != nil {
				t.Fatal(err)
			}
			s := newSampler(tc.p)
			rng := rand.New(rand.NewPCG(1, 2))
			v := make([]float64, 40000)
			for i := range v {
				v[i] = s.draw((float64(rng.Uint64()>>11) + 0.5) * 0x1p-53)
				if tc.bounded && (v[i] < tc.p.Lo || v[i] > tc.p.Hi) {
					t.Fatalf("draw %g outside [%g, %g]", v[i], tc.p.Lo, tc.p.Hi)
				}
			}
			sort.Float64s(v)
			q := func(p float64) float64 { return v[int(p*float64(len(v)-1))] }
			// Sampling error of a quantile from 40,000 draws is well under 2 %.
			for _, c := range []struct {
				name      string
				got, want float64
			}{
				{"2.5 %", q(0.025), tc.lo}, {"median", q(0.5), tc.med}, {"97.5 %", q(0.975), tc.hi},
			} {
				if math.Abs(c.got-c.want) > 0.02*c.want {
					t.Errorf("%s quantile got %.6g want %.6g (2 %%)", c.name, c.got, c.want)
				}
			}
		})
	}
}

func TestPriorValidate(t *testing.T) {
	bad := []Prior{
		{Dist: Fixed, Value: -1},
		{Dist: Fixed, Value: math.NaN()},
		{Dist: LogUniform, Lo: 0, Value: 1, Hi: 2},
		{Dist: LogUniform, Lo: 3, Value: 1, Hi: 2},
		{Dist: LogNormal, Lo: 1, Value: 5, Hi: 2},
		{Dist: LogNormal, Lo: 1, Value: 1.5, Hi: math.Inf(1)},
		{Dist: Dist(9), Value: 1},
	}
	for _, p := range bad {
		if err := p.Validate(); err == nil {
			t.Errorf("%+v: no error", p)
		}
	}
	var zero Prior
	if err := zero.Validate(); err != nil {
		t.Errorf("zero prior: %v, want a valid fixed 0", err)
	}
}

func TestPresetsValid(t *testing.T) {
	for _, e := range []EndMember{PresetRain(), PresetSilicate(), PresetGranitic(), PresetBasaltic(), PresetCarbonate(), PresetEvaporite()} {
		t.Run(e.Name, func(t *testing.T) {
			if err := e.Validate(); err != nil {
				t.Fatal(err)
			}
			if e.Ref == "" {
				t.Error("preset without a source")
			}
			for tr := range NTracers {
				p := e.Ratio[tr]
				if p.Dist != Fixed && (p.Value < p.Lo || p.Value > p.Hi) {
					t.Errorf("%s: central %g outside [%g, %g]", tr, p.Value, p.Lo, p.Hi)
				}
			}
		})
	}
	// Sea-salt ratios: Millero et al. (2008) molalities, docs/methods.md §4.2
	// (Ca/Na 0.0219249, Mg/Na 0.112624, K/Na 0.0217663, Cl/Na 1.16398).
	r := PresetRain()
	for tr, want := range map[Tracer]float64{CaNa: 0.0219249, MgNa: 0.112624, KNa: 0.0217663, ClNa: 1.16398} {
		if got := r.Ratio[tr].Value; math.Abs(got-want) > 1e-9 {
			t.Errorf("rain %s got %g want %g", tr, got, want)
		}
	}
	// Gaillardet et al. (1999) global silicate central values, docs/methods.md §6.2.
	s := PresetSilicate()
	for tr, want := range map[Tracer]float64{CaNa: 0.35, MgNa: 0.24, HCO3Na: 2, SrNa: 0.003} {
		if got := s.Ratio[tr].Value; got != want {
			t.Errorf("silicate %s got %g want %g", tr, got, want)
		}
	}
	if got := len(DefaultEndMembers(true)); got != 4 {
		t.Errorf("raw waters: %d end-members, want 4 (with rain)", got)
	}
	if got := DefaultEndMembers(false); len(got) != 3 || slices.ContainsFunc(got, func(e EndMember) bool { return e.Source == Atmosphere }) {
		t.Errorf("corrected waters: end-members %v, want three without rain", got)
	}
}

func TestParseTracer(t *testing.T) {
	tests := []struct {
		in   string
		want Tracer
		ok   bool
	}{
		{"Ca/Na", CaNa, true}, {" mg/na ", MgNa, true}, {"K / Na", KNa, true}, {"Alk/Na", HCO3Na, true},
		{"87Sr/86Sr", Sr87Sr86, true}, {"Sr87/Sr86", Sr87Sr86, true}, {"Sr/Na", SrNa, true}, {"Cl/Na", ClNa, true},
		{"Na/Ca", 0, false}, {"", 0, false},
	}
	for _, tc := range tests {
		got, err := ParseTracer(tc.in)
		if (err == nil) != tc.ok || (tc.ok && got != tc.want) {
			t.Errorf("ParseTracer(%q) = %v, %v; want %v, ok %v", tc.in, got, err, tc.want, tc.ok)
		}
		if tc.ok && got.String() == "" {
			t.Errorf("%v has no name", got)
		}
	}
}

func TestStatusTable(t *testing.T) {
	for s := NotRun; s <= Canceled; s++ {
		if s.String() == "unknown status" {
			t.Errorf("%d has no name", s)
		}
		if (s.Err() == nil) != (s == Fits || s == Rule) {
			t.Errorf("%v: Err() = %v", s, s.Err())
		}
	}
	if Status(99).Err() == nil || Status(99).String() != "unknown status" {
		t.Error("out-of-range status not reported")
	}
}
