package compare

import (
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/discharge"
	"lixiv/engine/flux"
)

// normalScatter returns a budget of a constant discharge over three
// calendar years and n samples whose concentrations are normal with mean mu
// and standard deviation sigma (invented), fluxed by the discharge-weighted
// estimator: every estimate is then a plain mean of the samples, the case
// with a closed form. It also returns the population standard deviation
// and mean of the concentrations, which the simulation resamples.
func normalScatter(n int, mu, sigma float64, seed uint64) (Scatter, float64, float64) {
	first := discharge.Date(2019, 1, 1)
	days := int(discharge.Date(2022, 1, 1) - first)
	q := make([]float64, days)
	for i := range q {
		q[i] = 1
	}
	rec := discharge.NewRecord("constant", first, q)
	rng := rand.New(rand.NewPCG(seed, 1))
	s := Scatter{Record: rec, Options: flux.Options{Method: flux.FlowWeighted, AreaKm2: 1, FirstMonth: 1}}
	for i := range n {
		s.Days = append(s.Days, first+discharge.Day(i*days/n))
		s.Q = append(s.Q, math.NaN())
		s.C = append(s.C, mu+sigma*rng.NormFloat64())
	}
	m := mean(s.C)
	v := 0.0
	for _, c := range s.C {
		v += (c - m) * (c - m)
	}
	return s, math.Sqrt(v / float64(n)), m
}

// zSum is z_(1−α/2) + z_(1−β) for α 0.05 and power 0.80: 1.959964 +
// 0.841621 = 2.801585 (standard normal quantiles; common practice).
const zSum = 1.959964 + 0.841621

// TestDetectableMatchesClosedForm: for normal errors of equal variance and
// a plain mean, the smallest difference detectable at two-sided level α
// with power 1 − β is (z_(1−α/2) + z_(1−β)) σ √(2/n) (common practice;
// 2.802 σ √(2/n) at 0.05 and 0.80), and √2 times that for BACI, which
// differences four means. The simulated detectable increase, relative to
// the mean, must match it within the simulation's error (20,000 simulated
// programmes for the null and as many for the power put the 97.5 % and
// 20 % quantiles within about 1 % of the spread; tolerance 4 %).
func TestDetectableMatchesClosedForm(t *testing.T) {
	s, sigma, mu := normalScatter(300, 100, 8, 7)
	for _, c := range []struct {
		name   string
		design Design
		plan   Plan
	}{
		{"treated-control, monthly, 2 years", TreatedControl, Plan{PerYear: 12, Years: 2}},
		{"treated-control, fortnightly, 1 year", TreatedControl, Plan{PerYear: 26, Years: 1}},
		{"BACI, monthly, 1 year each", BACI, Plan{PerYear: 12, Years: 1}},
	} {
		t.Run(c.name, func(t *testing.T) {
			det, err := Detect(s, c.design, c.plan, Power{Power: 0.8, Alpha: 0.05, Sims: 20000, Seed: 3})
			if err != nil {
				t.Fatal(err)
			}
			n := float64(c.plan.PerYear * c.plan.Years)
			want := zSum * sigma * math.Sqrt(2/n) / mu
			if c.design == BACI {
				want *= math.Sqrt2
			}
			t.Logf("simulated %.5f, closed form %.5f (%.2f %%); null sd %.5f, closed form %.5f", det.Relative, want,
				100*(det.Relative/want-1), det.SD, want/zSum)
			if math.Abs(det.Relative/want-1) > 0.04 {
				t.Errorf("detectable increase %.5f, closed form %.5f", det.Relative, want)
			}
		})
	}
}

// TestSamplesPerYear: the reverse of Detect. Asking for the increase that
// 12 samples a year detect gives about 12 (simulation noise may move it by
// a sample or two), and the design found detects it; an increase beyond
// reach of daily sampling is said to be out of reach.
func TestSamplesPerYear(t *testing.T) {
	s, _, _ := normalScatter(300, 100, 8, 7)
	p := Power{Power: 0.8, Alpha: 0.05, Sims: 1000, Seed: 4}
	d12, err := Detect(s, TreatedControl, Plan{PerYear: 12, Years: 2}, p)
	if err != nil {
		t.Fatal(err)
	}
	n, det, ok, err := SamplesPerYear(s, TreatedControl, 2, d12.Relative, p, 365)
	if err != nil {
		t.Fatal(err)
	}
	if !ok || n < 10 || n > 14 || det.Relative > d12.Relative || det.Plan.PerYear != n {
		t.Errorf("samples a year %d (ok %v, detects %.4f), want about 12 detecting %.4f or less", n, ok, det.Relative, d12.Relative)
	}
	// With a curve already simulated, the answer is the same.
	d6, err := Detect(s, TreatedControl, Plan{PerYear: 6, Years: 2}, p)
	if err != nil {
		t.Fatal(err)
	}
	d26, err := Detect(s, TreatedControl, Plan{PerYear: 26, Years: 2}, p)
	if err != nil {
		t.Fatal(err)
	}
	if m, _, ok, err := SamplesPerYear(s, TreatedControl, 2, d12.Relative, p, 365, d6, d12, d26); err != nil || !ok || m != n {
		t.Errorf("with a curve: %d (%v, %v), want %d", m, ok, err, n)
	}
	if n, _, ok, err := SamplesPerYear(s, TreatedControl, 1, 0.001, p, 52); err != nil || ok || n != 52 {
		t.Errorf("an increase of 0.1 %%: %d, %v, %v; want out of reach at 52", n, ok, err)
	}
}

// TestDetectRefuses: too few samples to learn the scatter from, or a
// programme of no samples, are refused with a message.
func TestDetectRefuses(t *testing.T) {
	s, _, _ := normalScatter(2, 100, 8, 7)
	if _, err := Detect(s, TreatedControl, Plan{PerYear: 12, Years: 1}, Power{Power: 0.8, Alpha: 0.05, Sims: 100}); err == nil {
		t.Error("two samples are not enough")
	}
	s, _, _ = normalScatter(50, 100, 8, 7)
	if _, err := Detect(s, TreatedControl, Plan{PerYear: 0, Years: 1}, Power{Power: 0.8, Alpha: 0.05, Sims: 100}); err == nil {
		t.Error("no samples a year is refused")
	}
}

func BenchmarkDetect(b *testing.B) {
	s, _, _ := normalScatter(100, 100, 8, 7)
	s.Options.Method = flux.Rating
	for b.Loop() {
		if _, err := Detect(s, TreatedControl, Plan{PerYear: 26, Years: 2}, Power{Power: 0.8, Alpha: 0.05, Sims: 500, Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

// TestDetectOnPartYears: a record with no complete reporting year lends
// its 365-day spans; one shorter than a year is refused.
func TestDetectOnPartYears(t *testing.T) {
	s, _, _ := normalScatter(60, 100, 8, 7)
	for _, c := range []struct {
		from, days int
		ok         bool
	}{{150, 400, true}, {150, 200, false}} {
		r := s
		r.Record = discharge.NewRecord("part", s.Record.Days[c.from], s.Record.Q[c.from:c.from+c.days])
		_, err := Detect(r, TreatedControl, Plan{PerYear: 12, Years: 1}, Power{Power: 0.8, Alpha: 0.05, Sims: 50, Seed: 1})
		if (err == nil) != c.ok {
			t.Errorf("%d days from day %d: %v", c.days, c.from, err)
		}
	}
}
