package web

import (
	"testing"

	"lixiv/engine/notebook"
)

func TestLabels(t *testing.T) {
	tests := []struct {
		name, got, want string
	}{
		{"column with unit", ColumnLabel(notebook.KindAtmosphere, "rain", &notebook.Column{Name: "Cl_atm", Unit: "µmol/L"}), "atmospheric Cl (µmol/L)"},
		{"bound with unit", ColumnLabel(notebook.KindCO2, "years", &notebook.Column{Name: "consumption_high", Unit: "mol/yr"}), "CO2 consumption, 97.5 % (mol/yr)"},
		{"cation and source", ColumnLabel(notebook.KindApportionment, "shares", &notebook.Column{Name: "Ca_silicate_low", Unit: "fraction"}), "Ca from silicate, 2.5 % (fraction)"},
		{"unknown column kept", ColumnLabel(notebook.KindFluxes, "t", &notebook.Column{Name: "odd_name"}), "odd_name"},
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

// TestColumnLabelsFromDescriptors: the page heads every column a
// descriptor labels with that label and the column's unit.
func TestColumnLabelsFromDescriptors(t *testing.T) {
	n := 0
	for _, k := range notebook.Kinds {
		for _, tab := range notebook.DescriptorOf(k).Tables {
			for _, c := range tab.Columns {
				want := notebook.ColumnLabel(k, tab.Name, c.Name)
				if l := tab.Label(c.Name); l != "" {
					n++
					if want != l {
						t.Errorf("%s.%s.%s: engine label %q, descriptor %q", k, tab.Name, c.Name, want, l)
					}
				}
				if c.Unit != "" {
					want += " (" + c.Unit + ")"
				}
				if got := ColumnLabel(k, tab.Name, &notebook.Column{Name: c.Name, Unit: c.Unit}); got != want {
					t.Errorf("%s.%s.%s: page shows %q, want %q", k, tab.Name, c.Name, got, want)
				}
			}
		}
	}
	if n == 0 {
		t.Error("no descriptor labels a column")
	}
}
