package notebook

import (
	"sync"

	"lixiv/engine/mix"
)

// The catchment-wide model's full pass takes over the mode searches of the
// quick pass before it (mix.CatchmentOptions.Searches): the searches do
// not depend on the lengths of the chains, and mix takes them only where
// everything they depend on is the same bit for bit, so the full pass's
// results are those it would give searching again.

// searchesMu guards every Document's searches (a cell may compute on
// another goroutine than the one that edits).
var searchesMu sync.Mutex

// searchesKey names an inversion: its cell and sulfate origin.
func searchesKey(job FarmJob) string { return job.Cell + "\x00" + job.Sulfate }

// searchesOf returns the searches kept for job's inversion, or nil (also
// for a nil d: a copy of the engine working a farm's job).
func (d *Document) searchesOf(job FarmJob) *mix.Searches {
	if d == nil {
		return nil
	}
	searchesMu.Lock()
	defer searchesMu.Unlock()
	return d.searches[searchesKey(job)]
}

// keepSearches keeps s, the searches of job's quick pass, for its full
// pass.
func (d *Document) keepSearches(job FarmJob, s *mix.Searches) {
	if d == nil {
		return
	}
	searchesMu.Lock()
	defer searchesMu.Unlock()
	if d.searches == nil {
		d.searches = map[string]*mix.Searches{}
	}
	d.searches[searchesKey(job)] = s
}
