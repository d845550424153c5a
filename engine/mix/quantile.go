package mix

import "slices"

// interval returns the 2.5 %, 50 % and 97.5 % quantiles of v (linear
// interpolation between order statistics, Hyndman & Fan 1996 type 7, the
// default of R and NumPy; from memory). It reorders v. Selection instead of
// sorting keeps it linear in len(v): the median splits v, and the outer
// quantiles are selected within its halves.
func interval(v []float64) Interval {
	n := len(v)
	im, _ := qindex(n, 0.5)
	vim := selectK(v, im) // now v[:im] <= vim <= v[im+1:]
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
			return vim, minOf(right)
		case k < im:
			part, j = left, k
		default:
			part, j = right, k-im-1
		}
		a := selectK(part, j)
		switch {
		case j+1 < len(part):
			return a, minOf(part[j+1:])
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

func minOf(v []float64) float64 {
	m := v[0]
	for _, x := range v[1:] {
		if x < m {
			m = x
		}
	}
	return m
}

// selectK reorders v so that v[k] is its k-th smallest element, smaller or
// equal ones to the left and greater or equal ones to the right (Hoare
// selection with a median-of-three pivot; deterministic).
func selectK(v []float64, k int) float64 {
	lo, hi := 0, len(v)-1
	for hi > lo {
		mid := lo + (hi-lo)/2
		if v[mid] < v[lo] {
			v[mid], v[lo] = v[lo], v[mid]
		}
		if v[hi] < v[lo] {
			v[hi], v[lo] = v[lo], v[hi]
		}
		if v[hi] < v[mid] {
			v[hi], v[mid] = v[mid], v[hi]
		}
		pivot := v[mid]
		i, j := lo, hi
		for i <= j {
			for v[i] < pivot {
				i++
			}
			for v[j] > pivot {
				j--
			}
			if i <= j {
				v[i], v[j] = v[j], v[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return v[k]
		}
	}
	return v[k]
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
