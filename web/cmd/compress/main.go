// Command compress writes the compressed twins of the built page's files
// for `lixiv serve`: name.br (brotli, quality 11, 16 MiB window) and
// name.gz (gzip at its best compression), each only where it is smaller
// than the file itself. It then prints the page's weight, the bytes the
// first visit transfers (each file the page fetches, by its smallest
// encoding), and fails when that passes the limit.
//
// Usage: compress [-limit bytes] dir
package main

import (
	"flag"
	"fmt"
	"io"
	"os"
)

// pageLimit is the most the page's first load may transfer: 2 MB.
const pageLimit = 2_000_000

func main() {
	limit := flag.Int64("limit", pageLimit, "largest first-load weight allowed, in bytes")
	flag.Parse()
	if flag.NArg() != 1 {
		fmt.Fprintln(os.Stderr, "usage: compress [-limit bytes] dir")
		os.Exit(2)
	}
	if err := run(flag.Arg(0), *limit, os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "compress:", err)
		os.Exit(1)
	}
}

// run compresses every file of dir and checks the page's weight.
func run(dir string, limit int64, out io.Writer) error {
	if err := twinAll(dir); err != nil {
		return err
	}
	w, err := measure(dir)
	if err != nil {
		return err
	}
	fmt.Fprint(out, w)
	if w.Total > limit {
		return fmt.Errorf("the page's first load transfers %d bytes, more than the %d allowed", w.Total, limit)
	}
	return nil
}
