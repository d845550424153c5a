package flux

import (
	"encoding/binary"
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"sync"

	"lixiv/engine/discharge"
)

// Apportioned is a quantity that a source apportionment attributes to
// measured species: silicate Ca (a part of the measured Ca), the silicate
// cations (parts of Na, K, Ca and Mg), or silicate CO2 consumption (each
// cation's silicate equivalents). Its load in reporting year y is
//
//	L_y = Σ_p L_y(Measured_p) × Σ_i Q_i a_p,i / Σ_i Q_i x_p,i
//
// over the parts p: the estimator's load of the measured species x_p
// (Options.Method), times the flow-weighted share of it that the quantity
// takes in the year's samples i, a_p,i its amount in sample i. Every
// estimator thus fluxes the quantity as it fluxes the measured species:
// the sources of a species add up to the species' load whenever the
// samples' sources add up to what was measured (to rounding), and a
// rating curve, which cannot take the zeros and negative values of
// apportioned series, is fitted only to measured concentrations. With the
// discharge-weighted estimator the load equals fluxing the amounts
// directly. Samples without an amount (no apportionment) take no part in
// the shares; the measured load uses every sample whose Measured value is
// given, so setting Measured NaN where the amount is missing leaves those
// samples out of the quantity altogether.
type Apportioned struct {
	Name      string          // for tables and messages, such as "silicate cations"
	MolarMass float64         // g/mol used for tonnes; 0 leaves tonnes NaN
	Days      []discharge.Day // sample days
	Q         []float64       // discharge at sampling, m³/s; nil or NaN means the daily record's value
	Parts     []Share
	// Weights optionally weight the draws of every part: Weights[i][k] ≥ 0
	// for draw k of sample i (nil: equal). Draw k of sample i is the same
	// posterior draw in every part, so a replicate takes it in all of them.
	Weights [][]float64
}

// Share is the part of an Apportioned quantity carried by one measured
// species.
type Share struct {
	// Of names the measured species. Parts of different quantities with
	// the same Of (and Measured) share their replicate loads through
	// BootstrapOptions.Cache, so it must name the values exactly: "Ca" for
	// every sample's Ca, "Ca of the apportioned samples" for another set.
	Of       string
	Measured []float64 // the measured species, µmol/L, per sample (NaN: not measured, or left out)
	Amount   []float64 // the quantity's amount attributed to it, µmol/L, per sample: the point value (NaN: none)
	// Draws optionally hold the amount under each Monte Carlo draw:
	// Draws[i][k] for draw k of sample i, as many in every part.
	Draws [][]float64
}

// series returns part p's measured species as a Series.
func (a *Apportioned) measured(p int) Series {
	return Series{Name: a.Parts[p].Of, Days: a.Days, C: a.Parts[p].Measured, Q: a.Q}
}

// check reports parts whose lengths do not match the samples.
func (a *Apportioned) check() error {
	if len(a.Parts) == 0 {
		return fmt.Errorf("%s: no parts", a.Name)
	}
	n := len(a.Days)
	for _, p := range a.Parts {
		if len(p.Measured) != n || len(p.Amount) != n || (p.Draws != nil && len(p.Draws) != n) {
			return fmt.Errorf("%s: part %s: %d measured values, %d amounts and %d draw lists for %d samples", a.Name, p.Of, len(p.Measured), len(p.Amount), len(p.Draws), n)
		}
	}
	for i := 0; i < n; i++ {
		nd := -1
		for _, p := range a.Parts {
			k := 0
			if p.Draws != nil {
				k = len(p.Draws[i])
			}
			if nd >= 0 && k != nd {
				return fmt.Errorf("%s: %w: sample %d has %d draws in one part and %d in another", a.Name, ErrDraws, i+1, nd, k)
			}
			nd = k
		}
	}
	return nil
}

// hasDraws reports whether any part has draws.
func (a *Apportioned) hasDraws() bool {
	for _, p := range a.Parts {
		if p.Draws != nil {
			return true
		}
	}
	return false
}

// shareSums adds, per year, Σ w_i Q_i a_i and Σ w_i Q_i x_i over the
// samples with both values, for the amounts am of one part.
func shareSums(smp []sample, w, am, x []float64, num, den []float64) {
	for y := range num {
		num[y], den[y] = 0, 0
	}
	for j, sm := range smp {
		if w[j] == 0 || sm.year < 0 || math.IsNaN(am[j]) || math.IsNaN(x[j]) {
			continue
		}
		wq := w[j] * sm.q
		num[sm.year] += wq * am[j]
		den[sm.year] += wq * x[j]
	}
}

