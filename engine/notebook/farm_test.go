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
}

func (f *copies) Work(ctx context.Context, job FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	f.jobs.Add(1)
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
				b, err := w.Sample(ctx, s, nil)
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

// TestFarmedSameResults computes the demo budget, quick pass first as the
// page does, with its samples worked by three copies of the engine: the
// results checksum equals the one stored in the file (computed
// in-process), and the apportionment and the CO2 cell's second sulfate
// origin both went through the farm. A copy that fails is named in the
// cell.
func TestFarmedSameResults(t *testing.T) {
	if runtime.GOOS == "js" {
		t.Skip("one thread: in WebAssembly the page's workers are checked by the browser test TestWorkersSameResults")
	}
	data, err := os.ReadFile(filepath.Join("..", "..", "examples", "corrie-vale", "corrie-vale.lixiv.json"))
	if err != nil {
		t.Fatal(err)
	}
	d, err := Parse(data, "corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	f := &copies{n: 3, fail: -1}
	d.Farm, d.Quick = f, true
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if v, err := d.Verify(); err != nil || !v.Match {
		t.Errorf("farmed results: %+v %v, want the stored checksum", v, err)
	}
	if got := f.jobs.Load(); got < 3 {
		t.Errorf("%d inversions farmed, want at least the quick and full apportionment and the CO2 cell's second origin", got)
	}

	d, _ = Parse(data, "corrie-vale.lixiv.json")
	d.Farm = &copies{n: 2, fail: 3}
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
}
