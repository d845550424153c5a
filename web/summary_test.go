package web

import "testing"

// TestState: the summary strip says "all computed" only when every cell
// is, and names what the others are.
func TestState(t *testing.T) {
	tests := []struct {
		name   string
		states []string
		busy   bool
		want   string
	}{
		{"all up to date", []string{"ok", "ok", "refining"}, false, "all computed"},
		{"busy", []string{"ok", "problem"}, true, "recomputing…"},
		{"waiting only", []string{"ok", "waiting", "waiting"}, false, "not all computed: 2 cells waiting for inputs"},
		{"doubtful only", []string{"ok", "doubtful"}, false, "computed, but 1 cell doubtful"},
		{"problem and doubtful", []string{"problem", "doubtful", "ok"}, false, "not all computed: 1 cell with a problem or waiting, 1 doubtful"},
		{"problem", []string{"problem", "waiting"}, false, "not all computed: 2 cells with a problem or waiting"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c := &Root{runner: runner{busy: tc.busy}}
			for i, s := range tc.states {
				c.Cells = append(c.Cells, CellView{ID: string(rune('a' + i)), State: s})
			}
			got := c.State()
			if got.Text != tc.want {
				t.Errorf("got %q, want %q", got.Text, tc.want)
			}
			if tc.want != "all computed" && tc.want != "recomputing…" && got.Href == "" {
				t.Errorf("%q links nowhere", got.Text)
			}
		})
	}
}
