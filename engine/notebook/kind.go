package notebook

import (
	"strings"

	"lixiv/engine/mix"
)

// Kind names what a cell does. The set is closed: a file naming another kind
// loads as a broken cell.
type Kind string

// The cell kinds, in the order a budget usually lists them.
const (
	KindSite          Kind = "site"          // catchment name, area, climate, period
	KindSamples       Kind = "samples"       // water-sample table and import options
	KindDischarge     Kind = "discharge"     // daily discharge record
	KindAtmosphere    Kind = "atmosphere"    // rain (atmospheric) correction
	KindSources       Kind = "sources"       // end-members and their priors
	KindApportionment Kind = "apportionment" // forward or inverse source apportionment
	KindFluxes        Kind = "fluxes"        // annual fluxes and yields
	KindCO2           Kind = "co2"           // CO2 consumption budget
	KindCarbonate     Kind = "carbonate"     // carbonate system: pCO2 and saturation indices
	KindMinerals      Kind = "minerals"      // mineral mass balance
	KindCompare       Kind = "comparison"    // treated against control: differences of budgets (calc_compare.go)
	KindNote          Kind = "note"          // free text
	KindChart         Kind = "chart"         // any output column against any other
	KindBroken        Kind = "broken"        // a cell that failed to load; never written as such
)

// Role is a named input of a cell: the cell it reads from is chosen in the
// cell's "uses" map, or, when absent there, is the nearest cell above of
// the role's kind.
type Role struct {
	Name     string // key in the "uses" map, such as "samples"
	Kind     Kind   // kind of cell the role accepts
	Optional bool   // the cell computes without it
}

// Roles returns the inputs a cell of kind k reads.
func (k Kind) Roles() []Role {
	if d := descriptors[k]; d != nil {
		return d.Inputs
	}
	return nil
}

// Valid reports whether k is a kind a user can add.
func (k Kind) Valid() bool { return descriptors[k] != nil }

// hasTable reports whether cells of kind k hold a data table.
func (k Kind) hasTable() bool {
	d := descriptors[k]
	return d != nil && d.Table
}

