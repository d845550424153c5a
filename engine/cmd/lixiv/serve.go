package main

import (
	"flag"
	"fmt"
	"io"
	"net/http"
)

// runServe serves the built page folder on a loopback address.
func runServe(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", "127.0.0.1:8080", "address to listen on")
	dir := fs.String("dir", "web/dist", "folder holding the built page")
	if err := fs.Parse(args); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "Lixiv notebook at http://%s/\n", *addr)
	return http.ListenAndServe(*addr, http.FileServer(http.Dir(*dir)))
}
