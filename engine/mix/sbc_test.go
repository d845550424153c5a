package mix

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// The simulation-based calibration of the inverse model (science.md §7.3;
// Talts, Betancourt, Simpson, Vehtari & Gelman 2018, "Validating Bayesian
// inference algorithms with simulation-based calibration", from memory).
// Synthetic waters are mixed from rain (sea salt with a spread of its
// ratios), evaporite, silicate and carbonate, with end-member ratios drawn
// from the very priors the inversion uses (or set at their centres, or near
// the edges of their 95 % ranges), and measured with the stated analytical
// precision. Each is corrected for rain and inverted; the 95 % intervals of
// the Na, Ca and Mg shares of every source must contain the truth in 92-98
// % of cases, and the rank of the truth among the weighted draws must be
// uniform.

// sbcSources names the sources of a synthetic water.
type sbcSources uint8

const (
	sbcRain sbcSources = 1 << iota
	sbcEvap
	sbcSil
	sbcCarb
)

func (s sbcSources) String() string {
	var p []string
	for i, n := range []string{"rain", "evaporite", "silicate", "carbonate"} {
		if s&(1<<i) != 0 {
			p = append(p, n)
		}
	}
	return strings.Join(p, "+")
}

func (s sbcSources) count() int {
	n := 0
	for i := range 4 {
		if s&(1<<i) != 0 {
			n++
		}
	}
	return n
}

// sbcRainSpread is the relative 1σ of the rain's X/Cl ratios in the study.
const sbcRainSpread = 0.05

// sbcWater is one synthetic water with its truth.
type sbcWater struct {
	water    Water
	src      sbcSources
	withEvap bool
	mode     string                      // "prior", "centre" or "edge"
	truth    [NSources][NCations]float64 // true µmol/L of each cation from each source
}

// sbcEndMembers returns the end-members of a problem.
func sbcEndMembers(withEvap bool) []EndMember {
	e := []EndMember{PresetSilicate(), PresetCarbonate()}
	if withEvap {
		e = append(e, PresetEvaporite())
	}
	return e
}

func sbcTracers(withEvap bool) []Tracer {
	if withEvap {
		return []Tracer{CaNa, MgNa, HCO3Na, ClNa}
	}
	return []Tracer{CaNa, MgNa, HCO3Na}
}

// drawRatios returns the end-member's ratios: from its prior's latent, at
// eta = 0 (centre) or at ±1.7 (near the edges of the 95 % range).
func drawRatios(e *EndMember, mode string, rng *rand.Rand) [NTracers]float64 {
	var v [NTracers]float64
	for t := range NTracers {
		s := newSampler(e.Ratio[t])
		if s.constant {
			v[t] = s.v
			continue
		}
		eta := 0.0
		switch mode {
		case "prior":
			eta = rng.NormFloat64()
		case "edge":
			eta = 1.7
			if rng.IntN(2) == 0 {
				eta = -1.7
			}
		}
		v[t] = math.Exp(s.fromLatent(eta))
	}
	return v
}

// sbcMake mixes one synthetic water.
func sbcMake(i int, src sbcSources, withEvap bool, mode string, rng *rand.Rand) sbcWater {
	w := sbcWater{src: src, withEvap: withEvap, mode: mode}
	var c [chem.NSpecies]float64
	add := func(s Source, na float64, r *[NTracers]float64) {
		for k, t := range [NCations]Tracer{-1, KNa, CaNa, MgNa} {
			x := na
			if t >= 0 {
				x = na * r[t]
			}
			w.truth[s][k] += x
			c[Cations[k]] += x
		}
		c[chem.Alk] += na * r[HCO3Na]
		c[chem.Cl] += na * r[ClNa]
	}
	logU := func(lo, hi float64) float64 { return lo * math.Exp(rng.Float64()*math.Log(hi/lo)) }
	clRain := 0.0
	if src&sbcRain != 0 {
		clRain = logU(20, 300)
		sea := correct.SeaSalt()
		c[chem.Cl] += clRain
		for k, sp := range Cations {
			x := clRain * sea[sp] * math.Exp(sbcRainSpread*rng.NormFloat64())
			w.truth[Atmosphere][k] += x
			c[sp] += x
		}
	}
	// The rock sources' shares of the rock-derived cation charge uniform
	// (a flat Dirichlet), the total log-uniform, as the prior of the
	// amounts (slab.go) takes them.
	var rock []Source
	for _, s := range []struct {
		f sbcSources
		s Source
	}{{sbcEvap, Evaporite}, {sbcSil, Silicate}, {sbcCarb, Carbonate}} {
		if src&s.f != 0 {
			rock = append(rock, s.s)
		}
	}
	if len(rock) > 0 {
		total := logU(40, 1000)
		g := make([]float64, len(rock))
		sum := 0.0
		for k := range g {
			g[k] = rng.ExpFloat64()
			sum += g[k]
		}
		ems := map[Source]EndMember{Evaporite: PresetEvaporite(), Silicate: PresetSilicate(), Carbonate: PresetCarbonate()}
		for k, s := range rock {
			e := ems[s]
			r := drawRatios(&e, mode, rng)
			charge := 1 + r[KNa] + 2*r[CaNa] + 2*r[MgNa]
			add(s, total*g[k]/sum/charge, &r)
		}
	}
	// Measured with the default precision: x + σ(x) z.
	prec := DefaultPrecision()
	meas := chem.NewComposition()
	for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.Alk} {
		x := c[sp]
		if x == 0 && sp == chem.Cl {
			meas[sp] = 0 // no Cl at all: reported as zero
			continue
		}
		meas[sp] = math.Max(0, x+prec.Sigma(sp, x)*rng.NormFloat64())
	}
	opt := correct.Options{ClCritical: math.Inf(1), Negative: correct.Keep}
	if withEvap {
		opt.ClCritical = math.Max(clRain, 1e-9) // the rain's Cl is known: Cl above it is halite
	}
	cr, err := correct.Apply(meas, &opt)
	if err != nil {
		panic(err)
	}
	w.water = Water{Name: fmt.Sprintf("%d %s %s", i, src, mode), Correction: &cr, Sr87Sr86: math.NaN()}
	return w
}

