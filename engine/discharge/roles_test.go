package discharge

import (
	"reflect"
	"testing"
)

func TestRoles(t *testing.T) {
	tests := []struct {
		header, want []string
	}{
		{[]string{"Date", "Discharge (m3/s)", "Quality"}, []string{"date", "discharge", ""}},
		{[]string{"day", "hour", "Q", "unit"}, []string{"date", "time of day", "discharge", "unit"}},
		{[]string{"2021-01-01", "3.2"}, []string{"date", "discharge"}},
		{[]string{"station", "flow [L/s]", "timestamp"}, []string{"", "discharge", "date"}},
	}
	for _, tt := range tests {
		if got := Roles(tt.header); !reflect.DeepEqual(got, tt.want) {
			t.Errorf("Roles(%q): got %q, want %q", tt.header, got, tt.want)
		}
	}
}
