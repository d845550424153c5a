// Package web is the Lixiv notebook page: vugu components that show a budget
// document (engine/notebook) as a vertical list of cells, let the user edit
// its inputs and read its outputs, and the browser glue for files, storage
// and long computations.
//
// The package holds no science. Every number it shows comes from the engine
// through the budget document; templates only place fields and call
// formatting helpers, and the charts (package plot) draw what the engine's
// output tables hold. It uses vugu's js package rather than syscall/js, so it
// builds, vets and tests natively as well as in the browser.
//
// The page works in five steps:
//  1. wasm/ creates the renderer and the Root component and runs the render loop.
//  2. Root loads the last autosaved budget, or on a first visit the demo
//     budget served beside the page, into a Session.
//  3. Each edit goes through the Session, which applies it to the document
//     (rejected edits leave it unchanged and say why beside the cell) and
//     keeps the undo history.
//  4. Root paints the edit, saves the budget to browser storage, then
//     computes the stale cells one by one on the page's thread, handing the
//     thread back to the browser every few tens of milliseconds (also from
//     inside a long Monte Carlo run, through its progress reports) so that
//     the page scrolls, takes typing and shows a progress bar. A new edit
//     cancels the run and starts another.
//  5. Each render gathers CellViews from the document; charts are drawn as
//     SVG text only when the outputs they read change, and mounted outside
//     vugu's DOM sync.
package web
