package mix

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"lixiv/engine/chem"
)

// Water is one water sample as the inverse model sees it.
type Water struct {
	Name     string
	Conc     chem.Composition // µmol/L (Alk µeq/L), NaN where not measured
	Sr87Sr86 float64          // 87Sr/86Sr; NaN when not measured
}

// Problem is what the inverse model is asked: which end-members mix, which
// tracers constrain them, and the waters to apportion. The waters may be
// raw river chemistry, with rain among the end-members, or chemistry already
// corrected for atmospheric (and evaporite) input, without them; see
// DefaultEndMembers.
type Problem struct {
	EndMembers []EndMember
	Tracers    []Tracer
	Waters     []Water
}

// Scoring chooses how draws are judged against the data.
type Scoring int

// The scorings (docs/methods.md §7.3 step 4).
const (
	// Accept keeps a draw when its chi-square misfit is within the 95 %
	// quantile of the chi-square distribution with nu = tracers + 1 -
	// end-members degrees of freedom (nu taken as 1 when it is 0 or less,
	// so an exactly determined sample must lie within about two standard
	// errors of the end-member simplex).
	Accept Scoring = iota
	// Weight keeps every draw with weight exp(-chi2/2) (importance
	// weighting of prior draws).
	Weight
)

// Options tune an inversion. The zero value means the documented defaults.
type Options struct {
	Draws       int                    // number of Monte Carlo draws; 0 means 10,000 (docs/methods.md §7.3)
	Seed        uint64                 // seed of the PCG generator; stored with the budget
	Scoring     Scoring                // Accept (default) or Weight
	RelErr      [chem.NSpecies]float64 // analytical 1σ relative error by species; 0 means 0.03 (docs/methods.md §8.6, common practice)
	FloorErr    float64                // smallest 1σ of a concentration, µmol/L; 0 means 0.01 (assumption)
	IsoErr      float64                // analytical 1σ of 87Sr/86Sr; 0 means 2e-5 (docs/methods.md §8.6, common practice)
	MinAccepted int                    // fewer kept draws than this give FewAccepted; 0 means min(100, Draws/10)
	Perturb     bool                   // also draw the measured ratios from their analytical errors, per sample and draw (docs/methods.md §7.3 step 1)
	Workers     int                    // goroutines for Invert; 0 means GOMAXPROCS
	Progress    func(done, total int)  // called with sample-draws done so far; never concurrently
	// Vary, when set, gives the concentrations of water s under draw d
	// (the water's Conc redone with that draw's rain correction, say):
	// each draw is then fitted to its own data, and the amounts of each
	// source follow that draw's concentrations. It returns false to drop
	// the draw. It is called for different samples at once and must give
	// the same numbers for the same s and d on every call. nil means Conc
	// for every draw.
	Vary func(s, d int) (chem.Composition, bool)
}

func (o *Options) withDefaults() Options {
	var d Options
	if o != nil {
		d = *o
	}
	if d.Draws <= 0 {
		d.Draws = 10000
	}
	for i, v := range d.RelErr {
		if v <= 0 {
			d.RelErr[i] = 0.03
		}
	}
	if d.FloorErr <= 0 {
		d.FloorErr = 0.01
	}
	if d.IsoErr <= 0 {
		d.IsoErr = 2e-5
	}
	if d.MinAccepted <= 0 {
		d.MinAccepted = min(100, max(1, d.Draws/10))
	}
	return d
}

// chi2q95 holds the 95 % quantiles of the chi-square distribution for 1 to
// 8 degrees of freedom (standard table values, checked against gonum's
// distuv.ChiSquared in the tests). Fixed constants keep acceptance
// bit-identical across targets.
var chi2q95 = [...]float64{0, 3.841458820694124, 5.991464547107979, 7.814727903251178,
	9.487729036781154, 11.070497693516351, 12.591587243743977, 14.067140449340169, 15.507313055865453}

// rowSpec is one ratio row for the kernels: its offset in a draw's block of
// the (reduced) table, its weight and its measured ratio.
type rowSpec struct {
	off  int
	w, d float64
}

