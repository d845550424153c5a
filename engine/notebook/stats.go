package notebook

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// parseNum reads a number typed in a table cell (a decimal comma is accepted).
func parseNum(s string) (float64, error) {
	t := strings.TrimSpace(strings.ReplaceAll(s, ",", "."))
	x, err := strconv.ParseFloat(t, 64)
	if err != nil || !finite(x) {
		return 0, fmt.Errorf("%q is not a number", s)
	}
	return x, nil
}

// median returns the median of the finite values of x (NaN when none).
func median(x []float64) float64 {
	q := quantiles(x, nil, 0.5)
	return q[0]
}

// quantiles returns the weighted quantiles ps of the finite values of x
// (weights w, nil for equal): the smallest value whose cumulative weight
// reaches p of the total, interpolated between neighbours. NaN when empty.
func quantiles(x, w []float64, ps ...float64) []float64 {
	type vw struct{ v, w float64 }
	s := make([]vw, 0, len(x))
	total := 0.0
	for i, v := range x {
		wi := 1.0
		if w != nil {
			wi = w[i]
		}
		if finite(v) && wi > 0 {
			s = append(s, vw{v, wi})
			total += wi
		}
	}
	out := make([]float64, len(ps))
	if len(s) == 0 {
		for i := range out {
			out[i] = math.NaN()
		}
		return out
	}
	sort.Slice(s, func(i, j int) bool { return s[i].v < s[j].v })
	for k, p := range ps {
		// position of the p-quantile on the midpoints of the cumulative weights
		target := p * total
		cum := 0.0
		out[k] = s[len(s)-1].v
		for i := range s {
			mid := cum + s[i].w/2
			if mid >= target {
				if i == 0 {
					out[k] = s[0].v
				} else {
					prevMid := cum - s[i-1].w/2
					f := (target - prevMid) / (mid - prevMid)
					out[k] = s[i-1].v + f*(s[i].v-s[i-1].v)
				}
				break
			}
			cum += s[i].w
		}
	}
	return out
}
