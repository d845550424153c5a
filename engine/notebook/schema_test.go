package notebook

import (
	"os"
	"strings"
	"testing"
)

// TestSchemaDocumentsEverySetting keeps SCHEMA.md in step with the settings.
func TestSchemaDocumentsEverySetting(t *testing.T) {
	b, err := os.ReadFile("SCHEMA.md")
	if err != nil {
		t.Fatal(err)
	}
	doc := string(b)
	for _, k := range Kinds {
		if !strings.Contains(doc, "**`"+string(k)+"`**") {
			t.Errorf("SCHEMA.md has no section for kind %q", k)
		}
		for _, p := range Params(DefaultSettings(k)) {
			if !strings.Contains(doc, "`"+p.Key+"`") {
				t.Errorf("SCHEMA.md does not document %s setting %q", k, p.Key)
			}
		}
		for _, r := range k.Roles() {
			if !strings.Contains(doc, "`"+r.Name+"`") {
				t.Errorf("SCHEMA.md does not name input %q of %s", r.Name, k)
			}
		}
	}
}
