package flux

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/internal/quantile"
)

// Series is a concentration series to be fluxed: one value per water sample,
// in µmol/L (or µeq/L for alkalinity), for a raw species or a
// source-apportioned quantity such as silicate Na or silicate CO2
// consumption.
type Series struct {
	Name      string          // for tables and messages, such as "Ca" or "Na sil"
	MolarMass float64         // g/mol used for tonnes; 0 leaves tonnes NaN. Use 12.011 (C) for t C.
	Days      []discharge.Day // sample days
	C         []float64       // concentration, µmol/L; NaN for a sample without a value (the median of its draws, if it has draws)
	Q         []float64       // discharge at sampling, m³/s; nil or NaN means the daily record's value

	// Draws optionally holds Monte Carlo draws of the concentration for each
	// sample, as from the inverse mixing model: Draws[i][d] is draw d of
	// sample i. Bootstrap takes each sample's draw from its own weighted
	// posterior (PerSampleDraw); for JointDraw, draw d of every sample must
	// stand for the same shared end-member values.
	Draws [][]float64
	// Weights optionally weight the draws: Weights[i][d] >= 0, 0 for a draw
	// the model rejected (never taken, whatever it holds). Nil means equal.
	Weights [][]float64
}

// ForSpecies returns a series for species sp with its molar mass from chem.
func ForSpecies(sp chem.Species, days []discharge.Day, c []float64) Series {
	return Series{Name: sp.Symbol(), MolarMass: sp.MolarMass(), Days: days, C: c}
}

// ErrOutsideRecord marks a sample whose date lies outside the discharge
// record; ErrNoDischarge one whose day is a gap with no discharge at sampling.
var (
	ErrNoSamples  = errors.New("no usable samples")
	ErrNoConc     = errors.New("no concentration")
	ErrNonPositve = errors.New("rating curve needs positive concentration and discharge")
)

// SampleError is a problem with one sample of a series. It wraps
// discharge.ErrOutside, discharge.ErrGap, ErrNoConc or ErrNonPositve.
type SampleError struct {
	Series string
	Index  int // position of the sample in the series, from 0
	Day    discharge.Day
	Err    error
}

// Error names the series, sample and day.
func (e *SampleError) Error() string {
	return fmt.Sprintf("%s: sample %d (%s): %v; left out", e.Series, e.Index+1, e.Day, e.Err)
}

// Unwrap returns the underlying error.
func (e *SampleError) Unwrap() error { return e.Err }

// sample is a water sample matched to the discharge record.
type sample struct {
	idx  int     // index in the Series
	k    int     // day index in the record
	year int     // index of its reporting year
	c    float64 // µmol/L
	q    float64 // m³/s at sampling
	t    float64 // decimal year
}

// match pairs every sample with its day's discharge and reporting year.
// A sample without a concentration is kept with c NaN (and a warning), so
// that series with the same samples resample them alike in Bootstrap;
// the estimators skip it.
func match(rec *discharge.Record, s Series, years []discharge.Year) ([]sample, []error) {
	var out []sample
	var warns []error
	for i, d := range s.Days {
		bad := func(err error) { warns = append(warns, &SampleError{s.Name, i, d, err}) }
		c := math.NaN()
		if i < len(s.C) {
			c = s.C[i]
		}
		if math.IsNaN(c) && i < len(s.Draws) && len(s.Draws[i]) > 0 {
			c = median(s.Draws[i])
		}
		missing := math.IsNaN(c)
		k := rec.Index(d)
		if k < 0 {
			if rec.Len() == 0 {
				bad(discharge.ErrOutside)
			} else {
				bad(fmt.Errorf("%w (%s to %s)", discharge.ErrOutside, rec.First(), rec.Last()))
			}
			continue
		}
		q := math.NaN()
		if i < len(s.Q) {
			q = s.Q[i]
		}
		if math.IsNaN(q) {
			if q = rec.Q[k]; math.IsNaN(q) {
				bad(discharge.ErrGap)
				continue
			}
		}
		y := -1
		for j, yr := range years {
			if d >= yr.Start && d <= yr.End {
				y = j
				break
			}
		}
		if missing {
			bad(ErrNoConc)
		}
		out = append(out, sample{idx: i, k: k, year: y, c: c, q: q, t: d.YearFraction()})
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].k < out[b].k })
	return out, warns
}

// withValues returns the matched samples that have a concentration.
func withValues(smp []sample) []sample {
	out := smp[:0:0]
	for _, sm := range smp {
		if !math.IsNaN(sm.c) {
			out = append(out, sm)
		}
	}
	return out
}

// median returns the median of the non-NaN values of v (NaN if none).
func median(v []float64) float64 { return quantile.Sorted(quantile.SortedNotNaN(v), 0.5) }
