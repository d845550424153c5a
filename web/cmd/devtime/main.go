package main

import (
	"context"
	"fmt"
	"os"
	"time"

	"lixiv/engine/notebook"
)

func main() {
	b, _ := os.ReadFile(os.Args[1])
	d, err := notebook.Parse(b, "dev")
	if err != nil {
		panic(err)
	}
	for {
		t0 := time.Now()
		p := d.Pending()
		if len(p) == 0 {
			break
		}
		d.Step(context.Background(), nil)
		fmt.Printf("%-14s %v\n", p[0], time.Since(t0))
	}
	t0 := time.Now()
	d.SetParam("rain", "na_per_cl", "0.8")
	for len(d.Pending()) > 0 {
		p := d.Pending()
		t1 := time.Now()
		d.Step(context.Background(), nil)
		fmt.Printf("edit %-14s %v\n", p[0], time.Since(t1))
	}
	fmt.Println("edit total", time.Since(t0))
}
