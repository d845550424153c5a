// Package order finds order statistics (the k-th smallest of a set of
// numbers) in linear expected time, without sorting. The engine uses it for
// the quantiles of Monte Carlo draws, where sorting every sample's draws
// cost more than drawing them.
package order

// Select reorders v so that v[k] is its k-th smallest element (from 0),
// with smaller or equal ones to its left and greater or equal ones to its
// right, and returns it. It uses Hoare selection with a median-of-three
// pivot, so it is deterministic. v must not hold NaN; k must be in range.
func Select(v []float64, k int) float64 {
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

// Min returns the smallest element of v, which must not be empty.
func Min(v []float64) float64 {
	m := v[0]
	for _, x := range v[1:] {
		if x < m {
			m = x
		}
	}
	return m
}

// Max returns the largest element of v, which must not be empty.
func Max(v []float64) float64 {
	m := v[0]
	for _, x := range v[1:] {
		if x > m {
			m = x
		}
	}
	return m
}
