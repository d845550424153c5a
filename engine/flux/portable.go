package flux

import (
	"math"
	"math/rand/v2"
)

// The Monte Carlo path must give the same bits natively and under
// WebAssembly. On amd64, math.Exp and math.Log run assembly that can differ
// in the last bit from the pure-Go code used under wasm, and math/rand/v2's
// NormFloat64 calls them. The functions here are plain Go on every target:
// exp and log follow the classic fdlibm algorithms (Sun Microsystems 1993;
// common practice), and normal draws use Marsaglia's polar method.

const (
	ln2Hi  = 6.93147180369123816490e-01
	ln2Lo  = 1.90821492927058770002e-10
	invLn2 = 1.44269504088896338700e+00
)

// pexp returns e**x, correct to within one unit in the last place.
func pexp(x float64) float64 {
	const (
		p1 = 1.66666666666666019037e-01
		p2 = -2.77777777770155933842e-03
		p3 = 6.61375632143793436117e-05
		p4 = -1.65339022054652515390e-06
		p5 = 4.13813679705723846039e-08
	)
	switch {
	case x != x || x > 1e300:
		return x // NaN, +Inf
	case x > 7.09782712893383973096e+02:
		return math.Inf(1)
	case x < -7.45133219101941108420e+02:
		return 0
	case -3.725290298461914e-09 < x && x < 3.725290298461914e-09:
		return 1 + x
	}
	var k int
	if x < 0 {
		k = int(invLn2*x - 0.5)
	} else {
		k = int(invLn2*x + 0.5)
	}
	hi := x - float64(k)*ln2Hi
	lo := float64(k) * ln2Lo
	r := hi - lo
	t := r * r
	c := r - t*(p1+t*(p2+t*(p3+t*(p4+t*p5))))
	y := 1 - ((lo - (r*c)/(2-c)) - hi)
	if k > -1020 && k < 1020 {
		// Multiplying by an exact power of two is exact: the same bits as
		// math.Ldexp, without its general-case work.
		return y * math.Float64frombits(uint64(k+1023)<<52)
	}
	return math.Ldexp(y, k)
}

// plog returns the natural logarithm of x, correct to within one unit in the
// last place.
func plog(x float64) float64 {
	const (
		l1 = 6.666666666666735130e-01
		l2 = 3.999999999940941908e-01
		l3 = 2.857142874366239149e-01
		l4 = 2.222219843214978396e-01
		l5 = 1.818357216161805012e-01
		l6 = 1.531383769920937332e-01
		l7 = 1.479819860511658591e-01
	)
	switch {
	case x != x || math.IsInf(x, 1):
		return x
	case x < 0:
		return math.NaN()
	case x == 0:
		return math.Inf(-1)
	}
	f1, ki := math.Frexp(x)
	if f1 < math.Sqrt2/2 {
		f1 *= 2
		ki--
	}
	f := f1 - 1
	k := float64(ki)
	s := f / (2 + f)
	s2 := s * s
	s4 := s2 * s2
	t1 := s2 * (l1 + s4*(l3+s4*(l5+s4*l7)))
	t2 := s4 * (l2 + s4*(l4+s4*l6))
	r := t1 + t2
	hfsq := 0.5 * f * f
	return k*ln2Hi - ((hfsq - (s*(hfsq+r) + k*ln2Lo)) - f)
}

// normal returns a standard normal draw by Marsaglia's polar method, using
// only uniform draws, plog and math.Sqrt (exact in IEEE arithmetic).
func normal(rng *rand.Rand) float64 {
	for {
		u := 2*rng.Float64() - 1
		v := 2*rng.Float64() - 1
		s := u*u + v*v
		if s > 0 && s < 1 {
			return u * math.Sqrt(-2*plog(s)/s)
		}
	}
}

// Exp returns e**x by the package's portable code (the same bits natively
// and in WebAssembly), for other engine packages whose random paths must
// agree across targets.
func Exp(x float64) float64 { return pexp(x) }

// Log returns the natural logarithm of x by the package's portable code
// (see Exp).
func Log(x float64) float64 { return plog(x) }
