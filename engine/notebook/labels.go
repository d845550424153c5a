package notebook

import (
	"errors"
	"fmt"
	"strings"

	"lixiv/engine/mix"
	"lixiv/engine/sample"
)

// Settings are named in files by their JSON key ("area_km2") and on the
// page, and in the messages the engine gives about them, by a label with
// its unit ("area (km²)"). The labels live here, keyed by the setting's
// key, with those of the settings the sample importer names in its own
// messages (sample.SettingLabels, which cannot import this package); a
// key without an entry is labelled by the rules of SettingLabel.

// settingLabels labels settings whose key does not read well by rule.
var settingLabels = map[string]string{
	"d34s_river_permil":             "δ34S river (‰)",
	"d34s_evaporite_permil":         "δ34S evaporite (‰)",
	"d34s_sulfide_permil":           "δ34S sulfide (‰)",
	"et_factor_uncertainty_percent": "ET factor uncertainty (%)",
	"evapotranspiration_mm":         "evapotranspiration, ET (mm/yr)",
	"precipitation_mm":              "precipitation, P (mm/yr)",
	"gap_fill_days":                 "fill gaps up to (days)",
	"water_year_start_month":        "reporting year starts",
	"ratio_source":                  "source of the ratios",
	"long_term_convention":          "long-term convention",
	"log_x":                         "log x axis",
	"log_y":                         "log y axis",
	"x":                             "x axis",
	"y":                             "y axis",
	"sulfate":                       "sulfate source",
	"negative_residuals":            "negative residuals",
	"bootstrap":                     "bootstrap replicates",
	"series_bootstrap":              "series bootstrap replicates",
	"draws":                         "prior draws (first stage)",
	"target_ess":                    "target effective sample size",
	"max_draws":                     "most draws per sample",
	"precision_percent":             "analytical precision (%, 1σ)",
	"precision_floor_umol":          "precision floor, major ions",
	"alkalinity_floor_ueq":          "precision floor, alkalinity",
	"sr_floor_umol":                 "precision floor, Sr",
	"sr_isotope_precision":          "87Sr/86Sr precision (1σ)",
	"unapportioned_samples":         "samples without an apportionment",
	"doubtful_above_percent":        "doubtful above (% of load or flow)",
	// carbonate system and mineral balance cells
	"activity_model":                 "activity model",
	"si_calcite_flag":                "flag SI of calcite above",
	"atmospheric_pco2_uatm":          "pCO2 of the air (µatm)",
	"pco2_flag_factor":               "flag pCO2 above (× the air's)",
	"primary_minerals":               "primary minerals, which dissolve (names from the built-in table below, plagioclase AnNN, formulas, or name = formula)",
	"secondary_minerals":             "secondary minerals, which may form",
	"fit_components":                 "components fitted (cations: SiO2 and HCO3 as checks)",
	"analytical_uncertainty_percent": "analytical uncertainty weighting the fit (%)",
}

// unitSuffixes turn a setting key's unit ending into a readable unit.
var unitSuffixes = []struct{ suffix, unit string }{
	{"_km2", "km²"}, {"_percent", "%"}, {"_umol", "µmol/L"}, {"_mm", "mm/yr"},
	{"_degrees", "°"}, {"_month", "month"},
}

// SettingLabel labels the setting with the given key: "area_km2" is
// "area (km²)", "na_per_cl" is "Na/Cl (mol/mol)".
func SettingLabel(key string) string {
	if l, ok := settingLabels[key]; ok {
		return l
	}
	if l, ok := sample.SettingLabels[key]; ok {
		return l
	}
	unit := ""
	for _, s := range unitSuffixes {
		if strings.HasSuffix(key, s.suffix) {
			key, unit = strings.TrimSuffix(key, s.suffix), s.unit
			break
		}
	}
	l := strings.ReplaceAll(key, "_", " ")
	l = strings.ReplaceAll(l, " per ", "/")
	for _, a := range []string{"nicb", "co2", "so4"} {
		if strings.HasPrefix(l, a+" ") || l == a {
			l = strings.ToUpper(a) + l[len(a):]
		}
	}
	if strings.HasSuffix(l, "/cl") {
		l = strings.ToUpper(l[:1]) + l[1:len(l)-3] + "/Cl (mol/mol)"
		l = strings.Replace(l, "So4", "SO4", 1)
	}
	if unit != "" {
		l += " (" + unit + ")"
	}
	return l
}

// Output columns are named in files by their name ("Na_atm_share") and on
// the page by a label (ColumnLabel): the one the kind's descriptor gives
// (TableInfo.Labels), else one made by rule from the name.

// boundWords name the interval bounds of "_low" and "_high" columns.
var boundWords = []struct{ suffix, words string }{{"_low", ", 2.5 %"}, {"_high", ", 97.5 %"}}

// sourceWords name the sources in column names such as "Na_silicate".
var sourceWords = map[string]string{
	"atmosphere": "from the atmosphere", "evaporite": "from evaporite",
	"silicate": "from silicate", "carbonate": "from carbonate",
}

// SourceNames names the sources of the apportionment in report order, as
// output columns write them after a cation ("Na_silicate").
func SourceNames() []string {
	out := make([]string, mix.NSources)
	for s := range out {
		out[s] = mix.Source(s).String()
	}
	return out
}

// ColumnLabel labels column name of output table of a cell of kind k,
// without its unit: the label the descriptor gives; a bound's, its base's
// label with the bound ("CO2 consumption, 97.5 %"); a cation and a source,
// "Ca from silicate"; else the name itself.
func ColumnLabel(k Kind, table, name string) string {
	for _, b := range boundWords {
		if base := strings.TrimSuffix(name, b.suffix); base != name && base != "" {
			return ColumnLabel(k, table, base) + b.words
		}
	}
	if d := descriptors[k]; d != nil {
		for i := range d.Tables {
			if l := d.Tables[i].Label(name); l != "" && d.Tables[i].Name == table {
				return l
			}
		}
	}
	if i := strings.IndexByte(name, '_'); i > 0 {
		if w, ok := sourceWords[name[i+1:]]; ok {
			return name[:i] + " " + w
		}
	}
	return name
}

// ColumnUnitLabel is ColumnLabel with the column's unit, when it has one:
// "atmospheric share of Na (fraction)".
func ColumnUnitLabel(k Kind, table string, col *Column) string {
	l := ColumnLabel(k, table, col.Name)
	if col.Unit != "" {
		l += " (" + col.Unit + ")"
	}
	return l
}

// SettingError is a message about one setting of a cell. It reads with the
// setting's label ("area (km²): -3 is outside [0, 1e+08]"); KeyError gives
// it with the key a budget file uses.
type SettingError struct {
	Key  string // the setting's JSON key
	Text string // what is wrong
}

// Error implements error, naming the setting by its label.
func (e *SettingError) Error() string { return SettingLabel(e.Key) + ": " + e.Text }

// KeyError names the setting by its key, as in the file.
func (e *SettingError) KeyError() string { return e.Key + ": " + e.Text }

// settingErr returns a SettingError for key.
func settingErr(key, format string, args ...any) error {
	return &SettingError{Key: key, Text: fmt.Sprintf(format, args...)}
}

// fileText gives err as a budget file's reader wants it: a setting named
// by its key.
func fileText(err error) string {
	var se *SettingError
	if errors.As(err, &se) {
		return se.KeyError()
	}
	return err.Error()
}
