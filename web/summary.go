package web

import (
	"fmt"
	"strings"

	"lixiv/engine/notebook"
	"lixiv/engine/problem"
)

// The summary strip's counts and state, the jump list of cells and the
// footer's comparison with stored results. They say only what the cells
// say: "all computed" only when no cell has a problem, waits or is in a
// state the page does not count as computed, and the comparison only for
// stored results that are the user's (Origin.Checked).

// Count is one entry of the summary strip's counts, a link when Href is set.
type Count struct {
	Text, Href string
}

// computed reports a state in which a cell's results stand as they are:
// up to date, or on the way to it.
func computed(state string) bool {
	switch state {
	case "ok", "refining", "running", "stale":
		return true
	}
	return false
}

// Counts lists the samples, flags, warnings and cells that need attention,
// each linked to the first place it concerns.
func (c *Root) Counts() []Count {
	var out []Count
	for _, v := range c.Cells {
		for _, f := range v.Figures {
			switch f.Name {
			case "samples read":
				out = append(out, Count{Text: f.Value + " samples", Href: "#cell-" + v.ID})
			case "samples flagged":
				out = append(out, Count{Text: f.Value + " flagged", Href: "#cell-" + v.ID})
			}
		}
	}
	warn, firstWarn := 0, ""
	for _, v := range c.Cells {
		n := len(v.Warnings)
		for _, p := range v.TableProblems {
			if p.Severity != problem.Note { // notes say what was inferred: no warning
				n++
			}
		}
		if n > 0 && firstWarn == "" {
			firstWarn = "#warnings-" + v.ID
			if len(v.Warnings) == 0 {
				firstWarn = "#problems-" + v.ID
			}
		}
		warn += n
	}
	out = append(out, Count{Text: plural(warn, "warning"), Href: firstWarn})
	if n, href := c.attention(); n > 0 {
		out = append(out, Count{Text: plural(n, "cell") + " to look at", Href: href})
	}
	return out
}

// attention counts the cells not computed (a problem, waiting, doubtful)
// and links the first.
func (c *Root) attention() (n int, href string) {
	for _, v := range c.Cells {
		if !computed(v.State) {
			if n == 0 {
				href = "#cell-" + v.ID
			}
			n++
		}
	}
	return n, href
}

// State is the summary strip's line on the budget as a whole.
func (c *Root) State() Count {
	if c.busy {
		return Count{Text: "recomputing…"}
	}
	n, href := c.attention()
	if n == 0 {
		return Count{Text: "all computed"}
	}
	waiting, doubtful := 0, 0
	for _, v := range c.Cells {
		switch v.State {
		case "waiting":
			waiting++
		case "doubtful":
			doubtful++
		}
	}
	switch n {
	case waiting:
		return Count{Text: fmt.Sprintf("not all computed: %s waiting for inputs", plural(n, "cell")), Href: href}
	case doubtful:
		return Count{Text: fmt.Sprintf("computed, but %s doubtful", plural(n, "cell")), Href: href}
	}
	if doubtful > 0 {
		return Count{Text: fmt.Sprintf("not all computed: %s with a problem or waiting, %d doubtful", plural(n-doubtful, "cell"), doubtful), Href: href}
	}
	return Count{Text: fmt.Sprintf("not all computed: %s with a problem or waiting", plural(n, "cell")), Href: href}
}

// plural returns "1 cell" or "3 cells".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}

// Jump is one entry of the jump list of cells.
type Jump struct {
	Href, Text, State string
}

// Jumps lists the cells in order, for the jump list under the summary.
func (c *Root) Jumps() []Jump {
	out := make([]Jump, len(c.Cells))
	for i, v := range c.Cells {
		out[i] = Jump{Href: "#cell-" + v.ID, Text: v.Title, State: v.State}
		if !computed(v.State) {
			out[i].Text += " (" + v.StateText + ")"
		}
	}
	return out
}

// footer gives the footer's comparison with stored results and the seeds.
func (c *Root) footer() (verify, seeds string) {
	d := c.S.Doc
	var ss []string
	for _, cell := range d.Cells {
		for _, p := range notebook.Params(cell.Settings) {
			if p.Key == "seed" {
				ss = append(ss, cell.ID+" "+p.Value)
			}
		}
	}
	seeds = strings.Join(ss, ", ")
	if seeds == "" {
		seeds = "none"
	}
	switch {
	case !c.S.Origin.Checked && c.S.Origin.Demo:
		verify = "the demo budget: stored results are compared only for a budget file you open or download"
	case !c.S.Origin.Checked:
		verify = "no stored results of this budget yet: downloading it stores them, and opening that file compares them with a rerun"
	case c.busy || len(d.Pending()) > 0:
		verify = "checking once the rerun is done"
	case d.Stored == nil:
		verify = "this budget holds no stored results"
	case c.verifyGen == c.gen && c.verifyDoc == d:
		verify = c.verifyText // the checksum covers every output: compute it once per recompute
	default:
		v, err := d.Verify()
		switch {
		case err != nil:
			verify = "cannot compare: " + err.Error()
		case v.Match:
			verify = "stored results match the rerun"
		case c.S.Edited():
			verify = "the budget was edited after its results were stored; downloading it stores the new results"
		case len(v.Differ) == 0:
			verify = "stored results DIFFER from the rerun in the tables (the headline figures agree)"
		default:
			verify = fmt.Sprintf("stored results DIFFER from the rerun (%d headline figures differ)", len(v.Differ))
		}
		c.verifyGen, c.verifyDoc, c.verifyText = c.gen, d, verify
	}
	return verify, seeds
}

// VerifyClass marks a rerun that does not reproduce the stored results.
func (c *Root) VerifyClass() string {
	if strings.Contains(c.Verify, "DIFFER") {
		return "verify bad"
	}
	return "verify"
}
