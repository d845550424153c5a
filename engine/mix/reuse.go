package mix

import (
	"math"
	"reflect"
)

// A run may take over the results of samples that an earlier run of
// another problem already worked, where nothing the sample's draws depend
// on differs: the run's options (the seed among them), the end-members
// and tracers, which give the first-stage table and the latent
// dimensions, and the sample's own place, name and setup (its data, their
// error model and the amounts its split is made of). Every sample draws
// from its own streams, keyed by its place, so such a sample's result is
// the earlier one bit for bit. The CO2 cell's comparison of sulfate
// origins runs the apportionment again with another origin: only the
// samples whose sulfate above the rain share is positive change.

// Reuse takes over from prev, the result of an earlier per-sample run,
// every sample it finished whose result this run would give bit for bit,
// and returns the samples left to work, in order. Step, Invert and Gather
// then pass over the samples taken over (counting their kept draws
// against Options.MaxKept in turn, as for the others). Call it before
// working any sample; a nil prev, or one from another kind of run, takes
// nothing over.
func (r *Run) Reuse(prev *Result) []int {
	todo := make([]int, 0, len(r.res.Samples))
	same := prev != nil && !prev.Joint && prev.Catchment == nil && r.cur == 0 && r.work == nil &&
		sameRunOptions(&prev.Options, &r.opt) && sameBits(prev.EndMembers, r.prob.EndMembers) && sameBits(prev.Tracers, r.prob.Tracers)
	if r.reused == nil {
		r.reused = make([]bool, len(r.res.Samples))
	}
	for s := range r.res.Samples {
		sr := &r.res.Samples[s]
		if !same || s >= len(prev.Samples) || !reusable(&prev.Samples[s], sr) {
			todo = append(todo, s)
			continue
		}
		st := sr.setup
		*sr = prev.Samples[s]
		sr.setup = st
		r.reused[s] = true
	}
	return todo
}

// reusable reports whether p, a sample an earlier run finished, is what
// working sr would give: the same name and setup, and a result complete.
func reusable(p, sr *SampleResult) bool {
	switch p.Status {
	case NotRun, Canceled:
		return false
	}
	return p.Name == sr.Name && sameBits(p.setup, sr.setup)
}

// unreuse sets sample s, taken over from an earlier run, back to a sample
// not begun.
func (r *Run) unreuse(s int) {
	r.res.Samples[s].notBegun()
	r.reused[s] = false
}

// notBegun sets sr back to what NewRun made it: its name, setup and the
// setup's warnings.
func (sr *SampleResult) notBegun() {
	*sr = SampleResult{Name: sr.Name, setup: sr.setup, Warnings: append([]error(nil), sr.setup.warnings...)}
}

// Reused reports whether sample s was taken over from an earlier run
// (Reuse).
func (r *Run) Reused(s int) bool { return r.reused != nil && r.reused[s] }

// sameRunOptions reports whether two runs' options (defaults filled in)
// give the same draws: all but the workers and the progress callback,
// which change no bit, and the cap on the kept draws, which each run
// applies to its own samples.
func sameRunOptions(a, b *Options) bool {
	x, y := *a, *b
	x.Workers, y.Workers = 0, 0
	x.Progress, y.Progress = nil, nil
	x.MaxKept, y.MaxKept = 0, 0
	return sameBits(x, y)
}

// sameBits reports whether a and b hold the same values, floats compared
// bit for bit (so that NaN equals NaN and 0 differs from −0), every field
// of a struct compared, exported or not, slices by length (nil apart from
// empty) and elements, pointers and interfaces by what they point to. A
// function value equals only a nil one. It is slow beside ==, and meant
// for the few comparisons Reuse makes per sample.
func sameBits(a, b any) bool {
	return sameValue(reflect.ValueOf(a), reflect.ValueOf(b))
}

func sameValue(a, b reflect.Value) bool {
	if a.IsValid() != b.IsValid() {
		return false
	}
	if !a.IsValid() {
		return true
	}
	if a.Type() != b.Type() {
		return false
	}
	switch a.Kind() {
	case reflect.Bool:
		return a.Bool() == b.Bool()
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return a.Int() == b.Int()
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Uintptr:
		return a.Uint() == b.Uint()
	case reflect.Float32, reflect.Float64:
		return math.Float64bits(a.Float()) == math.Float64bits(b.Float())
	case reflect.String:
		return a.String() == b.String()
	case reflect.Array:
		for i := range a.Len() {
			if !sameValue(a.Index(i), b.Index(i)) {
				return false
			}
		}
		return true
	case reflect.Slice:
		if a.IsNil() != b.IsNil() || a.Len() != b.Len() {
			return false
		}
		for i := range a.Len() {
			if !sameValue(a.Index(i), b.Index(i)) {
				return false
			}
		}
		return true
	case reflect.Struct:
		for i := range a.NumField() {
			if !sameValue(a.Field(i), b.Field(i)) {
				return false
			}
		}
		return true
	case reflect.Pointer, reflect.Interface:
		if a.IsNil() || b.IsNil() {
			return a.IsNil() && b.IsNil()
		}
		return sameValue(a.Elem(), b.Elem())
	case reflect.Func:
		return a.IsNil() && b.IsNil()
	}
	return false // maps, channels and the rest: never the same
}
