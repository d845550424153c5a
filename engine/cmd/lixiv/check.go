package main

import (
	"context"
	"flag"
	"fmt"
	"io"
)

func runCheck(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("check", flag.ContinueOnError)
	fs.SetOutput(stderr)
	if err := fs.Parse(args); err != nil {
		return usageError(err.Error())
	}
	if fs.NArg() == 0 {
		return usageError("check: name at least one budget file")
	}
	bad := 0
	for _, path := range fs.Args() {
		d, err := openBudget(context.Background(), path, 0)
		if err != nil {
			return err
		}
		if d.Stored == nil {
			fmt.Fprintf(stdout, "%s: no stored results to check\n", path)
			bad++
			continue
		}
		v, err := d.Verify()
		if err != nil {
			return err
		}
		if v.Match {
			fmt.Fprintf(stdout, "%s: match (sha256 %s…, engine %s)\n", path, v.Rerun[:16], v.Engine)
			continue
		}
		bad++
		fmt.Fprintf(stdout, "%s: DIFFERS: stored sha256 %s…, rerun %s… (stored by engine %s, rerun by %s)\n",
			path, short(v.Stored), short(v.Rerun), v.Engine, engineVersion())
		for _, m := range v.Differ {
			fmt.Fprintf(stdout, "  %s\n", m)
		}
	}
	if bad > 0 {
		return &statusError{code: errMismatch, msg: fmt.Sprintf("%d of %d budgets do not match their stored results", bad, fs.NArg())}
	}
	return nil
}

func short(s string) string {
	if len(s) > 16 {
		return s[:16]
	}
	return s
}
