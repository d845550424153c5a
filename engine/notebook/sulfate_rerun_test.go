package notebook

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"slices"
	"sync"
	"testing"
)

// listing is a Farm that works samples in-process (as copies does, with
// one copy) and records the samples each job asked for.
type listing struct {
	copies
	mu   sync.Mutex
	asks map[string][]int // by the job's sulfate origin ("" for the cell's own)
}

func (f *listing) Work(ctx context.Context, job FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	f.mu.Lock()
	f.asks[job.Sulfate] = slices.Clone(samples)
	f.mu.Unlock()
	return f.copies.Work(ctx, job, samples, put, progress)
}

// TestSulfateRerunSameAsFull: the CO2 cell's rerun of the apportionment
// with another sulfate origin (Apportioned.Under) works again only the
// samples with sulfate above their rain share, in-process and on a Farm
// (whose job then lists only those), and every draw, weight, sulfide
// sulfate, status and summary of every sample is bit for bit what working
// every sample again gives: on the demo, and on the demo with the rain
// ratios' spread (so that the sulfate above the rain share varies from
// draw to draw).
func TestSulfateRerunSameAsFull(t *testing.T) {
	if runtime.GOOS == "js" {
		t.Skip("the demo's apportionment takes minutes in WebAssembly; the bits are the native ones (TestWorkersSameResults)")
	}
	data, err := os.ReadFile(filepath.Join("..", "..", "examples", "corrie-vale", "corrie-vale.lixiv.json"))
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	for _, c := range []struct{ name, spread string }{{"demo", ""}, {"demo with rain-ratio spread", "20"}} {
		t.Run(c.name, func(t *testing.T) {
			full := map[string]*Apportioned{}
			for _, way := range []string{"farm", "one goroutine", "two goroutines"} {
				d, err := Parse(data, "corrie-vale.lixiv.json")
				if err != nil {
					t.Fatal(err)
				}
				if c.spread != "" {
					if err := d.SetParam("rain", "rain_ratio_uncertainty_percent", c.spread); err != nil {
						t.Fatal(err)
					}
				}
				farm := &listing{copies: copies{n: 1, fail: -1}, asks: map[string][]int{}}
				switch way {
				case "farm":
					d.Farm = farm
				case "one goroutine":
					d.Workers = 1
				default:
					d.Workers = 2
				}
				a := apportionedOf(t, d)
				var above []int
				for i := range a.Corrected {
					if a.Corrected[i].SO4Star > 0 {
						above = append(above, i)
					}
				}
				if len(above) == 0 || len(above) == len(a.Corrected) {
					t.Fatalf("%d of %d samples with sulfate above the rain share; the case needs some with and some without", len(above), len(a.Corrected))
				}
				for _, o := range otherOrigins(a.Sulfate) {
					got, err := a.Under(ctx, o, func(int, int) {})
					if err != nil {
						t.Fatal(err)
					}
					if way == "farm" && !slices.Equal(farm.asks[o], above) {
						t.Errorf("rerun under %s: samples farmed %v, want those with sulfate above the rain share %v", o, farm.asks[o], above)
					}
					if full[o] == nil {
						if full[o], err = a.redo(ctx, o, false, func(int, int) {}); err != nil {
							t.Fatal(err)
						}
						if way == "farm" && len(farm.asks[o]) != len(a.Corrected) {
							t.Errorf("full rerun under %s: %d samples farmed, want all %d", o, len(farm.asks[o]), len(a.Corrected))
						}
					}
					if msg := sameApportioned(got, full[o]); msg != "" {
						t.Errorf("rerun under %s (%s) differs from the full rerun: %s", o, way, msg)
					}
				}
			}
		})
	}
}

