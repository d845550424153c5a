package qc

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"lixiv/engine/chem"
	"lixiv/engine/sample"
)

// Warnings a Report carries. They do not stop the pipeline; test for them
// with errors.Is.
var (
	ErrImbalance    = errors.New("charge imbalance beyond the accepted limit")
	ErrRejected     = errors.New("charge imbalance beyond the reject limit")
	ErrNoBalance    = errors.New("no ions to balance")
	ErrMissingMajor = errors.New("missing major ion(s)")
	ErrCensored     = errors.New("values below detection")
	ErrOutlier      = errors.New("unusual ratio to chloride")
)

// Status is the outcome of the charge-balance check.
type Status int

// Charge-balance outcomes.
const (
	Unknown    Status = iota // no cations or no anions to balance
	Accepted                 // |imbalance| within Thresholds.OK
	Flagged                  // between Thresholds.OK and Thresholds.Reject
	Rejected                 // beyond Thresholds.Reject
	Incomplete               // a major ion is missing: no imbalance is computed
)

// String names the status.
func (s Status) String() string {
	switch s {
	case Accepted:
		return "ok"
	case Flagged:
		return "flag"
	case Rejected:
		return "reject"
	case Incomplete:
		return "incomplete"
	}
	return "unknown"
}

// Measure says which imbalance the thresholds apply to.
type Measure int

// Imbalance definitions (docs/methods.md §3.1). CBE is about half of NICB.
const (
	NICB Measure = iota // (TZ+ − TZ−)/TZ+ × 100, the default
	CBE                 // (TZ+ − TZ−)/(TZ+ + TZ−) × 100
)

// String names the measure.
func (m Measure) String() string {
	if m == CBE {
		return "CBE"
	}
	return "NICB"
}

// Thresholds are limits on the absolute imbalance, in percent.
type Thresholds struct {
	OK     float64 // at or below: accepted
	Reject float64 // above: rejected; between OK and Reject: flagged
}

// DefaultThresholds accept |NICB| ≤ 5 %, flag 5-10 % and reject above 10 %
// (common practice, no source; docs/methods.md §3.1).
var DefaultThresholds = Thresholds{OK: 5, Reject: 10}

// Classify returns the status of an imbalance x (percent). NaN is Unknown.
func (t Thresholds) Classify(x float64) Status {
	switch a := math.Abs(x); {
	case math.IsNaN(x):
		return Unknown
	case a <= t.OK:
		return Accepted
	case a <= t.Reject:
		return Flagged
	}
	return Rejected
}

// Options control Check. The zero value means the documented defaults.
type Options struct {
	// Thresholds on the imbalance; the zero value means DefaultThresholds.
	Thresholds Thresholds
	// Measure is the imbalance the thresholds apply to: NICB (default) or CBE.
	Measure Measure
	// DiluteBelow and Dilute give other thresholds for dilute waters, whose
	// TZ+ (µeq/L) is below DiluteBelow: such waters often tolerate ±10 %
	// (common practice, no source; docs/methods.md §3.1). Off when DiluteBelow
	// is 0 or Dilute is the zero value.
	DiluteBelow float64
	Dilute      Thresholds
	// OutlierZ is the robust z-score beyond which a ratio to chloride is
	// flagged; 0 means 3.5 (Iglewicz & Hoaglin 1993, modified z-score;
	// from memory).
	OutlierZ float64
	// MinSamples is the fewest samples with a ratio for the outlier test to
	// run; 0 means 5.
	MinSamples int
	// Ratios lists the species whose ratio to chloride is tested; nil means
	// Na, K, Ca, Mg, Sr, SO4, NO3, Alk, SiO2.
	Ratios []chem.Species
}

// Majors are the ions a charge balance needs (docs/methods.md §3.1: TZ+ = Na + K
// + 2Ca + 2Mg, TZ− = Cl + 2SO4 + NO3 + Alk; NO3 is left out, as it is often
// not measured and rarely carries much charge; common practice). With one
// of them missing the sums would compare part of the water with the whole
// and the imbalance could be anything (a blank Na turns a balanced water
// into NICB −100 % or so), so Check gives no NICB or CBE and the status
// Incomplete. Alkalinity counts as present when Alk or HCO3 is; a value
// below detection counts as present.
var Majors = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.Alk}

var defaultRatios = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Sr, chem.SO4, chem.NO3, chem.Alk, chem.SiO2}

// Outlier is a ratio to chloride far from the table's typical value.
type Outlier struct {
	Species chem.Species
	Ratio   float64 // X/Cl, mol/mol (eq/mol for Alk)
	Median  float64 // the table's median X/Cl
	Z       float64 // robust z-score of ln(X/Cl)
}

// Report is the quality control of one sample.
type Report struct {
	Index    int    // position in the samples given to Check
	ID       string // sample ID
	Line     int    // line in the source file
	Balance  Balance
	Status   Status         // charge-balance outcome under Options.Measure
	Missing  []chem.Species // major ions not measured
	Censored int            // number of values below detection
	Outliers []Outlier
	Warnings []error // one per finding, wrapping the Err* sentinels
}

