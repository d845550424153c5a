package notebook

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

// Kinds lists every kind a user can add, in the usual document order.
var Kinds = []Kind{KindSite, KindSamples, KindDischarge, KindCarbonate, KindAtmosphere, KindSources,
	KindApportionment, KindFluxes, KindCO2, KindMinerals, KindCompare, KindNote, KindChart}

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
	switch k {
	case KindDischarge:
		return []Role{{"site", KindSite, true}}
	case KindAtmosphere:
		return []Role{{"samples", KindSamples, false}, {"site", KindSite, true}}
	case KindApportionment:
		return []Role{{"atmosphere", KindAtmosphere, false}, {"sources", KindSources, false}}
	case KindFluxes:
		return []Role{{"apportionment", KindApportionment, false}, {"discharge", KindDischarge, false}, {"site", KindSite, false},
			{"carbonate", KindCarbonate, true}}
	case KindCO2:
		return []Role{{"fluxes", KindFluxes, true}, {"apportionment", KindApportionment, false}}
	case KindCarbonate:
		return carbonateRoles
	case KindMinerals:
		return mineralRoles
	case KindCompare:
		return compareRoles
	}
	return nil
}

// Valid reports whether k is a kind a user can add.
func (k Kind) Valid() bool {
	for _, x := range Kinds {
		if x == k {
			return true
		}
	}
	return false
}

// hasTable reports whether cells of kind k hold a data table.
func (k Kind) hasTable() bool {
	switch k {
	case KindSamples, KindDischarge, KindAtmosphere, KindSources:
		return true
	}
	return false
}
