package mix

import (
	"fmt"
	"math"
	"slices"
)

// Identifiability is the counting check of the catchment-wide model, made
// before the run (docs/methods.md §7.12): the samples must give more
// equations than their own amounts take, by at least the number of shared
// ratios, and their data must spread along the mixing space.
type Identifiability struct {
	OK bool
	// Samples is the number of samples that enter the joint fit (with Na* >
	// 0 and data to fit).
	Samples int
	// Spare is the equations the samples give beyond their own amounts
	// (Σ data − end-members); Shared is the number of shared ratios to
	// learn. The check wants Spare >= Shared.
	Spare, Shared int
	// Spread is the number of directions of the tracer space along which
	// the samples' ratios to Na spread clearly more than their errors;
	// Want is the end-members less one.
	Spread, Want int
	// Thin is the number of samples that give fewer than MinSpare
	// equations beyond their own amounts; the check wants them to be
	// half of the samples or fewer.
	Thin int
	// Text says the outcome in words.
	Text string
}

// MinSpare is the equations beyond its own amounts that a sample must
// give, in most samples, for the catchment-wide model to run. With one
// (four end-members read by four tracers), each sample's amounts absorb
// nearly all of its own scatter, and in the simulation study the shared
// ratios' 95 % intervals hold the truth somewhat too seldom and the chains
// do not always converge (docs/validation.md, catchment-wide, four sources
// and four tracers, past the counting check); with two (two or three
// end-members read by one tracer more) they are calibrated.
const MinSpare = 2

// spreadSigmas is how far, in standard errors of a sample variance, the
// samples' variance along a direction must exceed that of their errors for
// the direction to count (an engineering choice, no source).
const spreadSigmas = 4

// check makes the counting check and lists the samples of the joint fit.
func (c *CatchmentRun) check() Identifiability {
	r := c.base
	var id Identifiability
	kmax := 0
	for s := range r.res.Samples {
		st := &r.res.Samples[s].setup
		if st.skip || st.naFree || st.k == 0 {
			continue
		}
		c.used = append(c.used, s)
		c.diagCov = append(c.diagCov, diagonal(&st.cov))
		c.sameA = append(c.sameA, len(c.used) > 1 && sameLayout(&r.res.Samples[c.used[len(c.used)-2]].setup, st))
		for _, j := range st.act {
			c.seen[j] = true
		}
		id.Spare += st.r - st.k
		if st.r-st.k < MinSpare {
			id.Thin++
		}
		kmax = max(kmax, st.k)
	}
	id.Samples = len(c.used)
	for _, d := range r.dims {
		if c.seen[d.em] {
			id.Shared++
		}
	}
	id.Want = max(kmax-1, 0)
	id.Spread = c.spread()
	thin := 2*id.Thin > id.Samples && !c.co.thinAllowed
	id.OK = id.Samples > 0 && id.Spare >= id.Shared && id.Spread >= id.Want && id.Shared > 0 && !thin
	switch {
	case id.Shared == 0:
		id.Text = "the catchment-wide model has no shared ratio to learn: every end-member ratio the tracers read is fixed"
	case id.Samples == 0:
		id.Text = "no sample can enter the catchment-wide model (each lacks Na* above zero or data)"
	case id.Spare < id.Shared:
		id.Text = fmt.Sprintf("the samples cannot identify the shared end-member ratios: %d samples give %d equations beyond their own amounts, fewer than the %d shared ratios (more samples, or more tracers than end-members, are needed)",
			id.Samples, id.Spare, id.Shared)
	case id.Spread < id.Want:
		id.Text = fmt.Sprintf("the samples cannot identify the shared end-member ratios: their ratios to Na spread beyond their errors along %d direction(s) of the tracer space, and %d end-members need %d (samples of one water type teach nothing about the end-members)",
			id.Spread, kmax, id.Want)
	case thin:
		id.Text = fmt.Sprintf("the samples cannot identify the shared end-member ratios well enough: %d of %d samples give fewer than two equations beyond their own amounts (%d end-members, %d tracers and Na), too few for the catchment-wide model to be trusted (its intervals hold the truth too seldom in simulations); add a tracer (K/Na, say) or drop an end-member",
			id.Thin, id.Samples, kmax, len(r.prob.Tracers))
	default:
		id.Text = fmt.Sprintf("%d samples give %d equations beyond their own amounts for %d shared ratios, and spread along %d direction(s) of the tracer space (%d needed)",
			id.Samples, id.Spare, id.Shared, id.Spread, id.Want)
	}
	return id
}