// ratio returns num/den, NaN when den is 0 (a year without samples that
// have both values).
func ratio(num, den float64) float64 {
	if den == 0 {
		return math.NaN()
	}
	return num / den
}

// EstimateApportioned computes the annual loads of an apportioned quantity
// (see Apportioned): each part's measured species by opt.Method on every
// sample with a measured value, times its flow-weighted share. The
// Result's sample count and coverage figures are those of the samples with
// an amount. It returns an error when a measured species cannot be
// estimated or no sample has an amount.
func EstimateApportioned(rec *discharge.Record, a Apportioned, opt Options) (*Result, error) {
	if rec == nil || rec.Len() == 0 {
		return nil, fmt.Errorf("%s: %w: the discharge record is empty", a.Name, ErrNoSamples)
	}
	if err := a.check(); err != nil {
		return nil, err
	}
	years := rec.Years(opt.FirstMonth)
	res := &Result{Series: a.Name, Method: opt.Method}
	ny := len(years)
	total := make([]float64, ny)
	num, den := make([]float64, ny), make([]float64, ny)
	var withAmount []sample
	var sumQ []float64
	for p := range a.Parts {
		ms := a.measured(p)
		r, err := Estimate(rec, ms, opt)
		if err != nil {
			return res, fmt.Errorf("%s: %v", a.Name, err)
		}
		smp, _ := match(rec, ms, years)
		w := make([]float64, len(smp))
		am, x := make([]float64, len(smp)), make([]float64, len(smp))
		for j, sm := range smp {
			w[j], am[j], x[j] = 1, a.Parts[p].Amount[sm.idx], sm.c
			if p == 0 && !math.IsNaN(am[j]) && !math.IsNaN(x[j]) {
				withAmount = append(withAmount, sm)
			}
		}
		shareSums(smp, w, am, x, num, den)
		for y := range total {
			total[y] += r.Years[y].Mol * ratio(num[y], den[y])
		}
		if p == 0 {
			sumQ = make([]float64, ny)
			e := newEngine(rec, nil, years, Options{FirstMonth: opt.FirstMonth})
			copy(sumQ, e.sumQ)
		}
	}
	if len(withAmount) == 0 {
		return res, fmt.Errorf("%s: %w: no sample has an apportioned amount", a.Name, ErrNoSamples)
	}
	counts := make([]int, ny)
	for _, sm := range withAmount {
		if sm.year >= 0 {
			counts[sm.year]++
		}
	}
	res.Samples = len(withAmount)
	res.Years, res.Mean, res.MeanYears = summarise(years, total, sumQ, counts, opt, a.MolarMass, &res.Warnings, a.Name)
	res.YearSD = yearSD(res.Years)
	e := newEngine(rec, withAmount, years, Options{FirstMonth: opt.FirstMonth})
	res.HeldFlow, res.OutsideFlow = coverage(e, withAmount)
	top := 0.0
	for _, sm := range withAmount {
		top = math.Max(top, sm.q)
	}
	res.TopSampled = rec.Exceedance(top)
	return res, nil
}

