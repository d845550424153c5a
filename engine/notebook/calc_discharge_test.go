package notebook

import (
	"context"
	"strings"
	"testing"
)

// TestDischargeMessagesNameTheFile: a discharge record opened from a file
// (two comment lines above its header) names the file and the line of the
// file in its messages; the same rows typed into the page name the cell and
// the table's own lines.
func TestDischargeMessagesNameTheFile(t *testing.T) {
	text := "# gauge 7, Corrie Vale (fictional)\n# discharge in m3/s\ndate,Q (m3/s)\n2021-01-01,1.2\n2021-01-02,-0.5\n2021-01-03,1.1\n"
	tests := []struct {
		name string
		file bool
		want string
	}{
		{"opened from a file", true, "gauge.csv:5:2"},
		{"typed or loaded from a budget", false, "discharge:3:2"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			tab, err := ReadTable("gauge.csv", text)
			if err != nil {
				t.Fatal(err)
			}
			if !tt.file {
				tab.Source = nil
			}
			d := New("discharge messages")
			c, err := d.Add(KindDischarge, -1)
			if err != nil {
				t.Fatal(err)
			}
			c.ID = "discharge"
			if err := d.SetTable(c.ID, tab); err != nil {
				t.Fatal(err)
			}
			d.Recompute(context.Background(), nil)
			out := d.Output(c.ID)
			if out == nil {
				st, err := d.Status(c.ID)
				t.Fatalf("no output: %v %v", st, err)
			}
			found := false
			for _, m := range out.Messages {
				found = found || strings.HasPrefix(m.Error(), tt.want)
			}
			if !found {
				t.Errorf("messages %v; want one starting %q", out.Messages, tt.want)
			}
		})
	}
}
