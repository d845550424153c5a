package mix

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
)

// Water is one water sample as the inverse model sees it.
type Water struct {
	Name string
	// Conc holds the concentrations the model fits, µmol/L (Alk µeq/L),
	// NaN where not measured: raw river chemistry when rain is among the
	// end-members, or chemistry corrected elsewhere. It is not read when
	// Correction is set.
	Conc chem.Composition
	// Sr87Sr86 is the water's measured 87Sr/86Sr; NaN when not measured.
	Sr87Sr86 float64
	// Correction, when set, is the rain and evaporite correction of the
	// water's measured chemistry (correct.Apply). The model then fits the
	// corrected concentrations (before any negative policy: a residual
	// below zero is data too), propagates to them the analytical precision
	// of the measured concentrations and the spread of the correction's
	// inputs (Options.Rain), with the covariance the shared Cl brings, and
	// books what the correction removed to the atmosphere and evaporite
	// sources, draw by draw.
	Correction *correct.Result
	// Precision, when set, replaces Options.Precision for this water (for
	// example from columns of the sample table).
	Precision *correct.Precision
}

// Problem is what the inverse model is asked: which end-members mix, which
// tracers constrain them, and the waters to apportion. The waters may be
// raw river chemistry, with rain among the end-members, or chemistry
// corrected for atmospheric (and evaporite) input, without them; see
// DefaultEndMembers.
//
// An evaporite end-member takes part only where a tracer can see it: with
// the Cl/Na tracer, for a water that has a Cl value to fit. Without it, its
// ratios to Na (low Ca/Na, Mg/Na and HCO3/Na) cannot be told from a
// silicate end-member mixed with a little carbonate, and the split between
// them would be the priors' (docs/methods.md §7.9). When it takes part
// for a corrected water, the halite the correction took from Cl above Cl*
// is left in the data for it to fit.
type Problem struct {
	EndMembers []EndMember
	Tracers    []Tracer
	Waters     []Water
}

// Defaults of the analytical precision (common practice, no source:
// 2-5 % relative for major ions by ion chromatography or ICP, with a floor
// near the detection limit; docs/methods.md §7.2).
const (
	DefaultRelPrecision = 0.03  // relative 1σ of every measured concentration
	DefaultFloor        = 0.5   // µmol/L: smallest 1σ of Na, K, Ca, Mg, Cl, SO4
	DefaultAlkFloor     = 5     // µeq/L: smallest 1σ of alkalinity (and µmol/L of HCO3)
	DefaultSrFloor      = 0.001 // µmol/L: smallest 1σ of Sr
	DefaultIsoPrecision = 2e-5  // 1σ of 87Sr/86Sr
)

// DefaultPrecision returns the default analytical precision: 3 % relative
// with the floors above.
func DefaultPrecision() correct.Precision {
	p := correct.UniformPrecision(DefaultRelPrecision, DefaultFloor, DefaultSrFloor)
	p.Floor[chem.Alk], p.Floor[chem.HCO3] = DefaultAlkFloor, DefaultAlkFloor
	return p
}

// Options tune an inversion. The zero value means the documented defaults.
type Options struct {
	// Draws is the number of prior draws of the first stage, shared by all
	// samples; 0 means 400.
	Draws int
	// TargetESS is the effective sample size at which a sample's
	// refinement stops; 0 means 1000.
	TargetESS int
	// MaxDraws caps the draws of one sample over all stages; 0 means 20
	// times TargetESS (and never fewer than Draws).
	MaxDraws int
	// MaxKept caps the draws the result keeps over all samples (those
	// with a weight, about 150 bytes each), which bounds its memory; 0
	// means no cap. A run that would keep more stops at the sample that
	// passes it, and Run.Err and Invert say so.
	MaxKept int
	// Seed seeds the PCG generators; stored with the budget.
	Seed uint64
	// Precision is the analytical precision of the measured
	// concentrations; nil means DefaultPrecision().
	Precision *correct.Precision
	// IsoErr is the analytical 1σ of 87Sr/86Sr; 0 means DefaultIsoPrecision.
	IsoErr float64
	// Rain is the relative spread of the correction's inputs (X/Cl ratios
	// of rain, evapotranspiration factor) propagated for waters with a
	// Correction. ScaleCl says Cl* comes from measured rain, so that the
	// factor's spread moves it.
	Rain    correct.Uncertainty
	ScaleCl bool
	// Workers is the number of goroutines for Invert; 0 means GOMAXPROCS.
	Workers int
	// Progress is called with the work done so far and the work expected
	// (in draws), never concurrently.
	Progress func(done, total int)

	// perturb selects the other sampler of the calibration study: the
	// amounts solved by non-negative least squares for data perturbed by
	// their errors, the ratios weighted by the constrained misfit
	// (noVolume drops the Gaussian volume term ½ log det ÃᵀÃ from it).
	perturb, noVolume bool
}

