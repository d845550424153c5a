package mix

import (
	"encoding/binary"

	"hash/fnv"
	"lixiv/engine/chem"
	"math"
	"math/rand/v2"
	"slices"
)

// Interval is a posterior median with its 2.5 % and 97.5 % quantiles.
type Interval struct{ Lo, Median, Hi float64 }

// Quantiles holds a Split for each of the 2.5 %, 50 % and 97.5 % posterior
// quantiles (taken cell by cell, so the three Splits need not add up like
// a single draw does).
type Quantiles struct{ Lo, Median, Hi Split }

// Result is the outcome of an inversion.
type Result struct {
	Seed       uint64         // seed the draws came from
	Draws      int            // Monte Carlo draws per sample
	Scoring    Scoring        // how draws were judged
	EndMembers []EndMember    // the end-members, in the order of Alpha
	Samples    []SampleResult // one per water, in input order
	Status     Status         // the worst sample status (NotRun while a Run is unfinished)

	table []float64 // drawn ratios [draw][tracer][end-member]
	src   []Source
	vary  func(s, d int) (chem.Composition, bool) // Options.Vary
}

// data returns the Na and the measured cations of sample s under draw d:
// the sample's own, or those Options.Vary gave for the draw.
func (r *Result) data(s, d int) (na float64, meas [NCations]float64) {
	sr := &r.Samples[s]
	if r.vary == nil {
		return sr.prep.na, sr.prep.meas
	}
	c, _ := r.vary(s, d)
	for i, sp := range Cations {
		meas[i] = c[sp]
	}
	return c[chem.Na], meas
}

// SampleResult is the posterior of one water sample.
type SampleResult struct {
	Name       string
	Status     Status
	Kept       int        // draws kept: accepted, or with non-zero weight
	AcceptRate float64    // Kept / Draws
	ESS        float64    // effective sample size (sum w)² / sum w² of the kept draws
	Alpha      []Interval // fraction of the sample's Na from each end-member
	Amount     Quantiles  // µmol/L of each cation from each source
	Share      Quantiles  // fraction of each cation from each source
	Warnings   []error    // problems that did not stop the inversion

	prep  prep
	rng   *rand.PCG // data perturbation stream (Options.Perturb)
	kept  []int32   // kept draw numbers, increasing
	chi2  []float64 // their misfits
	alpha []float64 // their Na fractions, len(EndMembers) per draw
}

// Err returns the sample's status error (nil for Success).
func (s *SampleResult) Err() error { return s.Status.Err() }

// worst returns the status of the whole result.
func (r *Result) worst() Status {
	w := Success
	for i := range r.Samples {
		st := r.Samples[i].Status
		if st == NotRun {
			return NotRun
		}
		w = max(w, st)
	}
	return w
}

// Kept returns the number of kept draws of sample s.
func (r *Result) Kept(s int) int { return len(r.Samples[s].kept) }

// Draw returns the k-th kept draw of sample s (k < Kept(s)): the draw
// number d (the same d names the same end-member ratios in every sample,
// so fluxes can be propagated draw by draw), the split of the sample's
// cations among the sources in µmol/L, and the draw's weight (1 under
// Accept scoring).
func (r *Result) Draw(s, k int) (d int, split Split, weight float64) {
	sr := &r.Samples[s]
	var share Split
	d = int(sr.kept[k])
	na, meas := r.data(s, d)
	r.drawSplit(sr, k, na, &meas, &share, &split)
	return d, split, r.weight(sr, k)
}

// SplitAt returns the split of sample s under draw d and its weight, with
// ok false if the draw was not kept for that sample.
func (r *Result) SplitAt(s, d int) (split Split, weight float64, ok bool) {
	sr := &r.Samples[s]
	k, found := slices.BinarySearch(sr.kept, int32(d))
	if !found {
		return Split{}, 0, false
	}
	_, split, weight = r.Draw(s, k)
	return split, weight, true
}

