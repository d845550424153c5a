package notebook

import (
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestSchemaDefaultsMatchCode reads the default of every setting from
// SCHEMA.md, the first value in the brackets after its key in its kind's
// section ("`draws` (1000: ..."), and requires it to be the code's default
// (DefaultSettings), so the page and the engine cannot drift apart.
func TestSchemaDefaultsMatchCode(t *testing.T) {
	b, err := os.ReadFile("SCHEMA.md")
	if err != nil {
		t.Fatal(err)
	}
	doc := string(b)
	for _, k := range Kinds {
		head := "**`" + string(k) + "`**"
		i := strings.Index(doc, head)
		if i < 0 {
			t.Errorf("SCHEMA.md has no section for kind %q", k)
			continue
		}
		sec := doc[i+len(head):]
		if j := strings.Index(sec, "\n**`"); j >= 0 {
			sec = sec[:j]
		}
		sec = strings.Join(strings.Fields(sec), " ") // undo the line breaks
		for _, p := range Params(DefaultSettings(k)) {
			m := regexp.MustCompile("`" + regexp.QuoteMeta(p.Key) + "` \\(([^)]*)\\)").FindStringSubmatch(sec)
			if m == nil {
				t.Errorf("%s: SCHEMA.md gives no default for %q (want `%s` (value…))", k, p.Key, p.Key)
				continue
			}
			got, ok := firstLiteral(m[1])
			if !ok {
				t.Errorf("%s: SCHEMA.md's default of %q, %q, does not start with a value", k, p.Key, m[1])
				continue
			}
			if !sameDefault(p, got) {
				t.Errorf("%s %s: SCHEMA.md says %q, the code %q", k, p.Key, got, p.Value)
			}
		}
	}
}

// firstLiteral returns the value a bracket of SCHEMA.md starts with: a
// quoted text, a JSON list of quoted texts, a number or true/false.
func firstLiteral(s string) (string, bool) {
	s = strings.TrimSpace(s)
	switch {
	case strings.HasPrefix(s, `"`):
		j := strings.Index(s[1:], `"`)
		if j < 0 {
			return "", false
		}
		return s[1 : j+1], true
	case strings.HasPrefix(s, "["):
		j := strings.Index(s, "]")
		if j < 0 {
			return "", false
		}
		var items []string
		for _, it := range strings.Split(s[1:j], ",") {
			items = append(items, strings.Trim(strings.TrimSpace(it), `"`))
		}
		return strings.Join(items, ", "), true
	}
	tok := strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ';' || r == ':' || r == ' ' })
	if len(tok) == 0 {
		return "", false
	}
	if tok[0] == "true" || tok[0] == "false" {
		return tok[0], true
	}
	if _, err := strconv.ParseFloat(tok[0], 64); err != nil {
		return "", false
	}
	return tok[0], true
}

// sameDefault compares a setting's default with SCHEMA.md's text.
func sameDefault(p Param, doc string) bool {
	switch p.Type {
	case "number", "integer":
		v := p.Value
		if v == "" {
			v = "0" // a setting shown blank for 0 ("not given")
		}
		a, err1 := strconv.ParseFloat(v, 64)
		b, err2 := strconv.ParseFloat(doc, 64)
		return err1 == nil && err2 == nil && a == b
	}
	return p.Value == doc
}