func (o *Options) withDefaults() Options {
	var d Options
	if o != nil {
		d = *o
	}
	if d.Draws <= 0 {
		d.Draws = 400
	}
	if d.TargetESS <= 0 {
		d.TargetESS = 1000
	}
	if d.MaxDraws <= 0 {
		d.MaxDraws = 20 * d.TargetESS
	}
	d.MaxDraws = max(d.MaxDraws, d.Draws)
	if d.Precision == nil {
		p := DefaultPrecision()
		d.Precision = &p
	}
	if d.IsoErr <= 0 {
		d.IsoErr = DefaultIsoPrecision
	}
	return d
}

// seaSr87Sr86 is the 87Sr/86Sr of marine aerosol taken for the Sr the rain
// correction removes: seawater 0.709175 (McArthur, Howarth & Bailey 2001,
// J. Geol. 109; from memory, docs/methods.md §4.2).
const seaSr87Sr86 = 0.709175

func (p *Problem) validate(o *Options) error {
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
			if e.Ratio[Sr87Sr86].Value <= 0 || e.Ratio[SrNa].Value <= 0 {
				return fmt.Errorf("mix: end-member %q needs Sr/Na and 87Sr/86Sr for the isotope tracer", e.Name)
			}
		}
	}
	if err := o.Precision.Check(); err != nil {
		return fmt.Errorf("mix: %w", err)
	}
	if err := o.Rain.Check(); err != nil {
		return fmt.Errorf("mix: %w", err)
	}
	for _, w := range p.Waters {
		if w.Precision != nil {
			if err := w.Precision.Check(); err != nil {
				return fmt.Errorf("mix: sample %q: %w", w.Name, err)
			}
		}
	}
	return nil
}

// MaxEndMembers is the largest number of end-members the inverse model
// takes: the constrained solver enumerates the 2^n - 1 faces of the
// non-negative orthant at worst.
const MaxEndMembers = 6

// maxRows is the largest number of data rows: Na and one per tracer.
const maxRows = int(NTracers) + 1

// setup is what one water contributes to every draw: its data rows with
// their error model, whitened, and the amounts the split is made of.
type setup struct {
	skip   bool
	naFree bool  // Na* <= 0: where the fit fails, the Na-free rule answers
	act    []int // end-members taking part, in order
	k      int   // len(act)

	r      int                       // data rows: row 0 is Na, then one per tracer
	tr     [maxRows]Tracer           // tracer of each row (row 0: -1)
	iso    int                       // row of the Sr-weighted isotope datum, or -1
	y      [maxRows]float64          // the data
	sd     [maxRows]float64          // their marginal 1σ
	cov    [maxRows][maxRows]float64 // covariance of the rows (lower triangle)
	linv   [maxRows][maxRows]float64
	yt     [maxRows]float64         // whitened data L⁻¹ y
	yy     float64                  // |yt|²
	q      int                      // error sources
	m      []float64                // whitened error gradients L⁻¹ G, r × q
	x      [NCations]correct.Affine // corrected concentration of each cation (the data)
	in     [NCations]float64        // measured concentration of each cation, which the split adds up to
	has    [NCations]bool           // the cation is measured
	atm    [NCations]correct.Affine // removed by the correction, booked to the atmosphere
	evap   [NCations]correct.Affine // removed by the correction, booked to evaporite
	so4    correct.Affine           // sulfide-derived sulfate
	dims   []int                    // the run's latent dimensions that are this sample's (end-members taking part)
	halite bool                     // the correction's halite is left in the data

	warnings []error
}