// Check runs the per-sample checks on samples: charge balance with
// thresholds, missing major ions, censored values, and outlying ratios to
// chloride against the median and MAD of all the samples. It never drops a
// sample: every sample gets a Report, in the same order.
func Check(samples []*sample.Sample, opt Options) []Report {
	th := opt.Thresholds
	if th == (Thresholds{}) {
		th = DefaultThresholds
	}
	out := make([]Report, len(samples))
	for i, s := range samples {
		r := &out[i]
		r.Index, r.ID, r.Line = i, s.ID, s.Line
		r.Balance = ChargeBalance(s.C, s.PH, s.Temp)
		r.Missing = missingMajors(s)
		if len(r.Missing) > 0 {
			r.Balance.NICB, r.Balance.CBE = math.NaN(), math.NaN()
		}
		x := r.Balance.NICB
		if opt.Measure == CBE {
			x = r.Balance.CBE
		}
		lim := th
		if opt.DiluteBelow > 0 && opt.Dilute != (Thresholds{}) && r.Balance.TZPlus < opt.DiluteBelow {
			lim = opt.Dilute
		}
		r.Status = lim.Classify(x)
		switch {
		case r.Balance.TZPlus == 0 || r.Balance.TZMinus == 0:
			r.Status = Unknown
		case len(r.Missing) > 0:
			r.Status = Incomplete
		}
		switch r.Status {
		case Unknown:
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: need at least one cation and one anion", ErrNoBalance))
		case Flagged:
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s %+.1f %% (accepted within ±%g %%)", ErrImbalance, opt.Measure, x, lim.OK))
		case Rejected:
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s %+.1f %% (rejected beyond ±%g %%)", ErrRejected, opt.Measure, x, lim.Reject))
		}
		if len(r.Missing) > 0 {
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %s (no NICB without them)", ErrMissingMajor, MissingList(r.Missing)))
		}
		if r.Censored = s.NCensored(); r.Censored > 0 {
			r.Warnings = append(r.Warnings, fmt.Errorf("%w: %d (substituted values enter the balance)", ErrCensored, r.Censored))
		}
	}
	outliers(samples, out, opt)
	return out
}

// missingMajors lists the Majors that sample s lacks.
func missingMajors(s *sample.Sample) []chem.Species {
	var out []chem.Species
	for _, m := range Majors {
		if s.C.Has(m) || m == chem.Alk && s.C.Has(chem.HCO3) || s.IsCensored(m) {
			continue
		}
		out = append(out, m)
	}
	return out
}

// MissingList names missing ions for a message or a flag column, such as
// "Na, alkalinity".
func MissingList(sp []chem.Species) string {
	names := make([]string, len(sp))
	for i, s := range sp {
		names[i] = s.Symbol()
		if s == chem.Alk {
			names[i] = "alkalinity"
		}
	}
	return strings.Join(names, ", ")
}

// Flag is the short note for a sample table's flag column: "missing major
// ion(s): Na" for an Incomplete sample, "" otherwise.
func (r Report) Flag() string {
	if r.Status != Incomplete {
		return ""
	}
	return ErrMissingMajor.Error() + ": " + MissingList(r.Missing)
}

// usable reports whether species sp of s is a measured, positive value.
func usable(s *sample.Sample, sp chem.Species) bool {
	return s.C.Has(sp) && s.C[sp] > 0 && !s.IsCensored(sp)
}

// outliers flags ratios to chloride whose robust z-score of the logarithm,
// 0.6745 (x − median)/MAD, exceeds the limit (Iglewicz & Hoaglin 1993,
// from memory).
func outliers(samples []*sample.Sample, out []Report, opt Options) {
	zmax := opt.OutlierZ
	if zmax <= 0 {
		zmax = 3.5
	}
	minN := opt.MinSamples
	if minN <= 0 {
		minN = 5
	}
	ratios := opt.Ratios
	if ratios == nil {
		ratios = defaultRatios
	}
	logs := make([]float64, 0, len(samples))
	for _, sp := range ratios {
		if sp == chem.Cl {
			continue
		}
		logs = logs[:0]
		for _, s := range samples {
			if usable(s, sp) && usable(s, chem.Cl) {
				logs = append(logs, math.Log(s.C[sp]/s.C[chem.Cl]))
			}
		}
		if len(logs) < minN {
			continue
		}
		med, mad := medianMAD(logs)
		if !(mad > 0) {
			continue
		}
		for i, s := range samples {
			if !usable(s, sp) || !usable(s, chem.Cl) {
				continue
			}
			r := s.C[sp] / s.C[chem.Cl]
			z := 0.6745 * (math.Log(r) - med) / mad
			if math.Abs(z) > zmax {
				o := Outlier{Species: sp, Ratio: r, Median: math.Exp(med), Z: z}
				out[i].Outliers = append(out[i].Outliers, o)
				out[i].Warnings = append(out[i].Warnings, fmt.Errorf("%w: %s/Cl = %.4g against a median of %.4g (robust z %+.1f)", ErrOutlier, sp, r, o.Median, z))
			}
		}
	}
}

// medianMAD returns the median of x and the median absolute deviation from
// it. x is reordered.
func medianMAD(x []float64) (med, mad float64) {
	sort.Float64s(x)
	med = median(x)
	dev := make([]float64, len(x))
	for i, v := range x {
		dev[i] = math.Abs(v - med)
	}
	sort.Float64s(dev)
	return med, median(dev)
}

func median(sorted []float64) float64 {
	n := len(sorted)
	if n%2 == 1 {
		return sorted[n/2]
	}
	return (sorted[n/2-1] + sorted[n/2]) / 2
}
