package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"sort"
	"strings"
	"sync"
	"time"

	"lixiv/engine/notebook"
)

// budgetPaths expands folders into the budget files they hold, sorted.
func budgetPaths(args []string) ([]string, error) {
	var out []string
	for _, a := range args {
		info, err := os.Stat(a)
		if err != nil {
			return nil, err
		}
		if !info.IsDir() {
			out = append(out, a)
			continue
		}
		var found []string
		err = filepath.WalkDir(a, func(p string, e fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if !e.IsDir() && strings.HasSuffix(p, notebook.Extension) {
				found = append(found, p)
			}
			return nil
		})
		if err != nil {
			return nil, err
		}
		sort.Strings(found)
		out = append(out, found...)
	}
	return out, nil
}

// outcome is what one budget of a batch gave.
type outcome struct {
	line     string
	failed   bool
	doubtful bool
	mismatch bool
}

func runOne(ctx context.Context, path, outDir string) outcome {
	d, err := openBudget(ctx, path, 1)
	if err != nil {
		return outcome{line: fmt.Sprintf("%s: error: %v", path, err), failed: true}
	}
	o := outcome{}
	var parts []string
	if problems := cellProblems(d); len(problems) > 0 {
		parts = append(parts, fmt.Sprintf("%d cells with problems", len(problems)))
		o.failed = true
	}
	if doubt := doubtfulCells(d); len(doubt) > 0 {
		parts = append(parts, "doubtful: "+strings.Join(doubt, ", "))
		o.doubtful = true
	}
	r := d.Report()
	if c := r.Comparison; c != nil { // a budget of sections: its comparison's headline
		if q, ok := c.Differences["silicate CO2"]; ok {
			m := q.PerKm2
			f := notebook.Figure{Unit: "mol/km²/yr", Median: float64(m.Median), Low: float64(m.Low), High: float64(m.High)}
			parts = append(parts, c.Formula+" in silicate CO2 "+fmtRange(f, "no difference could be formed"))
		}
	} else if p, ok := r.CO2["silicate"]; ok {
		m := p.Mean.MolPerKm2PerY
		f := notebook.Figure{Unit: "mol/km²/yr", Median: float64(m.Median), Low: float64(m.Low), High: float64(m.High)}
		parts = append(parts, "silicate CO2 "+fmtRange(f, "no sample could be apportioned"))
	}
	if r.Snapshot != nil {
		if r.Snapshot.Match {
			parts = append(parts, "stored results match")
		} else {
			parts = append(parts, "stored results DIFFER")
			o.mismatch = true
		}
	}
	if outDir != "" {
		name := strings.TrimSuffix(filepath.Base(path), notebook.Extension) + ".report.json"
		if err := os.WriteFile(filepath.Join(outDir, name), r.JSON(), 0o644); err != nil {
			parts = append(parts, "cannot write report: "+err.Error())
			o.failed = true
		}
	}
	o.line = path + ": " + strings.Join(parts, "; ")
	return o
}

func runBatch(args []string, stdout, stderr io.Writer) error {
	fset := flag.NewFlagSet("batch", flag.ContinueOnError)
	fset.SetOutput(stderr)
	jobs := fset.Int("j", runtime.NumCPU(), "budgets computed at once")
	outDir := fset.String("out", "", "folder for one NAME.report.json per budget")
	check := fset.Bool("check", false, "exit with status 3 when any stored results differ")
	if err := fset.Parse(args); err != nil {
		return usageError(err.Error())
	}
	if fset.NArg() == 0 {
		return usageError("batch: name budget files or folders")
	}
	paths, err := budgetPaths(fset.Args())
	if err != nil {
		return err
	}
	if *outDir != "" {
		if err := os.MkdirAll(*outDir, 0o755); err != nil {
			return err
		}
	}
	start := time.Now()
	res := batch(context.Background(), paths, *jobs, *outDir)
	failed, differ, doubt := 0, 0, 0
	for _, o := range res {
		fmt.Fprintln(stdout, o.line)
		if o.failed {
			failed++
		}
		if o.mismatch {
			differ++
		}
		if o.doubtful {
			doubt++
		}
	}
	fmt.Fprintf(stderr, "%d budgets in %.2f s on %d workers\n", len(paths), time.Since(start).Seconds(), *jobs)
	if failed > 0 {
		return fmt.Errorf("%d of %d budgets failed", failed, len(paths))
	}
	if *check && differ > 0 {
		return &statusError{code: errMismatch, msg: fmt.Sprintf("%d of %d budgets do not match their stored results", differ, len(paths))}
	}
	if doubt > 0 {
		return &statusError{code: errDoubtful, msg: fmt.Sprintf("%d of %d budgets have doubtful results", doubt, len(paths))}
	}
	return nil
}

// batch computes the budgets on jobs goroutines and returns their outcomes
// in the order of paths.
func batch(ctx context.Context, paths []string, jobs int, outDir string) []outcome {
	if jobs < 1 {
		jobs = 1
	}
	// Budgets allocate their Monte Carlo draws afresh; collecting less often
	// trades some memory (tens of MB per worker) for speed.
	defer debug.SetGCPercent(debug.SetGCPercent(400))
	res := make([]outcome, len(paths))
	next := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				res[i] = runOne(ctx, paths[i], outDir)
			}
		}()
	}
	for i := range paths {
		next <- i
	}
	close(next)
	wg.Wait()
	return res
}