// AlphaAt returns the Na fractions (one per end-member) of the k-th kept
// draw of sample s, and its chi-square misfit.
func (r *Result) AlphaAt(s, k int) (alpha []float64, chi2 float64) {
	sr := &r.Samples[s]
	n := len(r.EndMembers)
	return slices.Clone(sr.alpha[k*n : (k+1)*n]), sr.chi2[k]
}

func (r *Result) weight(sr *SampleResult, k int) float64 {
	if r.Scoring == Weight {
		return pexp(-0.5 * sr.chi2[k])
	}
	return 1
}

// drawSplit computes the share of each cation from each source under the
// k-th kept draw of sr, and the amount in µmol/L. The model amount of
// cation X from end-member j is alpha_j Na (X/Na)_j; shares are these over
// their sum, and amounts are shares times the measured concentration, so
// that the sources add up to what was measured (the misfit is spread in
// proportion). A cation that was not measured keeps the model amounts. na
// and ms are the draw's Na and measured cations.
func (r *Result) drawSplit(sr *SampleResult, k int, na float64, ms *[NCations]float64, share, amount *Split) {
	var m Split
	r.model(sr, k, &m)
	for c := 0; c < NCations; c++ {
		tot := m[0][c] + m[1][c] + m[2][c] + m[3][c]
		meas := ms[c]
		for src := range NSources {
			sh := 0.0
			if tot > 0 {
				sh = m[src][c] / tot
			}
			share[src][c] = sh
			if math.IsNaN(meas) {
				amount[src][c] = m[src][c] * na
			} else {
				amount[src][c] = sh * meas
			}
		}
	}
}

// model fills m with the model amount of each cation from each source per
// unit of the sample's Na under the k-th kept draw of sr: the sum over the
// source's end-members j of a_j (X/Na)_j.
func (r *Result) model(sr *SampleResult, k int, m *Split) {
	n := len(r.EndMembers)
	stride := int(NTracers) * n
	d := int(sr.kept[k])
	tab := r.table[d*stride : (d+1)*stride]
	kt, ct, mt := tab[int(KNa)*n:int(KNa)*n+n], tab[int(CaNa)*n:int(CaNa)*n+n], tab[int(MgNa)*n:int(MgNa)*n+n]
	*m = Split{}
	for j, aj := range sr.alpha[k*n : (k+1)*n] {
		s := &m[r.src[j]]
		s[0] += aj
		s[1] += aj * kt[j]
		s[2] += aj * ct[j]
		s[3] += aj * mt[j]
	}
}

// scratch is per-goroutine working space for summaries.
type scratch struct {
	vals []float64
	w    []float64
	idx  []int
}

