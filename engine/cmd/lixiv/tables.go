package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"lixiv/engine/notebook"
)

func engineVersion() string { return notebook.EngineVersion }

func runTables(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("tables", flag.ContinueOnError)
	fs.SetOutput(stderr)
	out := fs.String("out", "", "folder to write the tables to (created if missing)")
	if err := fs.Parse(args); err != nil {
		return usageError(err.Error())
	}
	if *out == "" || fs.NArg() != 1 {
		return usageError("tables: give -out DIR and one budget file")
	}
	d, err := openBudget(context.Background(), fs.Arg(0), 0)
	if err != nil {
		return err
	}
	files, err := writeTables(d, *out)
	if err != nil {
		return err
	}
	for _, f := range files {
		fmt.Fprintln(stdout, f)
	}
	return nil
}

// writeTables writes every output table of d as CELL-TABLE.csv and .json,
// the headline figures as figures.csv and the report as report.json, and
// returns the file names written.
func writeTables(d *notebook.Document, dir string) ([]string, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	var names []string
	write := func(name string, data []byte) error {
		names = append(names, name)
		return os.WriteFile(filepath.Join(dir, name), data, 0o644)
	}
	var figs bytes.Buffer
	figs.WriteString("cell,figure,unit,median,low,high\n")
	for _, c := range d.Cells {
		o := d.Output(c.ID)
		if o == nil {
			continue
		}
		for _, t := range o.Tables {
			base := c.ID + "-" + t.Name
			if err := write(base+".csv", t.CSV()); err != nil {
				return names, err
			}
			if err := write(base+".json", t.JSON(c.ID)); err != nil {
				return names, err
			}
		}
		for _, f := range o.Figures {
			fmt.Fprintf(&figs, "%s,%q,%q,%s,%s,%s\n", c.ID, f.Name, f.Unit, num(f.Median), num(f.Low), num(f.High))
		}
	}
	if err := write("figures.csv", figs.Bytes()); err != nil {
		return names, err
	}
	return names, write("report.json", d.Report().JSON())
}

func num(x float64) string {
	if x != x {
		return ""
	}
	return fmt.Sprint(x)
}
