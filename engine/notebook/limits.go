package notebook

import (
	"errors"
	"fmt"

	"lixiv/engine/mix"
)

// The limits of a budget: what a file, a paste or a setting may ask of the
// engine, so that no input makes it run for hours, allocate without bound
// or hang. Every limit below is checked where the input arrives (loading a
// file, an edit, the computation that would exceed it), and an input beyond
// one gets a message naming the setting as the page labels it, with its
// key, and the limit; nothing the user typed is lost. SCHEMA.md lists them
// for readers of the file format, with the limits of the engine packages
// (discharge.MaxDays, mix.MaxEndMembers, the workbook caps of engine/sample).
//
// The costs they bound, measured natively on one goroutine (the page's
// WebAssembly is two to three times slower): the worst budget they allow
// computes in under a minute (BenchmarkWorstAllowed), reporting progress
// and honouring cancellation throughout.
const (
	// MaxFileSize is the largest budget file loaded, in bytes.
	MaxFileSize = 512 << 20
	// MaxDepth is the deepest nesting of JSON objects and arrays in a
	// budget file.
	MaxDepth = 64
	// MaxCells is the most cells in one budget.
	MaxCells = 10_000
	// MaxRows is the most rows in one data table (sample, discharge,
	// rain or end-member table).
	MaxRows = 2_000_000
	// MaxColumns is the most columns in one data table.
	MaxColumns = 1000
	// MaxDraws is the most Monte Carlo draws per sample (setting "draws").
	MaxDraws = 1_000_000
	// MaxSampleDraws caps the draws the inverse model keeps over all
	// samples (each sample's draws with a weight, about 150 bytes each,
	// for the cells below; at least its target ESS when it reaches it), so
	// that memory stays under 600 MB: samples × target_ess may not pass
	// it, and a run whose draws kept pass it stops with a message.
	MaxSampleDraws = 4_000_000
	// MaxForwardSampleDraws caps samples × draws under the forward model,
	// which keeps every draw of every sample (128 bytes each): about
	// 130 MB at the cap.
	MaxForwardSampleDraws = 1_000_000
	// MaxBootstrap is the most bootstrap replicates of one series
	// (settings "bootstrap" and "series_bootstrap").
	MaxBootstrap = 100_000
	// MaxBootstrapWork caps replicates × (samples + days of discharge in
	// the budget period) for each of the fluxes cell's bootstrap settings:
	// a replicate resamples every sample and sums the load over every day,
	// and a budget bootstraps about twenty series (measured species, each
	// cation from each source, the cation sums and CO2). 1000 replicates
	// thus reach 130 years of daily discharge; 10,000 replicates 13 years.
	MaxBootstrapWork = 50_000_000
)

// SettingName names a setting in a message as the page labels it
// (SettingLabel), with its key: "Monte Carlo draws (draws)". A setting
// without such a label is named by its key.
func SettingName(key string) string {
	if l := SettingLabel(key); l != "" {
		return fmt.Sprintf("%s (%s)", l, key)
	}
	return key
}

// checkBootstrapWork refuses a bootstrap setting whose replicates ×
// (samples + days) exceed MaxBootstrapWork.
func checkBootstrapWork(key string, replicates, samples, days int) error {
	if w := replicates * (samples + days); w > MaxBootstrapWork {
		return fmt.Errorf("%s: %s replicates × (%s samples + %s days of discharge) is %s, above the limit of %s; "+
			"use at most %s replicates, or a shorter budget period (site period_start, period_end)",
			SettingName(key), grouped(replicates), grouped(samples), grouped(days), grouped(w), grouped(MaxBootstrapWork),
			grouped(MaxBootstrapWork/(samples+days)))
	}
	return nil
}

// grouped writes a whole number with thin groups of three digits:
// 50,000,000.
func grouped(n int) string {
	s := fmt.Sprint(n)
	neg := ""
	if n < 0 {
		neg, s = "-", s[1:]
	}
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return neg + s
}

// checkSampleDraws refuses an apportionment whose samples × draws exceed
// MaxSampleDraws, or MaxForwardSampleDraws under the forward model.
func checkSampleDraws(model string, samples, draws int) error {
	limit, why := MaxSampleDraws, ""
	if model == "forward" {
		limit, why = MaxForwardSampleDraws, " for the forward model, which keeps every draw of every sample"
	}
	if samples*draws > limit {
		return fmt.Errorf("%s: %s samples × %s draws is %s sample-draws, above the limit of %s%s; use at most %s draws",
			SettingName("draws"), grouped(samples), grouped(draws), grouped(samples*draws), grouped(limit), why, grouped(max(1, limit/samples)))
	}
	return nil
}

// MaxCatchmentSamples is the most samples the catchment-wide model takes:
// its chains fit every sample at each step (4 chains × at most 23,000
// steps × 1,000 samples is 92 million small fits, some minutes on one
// core), and it keeps 1,000 joint draws of each.
const MaxCatchmentSamples = 1000

// checkCatchmentSamples refuses a catchment-wide model of more than
// MaxCatchmentSamples samples.
func checkCatchmentSamples(samples int) error {
	if samples > MaxCatchmentSamples {
		return settingErr("model", "the catchment-wide model takes at most %s samples (this budget apportions %s); use the per-sample model (inverse), or fewer samples",
			grouped(MaxCatchmentSamples), grouped(samples))
	}
	return nil
}

// checkInverseDraws refuses an inverse model whose samples × target
// effective sample size exceed MaxSampleDraws: each sample that reaches
// its target keeps at least that many draws. The run itself stops where
// the draws kept pass MaxSampleDraws (keptErr).
func checkInverseDraws(samples int, o *mix.Options) error {
	ess := o.TargetESS
	if ess <= 0 {
		ess = 1000 // mix.Options' default
	}
	if samples*ess > MaxSampleDraws {
		return fmt.Errorf("%s: %s samples × a target of %s is %s sample-draws, above the limit of %s; use a target of at most %s",
			SettingName("target_ess"), grouped(samples), grouped(ess), grouped(samples*ess), grouped(MaxSampleDraws),
			grouped(max(1, MaxSampleDraws/samples)))
	}
	return nil
}

// keptErr names the settings that decide how many draws the inverse model
// keeps when a run stopped at the limit (mix.ErrTooManyKept).
func keptErr(err error) error {
	if errors.Is(err, mix.ErrTooManyKept) {
		return fmt.Errorf("%v, the most the inverse model keeps (%s sample-draws); lower %s or %s",
			err, grouped(MaxSampleDraws), SettingName("max_draws"), SettingName("target_ess"))
	}
	return err
}
