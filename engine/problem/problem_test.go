package problem

import "testing"

// The names the page, the command line and the report write.
func TestNames(t *testing.T) {
	tests := []struct {
		got, want string
	}{
		{Warning.String(), "warning"}, {Error.String(), "problem"}, {Note.String(), "note"}, {Severity(9).String(), "warning"},
		{Unread.String(), "unread"}, {Substituted.String(), "substituted"}, {LeftOut.String(), "left out"},
		{Inferred.String(), "inferred"}, {Refused.String(), "refused"}, {Flagged.String(), "flagged"}, {Effect(-1).String(), "unread"},
	}
	for _, tt := range tests {
		if tt.got != tt.want {
			t.Errorf("got %q, want %q", tt.got, tt.want)
		}
	}
	if b, _ := Error.MarshalText(); string(b) != "problem" {
		t.Errorf("MarshalText %q", b)
	}
	if b, _ := LeftOut.MarshalText(); string(b) != "left out" {
		t.Errorf("MarshalText %q", b)
	}
}
