package compare

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"

	"lixiv/engine/internal/portable"
)

// streamJoint is the second PCG word of the joint draw choice.
const streamJoint = 0x6c69782d6a6f696e // "lix-join"

// Joint is one draw number per replicate taken from the joint posterior of
// the samples of several budgets whose draw d stands for the same shared
// values everywhere.
type Joint struct {
	// Draws lists the draw numbers with a positive joint weight, in order.
	Draws []int
	// Picks gives, for each replicate, an index into Draws.
	Picks []int
	// Effective is the effective number of joint draws, (Σ w)² / Σ w²
	// over Draws (Kish's effective sample size; common practice).
	Effective float64
}

// ErrNoJoint says that no draw number is kept by every sample.
var ErrNoJoint = errors.New("no draw is kept by every sample of the budgets")

// JointDraws takes a draw number for each of n replicates with probability
// proportional to its joint weight Π w_bi(d), the product over every sample
// i of every budget b of the weight the sample gives draw d (the posterior
// of the shared values given all the samples, with independent data
// errors; common practice for importance weights). weights[b][i] holds
// the weight of each draw number of sample i of budget b; a nil or empty
// row is a sample without draws and takes no part. Every other row must
// have the same length. A draw any sample rejected (weight 0) is never
// taken; when every draw is, the error is ErrNoJoint.
func JointDraws(weights [][][]float64, n int, seed uint64) (*Joint, error) {
	nd := -1
	for b := range weights {
		for i, w := range weights[b] {
			if len(w) == 0 {
				continue
			}
			if nd >= 0 && len(w) != nd {
				return nil, fmt.Errorf("budget %d, sample %d: %d draws, others %d", b+1, i+1, len(w), nd)
			}
			nd = len(w)
		}
	}
	if nd <= 0 {
		return nil, fmt.Errorf("no sample has draws")
	}
	lw := make([]float64, nd)
	for b := range weights {
		for _, w := range weights[b] {
			if len(w) == 0 {
				continue
			}
			for d, x := range w {
				if x > 0 && !math.IsInf(x, 0) {
					lw[d] += portable.Log(x)
				} else {
					lw[d] = math.Inf(-1)
				}
			}
		}
	}
	top := math.Inf(-1)
	for _, v := range lw {
		top = math.Max(top, v)
	}
	if math.IsInf(top, -1) || math.IsNaN(top) {
		return nil, ErrNoJoint
	}
	j := &Joint{}
	var cum []float64
	t, t2 := 0.0, 0.0
	for d, v := range lw {
		if math.IsInf(v, -1) {
			continue
		}
		w := portable.Exp(v - top)
		t += w
		t2 += w * w
		j.Draws = append(j.Draws, d)
		cum = append(cum, t)
	}
	j.Effective = t * t / t2
	rng := rand.New(rand.NewPCG(seed, streamJoint))
	j.Picks = make([]int, n)
	for r := range j.Picks {
		x := rng.Float64() * t
		k := sort.Search(len(cum), func(k int) bool { return cum[k] > x }) // a draw of weight 0 is never chosen
		j.Picks[r] = min(k, len(cum)-1)
	}
	return j, nil
}
