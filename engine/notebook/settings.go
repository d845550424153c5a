package notebook

import (
	"math"

	"lixiv/engine/chem"
	"lixiv/engine/mix"
)

// Settings are the parameters of one cell. Each kind has its own struct;
// the JSON key of every field is its name in the file and in SetParam.
// Fields are float64, int, int64, string, bool or []string.
type Settings interface {
	// Kind is the kind of cell the settings belong to.
	Kind() Kind
	// Validate reports a value out of its range, naming the key.
	Validate() error
}

// SiteSettings describe the catchment above the gauge.
type SiteSettings struct {
	Name               string  `json:"name"`                                         // catchment name
	AreaKm2            float64 `json:"area_km2" blank:"needed"`                      // area above the gauge, km² (0 = not given; blank in a field)
	AreaUncertainty    float64 `json:"area_uncertainty_percent"`                     // 1σ, % of the area
	Precipitation      float64 `json:"precipitation_mm" blank:"unknown"`             // mean annual P, mm/yr (0 = unknown; blank in a field)
	Evapotranspiration float64 `json:"evapotranspiration_mm" blank:"unknown"`        // mean annual ET, mm/yr (0 = unknown; blank in a field)
	PeriodStart        string  `json:"period_start"`                                 // first day of the budget, YYYY-MM-DD ("" = record start)
	PeriodEnd          string  `json:"period_end"`                                   // last day, YYYY-MM-DD ("" = record end)
	WaterYearStart     int     `json:"water_year_start_month"`                       // 1 = calendar year, 10 = October
	Latitude           float64 `json:"latitude_degrees,omitempty" blank:"not given"` // optional, for the reader only (0 = not given; blank in a field)
}

// SamplesSettings control how the sample table is read.
type SamplesSettings struct {
	BelowDetection string  `json:"below_detection"`     // substitute for values below detection
	DateOrder      string  `json:"date_order"`          // how dates such as 03/04/2021 are read
	NICBFlag       float64 `json:"nicb_flag_percent"`   // |NICB| above this is flagged
	NICBReject     float64 `json:"nicb_reject_percent"` // |NICB| above this leaves the sample out
	DefaultUnit    string  `json:"default_unit"`        // unit of species columns that state none ("" = ask: such columns are kept as text)
	// The analytical precision the apportionment propagates: a relative
	// 1σ with a floor; a column such as "Na rsd (%)" sets it per sample.
	PrecisionPercent float64 `json:"precision_percent"`    // relative 1σ of every measured concentration, %
	PrecisionFloor   float64 `json:"precision_floor_umol"` // smallest 1σ of Na, K, Ca, Mg, Cl, SO4, µmol/L
	AlkFloor         float64 `json:"alkalinity_floor_ueq"` // smallest 1σ of alkalinity, µeq/L
	SrFloor          float64 `json:"sr_floor_umol"`        // smallest 1σ of Sr, µmol/L
	IsoPrecision     float64 `json:"sr_isotope_precision"` // 1σ of 87Sr/86Sr
	// UseColumns names, by header, the column to read where a species has
	// two or more (two Ca columns); without it such columns are refused.
	UseColumns []string `json:"use_columns,omitempty"`
}

// DischargeSettings control how the daily record is read.
type DischargeSettings struct {
	Unit        string `json:"unit"`          // unit of the discharge column
	GapFillDays int    `json:"gap_fill_days"` // fill gaps up to this many days linearly (0 = none)
	DateOrder   string `json:"date_order"`    // how dates such as 03/04/2021 are read
}

// AtmosphereSettings choose the rain correction.
type AtmosphereSettings struct {
	Method           string  `json:"method"`                 // Cl-referenced sea salt, or measured rain × P/(P−ET)
	NaPerCl          float64 `json:"na_per_cl"`              // (Na/Cl) of rain, mol/mol
	KPerCl           float64 `json:"k_per_cl"`               // (K/Cl) of rain
	CaPerCl          float64 `json:"ca_per_cl"`              // (Ca/Cl) of rain
	MgPerCl          float64 `json:"mg_per_cl"`              // (Mg/Cl) of rain
	SO4PerCl         float64 `json:"so4_per_cl"`             // (SO4/Cl) of rain
	SrPerCl          float64 `json:"sr_per_cl"`              // (Sr/Cl) of rain
	CriticalChloride float64 `json:"critical_chloride_umol"` // Cl*, µmol/L; 0 = from rain, or all Cl atmospheric
	DryDeposition    float64 `json:"dry_deposition_factor"`  // f_dry ≥ 1 multiplying Cl*
	ExcessChloride   string  `json:"excess_chloride"`        // origin of chloride above Cl*
	RatioSource      string  `json:"ratio_source,omitempty"` // where the ratios come from, shown to readers
	// RatioUncertainty and FactorUncertainty are propagated through the
	// apportionment's Monte Carlo draws (docs/methods.md §8.6); 0 makes the
	// correction exact.
	RatioUncertainty  float64 `json:"rain_ratio_uncertainty_percent"` // 1σ of each X/Cl ratio, %
	FactorUncertainty float64 `json:"et_factor_uncertainty_percent"`  // 1σ of P/(P−ET), % (rain method, when Cl* comes from rain)
}

