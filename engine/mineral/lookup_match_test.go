package mineral

import (
	"regexp"
	"testing"
)

// The regular expressions plagioclaseAn and hydrateDot replace.
var (
	plagPattern = regexp.MustCompile(`(?i)^plagioclase\s*an\s*([0-9]+(?:\.[0-9]+)?)$`)
	hydratePat  = regexp.MustCompile(`\.[0-9]+H2O`)
)

// plagioclaseAn and hydrateDot decide as the regular expressions did.
func TestMatchersAsRegexp(t *testing.T) {
	for _, e := range []string{
		"plagioclase An38", "Plagioclase an 38.5", "PLAGIOCLASEAN50", "plagioclase\tAn\n7", "plagioclase An", "plagioclase An38.",
		"plagioclase An.5", "plagioclase An38.5.1", "plagioclase An 38 ", "plagioclase Ab38", "plagioclaſe An12", "plagioclase\vAn1",
		"xplagioclase An1", "plagioclase An1x", "plagioclase An０", "", "plagioclase",
	} {
		g, ok := plagioclaseAn(e)
		m := plagPattern.FindStringSubmatch(e)
		if ok != (m != nil) || ok && g != m[1] {
			t.Errorf("%q: %q %v, regular expression %q", e, g, ok, m)
		}
	}
	for _, f := range []string{"CaSO4.2H2O", "CaSO4·2H2O", "CaSO4.H2O", "Mg.12H2O.5", "a.b.3H2O", "..2H2O", ".2H2", "H2O.2", ".9H2O"} {
		if got, want := hydrateDot(f), hydratePat.MatchString(f); got != want {
			t.Errorf("%q: %v, want %v", f, got, want)
		}
	}
}

func FuzzMatchersAsRegexp(f *testing.F) {
	for _, s := range []string{"plagioclase An38.5", "CaSO4.2H2O", "plagioclaſe an 1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		g, ok := plagioclaseAn(s)
		m := plagPattern.FindStringSubmatch(s)
		if ok != (m != nil) || ok && g != m[1] {
			t.Errorf("%q: %q %v, regular expression %q", s, g, ok, m)
		}
		if got, want := hydrateDot(s), hydratePat.MatchString(s); got != want {
			t.Errorf("%q: hydrateDot %v, want %v", s, got, want)
		}
	})
}
