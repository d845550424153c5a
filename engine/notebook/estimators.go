package notebook

import (
	"slices"

	"lixiv/engine/flux"
)

// Estimator is a flux estimator a fluxes cell may choose: the one list the
// setting's choices, its validation, the tables of estimators side by side
// and the figures' notes read. Adding an estimator is the flux package's
// method and one entry here.
type Estimator struct {
	Value  string      // the setting's value, "rating-curve"
	Label  string      // its name for readers, "flow-adjusted interpolation"
	Method flux.Method // the flux package's method
}

// estimators lists the estimators in the order the page offers them and
// the side-by-side tables list them.
var estimators = []Estimator{
	{"rating-curve", "rating-curve", flux.Rating},
	{"discharge-weighted", "discharge-weighted", flux.FlowWeighted},
	{"interpolation", "flow-adjusted interpolation", flux.PeriodWeighted},
	{"beale", "Beale ratio", flux.Beale},
}

// Estimators lists the estimators a fluxes cell may choose.
func Estimators() []Estimator { return slices.Clone(estimators) }

// AddEstimator adds an estimator to the fluxes cell's choices and to its
// side-by-side tables, and returns a function that removes it again. It is
// meant for setup code and tests, not for concurrent use.
func AddEstimator(e Estimator) (remove func()) {
	estimators = append(estimators, e)
	refresh := func() { setChoices(KindFluxes, "estimator", estimatorChoices()) }
	refresh()
	return func() {
		estimators = slices.DeleteFunc(estimators, func(x Estimator) bool { return x == e })
		refresh()
	}
}

// estimatorChoices are the choices of the fluxes cell's estimator setting.
func estimatorChoices() []Choice {
	out := make([]Choice, len(estimators))
	for i, e := range estimators {
		out[i] = Choice{Value: e.Value}
	}
	return out
}

// estimatorOf returns the estimator whose setting's value is v.
func estimatorOf(v string) (Estimator, bool) {
	for _, e := range estimators {
		if e.Value == v {
			return e, true
		}
	}
	return Estimator{}, false
}

// estimatorFor returns the estimator of method m.
func estimatorFor(m flux.Method) Estimator {
	for _, e := range estimators {
		if e.Method == m {
			return e
		}
	}
	return Estimator{Value: m.String(), Label: m.String(), Method: m}
}

// estimatorName returns the settings word for a flux method.
func estimatorName(m flux.Method) string { return estimatorFor(m).Value }

// estimatorLabel names an estimator for readers.
func estimatorLabel(m flux.Method) string { return estimatorFor(m).Label }

// estimatorMethod returns the flux method of the setting's value v.
func estimatorMethod(v string) flux.Method {
	e, _ := estimatorOf(v)
	return e.Method
}

// setChoices sets the choices of setting key of kind k.
func setChoices(k Kind, key string, cs []Choice) {
	d := descriptors[k]
	for i := range d.Notes {
		if d.Notes[i].Key == key {
			d.Notes[i].Choices = cs
			return
		}
	}
	d.Notes = append(d.Notes, SettingNote{Key: key, Choices: cs})
}
