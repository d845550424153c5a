package quantile

import (
	"cmp"
	"math"
	"slices"

	"lixiv/engine/internal/order"
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
	// The median first: the 2.5 % quantile then lies among the values
	// below it and the 97.5 % one among those above, so each tail is
	// selected within its own part.
	m := lowerCut(ps, 0.5*tot)
	lo, hi := m.v, m.v
	if t := 0.025 * tot; m.below >= t {
		lo = lowerCut(ps[:m.lt], t).v
	}
	if t := 0.975 * tot; m.upto < t && m.gt < len(ps) {
		hi = lowerCut(ps[m.gt:], t-m.upto).v
	}
	return Interval{lo, m.v, hi}
}

// cut is where lowerCut found its value v: ps[:lt] holds the values below
// v, of weight below; ps[gt:] those above; upto is the weight of the
// values up to and including v.
type cut struct {
	v           float64
	lt, gt      int
	below, upto float64
}

// lowerSelect returns the smallest value of ps whose cumulative weight, in
// increasing order of the values, reaches target (the largest value when
// rounding leaves the total short of it). It reorders ps.
func lowerSelect(ps []Pair, target float64) float64 { return lowerCut(ps, target).v }

// lowerCut is lowerSelect, telling also where the value lies in the
// reordered ps: a weighted quickselect with a three-way partition around
// the median of three.
func lowerCut(ps []Pair, target float64) cut {
	lo, hi := 0, len(ps)
	base := 0.0
	for hi-lo > 12 {
		p := medianOf3(ps[lo].V, ps[lo+(hi-lo)/2].V, ps[hi-1].V)
		// [lo, lt) < p, [lt, gt) == p, [gt, hi) > p.
		lt, gt, wl, we := partition3(ps[lo:hi], p)
		lt, gt = lo+lt, lo+gt
		switch {
		case base+wl >= target:
			hi = lt
		case base+wl+we >= target:
			return cut{v: p, lt: lt, gt: gt, below: base + wl, upto: base + wl + we}
		default:
			base += wl + we
			lo = gt
		}
	}
	part := ps[lo:hi]
	slices.SortFunc(part, byValue)
	if len(part) == 0 { // a target not above the weight below lo (zero, or rounding)
		if hi == 0 { // nothing is below ps[0]: the smallest value
			return cut{v: ps[0].V, lt: 0, gt: 1, below: 0, upto: ps[0].W}
		}
		return cut{v: ps[hi-1].V, lt: hi - 1, gt: hi, below: base, upto: base}
	}
	j, cum := len(part)-1, base
	for k, x := range part {
		cum += x.W
		if cum >= target {
			j = k
			break
		}
	}
	// The run of values equal to part[j] around it, and the weights below
	// it and up to its end.
	v := part[j].V
	a, b := j, j+1
	for a > 0 && part[a-1].V == v {
		a--
	}
	for b < len(part) && part[b].V == v {
		b++
	}
	below := base
	for _, x := range part[:a] {
		below += x.W
	}
	upto := below
	for _, x := range part[a:b] {
		upto += x.W
	}
	return cut{v: v, lt: lo + a, gt: lo + b, below: below, upto: upto}
}

func byValue(a, b Pair) int { return cmp.Compare(a.V, b.V) }

// Buf computes mid-point quantiles, reusing its buffers across calls. The
// zero value is ready to use.
type Buf struct {
	s    []Pair
	f    []float64
	keys []uint64 // sortByRadix's working space
	tmp  []Pair
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
	b.sortByRadix(s)
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
					if mid <= prevMid { // weights too small to part the mid-points
						out[k] = s[i].V
						break
					}
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
