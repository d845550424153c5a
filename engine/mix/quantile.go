package mix

import (
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

// weightedInterval returns weighted 2.5 %, 50 % and 97.5 % quantiles: the
// smallest value whose cumulative weight reaches p of the total (common
// practice). v is left unchanged; idx is working space.
func weightedInterval(v, w []float64, idx *[]int) Interval {
	n := len(v)
	ix := slices.Grow((*idx)[:0], n)[:n]
	for i := range ix {
		ix[i] = i
	}
	slices.SortStableFunc(ix, func(a, b int) int {
		switch {
		case v[a] < v[b]:
			return -1
		case v[a] > v[b]:
			return 1
		}
		return 0
	})
	*idx = ix
	tot := 0.0
	for _, x := range w {
		tot += x
	}
	var out [3]float64
	ps := [3]float64{0.025, 0.5, 0.975}
	c, q := 0.0, 0
	for _, i := range ix {
		c += w[i]
		for q < 3 && c >= ps[q]*tot {
			out[q] = v[i]
			q++
		}
	}
	for ; q < 3; q++ {
		out[q] = v[ix[n-1]]
	}
	return Interval{out[0], out[1], out[2]}
}
