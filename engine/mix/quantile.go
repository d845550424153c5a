package mix

import (
	"math"
	"slices"

	"lixiv/engine/internal/order"
)

// interval returns the 2.5 %, 50 % and 97.5 % quantiles of v (linear
// interpolation between order statistics, Hyndman & Fan 1996 type 7, the
// default of R and NumPy; from memory). It reorders v. Selection instead of
// sorting keeps it linear in len(v): the median splits v, and the outer
// quantiles are selected within its halves.
func interval(v []float64) Interval {
	n := len(v)
	im, _ := qindex(n, 0.5)
	vim := order.Select(v, im) // now v[:im] <= vim <= v[im+1:]
	left, right := v[:im], v[im+1:]
	// stat returns the k-th order statistic and the (k+1)-th (or the k-th
	// again at the end), selecting only within the half that holds them.
	stat := func(k int) (float64, float64) {
		var part []float64
		var j int
		switch {
		case k == im:
			if len(right) == 0 {
				return vim, vim
			}
			return vim, order.Min(right)
		case k < im:
			part, j = left, k
		default:
			part, j = right, k-im-1
		}
		a := order.Select(part, j)
		switch {
		case j+1 < len(part):
			return a, order.Min(part[j+1:])
		case k < im:
			return a, vim
		}
		return a, a
	}
	q := func(p float64) float64 {
		i, f := qindex(n, p)
		a, b := stat(i)
		if f == 0 {
			return a
		}
		return a + f*(b-a)
	}
	return Interval{q(0.025), q(0.5), q(0.975)}
}

// qindex returns the integer and fractional parts of the type-7 position
// (n-1) p.
func qindex(n int, p float64) (int, float64) {
	h := p * float64(n-1)
	i := int(h)
	return i, h - float64(i)
}

// weightedInterval returns weighted 2.5 %, 50 % and 97.5 % quantiles: for
// each p the smallest value whose cumulative weight, in increasing order of
// the values, reaches p of the total (common practice). v and w are left
// unchanged; buf is working space. It selects rather than sorts, so it is
// linear in len(v) on average.
func weightedInterval(v, w []float64, buf *[]wpair) Interval {
	n := len(v)
	ps := slices.Grow((*buf)[:0], n)[:n]
	tot := 0.0
	k := 0
	for i := range v {
		if w[i] > 0 {
			ps[k] = wpair{v[i], w[i]}
			tot += w[i]
			k++
		}
	}
	ps = ps[:k]
	*buf = ps
	if k == 0 {
		return Interval{math.NaN(), math.NaN(), math.NaN()}
	}
	return Interval{wselect(ps, 0.025*tot), wselect(ps, 0.5*tot), wselect(ps, 0.975*tot)}
}

// wpair is a value with its weight.
type wpair struct{ v, w float64 }

// wselect returns the smallest value of ps whose cumulative weight, in
// increasing order of the values, reaches target (the largest value when
// rounding leaves the total short of it). It reorders ps: a weighted
// quickselect with a three-way partition around the median of three.
func wselect(ps []wpair, target float64) float64 {
	lo, hi := 0, len(ps)
	base := 0.0
	for hi-lo > 12 {
		a, b, c := ps[lo].v, ps[lo+(hi-lo)/2].v, ps[hi-1].v
		p := max(min(a, b), min(max(a, b), c))
		// [lo, lt) < p, [lt, gt) == p, [gt, hi) > p.
		lt, i, gt := lo, lo, hi
		wl, we := 0.0, 0.0
		for i < gt {
			switch x := ps[i]; {
			case x.v < p:
				ps[lt], ps[i] = ps[i], ps[lt]
				wl += x.w
				lt++
				i++
			case x.v > p:
				gt--
				ps[gt], ps[i] = ps[i], ps[gt]
			default:
				we += x.w
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
	slices.SortFunc(part, func(a, b wpair) int {
		switch {
		case a.v < b.v:
			return -1
		case a.v > b.v:
			return 1
		}
		return 0
	})
	for _, x := range part {
		base += x.w
		if base >= target {
			return x.v
		}
	}
	if len(part) > 0 {
		return part[len(part)-1].v
	}
	return ps[hi-1].v
}