// builtinKinds are the descriptors of the built-in kinds, in the usual
// document order: the one list of their inputs, settings' help and
// accepted values (the estimators' are those of estimators.go), output
// tables and headline figures, which rank the budget's figures: silicate,
// then carbonate, CO2 consumption per km²; the silicate weathering rate;
// runoff over the budget's complete years; the carbonate weathering rate;
// other CO2 figures per km², then the rest of the CO2 figures. Static
// data, so that it costs the page no start-up code.
var builtinKinds = []Descriptor{
	{Kind: KindSite, Label: "Site", New: newSite,
		Notes: []SettingNote{
			{Key: "name", Help: "the catchment's name"},
			{Key: "area_km2", Help: "area above the gauge; the budget needs it for yields"},
			{Key: "area_uncertainty_percent", Help: "1σ of the area, drawn in the bootstrap"},
			{Key: "precipitation_mm", Help: "mean annual precipitation, for the rain method and runoff from P − ET"},
			{Key: "evapotranspiration_mm", Help: "mean annual evapotranspiration, for the rain method and runoff from P − ET"},
			{Key: "period_start", Help: "first day of the budget, YYYY-MM-DD; empty for the start of the record"},
			{Key: "period_end", Help: "last day of the budget, YYYY-MM-DD; empty for the end of the record"},
			{Key: "water_year_start_month", Help: "the month reporting years start in", Choices: []Choice{{"1", "January to December (calendar year)"}, {"2", "February to January (water year)"}, {"3", "March to February (water year)"}, {"4", "April to March (water year)"}, {"5", "May to April (water year)"}, {"6", "June to May (water year)"}, {"7", "July to June (water year)"}, {"8", "August to July (water year)"}, {"9", "September to August (water year)"}, {"10", "October to September (water year)"}, {"11", "November to October (water year)"}, {"12", "December to November (water year)"}}},
			{Key: "latitude_degrees", Help: "for the reader only"},
		},
	},
	{Kind: KindSamples, Label: "Samples", Table: true, New: newSamples,
		Notes: []SettingNote{
			{Key: "below_detection", Help: "what stands in for a value reported below detection", Choices: []Choice{{Value: "half-limit"}, {Value: "zero"}, {Value: "limit"}, {Value: "leave-out"}}},
			{Key: "date_order", Help: "how dates written as three numbers are read; auto reads the order the column proves", Choices: []Choice{{Value: "auto"}, {Value: "day-first"}, {Value: "month-first"}}},
			{Key: "nicb_flag_percent", Help: "a charge balance beyond it is flagged"},
			{Key: "nicb_reject_percent", Help: "a charge balance beyond it leaves the sample out"},
			{Key: "default_unit", Help: "unit of species columns that name none; empty keeps such columns as text"},
			{Key: "precision_percent", Help: "relative 1σ of every measured concentration, propagated by the apportionment"},
			{Key: "precision_floor_umol", Help: "smallest 1σ of Na, K, Ca, Mg, Cl and SO4"},
			{Key: "alkalinity_floor_ueq", Help: "smallest 1σ of alkalinity"},
			{Key: "sr_floor_umol", Help: "smallest 1σ of Sr"},
			{Key: "sr_isotope_precision", Help: "1σ of 87Sr/86Sr"},
			{Key: "use_columns", Help: "headers of the columns to read where a species has two or more"},
		},
		Tables: []TableInfo{
			{Name: "samples", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Na", "µmol/L"}, {"K", "µmol/L"}, {"Ca", "µmol/L"}, {"Mg", "µmol/L"}, {"Cl", "µmol/L"}, {"SO4", "µmol/L"}, {"NO3", "µmol/L"}, {"Alk", "µeq/L"}, {"SiO2", "µmol/L"}, {"Sr", "µmol/L"}, {"NICB", "%"}, {"flag", ""}}},
		},
	},
	{Kind: KindDischarge, Label: "Discharge", Table: true, New: newDischarge,
		Inputs: []Role{{"site", KindSite, true}},
		Notes: []SettingNote{
			{Key: "unit", Help: "unit of the discharge column", Choices: []Choice{{Value: "m3/s"}, {Value: "L/s"}, {Value: "m3/day"}, {Value: "mm/day"}}},
			{Key: "gap_fill_days", Help: "gaps up to this many days are filled linearly; 0 leaves every gap"},
			{Key: "date_order", Help: "how dates written as three numbers are read; auto reads the order the column proves", Choices: []Choice{{Value: "auto"}, {Value: "day-first"}, {Value: "month-first"}}},
		},
		Tables: []TableInfo{
			{Name: "daily", Columns: []ColumnInfo{{"date", ""}, {"discharge", "m³/s"}}},
			{Name: "years", Columns: []ColumnInfo{{"year", ""}, {"runoff", "mm"}, {"days with data", "fraction"}}, Labels: []LabelInfo{{"days with data", "share of days with data"}}},
		},
	},
	{Kind: KindCarbonate, Label: "Carbonate system", New: newCarbonate,
		Inputs: []Role{{"samples", KindSamples, false}, {"discharge", KindDischarge, true}},
		Notes: []SettingNote{
			{Key: "activity_model", Help: "how activities are computed from the ionic strength", Choices: []Choice{{Value: "davies"}, {Value: "extended-debye-huckel"}}},
			{Key: "si_calcite_flag", Help: "SI of calcite above it is flagged"},
			{Key: "atmospheric_pco2_uatm", Help: "pCO2 of the air in the sampling years"},
			{Key: "pco2_flag_factor", Help: "pCO2 above this many times the air's is flagged"},
		},
		Tables: []TableInfo{
			{Name: "carbonate", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"discharge", "m³/s"}, {"temperature", "°C"}, {"pH", ""}, {"ionic_strength", "mol/L"}, {"HCO3", "µmol/L"}, {"CO3", "µmol/L"}, {"H2CO3", "µmol/L"}, {"DIC", "µmol/L"}, {"pCO2", "µatm"}, {"pCO2_excess", "× air"}, {"SI_calcite", ""}, {"SI_aragonite", ""}, {"SI_dolomite", ""}, {"flag", ""}}, Labels: []LabelInfo{{"ionic_strength", "ionic strength"}, {"H2CO3", "H2CO3*"}, {"pCO2_excess", "pCO2 over the air's"}, {"SI_calcite", "SI of calcite"}, {"SI_aragonite", "SI of aragonite"}, {"SI_dolomite", "SI of dolomite"}}},
		},
	},
	{Kind: KindAtmosphere, Label: "Atmospheric input", Table: true, New: newAtmosphere, ReadsTable: atmosphereReadsTable,
		Inputs: []Role{{"samples", KindSamples, false}, {"site", KindSite, true}},
		Notes: []SettingNote{
			{Key: "method", Help: "sea-salt: Cl-referenced with the ratios below; rain: the table's rain composition × P/(P−ET)", Choices: []Choice{{Value: "sea-salt"}, {Value: "rain"}}},
			{Key: "na_per_cl", Help: "Na/Cl of rain"},
			{Key: "k_per_cl", Help: "K/Cl of rain"},
			{Key: "ca_per_cl", Help: "Ca/Cl of rain"},
			{Key: "mg_per_cl", Help: "Mg/Cl of rain"},
			{Key: "so4_per_cl", Help: "SO4/Cl of rain"},
			{Key: "sr_per_cl", Help: "Sr/Cl of rain"},
			{Key: "critical_chloride_umol", Help: "Cl*, the chloride of atmospheric origin; 0 takes it from rain, or all Cl as atmospheric"},
			{Key: "dry_deposition_factor", Help: "multiplies Cl* for dry deposition (at least 1)"},
			{Key: "excess_chloride", Help: "where chloride above Cl* comes from", Choices: []Choice{{Value: "halite"}, {Value: "human"}}},
			{Key: "ratio_source", Help: "where the ratios come from, shown to readers"},
			{Key: "rain_ratio_uncertainty_percent", Help: "1σ of each X/Cl ratio"},
			{Key: "et_factor_uncertainty_percent", Help: "1σ of P/(P−ET), used by the rain method when Cl* comes from rain"},
		},
		Tables: []TableInfo{
			{Name: "rain", Columns: []ColumnInfo{{"sample", ""}, {"Cl_atm", "µmol/L"}, {"Na_atm", "µmol/L"}, {"K_atm", "µmol/L"}, {"Ca_atm", "µmol/L"}, {"Mg_atm", "µmol/L"}, {"SO4_atm", "µmol/L"}, {"Cl_excess", "µmol/L"}, {"Na_evaporite", "µmol/L"}, {"Na_atm_share", "fraction"}}, Labels: []LabelInfo{{"Cl_atm", "atmospheric Cl"}, {"Na_atm", "atmospheric Na"}, {"K_atm", "atmospheric K"}, {"Ca_atm", "atmospheric Ca"}, {"Mg_atm", "atmospheric Mg"}, {"SO4_atm", "atmospheric SO4"}, {"Cl_excess", "Cl above the rain input"}, {"Na_atm_share", "atmospheric share of Na"}}},
			{Name: "ratios", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Ca/Na", "mol/mol"}, {"Mg/Na", "mol/mol"}, {"HCO3/Na", "mol/mol"}, {"K/Na", "mol/mol"}}},
		},
	},
	{Kind: KindSources, Label: "End-members", Table: true, New: newSources,
		Notes: []SettingNote{
			{Key: "preset", Help: "the end-member table the cell started from", Choices: []Choice{{Value: "global"}, {Value: "granite"}, {Value: "basalt"}, {Value: "custom"}}},
		},
		Tables: []TableInfo{
			{Name: "priors", Columns: []ColumnInfo{{"end-member", ""}, {"source", ""}, {"ratio", ""}, {"low", "mol/mol"}, {"central", "mol/mol"}, {"high", "mol/mol"}}},
		},
	},
	{Kind: KindApportionment, Label: "Apportionment", New: newApportionment, Idle: apportionmentIdle,
		Inputs: []Role{{"atmosphere", KindAtmosphere, false}, {"sources", KindSources, false}},
		Notes: []SettingNote{
			{Key: "model", Help: "inverse: Monte Carlo fit of each sample; catchment: every sample together, the end-members' ratios shared and learned from all; forward: the published ratios applied",
				Choices: []Choice{{Value: "inverse"}, {Value: "catchment"}, {Value: "forward"}}},
			{Key: "tracers", Help: "ratios to Na the inverse and catchment-wide models fit"},
			{Key: "draws", Help: "prior draws of the inverse model's first stage; the forward model's draws per sample"},
			{Key: "target_ess", Help: "effective sample size at which a sample's refinement stops"},
			{Key: "max_draws", Help: "cap of draws per sample over all stages"},
			{Key: "seed", Help: "random seed; results depend on it only"},
			{Key: "sulfate", Help: "origin of the sulfate above the rain share", Choices: []Choice{{Value: "gypsum"}, {Value: "sulfide"}, {Value: "isotope"}}},
			{Key: "d34s_river_permil", Help: "δ34S of river sulfate for samples without a d34S column"},
			{Key: "d34s_evaporite_permil", Help: "δ34S of evaporite sulfate"},
			{Key: "d34s_sulfide_permil", Help: "δ34S of sulfate from sulfide oxidation"},
			{Key: "negative_residuals", Help: "what becomes of a source amount below zero", Choices: []Choice{{Value: "zero-and-flag"}, {Value: "keep"}}},
		},
		Tables: []TableInfo{
			{Name: "shares", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"status", ""}, {"ESS", "draws"}}, Open: true, Labels: []LabelInfo{{"ESS", "effective sample size"}}},
			{Name: "amounts", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}}, Open: true, Labels: []LabelInfo{{"SO4_sulfide", "SO4 from sulfide"}}},
			// The catchment-wide model's shared ratios and scatters.
			{Name: "shared", Columns: []ColumnInfo{{"end-member", ""}, {"ratio", ""}, {"prior", "mol/mol"}, {"prior_low", "mol/mol"},
				{"prior_high", "mol/mol"}, {"posterior", "mol/mol"}, {"posterior_low", "mol/mol"}, {"posterior_high", "mol/mol"},
				{"R-hat", ""}, {"ESS", "draws"}}},
		},
	},
	{Kind: KindFluxes, Label: "Fluxes", New: newFluxes,
		Inputs: []Role{{"apportionment", KindApportionment, false}, {"discharge", KindDischarge, false}, {"site", KindSite, false}, {"carbonate", KindCarbonate, true}},
		Notes: []SettingNote{
			{Key: "estimator", Help: "how concentrations and daily discharge make annual fluxes"}, // choices: estimators.go
			{Key: "seasonal_terms", Help: "rating curve with sine and cosine terms of the season"},
			{Key: "bias_correction", Help: "retransformation bias correction of the rating curve", Choices: []Choice{{Value: "smearing"}, {Value: "ferguson"}, {Value: "none"}}},
			{Key: "bootstrap", Help: "replicates for the interval of the cation sums"},
			{Key: "series_bootstrap", Help: "replicates for the intervals of the other series; 0 gives point values only"},
			{Key: "discharge_uncertainty_percent", Help: "1σ systematic error of discharge"},
			{Key: "seed", Help: "random seed of the bootstrap"},
			{Key: "unapportioned_samples", Help: "what becomes of samples without a usable apportionment", Choices: []Choice{{Value: "leave-out"}, {Value: "fill-shares"}}},
			{Key: "doubtful_above_percent", Help: "share of the load or flow the samples do not support above which the results are doubtful"},
		},
		Tables: []TableInfo{
			{Name: "mean", Columns: []ColumnInfo{{"series", ""}, {"flux", "mol/yr"}, {"flux_low", "mol/yr"}, {"flux_high", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"mass_flux", "t/yr"}, {"mass_flux_low", "t/yr"}, {"mass_flux_high", "t/yr"}, {"mass_yield", "t/km²/yr"}, {"mass_yield_low", "t/km²/yr"}, {"mass_yield_high", "t/km²/yr"}}, Labels: []LabelInfo{{"mass_flux", "mass flux"}, {"mass_yield", "mass yield"}}},
			{Name: "annual", Columns: []ColumnInfo{{"series", ""}, {"year", ""}, {"flux", "mol/yr"}, {"yield", "mol/km²/yr"}, {"runoff", "mm"}}},
			{Name: "estimators", Columns: []ColumnInfo{{"series", ""}, {"estimator", ""}, {"point", "mol/yr"}, {"flux", "mol/yr"}, {"flux_low", "mol/yr"}, {"flux_high", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"replicates", ""}}},
			{Name: "closure", Columns: []ColumnInfo{{"cation", ""}, {"atmosphere", "mol/yr"}, {"evaporite", "mol/yr"}, {"silicate", "mol/yr"}, {"carbonate", "mol/yr"}, {"human_input", "mol/yr"}, {"sum_of_sources", "mol/yr"}, {"measured", "mol/yr"}, {"difference", "fraction of measured"}}},
			{Name: "rating", Columns: []ColumnInfo{{"series", ""}, {"a", "µmol/L"}, {"b", ""}, {"R2", ""}, {"s", "ln units"}, {"bias_factor", ""}, {"n", "samples"}}, Labels: []LabelInfo{{"R2", "R²"}, {"s", "s (residual)"}, {"bias_factor", "bias factor"}}},
			{Name: "by-source", Columns: []ColumnInfo{{"figure", ""}, {"source", ""}, {"median", "mol/km²/yr"}, {"low", "mol/km²/yr"}, {"high", "mol/km²/yr"}, {"relative_width", "fraction of the median"}, {"replicates", ""}}, Labels: []LabelInfo{{"relative_width", "interval width ÷ median"}}},
			{Name: "interpolation", Columns: []ColumnInfo{{"series", ""}, {"b", ""}}},
		},
		Headline: []FigureInfo{
			{Name: "silicate weathering rate", Prefix: true, Rank: 2},
			{Name: "runoff over", Prefix: true, Rank: 3},
			{Name: "carbonate weathering rate", Prefix: true, Rank: 4},
		},
	},
	{Kind: KindCO2, Label: "CO2 budget", New: newCO2,
		Inputs: []Role{{"fluxes", KindFluxes, true}, {"apportionment", KindApportionment, false}},
		Notes: []SettingNote{
			{Key: "time_scale", Help: "short: years; long: geological", Choices: []Choice{{Value: "short"}, {Value: "long"}}},
			{Key: "sulfur_split", Help: "how sulfate from sulfide oxidation is shared between silicate and carbonate weathering", Choices: []Choice{{Value: "proportional"}, {Value: "carbonate"}}},
			{Key: "long_term_convention", Help: "the long-term silicate sink (docs/methods.md §9.2), used only with the long time scale", Choices: []Choice{{Value: "conventional"}, {Value: "alkalinity"}}},
		},
		Tables: []TableInfo{
			{Name: "per-litre", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"silicate", "µmol/L"}, {"silicate_low", "µmol/L"}, {"silicate_high", "µmol/L"}, {"carbonate", "µmol/L"}, {"carbonate_low", "µmol/L"}, {"carbonate_high", "µmol/L"}}, Labels: []LabelInfo{{"silicate", "silicate CO2 consumption"}, {"carbonate", "carbonate CO2 consumption"}}},
			{Name: "years", Columns: []ColumnInfo{{"source", ""}, {"year", ""}, {"consumption", "mol/yr"}, {"consumption_low", "mol/yr"}, {"consumption_high", "mol/yr"}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}}, Labels: []LabelInfo{{"consumption", "CO2 consumption"}, {"per_km2", "CO2 consumption per km²"}}},
			{Name: "estimators", Columns: []ColumnInfo{{"source", ""}, {"estimator", ""}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}, {"replicates", ""}}, Labels: []LabelInfo{{"per_km2", "per km²"}}},
			{Name: "sulfate", Columns: []ColumnInfo{{"origin", ""}, {"source", ""}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}}, Labels: []LabelInfo{{"per_km2", "per km²"}}},
			{Name: "by-source", Columns: []ColumnInfo{{"figure", ""}, {"source", ""}, {"median", "mol/km²/yr"}, {"low", "mol/km²/yr"}, {"high", "mol/km²/yr"}, {"relative_width", "fraction of the median"}, {"replicates", ""}}, Labels: []LabelInfo{{"relative_width", "interval width ÷ median"}}},
		},
		Headline: []FigureInfo{
			{Name: "silicate CO2 consumption per km²", Prefix: true, Rank: 0},
			{Name: "carbonate CO2 consumption per km²", Prefix: true, Rank: 1},
			{Name: "silicate CO2 consumption as carbon", Prefix: false, Rank: 5},
			{Name: "carbonate CO2 consumption as carbon", Prefix: false, Rank: 5},
			{Name: "silicate CO2 consumption", Prefix: false, Rank: 6},
			{Name: "carbonate CO2 consumption", Prefix: false, Rank: 6},
			{Name: "median silicate CO2 consumption per litre", Prefix: true, Rank: 6},
			{Name: "median carbonate CO2 consumption per litre", Prefix: true, Rank: 6},
		},
	},
	{Kind: KindMinerals, Label: "Mineral balance", New: newMinerals,
		Inputs: []Role{{"atmosphere", KindAtmosphere, false}, {"fluxes", KindFluxes, true}},
		Notes: []SettingNote{
			{Key: "primary_minerals", Help: "minerals that only dissolve"},
			{Key: "secondary_minerals", Help: "minerals that may form"},
			{Key: "fit_components", Help: "the water components the balance fits", Choices: []Choice{{Value: "all"}, {Value: "cations"}}},
			{Key: "analytical_uncertainty_percent", Help: "relative 1σ weighting each fitted component; 0 weights all alike"},
		},
		Tables: []TableInfo{
			{Name: "minerals", Columns: []ColumnInfo{{"mineral", ""}, {"name", ""}, {"formula", ""}, {"role", ""}, {"CO2_per_mol", "mol/mol"}, {"reaction", ""}, {"source", ""}}, Labels: []LabelInfo{{"CO2_per_mol", "CO2 per mole"}, {"reaction", "balanced reaction with carbonic acid"}}},
			{Name: "amounts", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"fit", ""}}, Open: true, Labels: []LabelInfo{{"CO2_consumed", "CO2 consumed"}}},
			{Name: "residuals", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Na", "µmol/L"}, {"K", "µmol/L"}, {"Ca", "µmol/L"}, {"Mg", "µmol/L"}, {"Cl", "µmol/L"}, {"SO4", "µmol/L"}, {"HCO3", "µeq/L"}, {"SiO2", "µmol/L"}}, Labels: []LabelInfo{{"Na", "Na left"}, {"K", "K left"}, {"Ca", "Ca left"}, {"Mg", "Mg left"}, {"Cl", "Cl left"}, {"SO4", "SO4 left"}, {"HCO3", "HCO3 left"}, {"SiO2", "SiO2 left"}}},
			{Name: "period", Columns: []ColumnInfo{{"mineral", ""}, {"flux", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"flux_weighted_mean", "µmol/L"}, {"CO2_per_mol", "mol/mol"}, {"CO2_consumed", "mol/km²/yr"}, {"CO2_consumed_low", "mol/km²/yr"}, {"CO2_consumed_high", "mol/km²/yr"}}, Labels: []LabelInfo{{"flux_weighted_mean", "flux-weighted mean"}, {"CO2_per_mol", "CO2 per mole"}, {"CO2_consumed", "CO2 consumed"}}},
			{Name: "catalogue", Columns: []ColumnInfo{{"mineral", ""}, {"name", ""}, {"formula", ""}, {"usual_role", ""}, {"CO2_per_mol", "mol/mol"}, {"source", ""}}, Labels: []LabelInfo{{"usual_role", "usual role"}, {"CO2_per_mol", "CO2 per mole"}}},
		},
		Headline: []FigureInfo{
			{Name: "CO2 consumed by the minerals balanced, per km²", Prefix: false, Rank: 5},
		},
	},
	compareDescriptor,
	{Kind: KindNote, Label: "Note", New: newNote,
		Notes: []SettingNote{
			{Key: "text", Help: "plain text, shown as text"},
		},
	},
	{Kind: KindChart, Label: "Chart", New: newChart,
		Notes: []SettingNote{
			{Key: "x", Help: "column on the horizontal axis, cell.table.column"},
			{Key: "y", Help: "column on the vertical axis, cell.table.column"},
			{Key: "style", Help: "how the points are drawn", Choices: []Choice{{Value: "points"}, {Value: "line"}}},
			{Key: "log_x", Help: "logarithmic horizontal axis"},
			{Key: "log_y", Help: "logarithmic vertical axis"},
		},
		Tables: []TableInfo{
			{Name: "points", Columns: []ColumnInfo{}, Open: true},
		},
	},
}

