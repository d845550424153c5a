package notebook

// outputTables are the output tables of each built-in kind, with their
// fixed columns and units, as SCHEMA.md lists them (a test checks both the
// schema and the examples' outputs against them).
var outputTables = map[Kind][]TableInfo{
	KindSamples: {
		{Name: "samples", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Na", "µmol/L"}, {"K", "µmol/L"}, {"Ca", "µmol/L"}, {"Mg", "µmol/L"}, {"Cl", "µmol/L"}, {"SO4", "µmol/L"}, {"NO3", "µmol/L"}, {"Alk", "µeq/L"}, {"SiO2", "µmol/L"}, {"Sr", "µmol/L"}, {"NICB", "%"}, {"flag", ""}}},
	},
	KindDischarge: {
		{Name: "daily", Columns: []ColumnInfo{{"date", ""}, {"discharge", "m³/s"}}},
		{Name: "years", Columns: []ColumnInfo{{"year", ""}, {"runoff", "mm"}, {"days with data", "fraction"}}},
	},
	KindAtmosphere: {
		{Name: "rain", Columns: []ColumnInfo{{"sample", ""}, {"Cl_atm", "µmol/L"}, {"Na_atm", "µmol/L"}, {"K_atm", "µmol/L"}, {"Ca_atm", "µmol/L"}, {"Mg_atm", "µmol/L"}, {"SO4_atm", "µmol/L"}, {"Cl_excess", "µmol/L"}, {"Na_evaporite", "µmol/L"}, {"Na_atm_share", "fraction"}}},
		{Name: "ratios", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Ca/Na", "mol/mol"}, {"Mg/Na", "mol/mol"}, {"HCO3/Na", "mol/mol"}, {"K/Na", "mol/mol"}}},
	},
	KindSources: {
		{Name: "priors", Columns: []ColumnInfo{{"end-member", ""}, {"source", ""}, {"ratio", ""}, {"low", "mol/mol"}, {"central", "mol/mol"}, {"high", "mol/mol"}}},
	},
	KindApportionment: {
		{Name: "shares", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"status", ""}, {"ESS", "draws"}}, Open: true},
		{Name: "amounts", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}}, Open: true},
	},
	KindFluxes: {
		{Name: "mean", Columns: []ColumnInfo{{"series", ""}, {"flux", "mol/yr"}, {"flux_low", "mol/yr"}, {"flux_high", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"mass_flux", "t/yr"}, {"mass_flux_low", "t/yr"}, {"mass_flux_high", "t/yr"}, {"mass_yield", "t/km²/yr"}, {"mass_yield_low", "t/km²/yr"}, {"mass_yield_high", "t/km²/yr"}}},
		{Name: "annual", Columns: []ColumnInfo{{"series", ""}, {"year", ""}, {"flux", "mol/yr"}, {"yield", "mol/km²/yr"}, {"runoff", "mm"}}},
		{Name: "estimators", Columns: []ColumnInfo{{"series", ""}, {"estimator", ""}, {"point", "mol/yr"}, {"flux", "mol/yr"}, {"flux_low", "mol/yr"}, {"flux_high", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"replicates", ""}}},
		{Name: "closure", Columns: []ColumnInfo{{"cation", ""}, {"atmosphere", "mol/yr"}, {"evaporite", "mol/yr"}, {"silicate", "mol/yr"}, {"carbonate", "mol/yr"}, {"human_input", "mol/yr"}, {"sum_of_sources", "mol/yr"}, {"measured", "mol/yr"}, {"difference", "fraction of measured"}}},
		{Name: "rating", Columns: []ColumnInfo{{"series", ""}, {"a", "µmol/L"}, {"b", ""}, {"R2", ""}, {"s", "ln units"}, {"bias_factor", ""}, {"n", "samples"}}},
		{Name: "by-source", Columns: []ColumnInfo{{"figure", ""}, {"source", ""}, {"median", "mol/km²/yr"}, {"low", "mol/km²/yr"}, {"high", "mol/km²/yr"}, {"relative_width", "fraction of the median"}, {"replicates", ""}}},
		{Name: "interpolation", Columns: []ColumnInfo{{"series", ""}, {"b", ""}}},
	},
	KindCO2: {
		{Name: "per-litre", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"silicate", "µmol/L"}, {"silicate_low", "µmol/L"}, {"silicate_high", "µmol/L"}, {"carbonate", "µmol/L"}, {"carbonate_low", "µmol/L"}, {"carbonate_high", "µmol/L"}}},
		{Name: "years", Columns: []ColumnInfo{{"source", ""}, {"year", ""}, {"consumption", "mol/yr"}, {"consumption_low", "mol/yr"}, {"consumption_high", "mol/yr"}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}}},
		{Name: "estimators", Columns: []ColumnInfo{{"source", ""}, {"estimator", ""}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}, {"replicates", ""}}},
		{Name: "sulfate", Columns: []ColumnInfo{{"origin", ""}, {"source", ""}, {"per_km2", "mol/km²/yr"}, {"per_km2_low", "mol/km²/yr"}, {"per_km2_high", "mol/km²/yr"}}},
		{Name: "by-source", Columns: []ColumnInfo{{"figure", ""}, {"source", ""}, {"median", "mol/km²/yr"}, {"low", "mol/km²/yr"}, {"high", "mol/km²/yr"}, {"relative_width", "fraction of the median"}, {"replicates", ""}}},
	},
	KindChart: {
		{Name: "points", Columns: []ColumnInfo{}, Open: true},
	},
	KindCarbonate: {
		{Name: "carbonate", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"discharge", "m³/s"}, {"temperature", "°C"}, {"pH", ""}, {"ionic_strength", "mol/L"}, {"HCO3", "µmol/L"}, {"CO3", "µmol/L"}, {"H2CO3", "µmol/L"}, {"DIC", "µmol/L"}, {"pCO2", "µatm"}, {"pCO2_excess", "× air"}, {"SI_calcite", ""}, {"SI_aragonite", ""}, {"SI_dolomite", ""}, {"flag", ""}}},
	},
	KindMinerals: {
		{Name: "minerals", Columns: []ColumnInfo{{"mineral", ""}, {"name", ""}, {"formula", ""}, {"role", ""}, {"CO2_per_mol", "mol/mol"}, {"reaction", ""}, {"source", ""}}},
		{Name: "amounts", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"fit", ""}}, Open: true},
		{Name: "residuals", Columns: []ColumnInfo{{"sample", ""}, {"date", ""}, {"Na", "µmol/L"}, {"K", "µmol/L"}, {"Ca", "µmol/L"}, {"Mg", "µmol/L"}, {"Cl", "µmol/L"}, {"SO4", "µmol/L"}, {"HCO3", "µeq/L"}, {"SiO2", "µmol/L"}}},
		{Name: "period", Columns: []ColumnInfo{{"mineral", ""}, {"flux", "mol/yr"}, {"yield", "mol/km²/yr"}, {"yield_low", "mol/km²/yr"}, {"yield_high", "mol/km²/yr"}, {"flux_weighted_mean", "µmol/L"}, {"CO2_per_mol", "mol/mol"}, {"CO2_consumed", "mol/km²/yr"}, {"CO2_consumed_low", "mol/km²/yr"}, {"CO2_consumed_high", "mol/km²/yr"}}},
		{Name: "catalogue", Columns: []ColumnInfo{{"mineral", ""}, {"name", ""}, {"formula", ""}, {"usual_role", ""}, {"CO2_per_mol", "mol/mol"}, {"source", ""}}},
	},
}

