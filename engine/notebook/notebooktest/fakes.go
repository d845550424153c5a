// Package notebooktest registers a kind of cell and a flux estimator that
// exist only in tests, through their descriptors alone, so that the
// engine's, the command line's and the page's tests can prove that what a
// descriptor says reaches validation, SCHEMA.md's check, `lixiv kinds` and
// the page's choice lists.
package notebooktest

import (
	"fmt"
	"strings"

	"lixiv/engine/flux"
	"lixiv/engine/notebook"
)

// Document returns the text of SCHEMA.md, schema, with the test kind and
// estimator documented in it.
func Document(schema string) string {
	return strings.Replace(schema, "\"beale\":", "\"beale\", \"window-mean\":", 1) +
		"\n**`glaze`** — a test kind. Input `fluxes`. `finish` (\"matt\" or \"gloss\"), `depth_mm` (1).\n\n| glaze | `coats` | coat, depth (mm) |\n"
}

// GlazeSettings are the settings of a kind of cell that exists only in
// tests: it proves a kind registered through its descriptor alone is
// validated, documented, listed and offered.
type GlazeSettings struct {
	Finish string  `json:"finish"`
	Depth  float64 `json:"depth_mm"`
}

// Kind implements Settings.
func (*GlazeSettings) Kind() notebook.Kind { return "glaze" }

// Validate implements Settings.
func (s *GlazeSettings) Validate() error {
	if !(s.Depth >= 0 && s.Depth <= 10) {
		return &notebook.SettingError{Key: "depth_mm", Text: fmt.Sprintf("%g is outside [0, 10]", s.Depth)}
	}
	return nil
}

// DescribeFakes registers the test kind "glaze" (reading the fluxes) and a
// test estimator "window-mean" (the Beale method under another name), and
// returns the function that removes both.
func DescribeFakes() (remove func()) {
	r1 := notebook.AddEstimator(notebook.Estimator{Value: "window-mean", Label: "window mean", Method: flux.Beale})
	r2 := notebook.Describe(notebook.Descriptor{Kind: "glaze", Label: "Glaze", Inputs: []notebook.Role{{Name: "fluxes", Kind: notebook.KindFluxes, Optional: true}},
		New: func() notebook.Settings { return &GlazeSettings{Finish: "matt", Depth: 1} },
		Notes: []notebook.SettingNote{{Key: "finish", Help: "how the surface looks",
			Choices: []notebook.Choice{{Value: "matt"}, {Value: "gloss", Label: "gloss (shiny)"}}}},
		Tables: []notebook.TableInfo{{Name: "coats", Columns: []notebook.ColumnInfo{{Name: "coat"}, {Name: "depth", Unit: "mm"}}}},
		Compute: func(e *notebook.Env) (*notebook.Output, error) {
			return &notebook.Output{Tables: []*notebook.ResultTable{{Name: "coats", Columns: []*notebook.Column{notebook.TextColumn("coat", []string{"first"}), notebook.NumColumn("depth", "mm", []float64{1})}}}}, nil
		}})
	return func() { r2(); r1() }
}
