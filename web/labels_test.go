package web

import (
	"testing"

	"lixiv/engine/notebook"
)

func TestLabels(t *testing.T) {
	tests := []struct {
		name, got, want string
	}{
		{"column by table", ColumnName("per-litre", "silicate"), "silicate CO2 consumption"},
		{"column bound", ColumnName("years", "consumption_high"), "CO2 consumption, 97.5 %"},
		{"column by name", ColumnName("rain", "Na_atm_share"), "atmospheric share of Na"},
		{"cation and source", ColumnName("shares", "Ca_silicate_low"), "Ca from silicate, 2.5 %"},
		{"per km² bound", ColumnName("other", "per_km2_low"), "per km², 2.5 %"},
		{"unknown column kept", ColumnName("t", "odd_name"), "odd_name"},
		{"column with unit", ColumnLabel("rain", &notebook.Column{Name: "Cl_atm", Unit: "µmol/L"}), "atmospheric Cl (µmol/L)"},
		{"water year", WaterYear("2021", 10), "2021 (water year Oct 2020–Sep 2021)"},
		{"calendar year", WaterYear("2021", 1), "2021"},
		{"not a year", WaterYear("mean", 10), "mean"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if tt.got != tt.want {
				t.Errorf("got %q, want %q", tt.got, tt.want)
			}
		})
	}
}

func TestIdleSettings(t *testing.T) {
	params := func(sulfate, model string) []notebook.Param {
		return []notebook.Param{{Key: "model", Value: model}, {Key: "sulfate", Value: sulfate}, {Key: "d34s_river_permil", Value: "5"}}
	}
	tests := []struct {
		kind           notebook.Kind
		key            string
		sulfate, model string
		want           bool
	}{
		{notebook.KindApportionment, "d34s_river_permil", "gypsum", "inverse", true},
		{notebook.KindApportionment, "d34s_river_permil", "isotope", "inverse", false},
		{notebook.KindApportionment, "draws", "gypsum", "inverse", false},
		{notebook.KindApportionment, "target_ess", "gypsum", "inverse", false},
		{notebook.KindApportionment, "target_ess", "gypsum", "catchment", true},
		{notebook.KindApportionment, "max_draws", "gypsum", "forward", true},
		{notebook.KindApportionment, "tracers", "gypsum", "catchment", false},
		{notebook.KindApportionment, "tracers", "gypsum", "forward", true},
		{notebook.KindAtmosphere, "d34s_river_permil", "gypsum", "inverse", false},
	}
	for _, tt := range tests {
		if got := idle(tt.kind, tt.key, params(tt.sulfate, tt.model)); got != tt.want {
			t.Errorf("idle(%s, %s, sulfate %s, model %s): got %v, want %v", tt.kind, tt.key, tt.sulfate, tt.model, got, tt.want)
		}
	}
}
