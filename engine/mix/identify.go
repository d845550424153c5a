package mix

import (
	"fmt"
	"strings"
)

// Confusion is an end-member that the chosen tracers cannot tell from one
// other end-member, or from a mix of two, given the widths of their priors
// (docs/methods.md §7.9): the fit can then trade one for the other and
// the split between them follows the priors.
type Confusion struct {
	EndMember int       // the end-member mimicked
	Mix       []int     // the end-members whose mix looks like it
	Weights   []float64 // their Na fractions in that mix
	Chi2      float64   // the distance between the two, in prior standard deviations squared
	Separator Tracer    // a tracer not chosen that would separate them, or -1
	Text      string    // in words
}

// chi2q95 holds the 95 % quantiles of the chi-square distribution for 1 to
// 8 degrees of freedom (standard table values, checked against gonum's
// distuv.ChiSquared in the tests).
var chi2q95 = [...]float64{0, 3.841458820694124, 5.991464547107979, 7.814727903251178,
	9.487729036781154, 11.070497693516351, 12.591587243743977, 14.067140449340169, 15.507313055865453}

// separates is the distance, in standard deviations, at which a tracer is
// said to separate two end-members (an engineering choice).
const separates = 3

// identFloor is the relative spread added to every ratio in the
// confusion test, for the analytical error of the data (the default
// precision).
const identFloor = DefaultRelPrecision

// confusions checks, before the run and from the central end-member ratios
// and the widths of their priors, whether an end-member taking part can be
// matched within the 95 % range by one other end-member or by a mix of two
// in the chosen tracers; for each it finds a tracer not chosen that would
// separate them.
func (p *Problem) confusions(r *Run) []Confusion {
	var act []int
	for j, e := range p.EndMembers {
		if e.Source == Evaporite && !r.useTr[ClNa] {
			continue
		}
		act = append(act, j)
	}
	used := p.Tracers
	var unused []Tracer
	for t := range NTracers {
		if !r.useTr[t] && (t != Sr87Sr86 || p.allHave(act, SrNa, Sr87Sr86)) {
			unused = append(unused, t)
		}
	}
	var out []Confusion
	reported := map[[2]int]bool{}
	for _, j := range act {
		best := Confusion{EndMember: j, Chi2: -1}
		for a, k := range act {
			if k == j {
				continue
			}
			if d, c := p.distance(r, used, j, k, k, 1); best.Chi2 < 0 || d < best.Chi2 {
				best.Mix, best.Weights, best.Chi2 = []int{k}, []float64{c}, d
			}
			for _, l := range act[a+1:] {
				if l == j {
					continue
				}
				if d, c := p.distance(r, used, j, k, l, -1); d < best.Chi2 {
					best.Mix, best.Weights, best.Chi2 = []int{k, l}, []float64{c, 1 - c}, d
				}
			}
		}
		nu := min(len(used), len(chi2q95)-1)
		if best.Chi2 < 0 || best.Chi2 >= chi2q95[nu] {
			continue
		}
		if len(best.Mix) == 1 {
			key := [2]int{min(j, best.Mix[0]), max(j, best.Mix[0])}
			if reported[key] {
				continue
			}
			reported[key] = true
		}
		best.Separator = -1
		top := 0.0
		for _, t := range unused {
			var sep float64
			if len(best.Mix) == 1 {
				sep = p.separation(r, t, j, best.Mix[0], best.Mix[0], 1)
			} else {
				sep = p.separation(r, t, j, best.Mix[0], best.Mix[1], best.Weights[0])
			}
			if sep > top {
				best.Separator, top = t, sep
			}
		}
		if top < separates {
			best.Separator = -1
		}
		best.Text = p.confusionText(&best)
		out = append(out, best)
	}
	return out
}

func (p *Problem) allHave(ems []int, ts ...Tracer) bool {
	for _, j := range ems {
		for _, t := range ts {
			if !(p.EndMembers[j].Ratio[t].Value > 0) {
				return false
			}
		}
	}
	return true
}

// distance returns the smallest sum over the tracers ts of (difference /
// spread)² between end-member j and the mix c k + (1 − c) l of Na fractions,
// over c in [0, 1] (c = fixed when fixed >= 0), and that c.
func (p *Problem) distance(r *Run, ts []Tracer, j, k, l int, fixed float64) (float64, float64) {
	best, bc := -1.0, 0.0
	steps := 200
	if fixed >= 0 {
		steps = 0
	}
	for i := 0; i <= steps; i++ {
		c := fixed
		if fixed < 0 {
			c = float64(i) / float64(steps)
		}
		d := 0.0
		for _, t := range ts {
			z := p.separationAt(r, t, j, k, l, c)
			d += z * z
		}
		if best < 0 || d < best {
			best, bc = d, c
		}
	}
	return best, bc
}

// separation returns |difference| / spread between end-member j and the mix
// c k + (1 − c) l in tracer t.
func (p *Problem) separation(r *Run, t Tracer, j, k, l int, c float64) float64 {
	return abs(p.separationAt(r, t, j, k, l, c))
}

func (p *Problem) separationAt(r *Run, t Tracer, j, k, l int, c float64) float64 {
	v := func(t Tracer, e int) (float64, float64) {
		s := &r.smp[t][e]
		x := p.EndMembers[e].Ratio[t].Value
		return x, s.sigmaLn() * x
	}
	vj, sj := v(t, j)
	vk, sk := v(t, k)
	vl, sl := v(t, l)
	var mix, s2 float64
	if t == Sr87Sr86 {
		// Mixed in proportion to Sr: weights c (Sr/Na)_k and (1 − c) (Sr/Na)_l.
		wk, wl := c*p.EndMembers[k].Ratio[SrNa].Value, (1-c)*p.EndMembers[l].Ratio[SrNa].Value
		mix = (wk*vk + wl*vl) / (wk + wl)
		s2 = sj*sj + (wk*sk/(wk+wl))*(wk*sk/(wk+wl)) + (wl*sl/(wk+wl))*(wl*sl/(wk+wl))
		// The isotope ratio's own analytical error, not a relative one.
		s2 += DefaultIsoPrecision * DefaultIsoPrecision
	} else {
		mix = c*vk + (1-c)*vl
		s2 = sj*sj + c*c*sk*sk + (1-c)*(1-c)*sl*sl
		f := identFloor * max(vj, mix)
		s2 += f * f
	}
	if s2 == 0 {
		if vj == mix {
			return 0
		}
		return 1e6
	}
	return (vj - mix) / sqrt(s2)
}

func (p *Problem) confusionText(c *Confusion) string {
	names := func(i int) string { return p.EndMembers[i].Name }
	var mix string
	if len(c.Mix) == 1 {
		mix = names(c.Mix[0])
	} else {
		mix = fmt.Sprintf("a mix of %s (%.0f %%) and %s (%.0f %%)", names(c.Mix[0]), 100*c.Weights[0], names(c.Mix[1]), 100*c.Weights[1])
	}
	ts := make([]string, len(p.Tracers))
	for i, t := range p.Tracers {
		ts[i] = t.String()
	}
	s := fmt.Sprintf("%s cannot be told from %s with %s", names(c.EndMember), mix, strings.Join(ts, ", "))
	if c.Separator >= 0 {
		return s + "; " + c.Separator.String() + " would separate them"
	}
	return s + "; no other tracer of the end-member table separates them"
}