// prep is what one water contributes to the per-draw solve.
type prep struct {
	skip     bool
	na       float64
	m        int               // rows in use
	par      [NTracers]int     // tracer of each row
	w        [NTracers]float64 // weight 1/σ² of each row
	d        [NTracers]float64 // measured ratio (0 for the isotope row)
	iso      int               // row of 87Sr/86Sr (always the last), or -1
	riso     float64           // measured 87Sr/86Sr
	meas     [NCations]float64 // measured cations, NaN if missing
	thresh   float64           // chi-square acceptance threshold
	c        float64           // sum of w d² over the rows, the misfit of a = 0
	rows     []rowSpec         // the ratio rows (not the isotope row), for the kernels
	warnings []error
}

func (p *Problem) validate() error {
	n := len(p.EndMembers)
	if n < 1 || n > MaxEndMembers {
		return fmt.Errorf("mix: %d end-members; want 1 to %d", n, MaxEndMembers)
	}
	for i := range p.EndMembers {
		if err := p.EndMembers[i].Validate(); err != nil {
			return err
		}
	}
	if len(p.Tracers) == 0 {
		return fmt.Errorf("mix: no tracers chosen")
	}
	var seen [NTracers]bool
	for _, t := range p.Tracers {
		if t < 0 || t >= NTracers {
			return fmt.Errorf("mix: unknown tracer %d", int(t))
		}
		if seen[t] {
			return fmt.Errorf("mix: tracer %s chosen twice", t)
		}
		seen[t] = true
	}
	if seen[Sr87Sr86] {
		for i := range p.EndMembers {
			e := &p.EndMembers[i]
			if e.Ratio[Sr87Sr86].Value <= 0 {
				return fmt.Errorf("mix: end-member %q has no 87Sr/86Sr, needed by the tracer", e.Name)
			}
		}
	}
	return nil
}

// measured returns the measured value of the numerator of tracer t.
func measured(c *chem.Composition, t Tracer) float64 {
	if t == HCO3Na && !c.Has(chem.HCO3) {
		return c[chem.Alk]
	}
	return c[t.Species()]
}

// fill sets the data rows of pr from the concentrations c: the measured
// cations, Na, and for each tracer its measured ratio to Na and weight,
// ratio rows first and the isotope row (if any) last, which the fast
// kernels rely on. rows is reused for pr.rows. It returns false when Na is
// missing or not positive; missing lists the tracers left out (bit t for
// tracer t).
func (p *Problem) fill(pr *prep, c *chem.Composition, sr87 float64, o *Options, rows []rowSpec) (ok bool, missing uint32) {
	*pr = prep{iso: -1, rows: rows[:0]}
	for i, sp := range Cations {
		pr.meas[i] = c[sp]
	}
	na := c[chem.Na]
	if math.IsNaN(na) || na <= 0 {
		return false, 0
	}
	pr.na = na
	sNa := math.Max(o.RelErr[chem.Na]*na, o.FloorErr)
	iso := false
	for _, t := range p.Tracers {
		if t == Sr87Sr86 {
			iso = true
			continue
		}
		x := measured(c, t)
		if math.IsNaN(x) || x < 0 {
			missing |= 1 << t
			continue
		}
		sp := t.Species()
		if t == HCO3Na && !c.Has(chem.HCO3) {
			sp = chem.Alk
		}
		sx := math.Max(o.RelErr[sp]*x, o.FloorErr)
		rho := x / na
		s := math.Sqrt((sx/na)*(sx/na) + (rho*sNa/na)*(rho*sNa/na))
		pr.par[pr.m], pr.w[pr.m], pr.d[pr.m] = int(t), 1/(s*s), rho
		pr.m++
	}
	if iso {
		x := c[chem.Sr]
		if math.IsNaN(sr87) || math.IsNaN(x) || x <= 0 {
			missing |= 1 << Sr87Sr86
		} else {
			// Row sum_j a_j (Sr/Na)_j (R_j - R) = 0; its 1σ is (Sr/Na) σ_R.
			s := x / na * o.IsoErr
			pr.iso = pr.m
			pr.riso = sr87
			pr.par[pr.m], pr.w[pr.m], pr.d[pr.m] = int(Sr87Sr86), 1/(s*s), 0
			pr.m++
		}
	}
	n := len(p.EndMembers)
	for k := 0; k < pr.m; k++ {
		pr.c += pr.w[k] * pr.d[k] * pr.d[k]
		if k != pr.iso {
			pr.rows = append(pr.rows, rowSpec{off: pr.par[k] * n, w: pr.w[k], d: pr.d[k]})
		}
	}
	return true, missing
}