// sbcWaters returns the study's waters: alternately without and with the
// evaporite end-member (and the Cl/Na tracer), each end-member of the
// problem present with probability ½ and rain with probability ¾ (at least
// one source), so that one-, two-, three- and four-source mixtures all
// occur; ratios from the priors, at their centres (one water in six) or
// near their edges (one in six).
func sbcWaters(n int, seed uint64) []sbcWater {
	rng := rand.New(rand.NewPCG(seed, 77))
	var out []sbcWater
	for i := range n {
		withEvap := i%2 == 1
		var src sbcSources
		for src == 0 {
			if rng.Float64() < 0.75 {
				src |= sbcRain
			}
			for _, f := range []sbcSources{sbcSil, sbcCarb, sbcEvap} {
				if (f != sbcEvap || withEvap) && rng.IntN(2) == 0 {
					src |= f
				}
			}
		}
		mode := "prior"
		switch i % 6 {
		case 2:
			mode = "centre"
		case 5:
			mode = "edge"
		}
		out = append(out, sbcMake(i, src, withEvap, mode, rng))
	}
	return out
}

// sbcStats accumulates coverage and ranks per source.
type sbcStats struct {
	cover, total [NSources]int
	ranks        [NSources][]float64
	rankBy       [NSources][NCations][]float64
	single       []string // single-source waters off by more than 1 %
	groups       map[string]*[NSources][2]int
	groupKeys    []string
	misses       []string
	singleN      int
	worstSingle  float64
}

// sbcRun inverts the waters (grouped by problem) and scores them.
func sbcRun(t testing.TB, ws []sbcWater, opt Options) *sbcStats {
	st := &sbcStats{}
	rng := rand.New(rand.NewPCG(opt.Seed, 99))
	for _, withEvap := range []bool{false, true} {
		var idx []int
		p := Problem{EndMembers: sbcEndMembers(withEvap), Tracers: sbcTracers(withEvap)}
		for i := range ws {
			if ws[i].withEvap == withEvap {
				idx = append(idx, i)
				p.Waters = append(p.Waters, ws[i].water)
			}
		}
		o := opt
		o.Rain = correct.Uncertainty{Ratios: sbcRainSpread}
		res, err := Invert(context.Background(), p, &o)
		if err != nil {
			t.Fatal(err)
		}
		for k, i := range idx {
			st.score(t, res, k, &ws[i], rng)
		}
	}
	return st
}

