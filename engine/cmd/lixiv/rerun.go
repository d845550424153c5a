package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"lixiv/engine/notebook"
)

// openBudget loads and computes one budget file.
func openBudget(ctx context.Context, path string, workers int) (*notebook.Document, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	d, err := notebook.Load(f, filepath.Base(path))
	if err != nil {
		return nil, err
	}
	d.Workers = workers
	if err := d.Recompute(ctx, nil); err != nil {
		return nil, fmt.Errorf("%s: %v", path, err)
	}
	return d, nil
}

func runRerun(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("rerun", flag.ContinueOnError)
	fs.SetOutput(stderr)
	asJSON := fs.Bool("json", false, "print the JSON report instead of the summary")
	if err := fs.Parse(args); err != nil {
		return usageError(err.Error())
	}
	if fs.NArg() == 0 {
		return usageError("rerun: name at least one budget file")
	}
	for _, path := range fs.Args() {
		d, err := openBudget(context.Background(), path, 0)
		if err != nil {
			return err
		}
		if *asJSON {
			stdout.Write(d.Report().JSON())
			continue
		}
		summary(stdout, path, d)
	}
	return nil
}

// fmtRange writes a figure with its interval.
func fmtRange(f notebook.Figure) string {
	if math.IsNaN(f.Low) {
		return fmt.Sprintf("%.4g %s", f.Median, f.Unit)
	}
	return fmt.Sprintf("%.4g [%.4g, %.4g] %s", f.Median, f.Low, f.High, f.Unit)
}

// summary prints each cell's state, headline figures and warnings.
func summary(w io.Writer, path string, d *notebook.Document) {
	fmt.Fprintf(w, "%s: %s\n", filepath.Base(path), d.Title)
	for _, c := range d.Cells {
		st, err := d.Status(c.ID)
		line := fmt.Sprintf("  %s (%s): %s", c.ID, c.Kind, st)
		if err != nil {
			line += ": " + err.Error()
		}
		fmt.Fprintln(w, line)
		o := d.Output(c.ID)
		if o == nil {
			continue
		}
		for _, f := range o.Figures {
			fmt.Fprintf(w, "    %s: %s\n", f.Name, fmtRange(f))
		}
		for _, m := range o.Warnings {
			fmt.Fprintf(w, "    warning: %s\n", m)
		}
	}
	if d.Stored != nil {
		if v, err := d.Verify(); err == nil {
			if v.Match {
				fmt.Fprintln(w, "  stored results: match the rerun")
			} else {
				fmt.Fprintf(w, "  stored results: DIFFER from the rerun (%s)\n", strings.Join(v.Differ, "; "))
			}
		}
	}
}