// BootstrapApportioned estimates the uncertainty of EstimateApportioned's
// loads as Bootstrap does for a series: in each replicate the resampled
// samples (the same as for any series with the same samples and seed),
// each sample's draw taken in every part (BootstrapOptions.Draws, with
// Apportioned.Weights), and the discharge and area errors enter both each
// measured species' load and the shares.
func BootstrapApportioned(rec *discharge.Record, a Apportioned, opt Options, b BootstrapOptions) (*Uncertainty, error) {
	if rec == nil || rec.Len() == 0 {
		return nil, fmt.Errorf("%s: %w: the discharge record is empty", a.Name, ErrNoSamples)
	}
	u := &Uncertainty{Series: a.Name, Method: opt.Method, Seed: b.Seed}
	if err := a.check(); err != nil {
		return u, err
	}
	years := rec.Years(opt.FirstMonth)
	// Every part has the same samples: match the first part's measured
	// species (matching depends on the days and discharges only).
	smp, _ := match(rec, a.measured(0), years)
	if len(smp) == 0 {
		return u, fmt.Errorf("%s: %w", a.Name, ErrNoSamples)
	}
	cache := b.Cache
	if cache == nil {
		cache = &Cache{} // for this call only
	}
	ny := len(years)
	refs := make([]*refLoads, len(a.Parts))
	for p := range a.Parts {
		rl, err := cache.loads(rec, a.measured(p), opt, b, smp, years)
		if err != nil {
			return u, fmt.Errorf("%s: %v", a.Name, err)
		}
		refs[p] = rl
	}
	rp := newReplicates(smp, len(a.Days), years, b)
	var picks [][]int32 // each replicate's draw of each sample; nil: the point values
	if b.Hold&Apportionment == 0 && a.hasDraws() {
		var err error
		if picks, err = cache.picks(a, b, rp.nrep); err != nil {
			return u, err
		}
	}
	col := newCollector(u, years, rp.nrep, opt, a.MolarMass, b.KeepReplicates)
	np := len(a.Parts)
	x := make([][]float64, np) // measured values of each part, by matched sample
	for p := range a.Parts {
		x[p] = make([]float64, len(smp))
		for j, sm := range smp {
			x[p][j] = a.Parts[p].Measured[sm.idx]
		}
	}
	num, den := make([]float64, np*ny), make([]float64, np*ny) // per part and year
	out := make([]float64, ny)
	// With neither the samples nor their draws varied, every replicate has
	// the same loads before its discharge and area errors.
	held := b.Hold&(Sampling|Apportionment) == Sampling|Apportionment
	var fixed []float64
	fixedOK := false
	for r := 0; r < rp.nrep; r++ {
		if err := b.err(); err != nil {
			return nil, err
		}
		fq, fa := rp.next(nil, nil)
		if held && fixed != nil {
			copy(out, fixed)
			col.add(r, out, refs[0].e.sumQ, fq, fa, fixedOK)
			b.tick()
			continue
		}
		for i := range num {
			num[i], den[i] = 0, 0
		}
		var pr []int32
		if picks != nil {
			pr = picks[r]
		}
		// One pass over the samples: Σ w Q a and Σ w Q x of each part and
		// year, a the sample's amount under its draw of this replicate.
		for j, sm := range smp {
			w := rp.w[j]
			if w == 0 || sm.year < 0 {
				continue
			}
			wq := w * sm.q
			k := int32(-1)
			if pr != nil {
				k = pr[sm.idx]
			}
			for p := 0; p < np; p++ {
				part := &a.Parts[p]
				av := part.Amount[sm.idx]
				if k >= 0 {
					av = part.Draws[sm.idx][k]
				}
				xv := x[p][j]
				if math.IsNaN(av) || math.IsNaN(xv) {
					continue
				}
				num[p*ny+sm.year] += wq * av
				den[p*ny+sm.year] += wq * xv
			}
		}
		ok := true
		for y := range out {
			out[y] = 0
		}
		for p := 0; p < np; p++ {
			ok = ok && refs[p].ok[r]
			for y := range out {
				out[y] += refs[p].mol[r][y] * ratio(num[p*ny+y], den[p*ny+y])
			}
		}
		if held {
			fixed, fixedOK = append([]float64(nil), out...), ok
		}
		col.add(r, out, refs[0].e.sumQ, fq, fa, ok)
		b.tick()
	}
	col.finish()
	return u, nil
}

// Cache keeps the replicate loads of measured series for the bootstraps
// of one budget (BootstrapOptions.Cache), and the draws each sample takes in
// each replicate. It is safe for concurrent use. Loads are keyed by the
// series' name, the options and the seed, and whether sampling is held; a
// series must keep its values under one name. Draws are keyed by the
// Apportioned.Weights slice (its first element's address), the seed and
// the draw mode: quantities that share one Weights slice have the same
// samples and kept draws, and take the same draws.
type Cache struct {
	mu sync.Mutex
	m  map[cacheKey]*refLoads
	pk map[pickKey][][]int32
	rs map[repKey]*repSet
}

type repKey struct {
	seed   uint64
	dq, da float64 // discharge and area errors
	n      int     // matched samples
	print  uint64  // their days and years
}

// replicateSet returns the resampling counts and factors of b's seed for
// the matched samples smp, for at least nrep replicates.
func (c *Cache) replicateSet(smp []sample, years []discharge.Year, b BootstrapOptions, nrep int) *repSet {
	h := fnv.New64a()
	var buf [8]byte
	for _, sm := range smp {
		binary.LittleEndian.PutUint64(buf[:], uint64(sm.k)<<16|uint64(sm.year+1))
		h.Write(buf[:])
	}
	key := repKey{seed: b.Seed, dq: b.DischargeError, da: b.AreaError, n: len(smp), print: h.Sum64()}
	c.mu.Lock()
	got := c.rs[key]
	c.mu.Unlock()
	if got != nil && len(got.w) >= nrep {
		return got
	}
	set := drawReplicates(smp, years, b, nrep)
	c.mu.Lock()
	if c.rs == nil {
		c.rs = map[repKey]*repSet{}
	}
	c.rs[key] = set
	c.mu.Unlock()
	return set
}

