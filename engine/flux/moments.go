package flux

import (
	"math"
	"sync/atomic"
)

// Bootstrap replicates of the rating curve differ only in their fitted
// coefficients, yet each one would evaluate exp(b0 + b ln Q_d) on every day
// of the record. For the curve without seasonal terms the yearly sum
// factorises around a reference slope b*:
//
//	Σ_d Q_d e^{b ln Q_d} = e^{b m} Σ_j Δ^j M_j,   M_j = Σ_d Q_d e^{b* u_d} u_d^j / j!
//
// with u_d = ln Q_d − m, Δ = b − b* (a Taylor series of e^{Δ u_d}; common
// practice). The moments M_j are summed once per record; a replicate then
// costs a few dozen operations per year instead of one exp per day. The
// series is used only while |Δ| max|u_d| ≤ momentRadius, where the first
// omitted term is below 1e-16 of the sum; otherwise the daily loop runs.
// All of it is plain Go arithmetic, so it gives the same bits natively and
// under WebAssembly.

const (
	momentTerms  = 25  // terms of the series kept
	momentRadius = 2.0 // largest |Δ| max|u_d| accepted
)

// useMoments switches the moment path on for bootstrap replicates; tests
// turn it off to compare with the daily loop.
var useMoments = true

// momentUses counts replicates summed through the moments (for tests).
var momentUses atomic.Int64

// moments holds the per-year moment sums around a reference slope.
type moments struct {
	beta float64     // reference slope b*
	m    float64     // centre of ln Q over the record's days with flow
	umax float64     // largest |ln Q_d − m|
	sum  [][]float64 // per year, M_0 … M_{momentTerms−1}
}

// prepareMoments sums the moments of the record around slope beta.
func (e *engine) prepareMoments(beta float64) *moments {
	mo := &moments{beta: beta, sum: make([][]float64, len(e.sumQ))}
	for y := range mo.sum {
		mo.sum[y] = make([]float64, momentTerms)
	}
	n := 0
	for k, q := range e.q {
		if math.IsNaN(q) || q <= 0 {
			continue
		}
		mo.m += e.lnq[k]
		n++
	}
	if n == 0 {
		return nil
	}
	mo.m /= float64(n)
	for k, q := range e.q {
		if math.IsNaN(q) || q <= 0 {
			continue
		}
		u := e.lnq[k] - mo.m
		if a := math.Abs(u); a > mo.umax {
			mo.umax = a
		}
		t := q * pexp(beta*u)
		row := mo.sum[e.year[k]]
		for j := 0; j < momentTerms; j++ {
			row[j] += t
			t *= u / float64(j+1)
		}
	}
	return mo
}

// sumRating adds Σ (C_d − Cref) Q_d per year into out for the curve
// C_d = cpos e^{b0 + b ln Q_d} bcf, and reports false when the slope is too
// far from the reference for the series.
func (mo *moments) sumRating(e *engine, cpos, b0, b, bcf, cref float64, out []float64) bool {
	d := b - mo.beta
	if math.Abs(d)*mo.umax > momentRadius {
		return false
	}
	scale := cpos * pexp(b0+b*mo.m) * bcf
	for y, row := range mo.sum {
		s := row[momentTerms-1]
		for j := momentTerms - 2; j >= 0; j-- {
			s = s*d + row[j]
		}
		out[y] += scale*s - cref*e.sumQ[y]
	}
	momentUses.Add(1)
	return true
}