func init() {
	for _, d := range builtinKinds {
		Describe(d)
	}
	setChoices(KindFluxes, "estimator", estimatorChoices())
}

func newSite() Settings {
	return &SiteSettings{AreaUncertainty: 2, WaterYearStart: 10} // 2 %: docs/methods.md §8.6, common practice
}

// newSamples: NICB limits, common practice. Precision: 2-5 % relative for
// major ions by ion chromatography or ICP with a floor near the detection
// limit, common practice, no source (package mix).
func newSamples() Settings {
	return &SamplesSettings{BelowDetection: "half-limit", DateOrder: "auto", NICBFlag: 5, NICBReject: 10,
		PrecisionPercent: 100 * mix.DefaultRelPrecision, PrecisionFloor: mix.DefaultFloor, AlkFloor: mix.DefaultAlkFloor,
		SrFloor: mix.DefaultSrFloor, IsoPrecision: mix.DefaultIsoPrecision}
}

func newDischarge() Settings {
	return &DischargeSettings{Unit: "m3/s", GapFillDays: 0, DateOrder: "auto"}
}

func newCarbonate() Settings { return defaultCarbonateSettings() }

// newAtmosphere: sea-salt ratios to Cl of Millero et al. (2008), Deep-Sea
// Res. I 55, reference composition. The docs/methods.md §8.6 asks for user
// values and gives none. The default method takes the reference-seawater
// ratios, whose major-ion proportions are constant in the open ocean
// (common practice, from memory), so they start exact (0); a user who
// measures rain, or expects fractionated aerosol or dust, sets a spread
// (the rain cell warns when measured rain ratios are taken as exact). The
// ET factor starts at 10 % (1σ; common practice, no source); it matters
// only where Cl* comes from measured rain. SCHEMA.md states both (a test
// reads it).
func newAtmosphere() Settings {
	return &AtmosphereSettings{Method: "sea-salt", NaPerCl: 0.859120, KPerCl: 0.0186998, CaPerCl: 0.0188361,
		MgPerCl: 0.0967577, SO4PerCl: 0.0517252, SrPerCl: 0.000166147, DryDeposition: 1,
		ExcessChloride: "halite", RatioSource: "seawater, Millero et al. 2008",
		RatioUncertainty: 0, FactorUncertainty: 10}
}

