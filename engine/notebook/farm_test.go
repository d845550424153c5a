package notebook

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
)

// copies is a Farm that works samples as the page's Web Workers do, each
// copy of the engine with a document of its own read from the job's
// budget, here on goroutines; fail makes the copy working that sample fail.
type copies struct {
	n    int
	fail int // sample whose copy fails, or -1
	jobs atomic.Int64
	// rounds counts the jobs that are rounds of the catchment-wide model.
	rounds atomic.Int64
}

func (f *copies) Work(ctx context.Context, job FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	f.jobs.Add(1)
	if job.State != nil {
		f.rounds.Add(1)
	}
	var next atomic.Int64
	var mu sync.Mutex
	errs := make([]error, f.n)
	var wg sync.WaitGroup
	for c := range f.n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var w *FarmWork
			for {
				i := int(next.Add(1)) - 1
				if i >= len(samples) {
					return
				}
				s := samples[i]
				if s == f.fail {
					errs[c] = fmt.Errorf("engine copy %d stopped", c+1)
					return
				}
				if w == nil || !w.Same(job) {
					var err error
					if w, err = NewFarmWork(ctx, job, w); err != nil {
						errs[c] = err
						return
					}
				}
				b, err := w.Unit(ctx, job.State, s, nil)
				if err == nil {
					mu.Lock()
					err = put(s, b)
					progress(float64(i+1) / float64(len(samples)))
					mu.Unlock()
				}
				if err != nil {
					errs[c] = err
					return
				}
			}
		}()
	}
	wg.Wait()
	return errors.Join(errs...)
}

// TestFarmedSameResults computes example budgets, quick pass first as
// the page does, with their inversions worked by copies of the engine: the
// results checksum equals the one stored in the file (computed
// in-process). In the demo the apportionment and the CO2 cell's second
// sulfate origin both go through the farm; in the catchment-wide example
// the chains and samples of its model, round by round. A copy that fails
// is named in the cell.
func TestFarmedSameResults(t *testing.T) {
	if runtime.GOOS == "js" {
		t.Skip("one thread: in WebAssembly the page's workers are checked by the browser tests TestWorkersSameResults and TestWorkersCatchmentSameResults")
	}
	cases := []struct {
		example      string
		copies, fail int   // the copies, and the unit of the copy that fails
		jobs, rounds int64 // the fewest jobs, and of them rounds of the catchment-wide model
		why          string
	}{
		{"corrie-vale", 3, 3, 3, 0, "the quick and full apportionment and the CO2 cell's second origin"},
		{"scarrow-ghyll", 2, 1, 6, 6, "the searches, the chains' rounds and the samples of the quick and the full pass"},
	}
	for _, tc := range cases {
		t.Run(tc.example, func(t *testing.T) {
			name := tc.example + ".lixiv.json"
			data, err := os.ReadFile(filepath.Join("..", "..", "examples", tc.example, name))
			if err != nil {
				t.Fatal(err)
			}
			d, err := Parse(data, name)
			if err != nil {
				t.Fatal(err)
			}
			f := &copies{n: tc.copies, fail: -1}
			d.Farm, d.Quick = f, true
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			if v, err := d.Verify(); err != nil || !v.Match {
				t.Errorf("farmed results: %+v %v, want the stored checksum", v, err)
			}
			if jobs, rounds := f.jobs.Load(), f.rounds.Load(); jobs < tc.jobs || rounds < tc.rounds {
				t.Errorf("%d jobs farmed, %d of them rounds of the catchment-wide model; want at least %d and %d: %s", jobs, rounds, tc.jobs, tc.rounds, tc.why)
			}

			d, _ = Parse(data, name)
			d.Farm = &copies{n: 2, fail: tc.fail}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			ap := ""
			for _, c := range d.Cells {
				if c.Kind == KindApportionment {
					ap = c.ID
				}
			}
			if st, err := d.Status(ap); st != Problem || err == nil || !strings.Contains(err.Error(), "engine copy") {
				t.Errorf("apportionment with a failed copy: %v %v, want a problem naming the copy", st, err)
			}
		})
	}
}
