package notebook

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"lixiv/engine/internal/order"
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
// (weights w, nil for equal), interpolated linearly between the midpoints
// of the cumulative weights of the sorted values. NaN when empty.
func quantiles(x, w []float64, ps ...float64) []float64 {
	var b quantileBuf
	return b.quantiles(x, w, ps...)
}

type vw struct{ v, w float64 }

// quantileBuf reuses its sort buffers across calls.
type quantileBuf struct {
	s []vw
	f []float64
}

func allOnes(w []float64) bool {
	for _, x := range w {
		if x != 1 {
			return false
		}
	}
	return true
}

// equal is quantiles with every weight 1: the same arithmetic (the
// cumulative weight before value i is exactly i), without the weights, and
// with the two order statistics each quantile needs selected rather than
// the values sorted.
func (b *quantileBuf) equal(x []float64, ps []float64) []float64 {
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

func (b *quantileBuf) quantiles(x, w []float64, ps ...float64) []float64 {
	if w == nil || allOnes(w) {
		return b.equal(x, ps)
	}
	return b.weighted(x, w, ps...)
}

func (b *quantileBuf) weighted(x, w []float64, ps ...float64) []float64 {
	s := b.s[:0]
	total := 0.0
	for i, v := range x {
		if wi := w[i]; finite(v) && wi > 0 {
			s = append(s, vw{v, w[i]})
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
	slices.SortFunc(s, func(a, b vw) int { return cmp.Compare(a.v, b.v) })
	for k, p := range ps {
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