// atmosphereReadsTable: the sea-salt method takes its ratios from the
// settings, not from measured rain.
func atmosphereReadsTable(s Settings) bool { return s.(*AtmosphereSettings).Method != "sea-salt" }

func newSources() Settings { return &SourcesSettings{Preset: "global"} }

// newApportionment: draws, target and cap are engineering choices
// (docs/methods.md). δ34S end-members: evaporite sulfate about +10 to +35 ‰
// (Claypool et al. 1980), sedimentary sulfide usually negative; both from
// memory (docs/methods.md §5.2). Users should set their own.
func newApportionment() Settings {
	return &ApportionmentSettings{Model: "inverse", Tracers: []string{"Ca/Na", "Mg/Na", "HCO3/Na"},
		Draws: 400, TargetESS: 1000, MaxDraws: 20000, Seed: 1, Sulfate: "gypsum", Negative: "zero-and-flag",
		D34SRiver: 5, D34SEvaporite: 15, D34SSulfide: -10}
}

// apportionmentIdle: the δ34S values are read only when the sulfate source
// is "isotope"; the tracers only by the inverse and catchment-wide models,
// and the refinement only by the inverse model.
func apportionmentIdle(s Settings, key string) bool {
	a := s.(*ApportionmentSettings)
	switch key {
	case "tracers":
		return a.Model == "forward"
	case "target_ess", "max_draws":
		return a.Model != "inverse"
	}
	return strings.HasPrefix(key, "d34s_") && a.Sulfate != "isotope"
}

// newFluxes: B = 1000 and σ_Q = 7 %: docs/methods.md §8.6 (Efron &
// Tibshirani 1993 for B; σ_Q common practice). SeriesBootstrap = 200 keeps
// the intervals of the other series cheap enough for the page to recompute
// after an edit (an engineering choice, no source). A quarter of the load
// resting on unapportioned samples or unbracketed flow makes the fluxes
// doubtful (an engineering choice, no source).
func newFluxes() Settings {
	return &FluxSettings{Estimator: "rating-curve", BiasCorrection: "smearing", Bootstrap: 1000, SeriesBootstrap: 200,
		DischargeUncertainty: 7, Seed: 1, Unapportioned: "leave-out", DoubtfulPercent: 25}
}

func newCO2() Settings {
	return &CO2Settings{TimeScale: "short", SulfurSplit: "proportional", LongTerm: "conventional"}
}

func newMinerals() Settings { return defaultMineralSettings() }

func newNote() Settings { return &NoteSettings{} }

func newChart() Settings { return &ChartSettings{Style: "points"} }
