//go:build js && wasm

// Command wasm is the browser entry of the Lixiv notebook page: it mounts the
// Root component of package web and runs vugu's render loop.
package main

import (
	"log"

	"github.com/vugu/vugu"
	"github.com/vugu/vugu/domrender"

	"lixiv/web"
)

func main() {
	renderer, err := domrender.New("#lixiv")
	if err != nil {
		log.Fatal(err)
	}
	defer renderer.Release()
	env, err := vugu.NewBuildEnv(renderer.EventEnv())
	if err != nil {
		log.Fatal(err)
	}
	root := &web.Root{}
	for ok := true; ok; ok = renderer.EventWait() {
		if err := renderer.Render(env.RunBuild(root)); err != nil {
			log.Print("render: ", err)
		}
		root.Rendered()
	}
}
