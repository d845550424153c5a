package co2

import (
	"errors"
	"fmt"
	"math"

	"lixiv/engine/mix"
)

// SulfurSplit says how sulfide-derived sulfate is shared between silicate
// and carbonate weathering (docs/methods.md §9.3; common practice, no source).
type SulfurSplit int

const (
	// Proportional shares SO4_sulf in proportion to the cation equivalents
	// each reservoir delivered: S_carb/SO4_sulf = 2(Ca+Mg)_carb /
	// [2(Ca+Mg)_carb + (Na+K+2Ca+2Mg)_sil] (the default). With no cations
	// from either, all goes to carbonate.
	Proportional SulfurSplit = iota
	// AllCarbonate gives all SO4_sulf to carbonate weathering, the upper
	// bound on CO2 release.
	AllCarbonate
)

// String names the choice.
func (s SulfurSplit) String() string {
	switch s {
	case Proportional:
		return "proportional to cation equivalents"
	case AllCarbonate:
		return "all to carbonate"
	}
	return "unknown"
}

// Options control Consumption; the zero value means the Proportional split.
type Options struct {
	Sulfur SulfurSplit
}

// Result is the CO2 accounting of one sample, µmol/L of CO2 unless stated.
type Result struct {
	SSil, SCarb float64 // sulfide-derived sulfate given to silicate and carbonate weathering
	AlkSil      float64 // alkalinity from silicate weathering, µeq/L
	AlkCarb     float64 // alkalinity from carbonate weathering, µeq/L
	PhiSil      float64 // short-term CO2 consumption by silicate weathering (= AlkSil)
	PhiCarb     float64 // short-term CO2 consumption by carbonate weathering (negative: release)
	PhiTotal    float64 // PhiSil + PhiCarb, independent of the sulfur split
	// NetLong is the geological figure after marine carbonate compensation:
	// PhiTotal − (AlkSil + AlkCarb)/2 (negative: a CO2 source). It is the
	// sum of a silicate part NetLongSil = PhiSil − AlkSil/2 = AlkSil/2 =
	// ½(Na+K)_sil + (Ca+Mg)_sil − S_sil and a carbonate part NetLongCarb =
	// PhiCarb − AlkCarb/2 = −S_carb (docs/methods.md §9.3).
	NetLong, NetLongSil, NetLongCarb float64
	// SinkSil is the conventional long-term silicate sink (docs/methods.md
	// §9.2; Berner, Lasaga & Garrels 1983, from memory): (Ca+Mg)_sil under
	// carbonic acid, the Ca+Mg part of NetLongSil without its Na, K half.
	// Silicate weathering by sulfuric acid consumes no CO2 (§9.3), so with
	// sulfide-derived sulfate S_sil comes off: Alk_sil/2 is shared between
	// Na+K and Ca+Mg by their charge, as §9.3 shares SO4_sulf between the
	// reservoirs, and SinkSil = (Ca+Mg)_sil × Alk_sil/(Na+K+2Ca+2Mg)_sil =
	// (Ca+Mg)_sil − S_sil × 2(Ca+Mg)_sil/(Na+K+2Ca+2Mg)_sil. With no silicate
	// Na or K this is (Ca+Mg)_sil − S_sil; it is never above NetLongSil and
	// never below 0 while the acid does not exceed the silicate cations
	// (derivation, common practice).
	SinkSil float64
	// Warnings are problems that do not stop the accounting.
	Warnings []error
}

// ErrInput marks an input Consumption cannot use.
var ErrInput = errors.New("co2: invalid input")

// ErrRelease warns that carbonate weathering by sulfuric acid is a net CO2
// source on the short time scale (PhiCarb < 0).
var ErrRelease = errors.New("carbonate weathering by sulfuric acid releases CO2")

// Consumption returns the CO2 consumed by the weathering apportioned in s,
// with so4Sulf µmol/L of sulfate from sulfide oxidation (0 for carbonic acid
// only), following the docs/methods.md §9.2 and §9.3. opt may be nil.
func Consumption(s *mix.Split, so4Sulf float64, opt *Options) (Result, error) {
	var r Result
	if opt == nil {
		opt = &Options{}
	}
	if s == nil {
		return r, fmt.Errorf("%w: no source apportionment", ErrInput)
	}
	if !(so4Sulf >= 0) || math.IsInf(so4Sulf, 0) {
		return r, fmt.Errorf("%w: sulfide-derived SO4 = %g µmol/L, want finite and >= 0", ErrInput, so4Sulf)
	}
	if opt.Sulfur != Proportional && opt.Sulfur != AllCarbonate {
		return r, fmt.Errorf("%w: sulfur split %d", ErrInput, opt.Sulfur)
	}
	sil := &s[mix.Silicate]
	carb := &s[mix.Carbonate]
	na, k, ca, mg := sil[0], sil[1], sil[2], sil[3]
	caC, mgC := carb[2], carb[3]

	eqSil := na + k + 2*ca + 2*mg
	eqCarb := 2 * (caC + mgC)
	switch {
	case so4Sulf == 0:
	case opt.Sulfur == AllCarbonate || eqSil+eqCarb <= 0:
		r.SCarb = so4Sulf
	default:
		r.SCarb = so4Sulf * eqCarb / (eqCarb + eqSil)
		r.SSil = so4Sulf - r.SCarb
	}
	r.AlkSil = eqSil - 2*r.SSil
	r.AlkCarb = eqCarb - 2*r.SCarb
	r.PhiSil = r.AlkSil
	r.PhiCarb = (caC + mgC) - 2*r.SCarb
	r.PhiTotal = r.PhiSil + r.PhiCarb
	r.NetLong = r.PhiTotal - (r.AlkSil+r.AlkCarb)/2
	r.NetLongSil, r.NetLongCarb = r.PhiSil-r.AlkSil/2, r.PhiCarb-r.AlkCarb/2
	r.SinkSil = ca + mg
	if r.SSil > 0 {
		r.SinkSil = (ca + mg) * r.AlkSil / eqSil
	}
	if math.IsNaN(r.PhiTotal) || math.IsNaN(r.SinkSil) {
		r.Warnings = append(r.Warnings, fmt.Errorf("%w: a silicate or carbonate cation is missing (NaN), so the CO2 figures are NaN", ErrInput))
	}
	if r.PhiCarb < 0 {
		r.Warnings = append(r.Warnings, fmt.Errorf("%w: phi_carb = %.4g µmol/L", ErrRelease, r.PhiCarb))
	}
	if r.AlkSil < 0 || r.AlkCarb < 0 {
		r.Warnings = append(r.Warnings, fmt.Errorf("%w: sulfuric acid exceeds the cations it could have weathered (Alk_sil %.4g, Alk_carb %.4g µeq/L)", ErrInput, r.AlkSil, r.AlkCarb))
	}
	return r, nil
}
