package flux

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// picker chooses, in each bootstrap replicate, the Monte Carlo draw each
// sample takes (DrawMode). It works on the samples of a series by their
// index in the series, so that series with the same samples and the same
// weights, bootstrapped with one seed, take the same draw of each sample
// in each replicate: the per-sample mode reads one uniform number per
// sample of the series per replicate, whatever the sample's draws.
type picker struct {
	mode  DrawMode
	n     int         // samples in the series
	count []int       // draws of each sample (0: none; the point value)
	cum   [][]float64 // cumulative weights of each sample's draws; nil for equal weights
	joint []float64   // JointDraw: cumulative joint weight of each draw number
}

// newPicker checks the draws and weights of a series of n samples (name
// for messages; draws[i] nil or empty: sample i has none) and prepares the
// cumulative weights. A draw of weight 0 may hold any value (it is never
// taken); a kept draw must be finite. tick is called now and then.
func newPicker(name string, n int, draws, weights [][]float64, mode DrawMode, tick func()) (*picker, error) {
	pk := &picker{mode: mode, n: n, count: make([]int, n)}
	if len(draws) == 0 {
		return pk, nil
	}
	if weights != nil {
		pk.cum = make([][]float64, n)
	}
	nd := -1
	for i := 0; i < n && i < len(draws); i++ {
		d := draws[i]
		if len(d) == 0 {
			continue
		}
		tick()
		var w []float64
		if weights != nil {
			if i >= len(weights) || len(weights[i]) != len(d) {
				return nil, fmt.Errorf("%s: %w: sample %d needs one weight per draw", name, ErrDraws, i+1)
			}
			w = weights[i]
		}
		cw := make([]float64, len(d))
		t := 0.0
		for k, v := range d {
			wk := 1.0
			if w != nil {
				wk = w[k]
				if !(wk >= 0) || math.IsInf(wk, 0) {
					return nil, fmt.Errorf("%s: %w: sample %d weight %d is %g", name, ErrDraws, i+1, k, wk)
				}
			}
			if wk > 0 && (math.IsNaN(v) || math.IsInf(v, 0)) {
				return nil, fmt.Errorf("%s: %w: sample %d draw %d is %g", name, ErrDraws, i+1, k, v)
			}
			t += wk
			cw[k] = t
		}
		if !(t > 0) {
			return nil, fmt.Errorf("%s: %w: sample %d has no draw of positive weight", name, ErrDraws, i+1)
		}
		if mode == JointDraw {
			if nd >= 0 && len(d) != nd {
				return nil, fmt.Errorf("%s: %w: joint draws need the same number of draws for every sample (sample %d has %d, others %d)", name, ErrDraws, i+1, len(d), nd)
			}
			nd = len(d)
		}
		pk.count[i] = len(d)
		if w != nil {
			pk.cum[i] = cw
		}
	}
	if mode == JointDraw && nd > 0 {
		if err := pk.jointWeights(name, nd); err != nil {
			return nil, err
		}
	}
	return pk, nil
}

// jointWeights forms the cumulative joint weights Π_i w_i(d) of the nd
// draw numbers, in logarithms (a product over many samples underflows) and
// scaled by the largest.
func (pk *picker) jointWeights(name string, nd int) error {
	lw := make([]float64, nd)
	for i := range pk.count {
		if pk.count[i] == 0 || pk.cum == nil {
			continue
		}
		prev := 0.0
		for d, c := range pk.cum[i] {
			lw[d] += plog(c - prev) // −Inf for a rejected draw
			prev = c
		}
	}
	top := math.Inf(-1)
	for _, v := range lw {
		top = math.Max(top, v)
	}
	if math.IsInf(top, -1) {
		return fmt.Errorf("%s: %w: no draw is kept by every sample, so no joint draw can be taken", name, ErrDraws)
	}
	pk.joint = make([]float64, nd)
	t := 0.0
	for d, v := range lw {
		t += pexp(v - top)
		pk.joint[d] = t
	}
	return nil
}

// choose returns the draw that the uniform number u picks among n draws
// with cumulative weights cw (equal weights when nil). A draw of weight 0
// is never chosen: its cumulative weight equals its predecessor's.
func choose(u float64, cw []float64, n int) int {
	if cw == nil {
		return min(int(u*float64(n)), n-1)
	}
	x := u * cw[n-1]
	lo, hi := 0, n // the first k with cw[k] > x
	for lo < hi {
		m := int(uint(lo+hi) >> 1)
		if cw[m] > x {
			hi = m
		} else {
			lo = m + 1
		}
	}
	return min(lo, n-1)
}

// pick fills idx (one entry per sample of the series) with the draw each
// sample takes in this replicate, -1 for a sample without draws.
func (pk *picker) pick(rng *rand.Rand, idx []int) {
	if pk.mode == JointDraw && pk.joint != nil {
		d := choose(rng.Float64(), pk.joint, len(pk.joint))
		for i := range idx {
			idx[i] = -1
			if pk.count[i] > 0 {
				idx[i] = d
			}
		}
		return
	}
	for i := range idx {
		u := rng.Float64()
		idx[i] = -1
		if i < pk.n && pk.count[i] > 0 {
			var cw []float64
			if pk.cum != nil {
				cw = pk.cum[i]
			}
			idx[i] = choose(u, cw, pk.count[i])
		}
	}
}

// checkGiven checks draw numbers given for nrep replicates
// (BootstrapOptions.DrawNumbers): one per replicate, and each kept (of
// positive weight) by every sample with draws.
func (pk *picker) checkGiven(name string, nums []int, nrep int) error {
	if nums == nil {
		return nil
	}
	if len(nums) < nrep {
		return fmt.Errorf("%s: %w: %d draw numbers given for %d replicates", name, ErrDraws, len(nums), nrep)
	}
	for r, d := range nums[:nrep] {
		for i, n := range pk.count {
			if n == 0 {
				continue
			}
			if d < 0 || d >= n {
				return fmt.Errorf("%s: %w: replicate %d is given draw %d, but sample %d has %d draws", name, ErrDraws, r+1, d, i+1, n)
			}
			if pk.cum != nil {
				w := pk.cum[i][d]
				if d > 0 {
					w -= pk.cum[i][d-1]
				}
				if !(w > 0) {
					return fmt.Errorf("%s: %w: replicate %d is given draw %d, which sample %d rejected", name, ErrDraws, r+1, d, i+1)
				}
			}
		}
	}
	return nil
}

// given fills idx with draw d for every sample with draws (-1 for the
// others): a draw number chosen by the caller (checkGiven).
func (pk *picker) given(d int, idx []int) {
	for i := range idx {
		idx[i] = -1
		if i < pk.n && pk.count[i] > 0 {
			idx[i] = d
		}
	}
}
