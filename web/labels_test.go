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