// apportionedOf computes the cells of d up to its apportionment cell
// (the CO2 cell would run the other origins itself) and returns its value.
func apportionedOf(t *testing.T, d *Document) *Apportioned {
	t.Helper()
	for d.Output("apportionment") == nil {
		if _, err := d.Step(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	a, ok := d.Output("apportionment").Value.(*Apportioned)
	if !ok || a.Model != "inverse" {
		t.Fatalf("the demo's apportionment: %T, want the per-sample inverse model", d.Output("apportionment").Value)
	}
	return a
}

// sameApportioned compares two apportionments of the same samples bit for
// bit: each sample's kept draws (number, split, weight, sulfide sulfate),
// status, verdict, ESS, mean split and the inverse model's summary (every
// exported field, warnings by text). It returns the first difference, or "".
func sameApportioned(a, b *Apportioned) string {
	if len(a.Names) != len(b.Names) || a.Draws != b.Draws {
		return fmt.Sprintf("%d samples, %d draws; want %d, %d", len(a.Names), a.Draws, len(b.Names), b.Draws)
	}
	for i := range a.Names {
		if a.Kept(i) != b.Kept(i) {
			return fmt.Sprintf("sample %s: %d draws kept, want %d", a.Names[i], a.Kept(i), b.Kept(i))
		}
		for k := range a.Kept(i) {
			d1, s1, w1 := a.KeptDraw(i, k)
			d2, s2, w2 := b.KeptDraw(i, k)
			if d1 != d2 || !sameFloats(s1, s2) || !sameFloats(w1, w2) || !sameFloats(a.SO4Sulf(i, d1), b.SO4Sulf(i, d2)) {
				return fmt.Sprintf("sample %s, kept draw %d: %d %v %v %v, want %d %v %v %v", a.Names[i], k, d1, s1, w1, a.SO4Sulf(i, d1), d2, s2, w2, b.SO4Sulf(i, d2))
			}
		}
		if a.Status[i] != b.Status[i] || a.Verdict[i] != b.Verdict[i] || !sameFloats(a.ESS[i], b.ESS[i]) || !sameFloats(a.Mean[i], b.Mean[i]) || a.Doubtful(i) != b.Doubtful(i) {
			return fmt.Sprintf("sample %s: %v %q ESS %v, want %v %q %v", a.Names[i], a.Status[i], a.Verdict[i], a.ESS[i], b.Status[i], b.Verdict[i], b.ESS[i])
		}
		if msg := sameExported(reflect.ValueOf(a.inverse.Samples[i]), reflect.ValueOf(b.inverse.Samples[i]), a.Names[i]); msg != "" {
			return msg
		}
	}
	if a.inverse.Status != b.inverse.Status {
		return fmt.Sprintf("status %v, want %v", a.inverse.Status, b.inverse.Status)
	}
	return ""
}

// sameFloats reports whether two values of the same type hold the same
// floats bit for bit.
func sameFloats(a, b any) bool { return sameExported(reflect.ValueOf(a), reflect.ValueOf(b), "") == "" }

// sameExported compares the exported parts of two values, floats bit for
// bit and errors by text, and returns where they first differ.
func sameExported(a, b reflect.Value, at string) string {
	if a.Kind() == reflect.Interface && a.Type().Implements(reflect.TypeFor[error]()) {
		if a.IsNil() || b.IsNil() {
			if a.IsNil() != b.IsNil() {
				return at + ": one error is nil"
			}
			return ""
		}
		if x, y := a.Interface().(error).Error(), b.Interface().(error).Error(); x != y {
			return fmt.Sprintf("%s: %q, want %q", at, x, y)
		}
		return ""
	}
	switch a.Kind() {
	case reflect.Float64:
		if math.Float64bits(a.Float()) != math.Float64bits(b.Float()) {
			return fmt.Sprintf("%s: %v, want %v", at, a.Float(), b.Float())
		}
	case reflect.Array, reflect.Slice:
		if a.Len() != b.Len() {
			return fmt.Sprintf("%s: length %d, want %d", at, a.Len(), b.Len())
		}
		for i := range a.Len() {
			if m := sameExported(a.Index(i), b.Index(i), fmt.Sprintf("%s[%d]", at, i)); m != "" {
				return m
			}
		}
	case reflect.Struct:
		for i := range a.NumField() {
			if f := a.Type().Field(i); f.IsExported() {
				if m := sameExported(a.Field(i), b.Field(i), at+"."+f.Name); m != "" {
					return m
				}
			}
		}
	case reflect.Pointer:
		if a.IsNil() || b.IsNil() {
			if a.IsNil() != b.IsNil() {
				return at + ": one is nil"
			}
			return ""
		}
		return sameExported(a.Elem(), b.Elem(), at)
	default:
		if a.Interface() != b.Interface() {
			return fmt.Sprintf("%s: %v, want %v", at, a.Interface(), b.Interface())
		}
	}
	return ""
}