type pickKey struct {
	w    *[]float64
	seed uint64
	mode DrawMode
	n    int
}

// picks returns each replicate's draw of each sample of a (-1: its point
// value) for at least nrep replicates, drawn from the draw stream of b's
// seed as Bootstrap would draw them.
func (c *Cache) picks(a Apportioned, b BootstrapOptions, nrep int) ([][]int32, error) {
	var key pickKey
	if len(a.Weights) > 0 && b.DrawNumbers == nil {
		key = pickKey{w: &a.Weights[0], seed: b.Seed, mode: b.Draws, n: len(a.Days)}
		c.mu.Lock()
		got := c.pk[key]
		c.mu.Unlock()
		if len(got) >= nrep {
			return got, nil
		}
	}
	var draws [][]float64
	for _, p := range a.Parts { // every part has the same number of draws (check)
		if p.Draws != nil {
			draws = p.Draws
			break
		}
	}
	pk, err := newPicker(a.Name, len(a.Days), draws, a.Weights, b.Draws, b.tick)
	if err != nil {
		return nil, err
	}
	if err := pk.checkGiven(a.Name, b.DrawNumbers, nrep); err != nil {
		return nil, err
	}
	rd := rand.New(rand.NewPCG(b.Seed, streamDraw))
	idx := make([]int, len(a.Days))
	out := make([][]int32, nrep)
	for r := range out {
		b.tick()
		if b.DrawNumbers != nil {
			pk.given(b.DrawNumbers[r], idx)
		} else {
			pk.pick(rd, idx)
		}
		out[r] = make([]int32, len(idx))
		for i, k := range idx {
			out[r][i] = int32(k)
		}
	}
	if key.w != nil {
		c.mu.Lock()
		if c.pk == nil {
			c.pk = map[pickKey][][]int32{}
		}
		c.pk[key] = out
		c.mu.Unlock()
	}
	return out, nil
}

type cacheKey struct {
	name string
	opt  Options
	seed uint64
	held bool // Sampling held: every replicate is the point estimate
	n    int  // samples, as a guard
}

// refLoads are one measured series' loads (mol per year, before the
// discharge factor) in each replicate, and whether the estimator could be
// applied.
type refLoads struct {
	mol [][]float64
	ok  []bool
	e   *engine
}

// loads returns the replicate loads of the measured series s, whose
// samples smp are matched to the record, computing them for at least b's
// replicates.
func (c *Cache) loads(rec *discharge.Record, s Series, opt Options, b BootstrapOptions, smp []sample, years []discharge.Year) (*refLoads, error) {
	nrep := b.Replicates
	if nrep <= 0 {
		nrep = 1000
	}
	key := cacheKey{name: s.Name, opt: opt, seed: b.Seed, held: b.Hold&Sampling != 0, n: len(s.Days)}
	c.mu.Lock()
	rl := c.m[key]
	c.mu.Unlock()
	if rl != nil && len(rl.mol) >= nrep {
		return rl, nil
	}
	// smp may have been matched for another series with the same samples:
	// the concentrations are s's.
	c0 := make([]float64, len(smp))
	some := false
	for j, sm := range smp {
		c0[j] = math.NaN()
		if sm.idx < len(s.C) {
			c0[j] = s.C[sm.idx]
		}
		some = some || !math.IsNaN(c0[j])
	}
	if !some {
		return nil, fmt.Errorf("%s: %w", s.Name, ErrNoSamples)
	}
	// The resampling stream alone decides the samples' counts; the other
	// sources do not change a measured series' loads before the discharge
	// factor.
	e := newEngine(rec, smp, years, opt)
	e.replicate = true
	rb := b
	rb.Replicates = nrep
	rb.Hold = b.Hold & Sampling
	rp := newReplicates(smp, len(s.Days), years, rb)
	rl = &refLoads{mol: make([][]float64, nrep), ok: make([]bool, nrep), e: e}
	for r := 0; r < nrep; r++ {
		if err := b.err(); err != nil {
			return nil, err // nothing is cached
		}
		rp.next(nil, nil)
		out := make([]float64, len(years))
		if r > 0 && rb.Hold&Sampling != 0 {
			copy(out, rl.mol[0])
			rl.ok[r] = rl.ok[0]
		} else {
			rl.ok[r] = e.loads(opt.Method, rp.w, c0, out, nil)
		}
		rl.mol[r] = out
		b.tick()
	}
	c.mu.Lock()
	if c.m == nil {
		c.m = map[cacheKey]*refLoads{}
	}
	c.m[key] = rl
	c.mu.Unlock()
	return rl, nil
}
