package enum

import "testing"

type colour int

func TestName(t *testing.T) {
	names := []string{"red", "green"}
	for _, c := range []struct {
		v    colour
		want string
	}{
		{0, "red"},
		{1, "green"},
		{2, "?"},
		{-1, "?"},
	} {
		if got := Name(c.v, names, "?"); got != c.want {
			t.Errorf("Name(%d) = %q, want %q", c.v, got, c.want)
		}
	}
}
