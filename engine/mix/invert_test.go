package mix

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
)

// docs/methods.md §13 item 15: end-members (Ca/Na, Mg/Na, HCO3/Na, 1000 Sr/Na,
// 87Sr/86Sr) silicate (0.35, 0.24, 2, 3, 0.7200), carbonate (50, 10, 120, 50,
// 0.7080), evaporite (0.17, 0.02, 0.3, 1.0, 0.7075) — illustrative test
// values of docs/methods.md §13 item 15, not a recommendation.
func item15EndMembers(spread float64) []EndMember {
	mk := func(name string, src Source, ca, mg, hco3, sr1000, r float64) EndMember {
		p := func(v float64) Prior {
			if spread == 0 {
				return FixedRatio(v)
			}
			return Spread(v, spread)
		}
		e := EndMember{Name: name, Source: src}
		e.Ratio[CaNa] = p(ca)
		e.Ratio[MgNa] = p(mg)
		e.Ratio[HCO3Na] = p(hco3)
		e.Ratio[SrNa] = p(sr1000 / 1000)
		e.Ratio[Sr87Sr86] = p(r)
		return e
	}
	return []EndMember{
		mk("silicate", Silicate, 0.35, 0.24, 2, 3, 0.7200),
		mk("carbonate", Carbonate, 50, 10, 120, 50, 0.7080),
		mk("evaporite", Evaporite, 0.17, 0.02, 0.3, 1.0, 0.7075),
	}
}

var item15Tracers = []Tracer{CaNa, MgNa, HCO3Na, SrNa, Sr87Sr86}

// mixWater mixes end-members (at their central values) with Na fractions
// alpha into a water of the given Na (µmol/L).
func mixWater(name string, em []EndMember, alpha []float64, na float64) Water {
	c := chem.NewComposition()
	c[chem.Na] = na
	sp := map[Tracer]chem.Species{CaNa: chem.Ca, MgNa: chem.Mg, KNa: chem.K, HCO3Na: chem.HCO3, ClNa: chem.Cl, SrNa: chem.Sr}
	for t, s := range sp {
		v := 0.0
		for j := range em {
			v += alpha[j] * em[j].Ratio[t].Value
		}
		c[s] = v * na
	}
	num, den := 0.0, 0.0
	for j := range em {
		num += alpha[j] * em[j].Ratio[SrNa].Value * em[j].Ratio[Sr87Sr86].Value
		den += alpha[j] * em[j].Ratio[SrNa].Value
	}
	return Water{Name: name, Conc: c, Sr87Sr86: num / den}
}

func TestItem15MixtureValues(t *testing.T) {
	w := mixWater("item 15", item15EndMembers(0), []float64{0.6, 0.1, 0.3}, 100)
	// docs/methods.md §13 item 15: mixture ratios (5.261, 1.15, 13.29, 7.1) and
	// 87Sr/86Sr 0.7110211 (1000 Sr/Na for the fourth).
	tests := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"Ca/Na", w.Conc[chem.Ca] / 100, 5.261, 1e-12},
		{"Mg/Na", w.Conc[chem.Mg] / 100, 1.15, 1e-12},
		{"HCO3/Na", w.Conc[chem.HCO3] / 100, 13.29, 1e-12},
		{"1000 Sr/Na", 1000 * w.Conc[chem.Sr] / 100, 7.1, 1e-12},
		{"87Sr/86Sr", w.Sr87Sr86, 0.7110211, 5e-8},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > tc.tol*math.Max(1, math.Abs(tc.want)) {
			t.Errorf("%s: got %.10g want %.10g", tc.name, tc.got, tc.want)
		}
	}
}

