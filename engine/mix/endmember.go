package mix

import (
	"errors"
	"fmt"
)

// EndMember is a user-defined source of solutes for the inverse model: a
// name, the reservoir its cations are booked to, and a prior for each ratio
// to Na (and for 87Sr/86Sr). Ratios the user does not set are fixed at 0,
// which is right for Cl/Na of a rock but must be set for every tracer in use
// that the end-member carries.
type EndMember struct {
	Name   string
	Source Source
	Ratio  [NTracers]Prior
	Ref    string // where the values come from, shown with the results
}

// Central returns the central value of each ratio: the fixed end-member the
// forward model would use.
func (e *EndMember) Central() [NTracers]float64 {
	var v [NTracers]float64
	for t := range v {
		v[t] = e.Ratio[t].Value
	}
	return v
}

// Validate checks the name, source and every prior.
func (e *EndMember) Validate() error {
	if e.Name == "" {
		return errors.New("mix: end-member without a name")
	}
	if e.Source < 0 || e.Source >= NSources {
		return fmt.Errorf("mix: end-member %q: unknown source %d", e.Name, int(e.Source))
	}
	for t, p := range e.Ratio {
		if err := p.Validate(); err != nil {
			return fmt.Errorf("mix: end-member %q, %s: %v", e.Name, Tracer(t), err)
		}
	}
	return nil
}

// Fix returns a copy of e with every prior collapsed to its central value.
func (e EndMember) Fix() EndMember {
	for t := range e.Ratio {
		e.Ratio[t] = FixedRatio(e.Ratio[t].Value)
	}
	return e
}
