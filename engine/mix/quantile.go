package mix

import "slices"

// interval returns the 2.5 %, 50 % and 97.5 % quantiles of v (linear
// interpolation between order statistics, Hyndman & Fan 1996 type 7, the
// default of R and NumPy; from memory). It reorders v. Selection instead of
// sorting keeps it linear in len(v).
func interval(v []float64) Interval {
	return Interval{quantile(v, 0.025), quantile(v, 0.5), quantile(v, 0.975)}
}

// quantile returns the type-7 p-quantile of v, reordering v.
func quantile(v []float64, p float64) float64 {
	n := len(v)
	if n == 1 {
		return v[0]
	}
	h := p * float64(n-1)
	i := int(h)
	f := h - float64(i)
	lo := selectK(v, i)
	if f == 0 || i+1 >= n {
		return lo
	}
	// After selection every element right of i is >= v[i]; the next order
	// statistic is their minimum.
	hi := v[i+1]
	for _, x := range v[i+2:] {
		if x < hi {
			hi = x
		}
	}
	return lo + f*(hi-lo)
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
