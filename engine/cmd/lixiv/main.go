// Command lixiv is the native face of the Lixiv engine: it serves the
// notebook page, reruns and checks budget files, writes their result
// tables, builds quick budgets from CSV files and runs batches on all cores.
// Run "lixiv help" for the sub-commands.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
)

func main() {
	if err := run(os.Args[1:], os.Stdout, os.Stderr); err != nil {
		fmt.Fprintln(os.Stderr, "lixiv:", err)
		os.Exit(exitCode(err))
	}
}

// run dispatches a sub-command. Tests call it directly.
func run(args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		return usageError("no sub-command; run lixiv help")
	}
	if cmd, ok := commands[args[0]]; ok {
		return cmd(args[1:], stdout, stderr)
	}
	switch args[0] {
	case "kinds":
		return runKinds(args[1:], stdout)
	case "help", "-h", "-help", "--help":
		return runHelp(args[1:], stdout)
	}
	return usageError(fmt.Sprintf("unknown sub-command %q; run lixiv help", args[0]))
}

// commands are the sub-commands that write to both outputs, by name.
var commands = map[string]func(args []string, stdout, stderr io.Writer) error{
	"serve": runServe, "rerun": runRerun, "check": runCheck, "tables": runTables, "quick": runQuick, "batch": runBatch,
}

// statusError carries an exit status other than 1.
type statusError struct {
	code int
	msg  string
}

func (e *statusError) Error() string { return e.msg }

func usageError(msg string) error { return &statusError{code: 2, msg: msg} }

// errMismatch is the exit status of a rerun that does not match its file.
const errMismatch = 3

// errDoubtful is the exit status of rerun, quick and batch when every cell
// computed but some results are doubtful (notebook.Doubtful).
const errDoubtful = 4

// exitCode maps an error to the process exit status: 2 for a usage error,
// 3 for results that do not match the stored snapshot, 4 for doubtful
// results, 1 otherwise, which includes a budget whose cells did not all
// compute (rerun, quick, batch).
func exitCode(err error) int {
	var se *statusError
	if errors.As(err, &se) {
		return se.code
	}
	return 1
}
