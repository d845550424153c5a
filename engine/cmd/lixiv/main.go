// Command lixiv is the native face of the Lixiv engine: it serves the
// notebook page, reruns and verifies budget files, and runs batches.
package main

import (
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
		return fmt.Errorf("usage: lixiv serve|run|verify|quick|batch ... (lixiv help)")
	}
	switch args[0] {
	case "serve":
		return runServe(args[1:], stdout, stderr)
	}
	return fmt.Errorf("unknown sub-command %q", args[0])
}

// exitCode maps an error to the process exit status.
func exitCode(err error) int { return 1 }
