package xlsxreader

import (
	"regexp"
	"strings"
	"testing"
)

// formatGroup is the regular expression isDateFormatCode replaces.
var formatGroup = regexp.MustCompile(`\[.+?\]|\\.|".*?"`)

func dateByRegexp(code string) bool {
	return strings.ContainsAny(formatGroup.ReplaceAllString(code, ""), "dmhysDMHYS")
}

// isDateFormatCode decides as the regular expression did, on number
// formats of the kinds spreadsheets write (common practice) and on
// awkward ones.
func TestIsDateFormatCodeAsRegexp(t *testing.T) {
	codes := []string{
		"", "0.00", "General", "yyyy-mm-dd", "d/m/yy", "h:mm:ss", "[h]:mm", "[$-409]0.00", "[Red]0.00",
		`0.00\d`, `"days"0`, `"d"`, `0 "h`, "[", "[]", "[]]", "[]d]", "[\n]d", "[d\n]", `\`, `\d`, `\` + "\n" + "d",
		`"`, `""d`, "\"a\nd\"", `[$€-2] #,##0.00`, `\€d`, "\\\xffd", "#,##0;[Red]-#,##0", "mmm-yy", "[Blue][>100]0", `"x"[y]\z`,
		"[mm]:ss", `_(* #,##0_);_(* \(#,##0\)`, "0.0E+00", "@", `[$-F800]dddd\,\ mmmm\ dd\,\ yyyy`,
	}
	for _, c := range codes {
		if got, want := isDateFormatCode(c), dateByRegexp(c); got != want {
			t.Errorf("%q: %v, want %v", c, got, want)
		}
	}
}

func FuzzIsDateFormatCode(f *testing.F) {
	for _, c := range []string{"yyyy-mm-dd", "[Red]0.00", `\d"m"[s]`, "[]]d", "\"\n\"y"} {
		f.Add(c)
	}
	f.Fuzz(func(t *testing.T, c string) {
		if got, want := isDateFormatCode(c), dateByRegexp(c); got != want {
			t.Errorf("%q: %v, want %v", c, got, want)
		}
	})
}
