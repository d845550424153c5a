// Package quantile holds the engine's one set of quantile functions and its
// one interval type, so that every package summarises draws, replicates and
// samples the same way.
//
// Two definitions are in use, each named for what it computes:
//
//   - Type 7 (Hyndman & Fan 1996, the default of R and NumPy; common
//     practice): linear interpolation between the order statistics at
//     position (n−1)p. Sorted, Select and Of95 compute it; Of95 selects
//     rather than sorts, so it is linear in n on average.
//   - Weighted: Lower95 takes, for each p, the smallest value whose
//     cumulative weight reaches p of the total (the weighted inverse
//     distribution function, common practice); Buf.Midpoints interpolates
//     between the mid-points of the cumulative weights of the sorted values
//     (with equal weights, Hyndman & Fan's type 5; common practice), which
//     the notebook uses for per-sample figures weighted by their draws.
//
// All functions give the same bits natively and in WebAssembly: they use
// only comparisons, additions and products that no compiler fuses.
package quantile

import (
	"math"
	"slices"

	"lixiv/engine/internal/order"
)

// Interval is a median with its 95 % bounds (the 2.5 % and 97.5 %
// quantiles), in the unit of the values summarised.
type Interval struct {
	Lo, Median, Hi float64
}

// NaN is the interval of no values.
func NaN() Interval { return Interval{math.NaN(), math.NaN(), math.NaN()} }

// Contains reports whether v lies within [Lo, Hi].
func (iv Interval) Contains(v float64) bool { return v >= iv.Lo && v <= iv.Hi }

// position returns the integer and fractional parts of the type-7
// position (n−1)p.
func position(n int, p float64) (int, float64) {
	h := p * float64(n-1)
	i := int(math.Floor(h))
	return i, h - float64(i)
}

// between interpolates a fraction f of the way from a to b. It gives +0
// from any two zeros, so the order in which equal values land in a
// selection does not show.
func between(a, b, f float64) float64 { return a + f*(b-a) }

// Sorted returns the type-7 p quantile of sorted x (NaN when x is empty).
func Sorted(x []float64, p float64) float64 {
	n := len(x)
	if n == 0 {
		return math.NaN()
	}
	i, f := position(n, p)
	if i >= n-1 {
		return x[n-1]
	}
	return between(x[i], x[i+1], f)
}

// Select returns Sorted of x sorted, bit for bit, without sorting: it
// selects the two order statistics it interpolates between, reordering x,
// which must hold no NaN. Values that compare equal have the same bits but
// for ±0, and the interpolation gives the same result from either, so the
// order in which equal values land does not show.
func Select(x []float64, p float64) float64 {
	n := len(x)
	if n == 0 {
		return math.NaN()
	}
	if i, f := position(n, p); i < n-1 {
		a := order.Select(x, i)
		return between(a, order.Min(x[i+1:]), f) // the right of i holds the larger ones
	}
	slices.Sort(x) // the last of equal values as a sort leaves them
	return x[n-1]
}

// SortedInterval returns the type-7 median and 95 % bounds of sorted x.
func SortedInterval(x []float64) Interval {
	return Interval{Sorted(x, 0.025), Sorted(x, 0.5), Sorted(x, 0.975)}
}

// SortedNotNaN returns the values of v that are not NaN, sorted, in a new
// slice; v is not changed.
func SortedNotNaN(v []float64) []float64 {
	s := make([]float64, 0, len(v))
	for _, x := range v {
		if !math.IsNaN(x) {
			s = append(s, x)
		}
	}
	slices.Sort(s)
	return s
}

// NotNaN returns the type-7 median and 95 % bounds of the values of v that
// are not NaN (NaN throughout when there are none); v is not changed.
func NotNaN(v []float64) Interval { return SortedInterval(SortedNotNaN(v)) }

// Of95 returns the type-7 2.5 %, 50 % and 97.5 % quantiles of v, which
// must hold no NaN. It reorders v. The median splits v, and the outer
// quantiles are selected within its halves.
func Of95(v []float64) Interval {
	n := len(v)
	if n == 0 {
		return NaN()
	}
	im, _ := position(n, 0.5)
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
		i, f := position(n, p)
		a, b := stat(i)
		return between(a, b, f)
	}
	return Interval{q(0.025), q(0.5), q(0.975)}
}
