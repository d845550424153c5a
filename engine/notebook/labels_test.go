package notebook

import (
	"testing"

	"lixiv/engine/mix"
)

func TestColumnLabel(t *testing.T) {
	tests := []struct {
		name        string
		kind        Kind
		table, col  string
		want        string
		unit, label string // a column with a unit, and its label
	}{
		{name: "by table", kind: KindCO2, table: "per-litre", col: "silicate", want: "silicate CO2 consumption"},
		{name: "bound", kind: KindCO2, table: "years", col: "consumption_high", want: "CO2 consumption, 97.5 %"},
		{name: "same name, other table", kind: KindCO2, table: "sulfate", col: "per_km2_low", want: "per km², 2.5 %"},
		{name: "same table name, other kind", kind: KindDischarge, table: "years", col: "days with data", want: "share of days with data"},
		{name: "rain", kind: KindAtmosphere, table: "rain", col: "Na_atm_share", want: "atmospheric share of Na"},
		{name: "cation and source", kind: KindApportionment, table: "shares", col: "Ca_silicate_low", want: "Ca from silicate, 2.5 %"},
		{name: "open column", kind: KindApportionment, table: "amounts", col: "SO4_sulfide", want: "SO4 from sulfide"},
		{name: "carbonate", kind: KindCarbonate, table: "carbonate", col: "SI_calcite", want: "SI of calcite"},
		{name: "minerals bound", kind: KindMinerals, table: "period", col: "CO2_consumed_low", want: "CO2 consumed, 2.5 %"},
		{name: "residual", kind: KindMinerals, table: "residuals", col: "SiO2", want: "SiO2 left"},
		{name: "not in another kind", kind: KindFluxes, table: "rain", col: "Na_atm_share", want: "Na_atm_share"},
		{name: "unknown kept", kind: KindFluxes, table: "t", col: "odd_name", want: "odd_name"},
		{name: "no kind", kind: KindBroken, table: "rain", col: "Cl_atm", want: "Cl_atm"},
		{name: "with unit", kind: KindAtmosphere, table: "rain", col: "Cl_atm", want: "atmospheric Cl", unit: "µmol/L", label: "atmospheric Cl (µmol/L)"},
		{name: "without unit", kind: KindFluxes, table: "mean", col: "series", want: "series", label: "series"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := ColumnLabel(tt.kind, tt.table, tt.col); got != tt.want {
				t.Errorf("ColumnLabel = %q, want %q", got, tt.want)
			}
			if tt.label == "" {
				return
			}
			if got := ColumnUnitLabel(tt.kind, tt.table, &Column{Name: tt.col, Unit: tt.unit}); got != tt.label {
				t.Errorf("ColumnUnitLabel = %q, want %q", got, tt.label)
			}
		})
	}
}

// TestColumnLabelsNameColumns: every label a descriptor gives names a
// column of its table (or of an open table, whose columns the data name),
// so that no label is lost to a renamed column.
func TestColumnLabelsNameColumns(t *testing.T) {
	for _, k := range Kinds {
		for _, tab := range DescriptorOf(k).Tables {
			for _, l := range tab.Labels {
				name := l.Column
				found := tab.Open
				for _, c := range tab.Columns {
					found = found || c.Name == name
				}
				if !found {
					t.Errorf("%s.%s: label for %q, which is not a column", k, tab.Name, name)
				}
			}
		}
	}
}

// TestSourceWords: every source of the apportionment reads as words in a
// column name such as "Na_silicate".
func TestSourceWords(t *testing.T) {
	names := SourceNames()
	if len(names) != int(mix.NSources) || names[mix.Silicate] != "silicate" {
		t.Errorf("SourceNames() = %q", names)
	}
	for _, s := range names {
		if sourceWords[s] == "" {
			t.Errorf("no words for %s", s)
		}
	}
}
