package main

import (
	"fmt"
	"io"
)

const helpText = `lixiv: chemical weathering budgets of river catchments

Usage:
  lixiv rerun [-json] FILE...          rerun budget files and print their summary
                                       (-json: the report documented in engine/notebook/SCHEMA.md)
  lixiv check FILE...                  rerun and compare with the results stored in each file;
                                       exit status 3 when any differs
  lixiv tables -out DIR FILE           rerun and write every result table as CSV and JSON,
                                       with report.json and figures.csv, to DIR
  lixiv quick -samples S.csv [-discharge Q.csv -area KM2] [-save B.lixiv.json] [-json]
                                       a budget with default settings from a samples file
                                       (CSV, TSV or .xlsx; -sheet NAME picks a workbook's sheet);
                                       without discharge: per-sample apportionment and CO2 per litre;
                                       -date-order, -below-detection, -default-unit and -use-column
                                       set what the page calls "date order", "below detection limit",
                                       "default unit" and "columns to use"
  lixiv batch [-j N] [-out DIR] [-check] FILE|DIR...
                                       run many budget files at once on all cores
  lixiv kinds [KIND...]                the kinds of cell a budget may hold: inputs, settings with
                                       their defaults and accepted values, output tables
  lixiv serve [-addr A] [-dir D]       serve the notebook page
  lixiv help                           this text

Budget files end in .lixiv.json. A budget may hold several catchments (or periods) in sections and
compare them in a comparison cell: rerun prints each section under its name, and the JSON report
adds "sections" and "comparison". Exit status: 0 ok; 1 error, or a budget with cells that did not
compute (rerun, quick and batch still print it); 2 usage; 3 results differ; 4 doubtful results
(every cell computed, but some rest on failed fits or unbracketed flow; the summary says why).
A figure without a value is printed as "no value" with the reason.
CO2 consumption is a geochemical budget, not a carbon-removal credit.
`

func runHelp(args []string, stdout io.Writer) error {
	_, err := fmt.Fprint(stdout, helpText)
	return err
}
