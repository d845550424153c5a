package sample

import (
	"strings"
	"unicode"

	"lixiv/engine/chem"
)

// heading is what a header cell says: a kind, a species for concentration
// columns, and the unit text it carries, if any.
type heading struct {
	kind    Kind
	species chem.Species
	basis   string // mass basis implied by the name ("N" for NO3-N)
	unit    string // unit text found in the header
	field   int    // for pH: +1 field, -1 lab, 0 unspecified
}

// nameKinds maps a squeezed header name (lower case, letters and digits
// only) to its kind. Spellings follow docs/methods.md §1.1.
var nameKinds = map[string]Kind{
	"id": ID, "sampleid": ID, "sample": ID, "samplename": ID, "sampleno": ID, "samplenumber": ID,
	"samplecode": ID, "probe": ID, "probennummer": ID, "labid": ID, "labno": ID, "labcode": ID, "labnumber": ID, "code": ID, "sampleref": ID,
	"site": Site, "siteid": Site, "sitename": Site, "sitecode": Site, "station": Site, "stationid": Site,
	"stationname": Site, "stationcode": Site, "location": Site, "locality": Site, "river": Site, "stream": Site,
	"samplingpoint": Site, "samplingsite": Site, "catchment": Site, "messstelle": Site,
	"date": Date, "sampledate": Date, "samplingdate": Date, "datesampled": Date, "collectiondate": Date,
	"datecollected": Date, "datum": Date, "datetime": Date, "dateandtime": Date, "timestamp": Date, "day": Date,
	"time": Clock, "uhrzeit": Clock, "zeit": Clock, "sampletime": Clock, "samplingtime": Clock, "timeofday": Clock, "clock": Clock,
	"q": Discharge, "discharge": Discharge, "flow": Discharge, "streamflow": Discharge, "qinst": Discharge,
	"qsampling": Discharge, "flowrate": Discharge, "cms": Discharge, "cfs": Discharge, "cumecs": Discharge,
	"87sr86sr": SrRatio, "sr87sr86": SrRatio, "8786sr": SrRatio, "sr8786": SrRatio, "87sr": SrRatio,
	"ph": PH, "phfield": PH, "fieldph": PH, "phlab": PH, "labph": PH, "phinsitu": PH,
	"t": Temperature, "temp": Temperature, "temperature": Temperature, "wt": Temperature, "tw": Temperature,
	"watertemp": Temperature, "watertemperature": Temperature, "twater": Temperature,
	"ec": Conductivity, "cond": Conductivity, "conductivity": Conductivity, "spc": Conductivity,
	"sc": Conductivity, "specificconductance": Conductivity, "specificconductivity": Conductivity,
	"spcond": Conductivity, "ec25": Conductivity, "conductivity25c": Conductivity, "conductivityat25c": Conductivity,
	"electricalconductivity": Conductivity, "cond25c": Conductivity, "ec25c": Conductivity,
}

// impliedUnit gives the unit a header name carries by itself.
var impliedUnit = map[string]string{"cms": "m3/s", "cumecs": "m3/s", "cfs": "cfs"}

// squeeze lowers s and keeps letters and digits only.
func squeeze(s string) string {
	var b strings.Builder
	for _, r := range s {
		if unicode.IsLetter(r) || unicode.IsDigit(r) {
			b.WriteRune(unicode.ToLower(r))
		}
	}
	return b.String()
}

// splitBracket separates "Ca (mg/L)" or "Ca2+ [µmol/L]" into the name and the
// text in the last pair of brackets.
func splitBracket(h string) (name, inner string, ok bool) {
	h = strings.TrimSpace(h)
	for _, p := range [][2]byte{{'(', ')'}, {'[', ']'}, {'{', '}'}} {
		o := strings.LastIndexByte(h, p[0])
		if o < 0 {
			continue
		}
		c := strings.IndexByte(h[o:], p[1])
		if c < 0 {
			continue
		}
		c += o
		name = strings.TrimSpace(h[:o] + " " + h[c+1:])
		return name, strings.TrimSpace(h[o+1 : c]), true
	}
	return h, "", false
}