// rawLinear writes uncorrected concentrations in the form of a correction
// that removes nothing, each measured species with its own error source.
func rawLinear(c *chem.Composition, prec *correct.Precision, species []chem.Species) correct.Linear {
	var l correct.Linear
	idx := map[chem.Species]int{}
	for _, s := range species {
		if sd := prec.Sigma(s, c[s]); sd > 0 {
			idx[s] = len(l.Sources)
			l.Sources = append(l.Sources, correct.ErrorSource{Species: s, Kind: correct.Measured, Sigma: sd})
		}
	}
	for s := range l.Input {
		a := correct.Affine{Value: c[s]}
		if i, ok := idx[chem.Species(s)]; ok {
			a.Grad = make([]float64, len(l.Sources))
			a.Grad[i] = l.Sources[i].Sigma
		}
		l.Input[s], l.Residual[s] = a, a
	}
	return l
}

// modelSpecies are the species a raw water's error model carries.
var modelSpecies = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.Sr, chem.Alk, chem.HCO3}

// numerator returns the species of tracer t's datum in c: alkalinity for
// HCO3/Na when HCO3 is not given.
func numerator(c *chem.Composition, t Tracer) chem.Species {
	if t == HCO3Na && !c.Has(chem.HCO3) {
		return chem.Alk
	}
	return t.Species()
}

