package sample

import (
	"testing"

	"lixiv/engine/chem"
)

func TestClassify(t *testing.T) {
	// Header spellings from the issue and docs/methods.md §1.1 (common practice).
	tests := []struct {
		in      string
		kind    Kind
		species chem.Species
		basis   string
		unit    string
	}{
		{"Ca (mg/L)", Concentration, chem.Ca, "", "mg/L"},
		{"Ca2+ [µmol/L]", Concentration, chem.Ca, "", "µmol/L"},
		{"Calcium mg/l", Concentration, chem.Ca, "", "mg/l"},
		{"Ca_umol_L", Concentration, chem.Ca, "", "umol L"},
		{"Na_mg_L", Concentration, chem.Na, "", "mg L"},
		{"Na (ppm)", Concentration, chem.Na, "", "ppm"},
		{"Na", Concentration, chem.Na, "", ""},
		{"Sodium, dissolved", Concentration, chem.Na, "", ""},
		{"Sodium (dissolved)", Concentration, chem.Na, "", ""},
		{"SO4 2- (mg/L)", Concentration, chem.SO4, "", "mg/L"},
		{"SO₄²⁻ [mg/L]", Concentration, chem.SO4, "", "mg/L"},
		{"Sulphate mg/L", Concentration, chem.SO4, "", "mg/L"},
		{"SO4-S (mg/L)", Concentration, chem.SO4, "S", "mg/L"},
		{"NO3-N (mg/L)", Concentration, chem.NO3, "N", "mg/L"},
		{"Nitrate as N mg/l", Concentration, chem.NO3, "N", "mg/l"},
		{"Alkalinity as CaCO3 (mg/L)", Concentration, chem.Alk, "CaCO3", "mg/L"},
		{"Alk (mg/L CaCO3)", Concentration, chem.Alk, "", "mg/L CaCO3"},
		{"Alk_meq_L", Concentration, chem.Alk, "", "meq L"},
		{"HCO3- (mg/L)", Concentration, chem.HCO3, "", "mg/L"},
		{"Si (mg/L)", Concentration, chem.SiO2, "Si", "mg/L"},
		{"DSi [µM]", Concentration, chem.SiO2, "", "µM"},
		{"Sr (ppb)", Concentration, chem.Sr, "", "ppb"},
		{"Sample ID", ID, 0, "", ""}, {"Lab no.", ID, 0, "", ""},
		{"Site", Site, 0, "", ""}, {"Station name", Site, 0, "", ""},
		{"Date", Date, 0, "", ""}, {"Sample date", Date, 0, "", ""}, {"DateTime", Date, 0, "", ""},
		{"Date (dd/mm/yyyy)", Date, 0, "", "dd/mm/yyyy"}, {"Time", Clock, 0, "", ""},
		{"Q (m3/s)", Discharge, 0, "", "m3/s"}, {"Discharge [L/s]", Discharge, 0, "", "L/s"},
		{"Flow cfs", Discharge, 0, "", "cfs"}, {"cfs", Discharge, 0, "", "cfs"}, {"Q_m3_s", Discharge, 0, "", "m3 s"},
		{"87Sr/86Sr", SrRatio, 0, "", ""}, {"Sr87/Sr86", SrRatio, 0, "", ""}, {"87Sr86Sr", SrRatio, 0, "", ""},
		{"pH", PH, 0, "", ""}, {"pH_field", PH, 0, "", ""}, {"pH (lab)", PH, 0, "", ""},
		{"T", Temperature, 0, "", ""}, {"Temp_C", Temperature, 0, "", "C"}, {"Water temp", Temperature, 0, "", ""},
		{"Temperature (°C)", Temperature, 0, "", "°C"},
		{"EC", Conductivity, 0, "", ""}, {"SpC (µS/cm)", Conductivity, 0, "", "µS/cm"},
		{"Conductivity @25C", Conductivity, 0, "", ""}, {"Specific conductance mS/m", Conductivity, 0, "", "mS/m"},
		{"DOC (mg/L)", Meta, 0, "", ""}, {"Notes", Meta, 0, "", ""}, {"", Meta, 0, "", ""}, {"Ca (furlongs)", Meta, 0, "", ""},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got := classify(tc.in)
			if got.kind != tc.kind || got.unit != tc.unit || tc.kind == Concentration && (got.species != tc.species || got.basis != tc.basis) {
				t.Errorf("classify(%q) = %v %v %q %q; want %v %v %q %q", tc.in, got.kind, got.species, got.basis, got.unit,
					tc.kind, tc.species, tc.basis, tc.unit)
			}
		})
	}
}

func TestSideUnits(t *testing.T) {
	// 1 ft3/s = 0.028316846592 m3/s exactly (1 ft = 0.3048 m; docs/methods.md §1.1);
	// mS/m x 10 and mS/cm x 1000 to µS/cm (docs/methods.md §1.1).
	for _, tc := range []struct {
		in   string
		want float64
	}{{"m3/s", 1}, {"m³/s", 1}, {"m3 s-1", 1}, {"L/s", 1e-3}, {"l s-1", 1e-3}, {"cfs", 0.028316846592}, {"ft3/s", 0.028316846592}} {
		if got, ok := dischargeUnit(tc.in); !ok || got != tc.want {
			t.Errorf("dischargeUnit(%q) = %v, %v; want %v", tc.in, got, ok, tc.want)
		}
	}
	for _, tc := range []struct {
		in   string
		want float64
	}{{"µS/cm", 1}, {"uS/cm", 1}, {"µS cm-1", 1}, {"mS/m", 10}, {"mS/cm", 1000}, {"µS/cm @25°C", 1}} {
		if got, ok := conductivityUnit(tc.in); !ok || got != tc.want {
			t.Errorf("conductivityUnit(%q) = %v, %v; want %v", tc.in, got, ok, tc.want)
		}
	}
	if s, o, ok := temperatureUnit("°F"); !ok || 50*s+o != 10 {
		t.Errorf("50 °F = %v °C, want 10", 50*s+o)
	}
}