// classify reads a header cell. Unknown headers give Meta.
func classify(h string) heading {
	name, inner, br := splitBracket(h)
	if br {
		if hd, ok := classifyName(name); ok {
			if isUnitText(hd.kind, inner) {
				hd.unit = inner
				return hd
			}
		}
		// The brackets hold part of the name: "Sodium (dissolved)".
		name = strings.TrimSpace(name + " " + inner)
	}
	toks := strings.FieldsFunc(name, func(r rune) bool { return r == ' ' || r == '_' || r == '\t' })
	for k := len(toks); k >= 1; k-- {
		hd, ok := classifyName(strings.Join(toks[:k], " "))
		if !ok {
			continue
		}
		rest := strings.Join(toks[k:], " ")
		if rest == "" {
			return hd
		}
		if isUnitText(hd.kind, rest) {
			hd.unit = rest
			return hd
		}
	}
	return heading{kind: Meta}
}

// classifyName reads a header name without its unit.
func classifyName(name string) (heading, bool) {
	sq := squeeze(name)
	if k, ok := nameKinds[sq]; ok {
		hd := heading{kind: k, unit: impliedUnit[sq]}
		if k == PH {
			switch {
			case strings.Contains(sq, "field") || strings.Contains(sq, "insitu"):
				hd.field = 1
			case strings.Contains(sq, "lab"):
				hd.field = -1
			}
		}
		return hd, true
	}
	if sp, basis, ok := chem.ParseSpecies(name); ok {
		return heading{kind: Concentration, species: sp, basis: basis}, true
	}
	return heading{}, false
}

// isUnitText reports whether s reads as a unit of a column of kind k.
func isUnitText(k Kind, s string) bool {
	switch k {
	case Concentration:
		_, err := chem.ParseUnit(s)
		return err == nil
	case Discharge:
		_, ok := dischargeUnit(s)
		return ok
	case Temperature:
		_, _, ok := temperatureUnit(s)
		return ok
	case Conductivity:
		_, ok := conductivityUnit(s)
		return ok
	case PH, SrRatio:
		return isNoUnit(s)
	case Date, Clock:
		_, ok := dateFormat(s)
		return ok || isNoUnit(s)
	}
	return false
}

// isNoUnit reports whether a units-row cell says "no unit".
func isNoUnit(s string) bool {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "-", "–", "—", "unitless", "dimensionless", "ph units", "ph unit", "units", "su", "s.u.", "ratio", "utc", "local":
		return true
	}
	return false
}

// unitKey lowers a unit and drops spaces, dots and exponents signs so that
// "m³ s⁻¹", "m3/s" and "m3.s-1" compare alike.
func unitKey(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	s = strings.Trim(s, "()[]{} ")
	r := strings.NewReplacer("³", "3", "⁻¹", "-1", "μ", "µ", " ", "", "·", "", "_", "/", "º", "°")
	return r.Replace(s)
}

// dischargeUnit returns the factor from a discharge unit to m³/s.
func dischargeUnit(s string) (float64, bool) {
	switch unitKey(s) {
	case "m3/s", "m3s-1", "m3.s-1", "m3s", "cms", "cumecs":
		return 1, true
	case "l/s", "ls-1", "l.s-1", "ls", "litres/s", "liters/s":
		return 1e-3, true
	case "cfs", "ft3/s", "ft3s-1", "cuft/s":
		return 0.028316846592, true // 1 ft = 0.3048 m exactly (docs/methods.md §1.1)
	case "m3/d", "m3/day", "m3d-1":
		return 1.0 / 86400, true
	case "m3/h", "m3/hr", "m3h-1":
		return 1.0 / 3600, true
	case "ml/d", "mld", "ml/day":
		return 1e3 / 86400, true // megalitres per day
	}
	return 0, false
}

// temperatureUnit returns the scale and offset from a temperature unit to °C.
func temperatureUnit(s string) (scale, offset float64, ok bool) {
	switch unitKey(s) {
	case "c", "°c", "degc", "deg.c", "celsius", "degreesc", "oc":
		return 1, 0, true
	case "f", "°f", "degf", "fahrenheit":
		return 5.0 / 9, -32 * 5.0 / 9, true
	}
	return 0, 0, false
}

// conductivityUnit returns the factor from a conductivity unit to µS/cm.
// A reference temperature written after it ("µS/cm @25°C") is allowed.
func conductivityUnit(s string) (float64, bool) {
	k := unitKey(s)
	for _, suf := range []string{"@25°c", "@25c", "at25°c", "at25c", "25°c", "25c", "@25"} {
		k = strings.TrimSuffix(k, suf)
	}
	switch k {
	case "µs/cm", "us/cm", "µscm-1", "uscm-1", "µs":
		return 1, true
	case "ms/cm", "mscm-1":
		return 1000, true
	case "ms/m", "msm-1":
		return 10, true
	case "s/m", "sm-1":
		return 1e4, true
	}
	return 0, false
}
