package mix

import (
	"fmt"
	"math"

	"lixiv/engine/internal/enum"
)

// Dist is the shape of an end-member ratio prior.
type Dist int

// The prior shapes.
const (
	Fixed      Dist = iota // the ratio is Value, exactly
	LogUniform             // log-uniform between Lo and Hi
	LogNormal              // log-normal with median Value and σ of ln = ln(Hi/Lo)/3.92: [Lo, Hi] read as a 95 % range
)

var distNames = [...]string{"fixed", "log-uniform", "log-normal"}

// String returns the name of the shape.
func (d Dist) String() string { return enum.Name(d, distNames[:], "unknown") }

// z975 is the 97.5 % standard normal quantile (common practice).
const z975 = 1.959963984540054

// Prior is the prior distribution of one end-member ratio: a central value
// and a range. Ratios are positive and span decades, so the random shapes
// are logarithmic (docs/methods.md §7.3). The zero Prior is a fixed ratio of 0.
//
// A published "central value ± range" is read one way everywhere (methods
// brief §7.3, revised): the range is the prior's 95 % interval, log-normal
// with its median at the central value and σ of ln = ln(Hi/Lo)/3.92
// (Within). Where the source states the ± is one standard deviation, use
// OneSigma. When the central value is the geometric mean of Lo and Hi, Lo
// and Hi are exactly the 2.5 % and 97.5 % quantiles; otherwise the interval
// keeps the width and moves with the median.
type Prior struct {
	Dist  Dist
	Value float64 // central value: the fixed ratio, the log-normal median, the value the forward model uses
	Lo    float64 // lower end of the range (LogUniform: hard bound; LogNormal: the 95 % range, with Hi)
	Hi    float64 // upper end of the range (LogUniform: hard bound; LogNormal: the 95 % range, with Lo)
}

// FixedRatio returns a prior that always gives v.
func FixedRatio(v float64) Prior { return Prior{Dist: Fixed, Value: v, Lo: v, Hi: v} }

// Range returns a log-uniform prior on [lo, hi] with central value v: hard
// bounds, for a user who means them. Published ranges take Within.
func Range(lo, v, hi float64) Prior { return Prior{Dist: LogUniform, Value: v, Lo: lo, Hi: hi} }

// Within returns the reading of a published central value v with a range
// [lo, hi]: log-normal with median v and σ of ln = ln(hi/lo)/3.92, the
// range taken as the 95 % interval (docs/methods.md §7.3).
func Within(lo, v, hi float64) Prior { return Prior{Dist: LogNormal, Value: v, Lo: lo, Hi: hi} }

// OneSigma returns the reading of a published v ± sd where the source says
// sd is one standard deviation: log-normal with median v and σ of ln =
// ln(1 + sd/v) (the relative spread, common practice).
func OneSigma(v, sd float64) Prior { return Spread(v, plog(1+sd/v)) }

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

// sigmaLn returns the σ of ln of a random prior (0 for a fixed one): for
// a log-uniform prior, that of the uniform, (ln Hi − ln Lo)/√12.
func (s *sampler) sigmaLn() float64 {
	switch {
	case s.constant:
		return 0
	case s.dist == LogUniform:
		return s.b * 0.28867513459481287
	}
	return s.b
}

// latent maps a uniform u in (0, 1) to the prior's standard normal latent
// eta = Φ⁻¹(u) and the log-ratio x. Every random prior is a function of a
// standard normal eta: log-normal x = a + b eta, log-uniform x = a + b Φ(eta),
// so the proposals of the inverse model are Gaussian in eta.
func (s *sampler) latent(u float64) (eta, x float64) {
	eta = normQuantile(u)
	return eta, s.fromLatent(eta)
}

// fromLatent returns the log-ratio of the latent eta.
func (s *sampler) fromLatent(eta float64) float64 {
	if s.dist == LogUniform {
		return s.fromUniform(eta)
	}
	return s.a + float64(s.b*eta) // small enough to be inlined, for the log-normal priors
}

// fromUniform is fromLatent for a log-uniform prior (not inlined, so that
// fromLatent is).
//
//go:noinline
func (s *sampler) fromUniform(eta float64) float64 {
	return s.a + float64(normCDF(eta)*s.b)
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
