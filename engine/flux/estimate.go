package flux

import (
	"errors"
	"fmt"
	"math"

	"lixiv/engine/discharge"
	"lixiv/engine/internal/enum"
	"lixiv/engine/internal/quantile"
)

// Method is a flux estimator.
type Method int

// The estimators (docs/methods.md §8). The zero value is FlowWeighted.
const (
	// FlowWeighted multiplies each year's discharge-weighted mean
	// concentration Σ C_i Q_i / Σ Q_i (samples of that year) by the year's
	// discharge (Walling & Webb 1985, "method 5", from memory).
	FlowWeighted Method = iota
	// PeriodWeighted interpolates concentration in time between samples,
	// holds it at the ends of the record, and multiplies by daily
	// discharge (common practice). The interpolation is flow-adjusted: the
	// samples' flow-normalised concentrations C_i Q_i^−b are interpolated
	// and multiplied by Q_d^b, with b the fitted slope of ln C on ln Q, so
	// that unsampled floods dilute (or concentrate) as the samples do; with
	// b = 0 it is plain linear interpolation. Plain interpolation of a
	// diluting solute overestimates the load of flashy catchments by 15 %
	// and more (docs/validation.md).
	PeriodWeighted
	// Rating fits ln C = a + b ln Q (optionally with sin and cos of the
	// season) by least squares over all samples, applies it to every day
	// and corrects the retransformation bias (Options.Bias).
	Rating
	// Beale is the bias-corrected ratio estimator applied to each year's
	// samples (Beale 1962, from memory; described by Tin 1965; used for
	// river loads by Dolan, Yui & Geist 1981; docs/methods.md §8.4).
	Beale
	NMethods // number of methods; not a method
)

var methodNames = [NMethods]string{"discharge-weighted", "flow-adjusted interpolation", "rating curve", "Beale ratio"}

// String names the method.
func (m Method) String() string { return enum.Name(m, methodNames[:], "?") }

// Options control Estimate and Bootstrap. The zero value is the
// flow-weighted estimator over calendar years with no area (yields NaN).
type Options struct {
	Method     Method
	AreaKm2    float64 // catchment area above the gauge; 0 leaves yields and runoff NaN
	FirstMonth int     // month reporting years start on, 1-12 (10 for 1 Oct - 30 Sep); 0 means January
	Seasonal   bool    // rating curve: add sin(2πt) and cos(2πt) terms (Cohn et al. 1992, from memory)
	Bias       Bias    // rating curve: retransformation bias correction; zero value Duan
}

// Load is a solute flux over a period, with its conversions. For a complete
// reporting year the per-period figures are per year.
type Load struct {
	Mol          float64 // mol
	Tonnes       float64 // t (mol × M × 1e-6)
	MolPerKm2    float64 // mol/km²
	TonnesPerKm2 float64 // t/km²
	RunoffMM     float64 // runoff over the same days, mm
}

// NewLoad converts a load in mol and the summed daily discharge of its days
// (m³/s × days) to a Load over area (km²) with molar mass (g/mol).
func NewLoad(mol, sumQDays, areaKm2, molarMass float64) Load {
	l := Load{Mol: mol, Tonnes: mol * molarMass * 1e-6}
	if molarMass == 0 {
		l.Tonnes = math.NaN()
	}
	if areaKm2 > 0 {
		l.MolPerKm2 = mol / areaKm2
		l.TonnesPerKm2 = l.Tonnes / areaKm2
		l.RunoffMM = discharge.RunoffMM(sumQDays, areaKm2)
	} else {
		l.MolPerKm2, l.TonnesPerKm2, l.RunoffMM = math.NaN(), math.NaN(), math.NaN()
	}
	return l
}

// YearLoad is the load of one reporting year.
type YearLoad struct {
	discharge.Year
	Load
	Samples int // samples taken in the year
}

// Result is the outcome of Estimate for one series.
type Result struct {
	Series string
	Method Method
	Years  []YearLoad // every year the record touches; see Year.Complete
	// Mean is the mean annual load over complete years (mol/yr, t/yr,
	// mol/km²/yr, t/km²/yr, mm/yr). With no complete year it is the load
	// over all days with discharge scaled to 365.25 days, and Warnings say so.
	Mean      Load
	MeanYears int // complete years in the mean
	// YearSD is the interannual standard deviation of the complete years'
	// loads (mol/yr; NaN with fewer than two complete years).
	YearSD float64
	Rating *RatingFit // the fitted curve (Rating method only)
	// Slope is the slope b of ln C on ln Q that the flow-adjusted
	// interpolation used (PeriodWeighted only; 0 when it could not be
	// fitted, which is plain interpolation).
	Slope float64
	// HeldFlow is the share of discharge on days before the first or after
	// the last sample, where PeriodWeighted holds the end values.
	HeldFlow float64
	// OutsideFlow is the share of discharge on days whose Q lies outside the
	// range of sampled Q, where the rating curve extrapolates.
	OutsideFlow float64
	// TopSampled is the place on the flow-duration curve of the highest
	// sampled discharge: the share of days with at least that flow. A large
	// value means the floods went unsampled (docs/methods.md §12).
	TopSampled float64
	Samples    int     // samples used
	Warnings   []error // samples left out, incomplete years, years without samples
}

// ErrNoYear is reported when no reporting year of the record is complete.
var ErrNoYear = errors.New("no complete year in the discharge record")