// prepare sets up the rows of one water and its warnings.
func (p *Problem) prepare(w *Water, o *Options) prep {
	var pr prep
	ok, missing := p.fill(&pr, &w.Conc, w.Sr87Sr86, o, nil)
	if !ok {
		pr.skip = true
		pr.warnings = append(pr.warnings, fmt.Errorf("%w: sample %q has no Na > 0", ErrSkipped, w.Name))
		return pr
	}
	for _, t := range p.Tracers {
		if t != Sr87Sr86 && missing&(1<<t) != 0 {
			pr.warnings = append(pr.warnings, fmt.Errorf("%w: %s of sample %q is missing or negative; left out", ErrMissingTracer, t, w.Name))
		}
	}
	if missing&(1<<Sr87Sr86) != 0 {
		pr.warnings = append(pr.warnings, fmt.Errorf("%w: %s of sample %q needs Sr and 87Sr/86Sr; left out", ErrMissingTracer, Sr87Sr86, w.Name))
	}
	n := len(p.EndMembers)
	if pr.m == 0 {
		pr.skip = true
		pr.warnings = append(pr.warnings, fmt.Errorf("%w: sample %q has none of the chosen tracers", ErrSkipped, w.Name))
		return pr
	}
	nu := pr.m + 1 - n
	pr.thresh = chi2q95[max(1, min(nu, len(chi2q95)-1))]
	rank, cond := p.identifiable(&pr)
	if pr.m < n-1 || rank < n {
		pr.warnings = append(pr.warnings, fmt.Errorf("%w: sample %q has %d independent of %d equations for %d end-members; results follow the priors",
			ErrUnderdetermined, w.Name, rank, pr.m+1, n))
	} else if cond > 1e3 {
		pr.warnings = append(pr.warnings, fmt.Errorf("%w: sample %q, condition number %.3g > 1e3 (docs/methods.md §7.4)", ErrIllConditioned, w.Name, cond))
	}
	return pr
}

// identifiable returns the rank and condition number of the mixing matrix
// [E; 1] at the central end-member values, each row scaled to unit maximum
// (docs/methods.md §7.4).
func (p *Problem) identifiable(pr *prep) (rank int, cond float64) {
	n := len(p.EndMembers)
	a := mat.NewDense(pr.m+1, n, nil)
	for k := 0; k < pr.m; k++ {
		big := 0.0
		for j := range p.EndMembers {
			e := &p.EndMembers[j]
			v := e.Ratio[pr.par[k]].Value
			if k == pr.iso {
				v = e.Ratio[SrNa].Value * (v - pr.riso)
			}
			a.Set(k, j, v)
			big = math.Max(big, math.Abs(v))
		}
		if big > 0 {
			for j := 0; j < n; j++ {
				a.Set(k, j, a.At(k, j)/big)
			}
		}
	}
	for j := 0; j < n; j++ {
		a.Set(pr.m, j, 1)
	}
	var svd mat.SVD
	if !svd.Factorize(a, mat.SVDNone) {
		return 0, math.Inf(1)
	}
	s := svd.Values(nil)
	for _, v := range s {
		if v > 1e-10*s[0] {
			rank++
		}
	}
	if rank < n {
		return rank, math.Inf(1)
	}
	return rank, s[0] / s[n-1]
}
