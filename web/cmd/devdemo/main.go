package main

import (
	"context"
	"fmt"
	"os"

	"lixiv/engine/notebook"
)

func main() {
	b, _ := os.ReadFile(os.Args[1])
	d, err := notebook.Parse(b, "dev")
	if err != nil {
		panic(err)
	}
	t, _ := notebook.SourcesTable("granite")
	if err := d.SetTable("sources", t); err != nil {
		panic(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		panic(err)
	}
	for _, c := range d.Cells {
		st, err := d.Status(c.ID)
		fmt.Fprintln(os.Stderr, c.ID, st, err)
	}
	os.Stdout.Write(d.Marshal())
}