// SourcesSettings name the end-member preset the table started from.
type SourcesSettings struct {
	Preset string `json:"preset"` // the end-member table the cell started from
}

// ApportionmentSettings choose the model.
type ApportionmentSettings struct {
	Model         string   `json:"model"`                 // the apportionment model: "inverse", "catchment" or "forward"
	Tracers       []string `json:"tracers"`               // ratios to Na fitted by the inverse model, e.g. "Ca/Na"
	Draws         int      `json:"draws"`                 // prior draws of the first stage (the forward model: draws per sample)
	TargetESS     int      `json:"target_ess"`            // effective sample size at which a sample's refinement stops
	MaxDraws      int      `json:"max_draws"`             // cap of draws per sample over all stages
	Seed          int64    `json:"seed"`                  // random seed; results depend on it only
	Sulfate       string   `json:"sulfate"`               // origin of SO4 above the rain share
	D34SRiver     float64  `json:"d34s_river_permil"`     // δ34S of river sulfate, ‰, for samples without a d34S column
	D34SEvaporite float64  `json:"d34s_evaporite_permil"` // δ34S of evaporite sulfate, ‰
	D34SSulfide   float64  `json:"d34s_sulfide_permil"`   // δ34S of sulfide-derived sulfate, ‰
	Negative      string   `json:"negative_residuals"`    // what becomes of a source amount below zero
}

// FluxSettings choose the flux estimator and its uncertainty.
type FluxSettings struct {
	Estimator            string  `json:"estimator"`                     // the flux estimator (estimators.go)
	Seasonal             bool    `json:"seasonal_terms"`                // rating curve with sine and cosine terms
	BiasCorrection       string  `json:"bias_correction"`               // retransformation bias correction
	Bootstrap            int     `json:"bootstrap"`                     // resamples for the interval of the cation sums
	SeriesBootstrap      int     `json:"series_bootstrap"`              // resamples for the intervals of the other series (0 = point values only)
	DischargeUncertainty float64 `json:"discharge_uncertainty_percent"` // 1σ systematic error of Q, %
	Seed                 int64   `json:"seed"`                          // random seed of the bootstrap
	// Unapportioned says what becomes of samples without a usable
	// apportionment: "leave-out" (their measured values are left out of
	// the source fluxes too, which the estimator then makes from the other
	// samples) or "fill-shares" (the measured species are fluxed from every
	// sample, and the missing samples take the flow-weighted source shares
	// of the apportioned samples of their year).
	Unapportioned string `json:"unapportioned_samples"`
	// DoubtfulPercent is the share of the flow-weighted cation load in
	// samples without a usable apportionment, or of the flow the samples
	// do not bracket, above which the fluxes and CO2 cells are doubtful, %.
	DoubtfulPercent float64 `json:"doubtful_above_percent"`
}

// CO2Settings choose the CO2 accounting.
type CO2Settings struct {
	TimeScale   string `json:"time_scale"`   // years or geological time
	SulfurSplit string `json:"sulfur_split"` // how sulfide-derived sulfate is shared
	// LongTerm is the long-term silicate convention (docs/methods.md §9.2):
	// "conventional", (Ca+Mg)_sil, or "alkalinity", ½ Alk_sil, which also
	// counts ½(Na+K)_sil; both less the share of sulfuric acid.
	LongTerm string `json:"long_term_convention"`
}

// NoteSettings hold free text.
type NoteSettings struct {
	Text string `json:"text"` // plain text, shown as text
}

// ChartSettings draw one output column against another. A column is named
// "cell.table.column", for example "flow.daily.discharge".
type ChartSettings struct {
	X     string `json:"x"`     // column on the horizontal axis
	Y     string `json:"y"`     // column on the vertical axis
	Style string `json:"style"` // how the points are drawn
	LogX  bool   `json:"log_x"` // logarithmic horizontal axis
	LogY  bool   `json:"log_y"` // logarithmic vertical axis
}

// BrokenSettings stand in for a cell that failed to load.
type BrokenSettings struct{}

// Kind implements Settings.
func (*SiteSettings) Kind() Kind { return KindSite }

// Kind implements Settings.
func (*SamplesSettings) Kind() Kind { return KindSamples }

// Kind implements Settings.
func (*DischargeSettings) Kind() Kind { return KindDischarge }

// Kind implements Settings.
func (*AtmosphereSettings) Kind() Kind { return KindAtmosphere }

// Kind implements Settings.
func (*SourcesSettings) Kind() Kind { return KindSources }

// Kind implements Settings.
func (*ApportionmentSettings) Kind() Kind { return KindApportionment }

// Kind implements Settings.
func (*FluxSettings) Kind() Kind { return KindFluxes }

// Kind implements Settings.
func (*CO2Settings) Kind() Kind { return KindCO2 }

// Kind implements Settings.
func (*NoteSettings) Kind() Kind { return KindNote }