// score checks one water: coverage and rank of each source's share of Na,
// Ca and Mg, and for a single rock source its share of the cation.
func (st *sbcStats) score(t testing.TB, res *Result, s int, w *sbcWater, rng *rand.Rand) {
	sr := &res.Samples[s]
	inModel := [NSources]bool{Atmosphere: true, Silicate: true, Carbonate: true, Evaporite: w.withEvap}
	n := res.Kept(s)
	for _, c := range []int{0, 2, 3} {
		tot := w.truth[0][c] + w.truth[1][c] + w.truth[2][c] + w.truth[3][c]
		for src := range NSources {
			if !inModel[src] {
				continue
			}
			truth := 0.0
			if tot > 0 {
				truth = w.truth[src][c] / tot
			}
			// Weighted share quantiles and the randomised rank of the truth.
			vals, wts := make([]float64, n), make([]float64, n)
			below, equal, sw := 0.0, 0.0, 0.0
			for k := range n {
				_, sp, wk := res.Draw(s, k)
				all := sp[0][c] + sp[1][c] + sp[2][c] + sp[3][c]
				v := 0.0
				if all > 0 {
					v = sp[src][c] / all
				}
				vals[k], wts[k] = v, wk
				sw += wk
				switch {
				case v < truth-1e-9:
					below += wk
				case v <= truth+1e-9:
					equal += wk
				}
			}
			var buf []wpair
			iv := weightedInterval(vals, wts, &buf)
			st.total[src]++
			key := fmt.Sprintf("%s/%v/%s/%s", w.src, w.withEvap, w.mode, Cations[c])
			if st.groups == nil {
				st.groups = map[string]*[NSources][2]int{}
			}
			if st.groups[key] == nil {
				st.groups[key] = &[NSources][2]int{}
				st.groupKeys = append(st.groupKeys, key)
			}
			st.groups[key][src][1]++
			if iv.Lo-1e-9 <= truth && truth <= iv.Hi+1e-9 {
				st.cover[src]++
				st.groups[key][src][0]++
			}
			if w.mode == "prior" {
				rk := (below + rng.Float64()*equal) / sw
				st.ranks[src] = append(st.ranks[src], rk)
				st.rankBy[src][c] = append(st.rankBy[src][c], rk)
			}
			if !(iv.Lo-1e-9 <= truth && truth <= iv.Hi+1e-9) {
				st.misses = append(st.misses, fmt.Sprintf("%s %s %s truth %.4f [%.4f %.4f %.4f] | %s ESS %.0f", sr.Name, Cations[c], Source(src), truth, iv.Lo, iv.Median, iv.Hi, sr.Verdict, sr.ESS))
			}
			// A single rock source: its share of the cation it carries.
			if w.src.count() == 1 && w.src&sbcRain == 0 && truth == 1 {
				st.singleN++
				if d := 1 - iv.Median; d > st.worstSingle {
					st.worstSingle = d
				}
				if iv.Median < 0.99 && (c == 0 && src != Carbonate || c == 2 && src == Carbonate) {
					st.single = append(st.single, fmt.Sprintf("%s: %s share of %s %.4f", sr.Name, src, Cations[c], iv.Median))
				}
			}
		}
	}
}

// chiSquareUniform returns the chi-square statistic of x (in [0, 1]) over
// bins equal bins, and its p-value.
func chiSquareUniform(x []float64, bins int) (float64, float64) {
	cnt := make([]float64, bins)
	for _, v := range x {
		cnt[min(bins-1, int(v*float64(bins)))]++
	}
	e := float64(len(x)) / float64(bins)
	chi := 0.0
	for _, c := range cnt {
		chi += (c - e) * (c - e) / e
	}
	return chi, chi2Survival(bins-1, chi)
}

func TestSBCExplore(t *testing.T) {
	if os.Getenv("LIXIV_SBC_EXPLORE") == "" {
		t.Skip("set LIXIV_SBC_EXPLORE=1 to compare the samplers")
	}
	ws := sbcWaters(240, 1)
	for _, nv := range []bool{false, true} {
		st := sbcRun(t, ws, Options{Seed: 3, perturb: nv})
		for src := range NSources {
			if st.total[src] == 0 {
				continue
			}
			chi, p := chiSquareUniform(st.ranks[src], 10)
			h := make([]int, 10)
			for _, v := range st.ranks[src] {
				h[min(9, int(v*10))]++
			}
			t.Logf("   ranks %v", h)
			for _, c := range []int{0, 2, 3} {
				h := make([]int, 10)
				for _, v := range st.rankBy[src][c] {
					h[min(9, int(v*10))]++
				}
				t.Logf("      %s %v", Cations[c], h)
			}
			t.Logf("perturb=%v %-10s coverage %.3f (%d) ranks chi2 %.1f p %.3g", nv, Source(src), float64(st.cover[src])/float64(st.total[src]), st.total[src], chi, p)
		}
		t.Logf("single: %d checks, worst %.4f, off: %v", st.singleN, st.worstSingle, st.single)
		for _, m := range st.misses[:0] {
			t.Log("miss:", m)
		}
		for _, k := range st.groupKeys[:0] {
			g := st.groups[k]
			t.Logf("   %-45s %v", k, g)
		}
	}
}
