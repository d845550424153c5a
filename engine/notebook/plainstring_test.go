package notebook

import (
	"encoding/json"
	"testing"
)

// cellText's short cut for plain strings gives what json.Unmarshal gives,
// and leaves every string that needs decoding to it.
func TestPlainStringAsUnmarshal(t *testing.T) {
	tests := []struct {
		in    string
		plain bool
	}{
		{`""`, true},
		{`"12.5"`, true},
		{`"Corrie Burn at the weir"`, true},
		{`"µmol/L"`, true},
		{`"<0.5"`, true},
		{`"a\"b"`, false},
		{`"tab\there"`, false},
		{`"\u00b5mol"`, false},
		{"\"bad \xff byte\"", false},
		{"\"new\nline\"", false},
	}
	for _, tt := range tests {
		s, ok := plainString([]byte(tt.in))
		if ok != tt.plain {
			t.Errorf("%q: plain %v, want %v", tt.in, ok, tt.plain)
		}
		got, err := cellText(json.RawMessage(tt.in))
		var want string
		werr := json.Unmarshal([]byte(tt.in), &want)
		if (err == nil) != (werr == nil) || got != want {
			t.Errorf("%q: cellText %q (%v), json.Unmarshal %q (%v)", tt.in, got, err, want, werr)
		}
		if ok && s != want {
			t.Errorf("%q: plainString %q, want %q", tt.in, s, want)
		}
	}
}
