package discharge

import (
	"errors"
	"math"
	"testing"
)

func TestToM3s(t *testing.T) {
	tests := []struct {
		name string
		v    float64
		u    Unit
		area float64
		want float64
	}{
		{"m3/s unchanged", 2.5, M3PerS, 0, 2.5},
		{"L/s", 1250, LPerS, 0, 1.25},            // 1000 L = 1 m3 (common practice)
		{"m3/day", 86400, M3PerDay, 0, 1},        // 86400 s per day (common practice)
		{"ft3/s", 100, FT3PerS, 0, 2.8316846592}, // 1 ft = 0.3048 m exactly (docs/methods.md §1.1)
		{"mm/day over 86.4 km2", 1, MMPerDay, 86.4, 1},
		{"mm/day over 250 km2", 2, MMPerDay, 250, 2 * 250 / 86.4}, // 1e-3 m × 250e6 m² / 86400 s (common practice)
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := ToM3s(tt.v, tt.u, tt.area)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(got-tt.want) > 1e-12*tt.want {
				t.Errorf("got %.15g m3/s, want %.15g (tolerance 1e-12 relative)", got, tt.want)
			}
		})
	}
	if _, err := ToM3s(1, MMPerDay, 0); !errors.Is(err, ErrNeedArea) {
		t.Errorf("mm/day without area: got %v, want ErrNeedArea", err)
	}
	// 1 ft3 = 0.3048^3 m3 exactly (definition of the foot).
	if got, want := FT3, 0.3048*0.3048*0.3048; math.Abs(got-want) > 1e-17 {
		t.Errorf("FT3 = %.17g, want %.17g", got, want)
	}
}

func TestParseUnit(t *testing.T) {
	tests := []struct {
		in   string
		want Unit
	}{
		{"m3/s", M3PerS}, {"m³/s", M3PerS}, {"(m3/s)", M3PerS}, {"cms", M3PerS}, {"m3 s-1", M3PerS}, {"m^3/s", M3PerS},
		{"L/s", LPerS}, {"l s-1", LPerS}, {"l/sec", LPerS},
		{"m3/day", M3PerDay}, {"m3/d", M3PerDay},
		{"ft3/s", FT3PerS}, {"CFS", FT3PerS},
		{"mm/day", MMPerDay}, {"mm d-1", MMPerDay},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got, err := ParseUnit(tt.in)
			if err != nil || got != tt.want {
				t.Errorf("ParseUnit(%q) = %v, %v; want %v", tt.in, got, err, tt.want)
			}
		})
	}
	if _, err := ParseUnit("furlongs"); !errors.Is(err, ErrUnknownUnit) {
		t.Errorf("unknown unit: got %v, want ErrUnknownUnit", err)
	}
}