// Kind implements Settings.
func (*ChartSettings) Kind() Kind { return KindChart }

// Kind implements Settings.
func (*BrokenSettings) Kind() Kind { return KindBroken }

// DefaultSettings returns the documented defaults for a new cell of kind k
// (its descriptor's New).
func DefaultSettings(k Kind) Settings {
	if d := descriptors[k]; d != nil {
		return d.New()
	}
	return &BrokenSettings{}
}

func inRange(key string, v, lo, hi float64) error {
	if math.IsNaN(v) || v < lo || v > hi {
		return settingErr(key, "%g is outside [%g, %g]", v, lo, hi)
	}
	return nil
}

func firstErr(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

// Validate implements Settings.
func (s *SiteSettings) Validate() error {
	return firstErr(
		inRange("area_km2", s.AreaKm2, 0, 1e8),
		inRange("area_uncertainty_percent", s.AreaUncertainty, 0, 100),
		inRange("precipitation_mm", s.Precipitation, 0, 20000),
		inRange("evapotranspiration_mm", s.Evapotranspiration, 0, 20000),
		inRange("water_year_start_month", float64(s.WaterYearStart), 1, 12),
		inRange("latitude_degrees", s.Latitude, -90, 90),
	)
}

// Validate implements Settings.
func (s *SamplesSettings) Validate() error {
	return firstErr(
		inRange("nicb_flag_percent", s.NICBFlag, 0, 100),
		inRange("nicb_reject_percent", s.NICBReject, 0, 1000),
		unitOK("default_unit", s.DefaultUnit),
		inRange("precision_percent", s.PrecisionPercent, 0, 100),
		inRange("precision_floor_umol", s.PrecisionFloor, 0, 1e4),
		inRange("alkalinity_floor_ueq", s.AlkFloor, 0, 1e4),
		inRange("sr_floor_umol", s.SrFloor, 0, 1e4),
		inRange("sr_isotope_precision", s.IsoPrecision, 0, 1),
	)
}

func unitOK(key, u string) error {
	if u == "" {
		return nil
	}
	if _, err := chem.ParseUnit(u); err != nil {
		return settingErr(key, "%v", err)
	}
	return nil
}

// Validate implements Settings.
func (s *DischargeSettings) Validate() error {
	return firstErr(
		inRange("gap_fill_days", float64(s.GapFillDays), 0, 366),
	)
}

// Validate implements Settings.
func (s *AtmosphereSettings) Validate() error {
	errs := []error{
		inRange("critical_chloride_umol", s.CriticalChloride, 0, 1e7),
		inRange("dry_deposition_factor", s.DryDeposition, 1, 100),
		inRange("rain_ratio_uncertainty_percent", s.RatioUncertainty, 0, 100),
		inRange("et_factor_uncertainty_percent", s.FactorUncertainty, 0, 100),
	}
	for _, r := range []struct {
		k string
		v float64
	}{{"na_per_cl", s.NaPerCl}, {"k_per_cl", s.KPerCl}, {"ca_per_cl", s.CaPerCl}, {"mg_per_cl", s.MgPerCl},
		{"so4_per_cl", s.SO4PerCl}, {"sr_per_cl", s.SrPerCl}} {
		errs = append(errs, inRange(r.k, r.v, 0, 1e4))
	}
	return firstErr(errs...)
}

// Validate implements Settings.
func (s *SourcesSettings) Validate() error { return nil }

// Validate implements Settings.
func (s *ApportionmentSettings) Validate() error {
	err := firstErr(
		inRange("d34s_river_permil", s.D34SRiver, -100, 100),
		inRange("d34s_evaporite_permil", s.D34SEvaporite, -100, 100),
		inRange("d34s_sulfide_permil", s.D34SSulfide, -100, 100),
		inRange("draws", float64(s.Draws), 1, MaxDraws),
		inRange("target_ess", float64(s.TargetESS), 1, MaxDraws),
		inRange("max_draws", float64(s.MaxDraws), 1, mix.MaxDraws),
	)
	if err != nil {
		return err
	}
	if s.Model != "forward" && len(s.Tracers) == 0 {
		return settingErr("tracers", "the %s model needs at least one tracer", s.Model)
	}
	return nil
}

// Validate implements Settings.
func (s *FluxSettings) Validate() error {
	return firstErr(
		inRange("bootstrap", float64(s.Bootstrap), 1, MaxBootstrap),
		inRange("series_bootstrap", float64(s.SeriesBootstrap), 0, MaxBootstrap),
		inRange("discharge_uncertainty_percent", s.DischargeUncertainty, 0, 100),
		inRange("doubtful_above_percent", s.DoubtfulPercent, 0, 100),
	)
}

// Validate implements Settings.
func (s *CO2Settings) Validate() error {
	return firstErr()
}

// Validate implements Settings.
func (s *NoteSettings) Validate() error { return nil }

// Validate implements Settings.
func (s *ChartSettings) Validate() error {
	return nil
}

// Validate implements Settings.
func (s *BrokenSettings) Validate() error { return nil }
