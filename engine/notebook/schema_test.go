package notebook

import (
	"os"
	"testing"
)

// TestSchemaDocumentsEverySetting keeps SCHEMA.md in step with the
// descriptors.
func TestSchemaDocumentsEverySetting(t *testing.T) {
	b, err := os.ReadFile("SCHEMA.md")
	if err != nil {
		t.Fatal(err)
	}
	for _, g := range SchemaGaps(string(b)) {
		t.Errorf("SCHEMA.md does not document: %s", g)
	}
}
