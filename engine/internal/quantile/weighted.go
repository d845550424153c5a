package quantile

import (
	"cmp"
	"math"
	"slices"

	"lixiv/engine/internal/order"
	"lixiv/engine/internal/portable"
)

// Pair is a value with its weight.
type Pair struct{ V, W float64 }

// Lower95 returns weighted 2.5 %, 50 % and 97.5 % quantiles: for each p the
// smallest value whose cumulative weight, in increasing order of the
// values, reaches p of the total. Values with a weight that is not above
// zero are left out; NaN throughout when none is left. v and w are left
// unchanged; buf is working space. It selects rather than sorts, so it is
// linear in len(v) on average.
func Lower95(v, w []float64, buf *[]Pair) Interval {
	n := len(v)
	ps := slices.Grow((*buf)[:0], n)[:n]
	tot := 0.0
	k := 0
	for i := range v {
		if w[i] > 0 {
			ps[k] = Pair{v[i], w[i]}
			tot += w[i]
			k++
		}
	}
	ps = ps[:k]
	*buf = ps
	if k == 0 {
		return NaN()
	}
	return Interval{lowerSelect(ps, 0.025*tot), lowerSelect(ps, 0.5*tot), lowerSelect(ps, 0.975*tot)}
}

// lowerSelect returns the smallest value of ps whose cumulative weight, in
// increasing order of the values, reaches target (the largest value when
// rounding leaves the total short of it). It reorders ps: a weighted
// quickselect with a three-way partition around the median of three.
func lowerSelect(ps []Pair, target float64) float64 {
	lo, hi := 0, len(ps)
	base := 0.0
	for hi-lo > 12 {
		a, b, c := ps[lo].V, ps[lo+(hi-lo)/2].V, ps[hi-1].V
		p := portable.Max(portable.Min(a, b), portable.Min(portable.Max(a, b), c))
		// [lo, lt) < p, [lt, gt) == p, [gt, hi) > p.
		lt, i, gt := lo, lo, hi
		wl, we := 0.0, 0.0
		for i < gt {
			switch x := ps[i]; {
			case x.V < p:
				ps[i] = ps[lt]
				ps[lt] = x
				wl += x.W
				lt++
				i++
			case x.V > p:
				gt--
				ps[i] = ps[gt]
				ps[gt] = x
			default:
				we += x.W
				i++
			}
		}
		switch {
		case base+wl >= target:
			hi = lt
		case base+wl+we >= target:
			return p
		default:
			base += wl + we
			lo = gt
		}
	}
	part := ps[lo:hi]
	slices.SortFunc(part, byValue)
	for _, x := range part {
		base += x.W
		if base >= target {
			return x.V
		}
	}
	if len(part) > 0 {
		return part[len(part)-1].V
	}
	return ps[hi-1].V
}

func byValue(a, b Pair) int { return cmp.Compare(a.V, b.V) }

// Buf computes mid-point quantiles, reusing its buffers across calls. The
// zero value is ready to use.
type Buf struct {
	s []Pair
	f []float64
}

// Midpoints returns the quantiles ps of the finite values of x with weights
// w (nil for equal; values with a weight not above zero are left out),
// interpolated linearly between the mid-points of the cumulative weights of
// the sorted values; NaN when no value is left.
func (b *Buf) Midpoints(x, w []float64, ps ...float64) []float64 {
	if w == nil || allOnes(w) {
		return b.equal(x, ps)
	}
	return b.weighted(x, w, ps)
}

func allOnes(w []float64) bool {
	for _, x := range w {
		if x != 1 {
			return false
		}
	}
	return true
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// equal is Midpoints with every weight 1: the same arithmetic (the
// cumulative weight before value i is exactly i), without the weights, and
// with the two order statistics each quantile needs selected rather than
// the values sorted.
func (b *Buf) equal(x []float64, ps []float64) []float64 {
	s := b.f[:0]
	for _, v := range x {
		if finite(v) {
			s = append(s, v)
		}
	}
	b.f = s
	out := make([]float64, len(ps))
	n := len(s)
	for k, p := range ps {
		if n == 0 {
			out[k] = math.NaN()
			continue
		}
		// The first i whose mid-point i + 0.5 reaches the target.
		target := p * float64(n)
		i := max(int(math.Ceil(target-0.5)), 0)
		for i > 0 && float64(i-1)+0.5 >= target {
			i--
		}
		for i < n && float64(i)+0.5 < target {
			i++
		}
		switch {
		case i >= n:
			out[k] = order.Max(s)
		case i == 0:
			out[k] = order.Min(s)
		default:
			lo := order.Select(s, i-1) // s[i:] now holds the greater values
			hi := order.Min(s[i:])
			cum := float64(i)
			mid, prevMid := cum+0.5, cum-0.5
			f := (target - prevMid) / (mid - prevMid)
			out[k] = lo + f*(hi-lo)
		}
	}
	return out
}

func (b *Buf) weighted(x, w []float64, ps []float64) []float64 {
	s := b.s[:0]
	total := 0.0
	for i, v := range x {
		if wi := w[i]; finite(v) && wi > 0 {
			s = append(s, Pair{v, w[i]})
			total += w[i]
		}
	}
	b.s = s
	out := make([]float64, len(ps))
	if len(s) == 0 {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	sortPairs(s) // as slices.SortFunc(s, byValue), faster: the values are finite
	for k, p := range ps {
		target := p * total
		cum := 0.0
		out[k] = s[len(s)-1].V
		for i := range s {
			mid := cum + s[i].W/2
			if mid >= target {
				if i == 0 {
					out[k] = s[0].V
				} else {
					prevMid := cum - s[i-1].W/2
					f := (target - prevMid) / (mid - prevMid)
					out[k] = s[i-1].V + f*(s[i].V-s[i-1].V)
				}
				break
			}
			cum += s[i].W
		}
	}
	return out
}
