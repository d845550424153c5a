//go:build browser

package browsertest

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// awkwardImports are awkward laboratory files (engine/sample and
// engine/discharge testdata/awkward, invented) covering each kind of
// outcome, with the words the page must show beside the table when the
// file is opened (rows of the table and the file's lines) and when its
// text is pasted into a new cell (rows of the table).
var awkwardImports = []struct {
	file       string
	kind       string // the cell the file goes to
	open, past []string
}{
	{"sample/testdata/awkward/below-detection.csv", "samples",
		[]string{`row 1 (line 2), column K (mg/L): "<0.39098": 6 values below detection`, `half the limit stands in for each (setting "below detection limit")`},
		[]string{`row 1, column K (mg/L): "<0.39098": 6 values below detection`}},
	{"sample/testdata/awkward/not-determined.csv", "samples",
		[]string{`row 1 (line 2), column Cl (mg/L): "n.d.": 1 cell read as missing, not as zero`, `"n.d." is read as not determined`},
		[]string{`row 1, column Cl (mg/L): "n.d.": 1 cell read as missing`}},
	{"sample/testdata/awkward/sentinels.csv", "samples",
		[]string{`row 1 (line 2), column Mg (mg/L): "-999": 5 cells read as missing, not as zero`},
		[]string{`row 1, column Mg (mg/L): "-999": 5 cells read as missing`}},
	{"sample/testdata/awkward/duplicate-columns.csv", "samples",
		[]string{`header row, column Ca (mg/L): duplicated column; Ca is in column 3 "Ca (mg/L)" and column 5 "Ca2+ (umol/L)"; none is read`, `"columns to use"`},
		[]string{`header row, column Ca (mg/L): duplicated column; Ca is in column 3 "Ca (mg/L)" and column 5`}},
	{"sample/testdata/awkward/dates-ambiguous.csv", "samples",
		[]string{`row 1 (line 2), column Date: "05/03/2024": ambiguous date order; all 2 dates, such as this one, read both day-first and month-first; set "date order" to day-first or month-first`},
		[]string{`row 1, column Date: "05/03/2024": ambiguous date order`}},
	{"sample/testdata/awkward/two-date-formats.csv", "samples",
		[]string{`row 2 (line 3), column Date: "13/03/2024": dates read day-first, as this one shows (13 cannot be a month)`},
		[]string{`row 2, column Date: "13/03/2024": dates read day-first`}},
	{"sample/testdata/awkward/decimal-comma.csv", "samples",
		[]string{`row 1 (line 2): "40,078": numbers read with a decimal comma`},
		[]string{`row 1: "40,078": numbers read with a decimal comma`}},
	{"sample/testdata/awkward/blank-and-comment-lines.csv", "samples",
		[]string{`row 2 (line 7), column Sample: "# S2 re-run below": the line starts with # and is read as a comment`},
		[]string{`row 2, column Sample: "# S2 re-run below": the line starts with #`}},
	{"sample/testdata/awkward/mixed-units-column.csv", "samples",
		[]string{`row 2 (line 3), column Ca (mg/L): "500 umol/L": read in µmol/L, the unit the cell gives`},
		[]string{`row 2, column Ca (mg/L): "500 umol/L": read in µmol/L`}},
	{"sample/testdata/awkward/negative-and-text.csv", "samples",
		[]string{`row 1 (line 2), column Na (mg/L): "-2.3": negative value`, `row 2 (line 3), column Ca (mg/L): "high": not a number`},
		[]string{`row 2, column Ca (mg/L): "high": not a number`}},
	{"discharge/testdata/awkward/bad-days.csv", "discharge",
		[]string{`row 2 (line 3), column Q (m3/s): "-0.4": negative discharge: 2021-10-02: -0.4 is below zero; the day is left out (a gap)`,
			`row 3 (line 4), column Q (m3/s): "-999": 2021-10-03: the discharge holds "-999", a no-data code read as missing`,
			`row 4 (line 5), column Q (m3/s): 2021-10-04: the discharge is empty`, `3 days left out (1 below zero, 1 with a no-data code, 1 empty)`},
		[]string{`row 2, column Q (m3/s): "-0.4": negative discharge`, `3 days left out`}},
	{"discharge/testdata/awkward/ambiguous.csv", "discharge",
		[]string{`row 1 (line 2), column Date: "01/10/2021": ambiguous date order: every date, such as this one, reads both day-first and month-first; set "date order" to day-first or month-first`},
		[]string{`row 1, column Date: "01/10/2021": ambiguous date order`}},
}

// TestAwkwardFilesOpenAndPaste opens each awkward file through the file
// picker and pastes its text into a new cell, and checks the words the page
// shows beside the table.
func TestAwkwardFilesOpenAndPaste(t *testing.T) {
	srv := startServer(t)
	for _, tc := range awkwardImports {
		t.Run(filepath.Base(tc.file), func(t *testing.T) {
			path := filepath.Join(repo, "engine", tc.file)
			text, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			ctx := newBrowser(t, "")
			open(t, ctx, srv.URL)
			waitIdle(t, ctx)
			// Open: the file replaces the table of the first cell of its kind
			// (asked, the user puts it into the demo).
			gen := eval[string](t, ctx, `document.body.dataset.gen`)
			if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{path})); err != nil {
				t.Fatal(err)
			}
			intoDemo(t, ctx)
			waitGen(t, ctx, gen)
			shown := eval[string](t, ctx, fmt.Sprintf(`(document.querySelector("section.kind-%s .table-problems") || {textContent: ""}).textContent`, tc.kind))
			for _, w := range tc.open {
				if !strings.Contains(shown, w) {
					t.Errorf("opened: the page does not show %q beside the table; it shows %q", w, shown)
				}
			}
			// Paste: into the paste box of a new cell of the kind.
			eval[bool](t, ctx, fmt.Sprintf(`(() => { const s = document.getElementById("add-kind"); s.value = %q;
				s.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, tc.kind))
			gen = eval[string](t, ctx, `document.body.dataset.gen`)
			eval[bool](t, ctx, `document.getElementById("add-cell").click() || true`)
			waitGen(t, ctx, gen)
			id := eval[string](t, ctx, fmt.Sprintf(`[...document.querySelectorAll("section.kind-%s")].pop().id.replace("cell-", "")`, tc.kind))
			paste(t, ctx, "#paste-"+id, string(text))
			q, _ := json.Marshal("#cell-" + id + " .table-problems")
			shown = eval[string](t, ctx, fmt.Sprintf(`(document.querySelector(%s) || {textContent: ""}).textContent`, q))
			for _, w := range tc.past {
				if !strings.Contains(shown, w) {
					t.Errorf("pasted: the page does not show %q beside the table; it shows %q", w, shown)
				}
			}
		})
	}
}
