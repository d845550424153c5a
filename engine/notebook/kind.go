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

// The built-in kinds, in the usual document order. Choice lists here are
// the only list of the values a setting accepts; the estimators are those
// of estimators.go.
func init() {
	Describe(Descriptor{Kind: KindSite, Label: "Site", New: func() Settings {
		return &SiteSettings{AreaUncertainty: 2, WaterYearStart: 10} // 2 %: docs/methods.md §8.6, common practice
	}, Choices: map[string][]Choice{"water_year_start_month": monthChoices()}})
	Describe(Descriptor{Kind: KindSamples, Label: "Samples", Table: true, New: func() Settings {
		// NICB limits: common practice. Precision: 2-5 % relative for major
		// ions by ion chromatography or ICP with a floor near the
		// detection limit, common practice, no source (package mix).
		return &SamplesSettings{BelowDetection: "half-limit", DateOrder: "auto", NICBFlag: 5, NICBReject: 10,
			PrecisionPercent: 100 * mix.DefaultRelPrecision, PrecisionFloor: mix.DefaultFloor, AlkFloor: mix.DefaultAlkFloor,
			SrFloor: mix.DefaultSrFloor, IsoPrecision: mix.DefaultIsoPrecision}
	}, Choices: map[string][]Choice{
		"below_detection": words("half-limit", "zero", "limit", "leave-out"),
		"date_order":      words("auto", "day-first", "month-first"),
	}})
	Describe(Descriptor{Kind: KindDischarge, Label: "Discharge", Table: true, Inputs: []Role{{"site", KindSite, true}},
		New: func() Settings { return &DischargeSettings{Unit: "m3/s", GapFillDays: 0, DateOrder: "auto"} },
		Choices: map[string][]Choice{
			"unit":       words("m3/s", "L/s", "m3/day", "mm/day"),
			"date_order": words("auto", "day-first", "month-first"),
		}})
	Describe(Descriptor{Kind: KindCarbonate, Label: "Carbonate system", Inputs: carbonateRoles,
		New:     func() Settings { return defaultCarbonateSettings() },
		Choices: map[string][]Choice{"activity_model": words("davies", "extended-debye-huckel")}})
	Describe(Descriptor{Kind: KindAtmosphere, Label: "Atmospheric input", Table: true,
		Inputs: []Role{{"samples", KindSamples, false}, {"site", KindSite, true}},
		New: func() Settings {
			// Sea-salt ratios to Cl: Millero et al. (2008), Deep-Sea Res. I 55, reference composition.
			return &AtmosphereSettings{Method: "sea-salt", NaPerCl: 0.859120, KPerCl: 0.0186998, CaPerCl: 0.0188361,
				MgPerCl: 0.0967577, SO4PerCl: 0.0517252, SrPerCl: 0.000166147, DryDeposition: 1,
				ExcessChloride: "halite", RatioSource: "seawater, Millero et al. 2008",
				// The docs/methods.md §8.6 asks for user values and gives none.
				// The default method takes the reference-seawater ratios, whose
				// major-ion proportions are constant in the open ocean (common
				// practice, from memory), so they start exact (0); a user who
				// measures rain, or expects fractionated aerosol or dust, sets a
				// spread (the rain cell warns when measured rain ratios are
				// taken as exact). The ET factor starts at 10 % (1σ; common
				// practice, no source); it matters only where Cl* comes from
				// measured rain. SCHEMA.md states both (a test reads it).
				RatioUncertainty: 0, FactorUncertainty: 10}
		},
		Choices: map[string][]Choice{
			"method":          words("sea-salt", "rain"),
			"excess_chloride": words("halite", "human"),
		},
		// The sea-salt method takes its ratios from the settings, not
		// from measured rain.
		ReadsTable: func(s Settings) bool { return s.(*AtmosphereSettings).Method != "sea-salt" }})
	Describe(Descriptor{Kind: KindSources, Label: "End-members", Table: true,
		New:     func() Settings { return &SourcesSettings{Preset: "global"} },
		Choices: map[string][]Choice{"preset": words("global", "granite", "basalt", "custom")}})
	Describe(Descriptor{Kind: KindApportionment, Label: "Apportionment",
		Inputs: []Role{{"atmosphere", KindAtmosphere, false}, {"sources", KindSources, false}},
		New: func() Settings {
			return &ApportionmentSettings{Model: "inverse", Tracers: []string{"Ca/Na", "Mg/Na", "HCO3/Na"},
				// Draws, target and cap: engineering choices (docs/methods.md).
				Draws: 400, TargetESS: 1000, MaxDraws: 20000, Seed: 1, Sulfate: "gypsum", Negative: "zero-and-flag",
				// δ34S end-members: evaporite sulfate about +10 to +35 ‰ (Claypool
				// et al. 1980), sedimentary sulfide usually negative; both from
				// memory (docs/methods.md §5.2). Users should set their own.
				D34SRiver: 5, D34SEvaporite: 15, D34SSulfide: -10}
		},
		Choices: map[string][]Choice{
			"model":              words("inverse", "forward"),
			"sulfate":            words("gypsum", "sulfide", "isotope"),
			"negative_residuals": words("zero-and-flag", "keep"),
		},
		// The δ34S values are read only when the sulfate source is
		// "isotope"; the tracers and the refinement only by the inverse
		// model.
		Idle: func(s Settings, key string) bool {
			a := s.(*ApportionmentSettings)
			switch key {
			case "tracers", "target_ess", "max_draws":
				return a.Model == "forward"
			}
			return strings.HasPrefix(key, "d34s_") && a.Sulfate != "isotope"
		}})
	Describe(Descriptor{Kind: KindFluxes, Label: "Fluxes",
		Inputs: []Role{{"apportionment", KindApportionment, false}, {"discharge", KindDischarge, false}, {"site", KindSite, false},
			{"carbonate", KindCarbonate, true}},
		New: func() Settings {
			// B = 1000 and σ_Q = 7 %: docs/methods.md §8.6 (Efron & Tibshirani 1993
			// for B; σ_Q common practice).
			// SeriesBootstrap = 200 keeps the intervals of the other series
			// cheap enough for the page to recompute after an edit (an
			// engineering choice, no source).
			// A quarter of the load resting on unapportioned samples or
			// unbracketed flow makes the fluxes doubtful (an engineering
			// choice, no source).
			return &FluxSettings{Estimator: "rating-curve", BiasCorrection: "smearing", Bootstrap: 1000, SeriesBootstrap: 200,
				DischargeUncertainty: 7, Seed: 1, Unapportioned: "leave-out", DoubtfulPercent: 25}
		},
		Choices: map[string][]Choice{
			"estimator":             estimatorChoices(),
			"bias_correction":       words("smearing", "ferguson", "none"),
			"unapportioned_samples": words("leave-out", "fill-shares"),
		}})
	Describe(Descriptor{Kind: KindCO2, Label: "CO2 budget",
		Inputs: []Role{{"fluxes", KindFluxes, true}, {"apportionment", KindApportionment, false}},
		New: func() Settings {
			return &CO2Settings{TimeScale: "short", SulfurSplit: "proportional", LongTerm: "conventional"}
		},
		Choices: map[string][]Choice{
			"time_scale":           words("short", "long"),
			"sulfur_split":         words("proportional", "carbonate"),
			"long_term_convention": words("conventional", "alkalinity"),
		}})
	Describe(Descriptor{Kind: KindMinerals, Label: "Mineral balance", Inputs: mineralRoles,
		New:     func() Settings { return defaultMineralSettings() },
		Choices: map[string][]Choice{"fit_components": words("all", "cations")}})
	Describe(Descriptor{Kind: KindNote, Label: "Note", New: func() Settings { return &NoteSettings{} }})
	Describe(Descriptor{Kind: KindChart, Label: "Chart", New: func() Settings { return &ChartSettings{Style: "points"} },
		Choices: map[string][]Choice{"style": words("points", "line")}})
	for k, d := range descriptors {
		d.Tables, d.Headline, d.Help = outputTables[k], headlines[k], settingHelp[k]
	}
}
