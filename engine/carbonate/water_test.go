package carbonate

import (
	"errors"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
)

func TestAnalyseRefuses(t *testing.T) {
	ok := Water{TempC: 10, PH: 7.5, Alk: 1e-3, Ca: 4e-4, Mg: 1e-4, Background: 2e-3}
	for _, c := range []struct {
		name string
		edit func(*Water)
		want error  // nil: any error
		text string // in the message
	}{
		{"no pH", func(w *Water) { w.PH = math.NaN() }, ErrNoPH, ""},
		{"no temperature", func(w *Water) { w.TempC = math.NaN() }, ErrNoTemperature, ""},
		{"no alkalinity", func(w *Water) { w.Alk = math.NaN() }, ErrNoAlkalinity, ""},
		{"zero alkalinity", func(w *Water) { w.Alk = 0 }, ErrNoAlkalinity, ""},
		{"pH 15", func(w *Water) { w.PH = 15 }, nil, "pH 15"},
		{"boiling", func(w *Water) { w.TempC = 120 }, nil, "120 °C"},
		{"negative background", func(w *Water) { w.Background = -1 }, nil, "background"},
	} {
		w := ok
		c.edit(&w)
		_, err := Analyse(w, Davies)
		if err == nil || (c.want != nil && !errors.Is(err, c.want)) || !strings.Contains(err.Error(), c.text) {
			t.Errorf("%s: err %v", c.name, err)
		}
	}
}

// TestAnalyseWarns: a water beyond the activity model's validity, or
// beyond the constants' temperatures, is computed and says so.
func TestAnalyseWarns(t *testing.T) {
	for _, c := range []struct {
		name string
		w    Water
		m    Model
		warn string
	}{
		{"brackish, extended DH", Water{TempC: 20, PH: 7.8, Alk: 3e-3, Ca: 5e-3, Mg: 2e-2, Background: 0.2}, ExtendedDH, "above the 0.1 mol/L"},
		{"brine, Davies", Water{TempC: 20, PH: 7.8, Alk: 3e-3, Ca: 5e-3, Mg: 2e-2, Background: 0.7}, Davies, "above the 0.5 mol/L"},
		{"hot spring", Water{TempC: 95, PH: 7, Alk: 3e-3, Ca: 1e-3, Mg: 1e-4, Background: 0.01}, Davies, "outside the 0–90 °C"},
		{"ideal", Water{TempC: 20, PH: 7.8, Alk: 1e-3, Ca: 1e-3, Mg: 1e-4, Background: 0.003}, Ideal, "taken as 1"},
	} {
		r, err := Analyse(c.w, c.m)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if !strings.Contains(strings.Join(r.Warnings, "; "), c.warn) {
			t.Errorf("%s: warnings %q lack %q", c.name, r.Warnings, c.warn)
		}
	}
	r, _ := Analyse(Water{TempC: 10, PH: 7.5, Alk: 1e-3, Ca: 4e-4, Mg: 1e-4, Background: 2e-3}, Davies)
	if len(r.Warnings) > 0 {
		t.Errorf("a plain stream water warns: %q", r.Warnings)
	}
}

// TestAnalyseIsSelfConsistent: the ionic strength Analyse returns is the
// fixed point it claims (background plus the carbonate species it gives),
// and its species are Speciate's at the coefficients of that strength.
func TestAnalyseIsSelfConsistent(t *testing.T) {
	for _, m := range []Model{Davies, ExtendedDH} {
		w := Water{TempC: 8, PH: 8.1, Alk: 2.5e-3, Ca: 1.2e-3, Mg: 3e-4, Background: 3.5e-3}
		r, err := Analyse(w, m)
		if err != nil {
			t.Fatal(err)
		}
		I := w.Background + 0.5*(r.HCO3+4*r.CO3+r.OH+r.H)
		if relErr(r.I, I) > 1e-11 {
			t.Errorf("%s: I = %g, species give %g", m, r.I, I)
		}
		s := Speciate(w.Alk, w.PH, At(w.TempC), m.Gammas(r.I, w.TempC))
		if s != r.Species {
			t.Errorf("%s: species %+v, Speciate gives %+v", m, r.Species, s)
		}
		if math.IsNaN(r.SIDolomite) || math.IsNaN(r.SIAragonite) || !(r.SIAragonite < r.SICalcite) {
			t.Errorf("%s: SI %g %g %g", m, r.SICalcite, r.SIAragonite, r.SIDolomite)
		}
	}
	// Without Ca there are no saturation indices; without Mg no dolomite index.
	r, _ := Analyse(Water{TempC: 8, PH: 8.1, Alk: 2.5e-3, Ca: math.NaN(), Mg: 3e-4, Background: 3.5e-3}, Davies)
	if !math.IsNaN(r.SICalcite) || !math.IsNaN(r.SIDolomite) {
		t.Errorf("no Ca: SI %g, %g", r.SICalcite, r.SIDolomite)
	}
	r, _ = Analyse(Water{TempC: 8, PH: 8.1, Alk: 2.5e-3, Ca: 1e-3, Mg: math.NaN(), Background: 3.5e-3}, Davies)
	if math.IsNaN(r.SICalcite) || !math.IsNaN(r.SIDolomite) {
		t.Errorf("no Mg: SI %g, %g", r.SICalcite, r.SIDolomite)
	}
}

// TestBackground: I = ½ Σ c z² over the measured major ions; missing major
// ions are named.
func TestBackground(t *testing.T) {
	c := chem.NewComposition()
	c[chem.Na], c[chem.Ca], c[chem.Cl], c[chem.SO4], c[chem.NO3] = 100, 200, 50, 40, 10
	c[chem.Alk], c[chem.SiO2] = 450, 100 // not part of the background
	I, missing := Background(c)
	want := 0.5 * (100 + 4*200 + 50 + 4*40 + 10) * 1e-6
	if relErr(I, want) > 1e-12 {
		t.Errorf("I = %g, want %g", I, want)
	}
	if len(missing) != 2 || missing[0] != chem.K || missing[1] != chem.Mg {
		t.Errorf("missing %v, want [K Mg]", missing)
	}
}