// spread counts the directions of the space of log ratios to Na along
// which the used samples spread clearly more than their errors: the
// eigenvalues of the covariance of the log ratios, each tracer
// standardised by its median error, that exceed 1 by spreadSigmas
// standard errors.
func (c *CatchmentRun) spread() int {
	r := c.base
	var rows [maxRows]Tracer
	m := 0
	for _, t := range r.prob.Tracers {
		rows[m] = t
		m++
	}
	if m == 0 {
		return 0
	}
	var pts [][]float64
	errs := make([][]float64, m)
	for _, s := range c.used {
		st := &r.res.Samples[s].setup
		v, ev := make([]float64, m), make([]float64, m)
		ok := st.y[0] > 0
		for i := 0; i < m && ok; i++ {
			row := -1
			for q := 1; q < st.r; q++ {
				if st.tr[q] == rows[i] {
					row = q
				}
			}
			if row < 0 || !(st.y[row] > 0) {
				ok = false
				break
			}
			v[i] = plog(st.y[row] / st.y[0])
			ev[i] = math.Hypot(st.sd[row]/st.y[row], st.sd[0]/st.y[0])
		}
		if ok {
			pts = append(pts, v)
			for i := range m {
				errs[i] = append(errs[i], ev[i])
			}
		}
	}
	if len(pts) < 2 {
		return 0
	}
	scale := make([]float64, m)
	for i := range m {
		scale[i] = interval(errs[i]).Median
		if !(scale[i] > 0) {
			scale[i] = 1e-6
		}
	}
	mean := make([]float64, m)
	for _, p := range pts {
		for i := range m {
			mean[i] += p[i] / scale[i]
		}
	}
	for i := range mean {
		mean[i] /= float64(len(pts))
	}
	cov := make([]float64, m*m)
	for _, p := range pts {
		for i := range m {
			for j := range m {
				cov[i*m+j] += (p[i]/scale[i] - mean[i]) * (p[j]/scale[j] - mean[j])
			}
		}
	}
	for i := range cov {
		cov[i] /= float64(len(pts) - 1)
	}
	n := 0
	// Along a direction of pure error the variance is near 1, give or take
	// sqrt(2/(S−1)) for S samples (common practice for a sample variance):
	// a direction counts when its variance exceeds 1 by spreadSigmas of
	// that.
	limit := 1 + spreadSigmas*sqrt(2/float64(len(pts)-1))
	for _, l := range jacobiEigen(m, cov) {
		if l > limit {
			n++
		}
	}
	return n
}

// jacobiEigen returns the eigenvalues of the symmetric n×n matrix a (which
// it overwrites) by cyclic Jacobi rotations (common practice; Golub & Van
// Loan 2013, §8.5, from memory).
func jacobiEigen(n int, a []float64) []float64 {
	for sweep := 0; sweep < 60; sweep++ {
		off := 0.0
		for i := range n {
			for j := i + 1; j < n; j++ {
				off += a[i*n+j] * a[i*n+j]
			}
		}
		if off < 1e-22 {
			break
		}
		for p := range n {
			for q := p + 1; q < n; q++ {
				apq := a[p*n+q]
				if apq == 0 {
					continue
				}
				theta := (a[q*n+q] - a[p*n+p]) / (2 * apq)
				t := 1 / (math.Abs(theta) + sqrt(theta*theta+1))
				if theta < 0 {
					t = -t
				}
				cs := 1 / sqrt(t*t+1)
				sn := t * cs
				for k := range n {
					akp, akq := a[k*n+p], a[k*n+q]
					a[k*n+p], a[k*n+q] = cs*akp-sn*akq, sn*akp+cs*akq
				}
				for k := range n {
					apk, aqk := a[p*n+k], a[q*n+k]
					a[p*n+k], a[q*n+k] = cs*apk-sn*aqk, sn*apk+cs*aqk
				}
			}
		}
	}
	out := make([]float64, n)
	for i := range n {
		out[i] = a[i*n+i]
	}
	return out
}

// sameLayout reports whether the designs of a and b (design) have the same
// rows and end-members, so that one serves for both.
func sameLayout(a, b *setup) bool {
	return a.r == b.r && a.iso == b.iso && a.tr == b.tr && slices.Equal(a.act, b.act)
}