// finish turns the kept draws of sample s into its summary and status.
func (r *Run) finish(s int, sc *scratch) {
	sr := &r.res.Samples[s]
	res := r.res
	n := r.n
	kept := len(sr.kept)
	sr.Kept = kept
	sr.AcceptRate = float64(kept) / float64(r.opt.Draws)
	sr.Alpha = make([]Interval, n)
	switch {
	case sr.prep.skip:
		sr.Status = Skipped
		return
	case kept == 0:
		sr.Status = NoFit
		sr.Warnings = append(sr.Warnings, ErrNoFit)
		for j := range sr.Alpha {
			sr.Alpha[j] = Interval{math.NaN(), math.NaN(), math.NaN()}
		}
		nan := math.NaN()
		for src := range NSources {
			for c := range NCations {
				sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = nan, nan, nan
				sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c] = nan, nan, nan
			}
		}
		return
	case kept < r.opt.MinAccepted:
		sr.Status = FewAccepted
	default:
		sr.Status = Success
	}
	// Weights and effective sample size.
	sc.w = slices.Grow(sc.w[:0], kept)[:kept]
	sw, sw2 := 0.0, 0.0
	for k := range kept {
		w := res.weight(sr, k)
		sc.w[k] = w
		sw += w
		sw2 += w * w
	}
	sr.ESS = sw * sw / sw2
	weighted := r.opt.Scoring == Weight
	// Columns: n alphas, then share and amount of every source and cation.
	const cells = int(NSources) * NCations
	cols := n + 2*cells
	sc.vals = slices.Grow(sc.vals[:0], cols*kept)[:cols*kept]
	var present [NSources]bool
	for _, src := range r.src {
		present[src] = true
	}
	var srcs []Source
	for src := range NSources {
		if present[src] {
			srcs = append(srcs, src)
		}
	}
	// With per-draw data the amounts are not the shares times one
	// measured value, so every amount column is filled and summarised.
	varying := res.vary != nil
	var m Split
	for k := range kept {
		for j := 0; j < n; j++ {
			sc.vals[j*kept+k] = sr.alpha[k*n+j]
		}
		na, meas := res.data(s, int(sr.kept[k]))
		// As drawSplit, written straight into the columns.
		res.model(sr, k, &m)
		for c := 0; c < NCations; c++ {
			tot := m[0][c] + m[1][c] + m[2][c] + m[3][c]
			unmeasured := math.IsNaN(meas[c])
			for _, src := range srcs {
				i := int(src)*NCations + c
				sh := 0.0
				if tot > 0 {
					sh = m[src][c] / tot
				}
				sc.vals[(n+i)*kept+k] = sh
				switch {
				case unmeasured:
					sc.vals[(n+cells+i)*kept+k] = m[src][c] * na
				case varying:
					sc.vals[(n+cells+i)*kept+k] = sh * meas[c]
				}
			}
		}
	}
	q := func(col int) Interval {
		v := sc.vals[col*kept : (col+1)*kept]
		if weighted {
			return weightedInterval(v, sc.w, &sc.idx)
		}
		return interval(v)
	}
	for j := 0; j < n; j++ {
		sr.Alpha[j] = q(j)
	}
	for src := range NSources {
		if !present[src] {
			continue // zero everywhere
		}
		for c := range NCations {
			i := int(src)*NCations + c
			iv := q(n + i)
			sr.Share.Lo[src][c], sr.Share.Median[src][c], sr.Share.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
			if meas := sr.prep.meas[c]; !math.IsNaN(meas) && !varying {
				// amount = share x measured, a monotone map: its quantiles follow.
				sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = iv.Lo*meas, iv.Median*meas, iv.Hi*meas
				continue
			}
			iv = q(n + cells + i)
			sr.Amount.Lo[src][c], sr.Amount.Median[src][c], sr.Amount.Hi[src][c] = iv.Lo, iv.Median, iv.Hi
		}
	}
	if sr.Status == FewAccepted {
		sr.Warnings = append(sr.Warnings, ErrFewAccepted)
	}
}

// Checksum returns a 64-bit FNV-1a hash of the bits of every number in the
// result: statuses, summaries and every kept draw. Two runs agree bit for
// bit exactly when their checksums agree (barring a hash collision).
func (r *Result) Checksum() uint64 {
	h := fnv.New64a()
	var b [8]byte
	put := func(v uint64) {
		binary.LittleEndian.PutUint64(b[:], v)
		h.Write(b[:])
	}
	f := func(x float64) { put(math.Float64bits(x)) }
	sp := func(s *Split) {
		for src := range NSources {
			for c := range NCations {
				f(s[src][c])
			}
		}
	}
	put(r.Seed)
	put(uint64(r.Draws))
	for _, v := range r.table {
		f(v)
	}
	for i := range r.Samples {
		s := &r.Samples[i]
		put(uint64(s.Status))
		put(uint64(s.Kept))
		f(s.AcceptRate)
		f(s.ESS)
		for _, a := range s.Alpha {
			f(a.Lo)
			f(a.Median)
			f(a.Hi)
		}
		for _, q := range []*Quantiles{&s.Amount, &s.Share} {
			sp(&q.Lo)
			sp(&q.Median)
			sp(&q.Hi)
		}
		for _, d := range s.kept {
			put(uint64(d))
		}
		for _, v := range s.chi2 {
			f(v)
		}
		for _, v := range s.alpha {
			f(v)
		}
	}
	return h.Sum64()
}
