package mix

import (
	"fmt"
	"math"
)

// Dist is the shape of an end-member ratio prior.
type Dist int

// The prior shapes.
const (
	Fixed      Dist = iota // the ratio is Value, exactly
	LogUniform             // log-uniform between Lo and Hi
	LogNormal              // log-normal with median Value; [Lo, Hi] is its central 95 % range
)

var distNames = [...]string{"fixed", "log-uniform", "log-normal"}

// String returns the name of the shape.
func (d Dist) String() string {
	if d < 0 || int(d) >= len(distNames) {
		return "unknown"
	}
	return distNames[d]
}

// z975 is the 97.5 % standard normal quantile (common practice).
const z975 = 1.959963984540054

// Prior is the prior distribution of one end-member ratio: a central value
// and a range. Ratios are positive and span decades, so the random shapes
// are logarithmic (docs/methods.md §7.2). The zero Prior is a fixed ratio of 0.
type Prior struct {
	Dist  Dist
	Value float64 // central value: the fixed ratio, the log-normal median, the value the forward model uses
	Lo    float64 // lower end of the range (LogUniform: hard bound; LogNormal: 2.5 % quantile)
	Hi    float64 // upper end of the range (LogUniform: hard bound; LogNormal: 97.5 % quantile)
}

// FixedRatio returns a prior that always gives v.
func FixedRatio(v float64) Prior { return Prior{Dist: Fixed, Value: v, Lo: v, Hi: v} }

// Range returns a log-uniform prior on [lo, hi] with central value v.
func Range(lo, v, hi float64) Prior { return Prior{Dist: LogUniform, Value: v, Lo: lo, Hi: hi} }

// Spread returns a log-normal prior with median v whose log has standard
// deviation rel (so rel = 0.01 is a 1 % spread).
func Spread(v, rel float64) Prior {
	f := pexp(z975 * rel)
	return Prior{Dist: LogNormal, Value: v, Lo: v / f, Hi: v * f}
}

// Validate reports a prior that cannot be sampled.
func (p Prior) Validate() error {
	bad := func(x float64) bool { return math.IsNaN(x) || math.IsInf(x, 0) }
	switch p.Dist {
	case Fixed:
		if bad(p.Value) || p.Value < 0 {
			return fmt.Errorf("fixed ratio %g must be a finite number >= 0", p.Value)
		}
	case LogUniform, LogNormal:
		if bad(p.Lo) || bad(p.Hi) || bad(p.Value) || p.Lo <= 0 || p.Hi < p.Lo {
			return fmt.Errorf("%s range [%g, %g] needs 0 < low <= high", p.Dist, p.Lo, p.Hi)
		}
		if p.Dist == LogNormal && (p.Value < p.Lo || p.Value > p.Hi) {
			return fmt.Errorf("log-normal median %g lies outside its range [%g, %g]", p.Value, p.Lo, p.Hi)
		}
	default:
		return fmt.Errorf("unknown prior shape %d", int(p.Dist))
	}
	return nil
}

// sampler draws from a validated prior with precomputed logs.
type sampler struct {
	dist     Dist
	v        float64 // fixed value
	a, b     float64 // LogUniform: ln lo, ln hi - ln lo; LogNormal: ln median, sd of ln
	constant bool
}

func newSampler(p Prior) sampler {
	s := sampler{dist: p.Dist, v: p.Value}
	switch p.Dist {
	case LogUniform:
		s.a = plog(p.Lo)
		s.b = plog(p.Hi) - s.a
	case LogNormal:
		s.a = plog(p.Value)
		s.b = (plog(p.Hi) - plog(p.Lo)) / (2 * z975)
	}
	if p.Dist == Fixed || s.b == 0 {
		s.constant = true
		if p.Dist != Fixed {
			s.v = p.Value
		}
	}
	return s
}

// draw maps a uniform u in (0, 1) to a prior draw.
func (s *sampler) draw(u float64) float64 {
	switch {
	case s.constant:
		return s.v
	case s.dist == LogUniform:
		return pexp(s.a + float64(u*s.b))
	default:
		return pexp(s.a + float64(s.b*normQuantile(u)))
	}
}