// prepare sets up water w for the run.
func (r *Run) prepare(w *Water) setup {
	var st setup
	st.iso = -1
	o := &r.opt
	prec := o.Precision
	if w.Precision != nil {
		prec = w.Precision
	}
	var lin correct.Linear
	in := &w.Conc
	if w.Correction != nil {
		lin = w.Correction.Linearize(prec, o.Rain, o.ScaleCl)
		in = &w.Correction.Input
	} else {
		lin = rawLinear(&w.Conc, prec, modelSpecies)
	}
	// End-members taking part: an evaporite end-member only where Cl/Na
	// sees it.
	clData := !math.IsNaN(lin.Residual[chem.Cl].Value)
	for j := range r.prob.EndMembers {
		e := &r.prob.EndMembers[j]
		if e.Source == Evaporite && !(r.useTr[ClNa] && clData) {
			st.warnings = append(st.warnings, fmt.Errorf("%w: %q of sample %q: without the Cl/Na tracer its Na cannot be told from silicate Na (halite is taken from Cl above Cl* by the rain correction)",
				ErrNotSeen, e.Name, w.Name))
			continue
		}
		if e.Source == Evaporite && w.Correction != nil {
			st.halite = true
		}
		st.act = append(st.act, j)
	}
	st.k = len(st.act)
	for i, d := range r.dims {
		for _, j := range st.act {
			if d.em == j {
				st.dims = append(st.dims, i)
			}
		}
	}
	// The data: corrected values, with the halite left in them when an
	// evaporite end-member fits it.
	data := func(s chem.Species) correct.Affine {
		a := lin.Residual[s]
		if st.halite && (s == chem.Na || s == chem.Cl) && lin.Halite.Grad != nil {
			a = sumAffine(a, lin.Halite, 1)
		}
		return a
	}
	na := data(chem.Na)
	if math.IsNaN(na.Value) {
		st.skip = true
		st.warnings = append(st.warnings, fmt.Errorf("%w: sample %q has no Na", ErrSkipped, w.Name))
		return st
	}
	rows := []correct.Affine{na}
	st.tr[0] = -1
	for _, t := range r.prob.Tracers {
		if t == Sr87Sr86 {
			continue
		}
		a := data(numerator(in, t))
		if math.IsNaN(a.Value) {
			st.warnings = append(st.warnings, fmt.Errorf("%w: %s of sample %q is not measured; left out", ErrMissingTracer, t, w.Name))
			continue
		}
		st.tr[len(rows)] = t
		rows = append(rows, a)
	}
	q := len(lin.Sources)
	if r.useTr[Sr87Sr86] {
		sr, atm := lin.Input[chem.Sr], lin.Atm[chem.Sr]
		if math.IsNaN(w.Sr87Sr86) || !(sr.Value > 0) {
			st.warnings = append(st.warnings, fmt.Errorf("%w: %s of sample %q needs Sr and 87Sr/86Sr; left out", ErrMissingTracer, Sr87Sr86, w.Name))
		} else {
			// R* Sr* = R Sr − R_sea Sr_atm, with the isotope precision as
			// one more error source.
			a := sumAffine(correct.Affine{Value: 0}, sr, w.Sr87Sr86)
			if atm.Value > 0 || atm.Grad != nil {
				a = sumAffine(a, atm, -seaSr87Sr86)
			}
			a.Grad = append(append([]float64(nil), padded(a.Grad, q)...), sr.Value*o.IsoErr)
			q++
			st.iso = len(rows)
			st.tr[st.iso] = Sr87Sr86
			rows = append(rows, a)
		}
	}
	st.r, st.q = len(rows), q
	for i, a := range rows {
		st.y[i] = a.Value
	}
	// Amounts: the corrected cations (with the halite in Na where it is
	// fitted), and what the correction booked to the atmosphere and to
	// evaporite.
	for c, sp := range Cations {
		x := data(sp)
		st.x[c] = correct.Affine{Value: x.Value, Grad: padded(x.Grad, q)}
		st.in[c] = lin.Input[sp].Value
		st.has[c] = !math.IsNaN(x.Value)
		st.atm[c] = correct.Affine{Value: lin.Atm[sp].Value, Grad: padded(lin.Atm[sp].Grad, q)}
		ev := lin.Evap(sp)
		if st.halite && sp == chem.Na {
			ev = correct.Affine{}
		}
		st.evap[c] = correct.Affine{Value: ev.Value, Grad: padded(ev.Grad, q)}
	}
	st.so4 = correct.Affine{Value: lin.SO4Sulf.Value, Grad: padded(lin.SO4Sulf.Grad, q)}
	st.naFree = !(na.Value > 0)
	if st.r < st.k {
		st.warnings = append(st.warnings, fmt.Errorf("%w: sample %q has %d data (Na and %d tracers) for %d end-members; the split follows the end-member ranges",
			ErrUnderdetermined, w.Name, st.r, st.r-1, st.k))
	}
	// Covariance C = G Gᵀ of the rows, its Cholesky factor L, and the
	// whitening L⁻¹ of the data and of the error gradients.
	var cov [maxRows][maxRows]float64
	for i := 0; i < st.r; i++ {
		gi := padded(rows[i].Grad, q)
		for j := 0; j <= i; j++ {
			gj := padded(rows[j].Grad, q)
			s := 0.0
			for k := range gi {
				s += gi[k] * gj[k]
			}
			cov[i][j] = s
		}
		st.sd[i] = math.Sqrt(cov[i][i])
	}
	st.cov = cov
	var l [maxRows][maxRows]float64
	for j := 0; j < st.r; j++ {
		d := cov[j][j]
		for p := 0; p < j; p++ {
			d -= l[j][p] * l[j][p]
		}
		// A datum without error (a zero floor and a zero value) gets a
		// tiny one, so that the whitening exists.
		d = math.Max(d, 1e-18*(1+cov[j][j])+1e-30)
		l[j][j] = math.Sqrt(d)
		for i := j + 1; i < st.r; i++ {
			s := cov[i][j]
			for p := 0; p < j; p++ {
				s -= l[i][p] * l[j][p]
			}
			l[i][j] = s / l[j][j]
		}
	}
	for c := 0; c < st.r; c++ { // column c of L⁻¹
		for i := c; i < st.r; i++ {
			s := 0.0
			if i == c {
				s = 1
			}
			for p := c; p < i; p++ {
				s -= l[i][p] * st.linv[p][c]
			}
			st.linv[i][c] = s / l[i][i]
		}
	}
	st.m = make([]float64, st.r*q)
	for i := 0; i < st.r; i++ {
		yt := 0.0
		for p := 0; p <= i; p++ {
			yt += st.linv[i][p] * st.y[p]
			gp := padded(rows[p].Grad, q)
			for k := 0; k < q; k++ {
				st.m[i*q+k] += st.linv[i][p] * gp[k]
			}
		}
		st.yt[i] = yt
		st.yy += yt * yt
	}
	return st
}

// padded returns g with zeros up to length q (nil g gives zeros).
func padded(g []float64, q int) []float64 {
	if len(g) >= q {
		return g[:q]
	}
	out := make([]float64, q)
	copy(out, g)
	return out
}

// sumAffine returns a + f b.
func sumAffine(a, b correct.Affine, f float64) correct.Affine {
	n := max(len(a.Grad), len(b.Grad))
	out := correct.Affine{Value: a.Value + f*b.Value}
	if n > 0 {
		out.Grad = make([]float64, n)
		copy(out.Grad, a.Grad)
		for i, g := range b.Grad {
			out.Grad[i] += f * g
		}
	}
	return out
}
