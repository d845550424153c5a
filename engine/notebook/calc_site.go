package notebook

import (
	"fmt"
	"math"
	"strings"

	"lixiv/engine/discharge"
)

// Site is the value a site cell hands to the cells below it.
type Site struct {
	Name           string
	AreaKm2        float64 // km²
	AreaSigma      float64 // 1σ relative uncertainty of the area (0.02 = 2 %)
	P, ET          float64 // mm/yr; 0 when not given
	Start, End     discharge.Day
	HasStart       bool
	HasEnd         bool
	WaterYearStart int // 1-12
}

func init() {
	Register(KindSite, computeSite)
	Register(KindNote, computeNote)
}

// parseDay reads a YYYY-MM-DD date.
func parseDay(s string) (discharge.Day, error) {
	var y, m, d int
	if _, err := fmt.Sscanf(strings.TrimSpace(s), "%4d-%2d-%2d", &y, &m, &d); err != nil || m < 1 || m > 12 || d < 1 || d > 31 {
		return 0, fmt.Errorf("%q is not a date written YYYY-MM-DD", s)
	}
	return discharge.Date(y, m, d), nil
}

func computeSite(e *Env) (*Output, error) {
	s := e.Cell.Settings.(*SiteSettings)
	v := &Site{Name: s.Name, AreaKm2: s.AreaKm2, AreaSigma: s.AreaUncertainty / 100, P: s.Precipitation,
		ET: s.Evapotranspiration, WaterYearStart: s.WaterYearStart}
	var err error
	if s.PeriodStart != "" {
		if v.Start, err = parseDay(s.PeriodStart); err != nil {
			return nil, settingErr("period_start", "%v", err)
		}
		v.HasStart = true
	}
	if s.PeriodEnd != "" {
		if v.End, err = parseDay(s.PeriodEnd); err != nil {
			return nil, settingErr("period_end", "%v", err)
		}
		v.HasEnd = true
	}
	if v.HasStart && v.HasEnd && v.End < v.Start {
		return nil, settingErr("period_end", "%s is before the %s, %s", s.PeriodEnd, SettingLabel("period_start"), s.PeriodStart)
	}
	out := &Output{Value: v}
	out.Figures = append(out.Figures, Point("catchment area", "km²", s.AreaKm2))
	if s.Precipitation > 0 && s.Evapotranspiration > 0 {
		if s.Evapotranspiration >= s.Precipitation {
			return nil, settingErr("evapotranspiration_mm", "%g must be below the %s, %g", s.Evapotranspiration, SettingLabel("precipitation_mm"), s.Precipitation)
		}
		out.Figures = append(out.Figures, Point("runoff from P − ET", "mm/yr", s.Precipitation-s.Evapotranspiration))
	}
	return out, nil
}

func computeNote(e *Env) (*Output, error) { return &Output{}, nil }

// finite reports whether x is a usable number.
func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
