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
	var bad, doubt []string
	for _, path := range fs.Args() {
		d, err := openBudget(context.Background(), path, 0)
		if err != nil {
			return err
		}
		if *asJSON {
			stdout.Write(d.Report().JSON())
		} else {
			summary(stdout, path, d)
		}
		if p := cellProblems(d); len(p) > 0 {
			bad = append(bad, fmt.Sprintf("%s: %s", filepath.Base(path), strings.Join(p, ", ")))
		}
		if p := doubtfulCells(d); len(p) > 0 {
			doubt = append(doubt, fmt.Sprintf("%s: %s", filepath.Base(path), strings.Join(p, ", ")))
		}
	}
	return problemsError(bad, doubt)
}

// cellProblems names the cells of d that did not compute, with their state:
// "samples (problem)", "rain (waiting for inputs)".
func cellProblems(d *notebook.Document) []string {
	var out []string
	for _, c := range d.Cells {
		if st, _ := d.Status(c.ID); st != notebook.UpToDate && st != notebook.Doubtful {
			out = append(out, fmt.Sprintf("%s (%s)", c.ID, st))
		}
	}
	return out
}

// doubtfulCells names the cells of d whose results are doubtful.
func doubtfulCells(d *notebook.Document) []string {
	var out []string
	for _, c := range d.Cells {
		if st, _ := d.Status(c.ID); st == notebook.Doubtful {
			out = append(out, c.ID)
		}
	}
	return out
}

// problemsError is the error for budgets whose cells did not all compute,
// exit status 1 as in batch, or else for budgets with doubtful results,
// exit status 4 (one entry per budget in each list); nil for neither.
func problemsError(bad, doubt []string) error {
	if len(bad) > 0 {
		return fmt.Errorf("cells with problems (see above): %s", strings.Join(bad, "; "))
	}
	if len(doubt) > 0 {
		return &statusError{code: errDoubtful, msg: fmt.Sprintf("doubtful results (see above): %s", strings.Join(doubt, "; "))}
	}
	return nil
}

// fmtRange writes a figure with its interval, or "no value" and why when it
// has none.
func fmtRange(f notebook.Figure, why string) string {
	if math.IsNaN(f.Median) || math.IsInf(f.Median, 0) {
		return "no value: " + why
	}
	if math.IsNaN(f.Low) || math.IsNaN(f.High) {
		return strings.TrimSpace(fmt.Sprintf("%.4g %s", f.Median, f.Unit))
	}
	return strings.TrimSpace(fmt.Sprintf("%.4g [%.4g, %.4g] %s", f.Median, f.Low, f.High, f.Unit))
}

// noValueReason says why a figure of cell c has no value: no sample could
// be apportioned (for the cells that rest on the apportionment), or no
// sample gave one.
func noValueReason(d *notebook.Document, c *notebook.Cell) string {
	switch c.Kind {
	case notebook.KindApportionment, notebook.KindCO2, notebook.KindFluxes:
		for _, a := range d.Cells {
			if a.Kind != notebook.KindApportionment {
				continue
			}
			if f := d.Output(a.ID).Figure("samples apportioned"); f != nil && f.Median == 0 {
				return "no sample could be apportioned (see the apportionment warnings)"
			}
		}
	}
	return "no sample gave one (see the warnings)"
}

// summary prints each cell's state, headline figures and warnings.
func summary(w io.Writer, path string, d *notebook.Document) {
	fmt.Fprintf(w, "%s: %s\n", filepath.Base(path), d.Title)
	section := "\x00"
	for _, c := range d.Cells {
		if d.HasSections() && c.Section != section {
			section = c.Section
			if section == "" {
				fmt.Fprintln(w, "  shared by every section:")
			} else {
				fmt.Fprintf(w, "  section %q:\n", section)
			}
		}
		st, err := d.Status(c.ID)
		line := fmt.Sprintf("  %s (%s): %s", c.ID, c.Kind, st)
		if err != nil && st != notebook.Doubtful {
			line += ": " + err.Error()
		}
		fmt.Fprintln(w, line)
		o := d.Output(c.ID)
		if o == nil {
			continue
		}
		if st == notebook.Doubtful {
			for _, r := range o.Doubtful {
				fmt.Fprintf(w, "    doubtful: %s\n", r)
			}
		}
		for _, f := range o.Figures {
			fmt.Fprintf(w, "    %s: %s\n", f.Name, fmtRange(f, noValueReason(d, c)))
			if f.Note != "" {
				fmt.Fprintf(w, "      (%s)\n", f.Note)
			}
		}
		for _, m := range o.Messages {
			fmt.Fprintf(w, "    %s: %s\n", m.Severity, m)
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
