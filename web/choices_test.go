package web

import (
	"slices"
	"strings"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/notebook/notebooktest"
)

// TestChoicesOfferedAreAccepted: every value the page offers for a setting
// that takes one of a few words is accepted by the engine, a value it does
// not offer is refused, and every value the engine's descriptors accept is
// offered, for every kind, including a kind and an estimator registered
// through their descriptors alone.
func TestChoicesOfferedAreAccepted(t *testing.T) {
	defer notebooktest.DescribeFakes()()
	d := notebook.New("choices")
	for _, k := range notebook.Kinds {
		if _, err := d.Add(k, -1); err != nil {
			t.Fatal(err)
		}
	}
	s := NewSession(d, "choices.lixiv.json", Origin{})
	offered := map[[3]string]bool{}
	for _, v := range s.Cells("", 0, nil) {
		k := notebook.Kind(v.Kind)
		for _, p := range v.Params {
			if len(p.Options) == 0 || k == notebook.KindChart && (p.Key == "x" || p.Key == "y") ||
				k == notebook.KindCompare && strings.HasSuffix(p.Key, "_section") {
				continue // free values; a chart's columns and a comparison's sections are those of the budget
			}
			if p.OptionLabels != nil && len(p.OptionLabels) != len(p.Options) {
				t.Errorf("%s %s: %d labels for %d choices", k, p.Key, len(p.OptionLabels), len(p.Options))
			}
			for _, o := range p.Options {
				offered[[3]string{string(k), p.Key, o}] = true
				if err := s.Doc.Clone().SetParam(v.ID, p.Key, o); err != nil {
					t.Errorf("%s %s = %q is offered but refused: %v", k, p.Key, o, err)
				}
			}
			if err := s.Doc.Clone().SetParam(v.ID, p.Key, "not offered"); err == nil {
				t.Errorf("%s %s accepts a value the page does not offer", k, p.Key)
			}
		}
	}
	for _, k := range notebook.Kinds {
		for _, st := range notebook.DescriptorOf(k).Settings() {
			for _, c := range st.Choices {
				if !offered[[3]string{string(k), st.Key, c.Value}] {
					t.Errorf("%s %s = %q is accepted but not offered", k, st.Key, c.Value)
				}
			}
		}
	}
	for _, want := range [][3]string{{"glaze", "finish", "gloss"}, {"fluxes", "estimator", "window-mean"}} {
		if !offered[want] {
			t.Errorf("the page does not offer %q", want)
		}
	}
	if !slices.Contains((&Root{}).Kinds(), "glaze") || KindLabel("glaze") != "Glaze" {
		t.Error("the described kind is not among the kinds the page adds")
	}
}
