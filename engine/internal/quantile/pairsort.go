package quantile

import (
	"math"
	"slices"

	"lixiv/engine/internal/portable"
)

// radixFrom is the length from which sortByRadix sorts by radix.
const radixFrom = 256

// sortByRadix sorts ps by value, for values that are not NaN, with the
// buffer's working space. Long slices are sorted by radix, eight bits at a
// time, which keeps equal values in their order and runs as plain loops
// (in WebAssembly a sort by a comparison function pays a call for every
// comparison); short ones by the library's sort.
func (b *Buf) sortByRadix(ps []Pair) {
	n := len(ps)
	if n < radixFrom {
		slices.SortFunc(ps, byValue)
		return
	}
	b.keys = slices.Grow(b.keys[:0], 2*n)[:2*n]
	b.tmp = slices.Grow(b.tmp[:0], n)[:n]
	keys, ktmp, tmp := b.keys[:n], b.keys[n:], b.tmp
	// A float's bits, turned so that their order as integers is the
	// values' order: negative values have every bit flipped, others only
	// the sign bit.
	var count [8][256]int
	for i, p := range ps {
		bits := math.Float64bits(p.V)
		k := bits ^ (uint64(int64(bits)>>63) | 1<<63)
		keys[i] = k
		for d := range 8 {
			count[d][byte(k>>(8*d))]++
		}
	}
	src, dst, ksrc, kdst := ps, tmp, keys, ktmp
	for d := range 8 {
		c := &count[d]
		if c[byte(ksrc[0]>>(8*d))] == n { // every key has this byte: nothing to move
			continue
		}
		pos := 0
		for v := range 256 {
			c[v], pos = pos, pos+c[v]
		}
		shift := uint(8 * d)
		for i, k := range ksrc {
			j := c[byte(k>>shift)]
			c[byte(k>>shift)] = j + 1
			dst[j], kdst[j] = src[i], k
		}
		src, dst, ksrc, kdst = dst, src, kdst, ksrc
	}
	if &src[0] != &ps[0] {
		copy(ps, src)
	}
}

// medianOf3 is the median of three values, none NaN.
func medianOf3(a, b, c float64) float64 {
	return portable.Max(portable.Min(a, b), portable.Min(portable.Max(a, b), c))
}

// partition3 reorders ps around p: ps[:lt] < p, ps[lt:gt] == p and
// ps[gt:] > p, and returns lt, gt and the weights below p and equal to it.
func partition3(ps []Pair, p float64) (lt, gt int, wl, we float64) {
	i := 0
	gt = len(ps)
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
	return lt, gt, wl, we
}