func TestInvertFixedEndMembersRecoverAlpha(t *testing.T) {
	// docs/methods.md §13 item 15: noise-free data and fixed end-members return
	// alpha to 1e-6 with chi2 ≈ 0.
	em := item15EndMembers(0)
	want := []float64{0.6, 0.1, 0.3}
	p := Problem{EndMembers: em, Tracers: item15Tracers, Waters: []Water{mixWater("item 15", em, want, 100)}}
	res, err := Invert(context.Background(), p, &Options{Draws: 50, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	sr := &res.Samples[0]
	if sr.Status != Success || sr.Kept != 50 {
		t.Fatalf("status %v kept %d, want success with 50 kept", sr.Status, sr.Kept)
	}
	a, chi2 := res.AlphaAt(0, 0)
	for j := range want {
		if math.Abs(a[j]-want[j]) > 1e-6 {
			t.Errorf("alpha[%s] got %.10f want %.1f (tolerance 1e-6)", em[j].Name, a[j], want[j])
		}
		if math.Abs(sr.Alpha[j].Median-want[j]) > 1e-6 {
			t.Errorf("median alpha[%s] got %.10f want %.1f", em[j].Name, sr.Alpha[j].Median, want[j])
		}
	}
	if chi2 > 1e-9 {
		t.Errorf("chi2 got %g want ≈ 0 (< 1e-9)", chi2)
	}
}

func TestInvertNarrowPriorsContainTruth(t *testing.T) {
	// docs/methods.md §13 item 15: Monte Carlo with 1 % priors contains the true
	// alphas inside its 95 % interval.
	want := []float64{0.6, 0.1, 0.3}
	w := mixWater("item 15", item15EndMembers(0), want, 100)
	for _, sc := range []Scoring{Accept, Weight} {
		t.Run([]string{"accept", "weight"}[sc], func(t *testing.T) {
			em := item15EndMembers(0.01)
			p := Problem{EndMembers: em, Tracers: item15Tracers, Waters: []Water{w}}
			res, err := Invert(context.Background(), p, &Options{Draws: 4000, Seed: 3, Scoring: sc})
			if err != nil {
				t.Fatal(err)
			}
			sr := &res.Samples[0]
			if err := sr.Err(); err != nil {
				t.Fatalf("status: %v (warnings %v)", err, sr.Warnings)
			}
			for j := range want {
				iv := sr.Alpha[j]
				if !(iv.Lo <= want[j] && want[j] <= iv.Hi) {
					t.Errorf("alpha[%s]: 95 %% interval [%.4f, %.4f] misses %.1f", em[j].Name, iv.Lo, iv.Hi, want[j])
				}
				t.Logf("alpha[%s] %.4f [%.4f, %.4f]", em[j].Name, iv.Median, iv.Lo, iv.Hi)
			}
			// Carbonate dominates Ca/Na, Mg/Na and HCO3/Na, so its fraction is
			// tightly bound; silicate against evaporite rests on 87Sr/86Sr,
			// whose 1 % prior (±0.007) is wide against their difference.
			if iv := sr.Alpha[1]; iv.Hi-iv.Lo > 0.03 {
				t.Errorf("carbonate alpha interval [%.4f, %.4f] wider than 0.03", iv.Lo, iv.Hi)
			}
		})
	}
}

// catchment is a fictional "Marlow Fen" set-up: four end-members (rain,
// evaporite, silicate, carbonate) with invented true ratios, used by the
// recovery, determinism and speed tests.
func catchment() (truth []EndMember, prior []EndMember) {
	truth = []EndMember{PresetRain(), PresetEvaporite(), PresetSilicate(), PresetCarbonate()}
	truth[1].Ratio[KNa] = FixedRatio(0.01) // a little K so every ratio is positive
	for i := range truth {
		truth[i] = truth[i].Fix()
	}
	// True values off-centre, within the priors: invented for the test.
	truth[2].Ratio[CaNa].Value = 0.42
	truth[2].Ratio[MgNa].Value = 0.19
	truth[2].Ratio[Sr87Sr86].Value = 0.7265
	truth[3].Ratio[CaNa].Value = 41
	truth[3].Ratio[HCO3Na].Value = 95
	prior = make([]EndMember, len(truth))
	for i, e := range truth {
		p := e
		for t := range p.Ratio {
			v := p.Ratio[t].Value
			if v > 0 {
				p.Ratio[t] = Range(v/1.25, v, v*1.25)
			}
		}
		p.Ratio[Sr87Sr86] = Range(e.Ratio[Sr87Sr86].Value-0.002, e.Ratio[Sr87Sr86].Value, e.Ratio[Sr87Sr86].Value+0.002)
		prior[i] = p
	}
	return truth, prior
}

var allTracers = []Tracer{CaNa, MgNa, KNa, HCO3Na, ClNa, SrNa, Sr87Sr86}

// catchmentWaters mixes ns waters with random Na fractions and adds
// relative Gaussian noise of sd noise to every concentration (and 1e-5 to
// 87Sr/86Sr). It returns the waters and their true Na fractions.
func catchmentWaters(truth []EndMember, ns int, noise float64, seed uint64) ([]Water, [][]float64) {
	rng := rand.New(rand.NewPCG(seed, 99))
	ws := make([]Water, ns)
	as := make([][]float64, ns)
	for s := range ws {
		a := make([]float64, len(truth))
		tot := 0.0
		for j := range a {
			a[j] = 0.05 + rng.Float64()
			tot += a[j]
		}
		for j := range a {
			a[j] /= tot
		}
		w := mixWater("Marlow Fen "+string(rune('A'+s%26)), truth, a, 50+400*rng.Float64())
		for i := range w.Conc {
			if !math.IsNaN(w.Conc[i]) {
				w.Conc[i] *= 1 + noise*rng.NormFloat64()
			}
		}
		w.Sr87Sr86 += 1e-5 * rng.NormFloat64()
		ws[s], as[s] = w, a
	}
	return ws, as
}

// trueShare returns the true share of cation c from source src.
func trueShare(truth []EndMember, a []float64, src Source, c int) float64 {
	num, den := 0.0, 0.0
	for j, e := range truth {
		r := 1.0
		if c > 0 {
			r = e.Ratio[cationTracer[c]].Value
		}
		den += a[j] * r
		if e.Source == src {
			num += a[j] * r
		}
	}
	return num / den
}

func TestInvertRecoversKnownShares(t *testing.T) {
	// Recovery (issue 3): waters mixed from known end-members plus 2 % noise;
	// the 95 % intervals must contain the true shares in at least 90 % of
	// samples, for every source and cation.
	truth, prior := catchment()
	ws, as := catchmentWaters(truth, 30, 0.02, 5)
	p := Problem{EndMembers: prior, Tracers: allTracers, Waters: ws}
	res, err := Invert(context.Background(), p, &Options{Draws: 8000, Seed: 8, MinAccepted: 50})
	if err != nil {
		t.Fatal(err)
	}
	for src := range NSources {
		for c := range NCations {
			hit := 0
			for s := range ws {
				sr := &res.Samples[s]
				if sr.Status != Success && sr.Status != FewAccepted {
					t.Fatalf("sample %d: status %v, warnings %v", s, sr.Status, sr.Warnings)
				}
				v := trueShare(truth, as[s], src, c)
				if sr.Share.Lo[src][c] <= v && v <= sr.Share.Hi[src][c] {
					hit++
				}
			}
			frac := float64(hit) / float64(len(ws))
			width := 0.0
			for s := range ws {
				width += res.Samples[s].Share.Hi[src][c] - res.Samples[s].Share.Lo[src][c]
			}
			t.Logf("%v %v: %.0f %% of intervals contain the truth, mean width %.3f", src, Cations[c], 100*frac, width/float64(len(ws)))
			// The intervals must also be informative where the tracers
			// constrain the split: silicate and carbonate Ca and Mg.
			if (src == Silicate || src == Carbonate) && (Cations[c] == chem.Ca || Cations[c] == chem.Mg) && width/float64(len(ws)) > 0.1 {
				t.Errorf("%v %v: mean interval width %.3f, want < 0.1", src, Cations[c], width/float64(len(ws)))
			}
			if frac < 0.9 {
				t.Errorf("%v %v: intervals contain the true share in %.0f %% of samples, want >= 90 %%", src, Cations[c], 100*frac)
			}
		}
	}
}

func TestInvertFractionsAndMassBalance(t *testing.T) {
	truth, prior := catchment()
	ws, _ := catchmentWaters(truth, 6, 0.02, 6)
	ws[2].Conc[chem.K] = math.NaN() // K not measured: model amounts
	p := Problem{EndMembers: prior, Tracers: []Tracer{CaNa, MgNa, HCO3Na, ClNa, SrNa}, Waters: ws}
	res, err := Invert(context.Background(), p, &Options{Draws: 1000, Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	for s := range ws {
		t.Run(ws[s].Name, func(t *testing.T) {
			n := res.Kept(s)
			if n == 0 {
				t.Fatalf("no kept draws: %v", res.Samples[s].Warnings)
			}
			for k := 0; k < n; k += 17 {
				a, _ := res.AlphaAt(s, k)
				sum := 0.0
				for j, v := range a {
					if v < 0 {
						t.Fatalf("draw %d: alpha[%d] = %g < 0", k, j, v)
					}
					sum += v
				}
				if math.Abs(sum-1) > 1e-12 {
					t.Fatalf("draw %d: sum alpha %.17g, want 1 (1e-12)", k, sum)
				}
				d, split, _ := res.Draw(s, k)
				// Mass balance: sources add up to the measured cation; the
				// Na from each source is its alpha times Na.
				for c, sp := range Cations {
					meas := ws[s].Conc[sp]
					if math.IsNaN(meas) {
						// model amounts: K_j = alpha_j Na (K/Na)_j from the drawn ratios
						want := 0.0
						stride := int(NTracers) * len(prior)
						for j := range prior {
							want += a[j] * ws[s].Conc[chem.Na] * res.table[d*stride+int(KNa)*len(prior)+j]
						}
						meas = want
					}
					if got := split.Total(sp); math.Abs(got-meas) > 1e-9*meas {
						t.Errorf("draw %d %v: sources sum to %.12g, want %.12g", d, Cations[c], got, meas)
					}
				}
				for j, e := range prior {
					if got, want := split[e.Source][0], a[j]*ws[s].Conc[chem.Na]; math.Abs(got-want) > 1e-9*want+1e-12 {
						t.Errorf("draw %d: Na from %v got %g want %g", d, e.Source, got, want)
					}
				}
				if got, w, ok := res.SplitAt(s, d); !ok || got != split || w != 1 {
					t.Errorf("SplitAt(%d, %d) = %v, %v, %v; want the same split, 1, true", s, d, got, w, ok)
				}
			}
			sr := &res.Samples[s]
			for src := range NSources {
				for c := range NCations {
					lo, md, hi := sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c]
					if !(0 <= lo && lo <= md && md <= hi && hi <= 1) {
						t.Errorf("%v %v: share quantiles %g <= %g <= %g not ordered within [0, 1]", src, Cations[c], lo, md, hi)
					}
				}
			}
		})
	}
}