// headlines rank the figures the summary strip shows first: silicate,
// then carbonate, CO2 consumption per km²; the silicate weathering rate;
// runoff over the budget's complete years; the carbonate weathering rate;
// other CO2 figures per km², then the rest of the CO2 figures.
var headlines = map[Kind][]FigureInfo{
	KindCO2: {
		{Name: "silicate CO2 consumption per km²", Prefix: true, Rank: 0},
		{Name: "carbonate CO2 consumption per km²", Prefix: true, Rank: 1},
		{Name: "silicate CO2 consumption as carbon", Rank: 5},
		{Name: "carbonate CO2 consumption as carbon", Rank: 5},
		{Name: "silicate CO2 consumption", Rank: 6},
		{Name: "carbonate CO2 consumption", Rank: 6},
		{Name: "median silicate CO2 consumption per litre", Prefix: true, Rank: 6},
		{Name: "median carbonate CO2 consumption per litre", Prefix: true, Rank: 6},
	},
	KindFluxes: {
		{Name: "silicate weathering rate", Prefix: true, Rank: 2},
		{Name: "runoff over", Prefix: true, Rank: 3},
		{Name: "carbonate weathering rate", Prefix: true, Rank: 4},
	},
	KindMinerals: {
		{Name: "CO2 consumed by the minerals balanced, per km²", Rank: 5},
	},
}