// Estimate computes annual loads of series s against the daily record rec.
// Samples outside the record, on gap days without a discharge at sampling,
// or without a concentration are left out and listed in Result.Warnings.
// It returns an error only when no load can be computed at all.
func Estimate(rec *discharge.Record, s Series, opt Options) (*Result, error) {
	if rec == nil || rec.Len() == 0 {
		return nil, fmt.Errorf("%s: %w: the discharge record is empty", s.Name, ErrNoSamples)
	}
	years := rec.Years(opt.FirstMonth)
	smp, warns := match(rec, s, years)
	smp = withValues(smp)
	res := &Result{Series: s.Name, Method: opt.Method, Warnings: warns}
	if opt.Method == Rating {
		kept := smp[:0:0]
		for _, sm := range smp {
			if !(sm.c > 0 && sm.q > 0) {
				res.Warnings = append(res.Warnings, &SampleError{s.Name, sm.idx, s.Days[sm.idx], ErrNonPositve})
				continue
			}
			kept = append(kept, sm)
		}
		smp = kept
	}
	if len(smp) == 0 {
		return res, fmt.Errorf("%s: %w", s.Name, ErrNoSamples)
	}
	e := newEngine(rec, smp, years, opt)
	w := make([]float64, len(smp))
	c := make([]float64, len(smp))
	for i, sm := range smp {
		w[i], c[i] = 1, sm.c
	}
	out := make([]float64, len(years))
	var fit RatingFit
	if !e.loads(opt.Method, w, c, out, &fit) {
		return res, fmt.Errorf("%s: the %v estimator cannot be applied to these %d samples (too few, all at one discharge, or a fit that extrapolates beyond range)", s.Name, opt.Method, len(smp))
	}
	if opt.Method == Rating && opt.Seasonal && smp[len(smp)-1].k-smp[0].k < 365 {
		res.Warnings = append(res.Warnings, fmt.Errorf("%s: the samples span less than a year, so the seasonal terms are poorly determined", s.Name))
	}
	if opt.Method == PeriodWeighted {
		res.Slope = e.slope
	}
	if opt.Method == Rating {
		res.Rating = &fit
		if fit.Fitted < 1 {
			res.Warnings = append(res.Warnings, fmt.Errorf("%s: discharge did not vary among the samples; the exponent b was set to 0", s.Name))
		}
	}
	res.Samples = len(smp)
	counts := make([]int, len(years))
	for _, sm := range smp {
		counts[sm.year]++
	}
	res.Years, res.Mean, res.MeanYears = summarise(years, out, e.sumQ, counts, opt, s.MolarMass, &res.Warnings, s.Name)
	res.HeldFlow, res.OutsideFlow = coverage(e, smp)
	res.YearSD = yearSD(res.Years)
	top := 0.0
	for _, sm := range smp {
		top = math.Max(top, sm.q)
	}
	res.TopSampled = rec.Exceedance(top)
	return res, nil
}

// summarise turns per-year loads into YearLoads and the mean annual load.
func summarise(years []discharge.Year, mol, sumQ []float64, counts []int, opt Options, mass float64, warns *[]error, name string) ([]YearLoad, Load, int) {
	out := make([]YearLoad, len(years))
	var mSum, qSum float64
	var nComplete, days int
	var allMol, allQ float64
	for y, yr := range years {
		out[y] = YearLoad{Year: yr, Load: NewLoad(mol[y], sumQ[y], opt.AreaKm2, mass), Samples: counts[y]}
		if math.IsNaN(mol[y]) && warns != nil {
			*warns = append(*warns, fmt.Errorf("%s: year %s has no samples; the %v estimator gives no load for it", name, yr, opt.Method))
		}
		if yr.Complete() {
			mSum += mol[y]
			qSum += sumQ[y]
			nComplete++
		} else if warns != nil && yr.WithData > 0 {
			*warns = append(*warns, fmt.Errorf("%s: year %s has discharge on %d of %d days; it is left out of the mean", name, yr, yr.WithData, yr.Days))
		}
		allMol += mol[y]
		allQ += sumQ[y]
		days += yr.WithData
	}
	if nComplete > 0 {
		n := float64(nComplete)
		return out, NewLoad(mSum/n, qSum/n, opt.AreaKm2, mass), nComplete
	}
	if warns != nil {
		*warns = append(*warns, fmt.Errorf("%s: %w; the mean annual load is scaled from %d days to 365.25", name, ErrNoYear, days))
	}
	f := 365.25 / float64(days)
	return out, NewLoad(allMol*f, allQ*f, opt.AreaKm2, mass), 0
}

func yearSD(ys []YearLoad) float64 {
	var v []float64
	for _, y := range ys {
		if y.Complete() {
			v = append(v, y.Mol)
		}
	}
	return quantile.StdDev(v)
}

// coverage returns the share of discharge before the first and after the
// last sample day, and on days with Q outside the sampled range.
func coverage(e *engine, smp []sample) (held, outside float64) {
	first, last := smp[0].k, smp[len(smp)-1].k
	qmin, qmax := math.Inf(1), math.Inf(-1)
	for _, s := range smp {
		qmin, qmax = math.Min(qmin, s.q), math.Max(qmax, s.q)
	}
	var tot float64
	for k, q := range e.q {
		if math.IsNaN(q) {
			continue
		}
		tot += q
		if k < first || k > last {
			held += q
		}
		if q < qmin || q > qmax {
			outside += q
		}
	}
	if tot == 0 {
		return 0, 0
	}
	return held / tot, outside / tot
}
