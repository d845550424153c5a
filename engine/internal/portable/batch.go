package portable

import "math"

// ExpAll sets each x[i] to Exp(x[i]): the same bits, in one call. Compiled to
// WebAssembly, a call costs about as much as Exp's arithmetic, and the
// engine's weights take tens of exponentials per draw in loops; this is
// Exp's body again inside one loop (TestBatchSameBits holds the two together bit
// for bit).
func ExpAll(x []float64) {
	for i, v := range x {
		switch {
		case v != v:
			continue
		case v > expOverflow:
			x[i] = math.Inf(1)
			continue
		case v < expFlush:
			x[i] = 0
			continue
		case -expTiny < v && v < expTiny:
			x[i] = 1 + v
			continue
		}
		var k int
		if v < 0 {
			k = int(float64(log2e*v) - 0.5)
		} else {
			k = int(float64(log2e*v) + 0.5)
		}
		hi := v - float64(float64(k)*ln2Hi)
		lo := float64(k) * ln2Lo
		r := hi - lo
		t := r * r
		q := float64(t*expP5) + expP4
		q = float64(t*q) + expP3
		q = float64(t*q) + expP2
		q = float64(t*q) + expP1
		c := r - float64(t*q)
		y := 1 - ((lo - float64(r*c)/(2-c)) - hi)
		if k > 1000 {
			y *= 0x1p1000
			k -= 1000
		} else if k < -1000 {
			y *= 0x1p-1000
			k += 1000
		}
		x[i] = y * math.Float64frombits(uint64(k+1023)<<52)
	}
}

// LogAll sets each x[i] to Log(x[i]): the same bits, in one call (Log's
// body again inside one loop; see ExpAll).
func LogAll(x []float64) {
	for i, v := range x {
		switch {
		case v != v || math.IsInf(v, 1):
			continue
		case v < 0:
			x[i] = math.NaN()
			continue
		case v == 0:
			x[i] = math.Inf(-1)
			continue
		}
		ki := 0
		if v < 0x1p-1022 {
			v *= 0x1p52
			ki = -52
		}
		b := math.Float64bits(v)
		ki += int((b>>52)&0x7ff) - 1022
		f1 := math.Float64frombits(b&^(0x7ff<<52) | 1022<<52)
		if f1 < math.Sqrt2/2 {
			f1 *= 2
			ki--
		}
		f := f1 - 1
		k := float64(ki)
		s := f / (2 + f)
		s2 := s * s
		s4 := s2 * s2
		t1 := float64(s4*logL7) + logL5
		t1 = float64(s4*t1) + logL3
		t1 = float64(s4*t1) + logL1
		t1 = s2 * t1
		t2 := float64(s4*logL6) + logL4
		t2 = float64(s4*t2) + logL2
		t2 = s4 * t2
		r := t1 + t2
		hfsq := 0.5 * f * f
		x[i] = float64(k*ln2Hi) - ((hfsq - (float64(s*(hfsq+r)) + float64(k*ln2Lo))) - f)
	}
}
