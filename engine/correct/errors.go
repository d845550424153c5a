package correct

import "errors"

// Sentinel errors. Warnings in Result.Warnings and errors returned by Apply
// wrap one of these, so callers can test them with errors.Is.
var (
	// ErrOption marks an invalid option (a negative Cl*, ET >= P, ...).
	ErrOption = errors.New("correct: invalid option")
	// ErrMissing marks a species the correction needs but the sample lacks.
	ErrMissing = errors.New("correct: species not measured")
	// ErrNegativeInput marks a negative or infinite measured concentration.
	ErrNegativeInput = errors.New("correct: negative or infinite concentration")
	// ErrAllClAtmospheric warns that, with neither rain data nor a user Cl*,
	// all Cl was taken as atmospheric (Cl* = +Inf).
	ErrAllClAtmospheric = errors.New("no rain data and no critical Cl*: all Cl taken as atmospheric")
	// ErrRainFallback warns that a species missing from the rain analysis
	// was corrected with the sea-salt ratio.
	ErrRainFallback = errors.New("rain ratio replaced by sea salt")
	// ErrHumanInput flags excess Cl (and its Na equivalent) removed as human
	// input rather than halite.
	ErrHumanInput = errors.New("excess Cl removed as human input")
	// ErrNegativeResidual reports a residual below zero after correction.
	ErrNegativeResidual = errors.New("negative residual after correction")
	// ErrSulfideFraction warns that the δ34S sulfide fraction fell outside
	// [0, 1] and was limited to it.
	ErrSulfideFraction = errors.New("δ34S sulfide fraction outside [0, 1]")
)
