// Package web is the Lixiv notebook page: vugu components that show a budget
// document as a vertical list of cells, let the user edit its inputs and
// read its outputs, and the browser glue for files, storage and the Monte
// Carlo worker.
//
// The package holds no science. Every number it shows comes from the engine
// through the budget document; templates only place fields and call
// formatting helpers. It uses vugu's js package rather than syscall/js, so it
// builds and its tests run natively as well as in the browser.
//
// The page works in four steps:
//  1. wasm/ creates the renderer and the Root component and runs the render loop.
//  2. Root loads the last autosaved budget (or the demo) into a Session.
//  3. Each edit goes through the Session, which records undo history, marks
//     cells stale and asks the worker to recompute.
//  4. Results come back from the worker; the Session publishes them and the
//     page repaints, plots drawn as SVG strings by package plot.
package web
