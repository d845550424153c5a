package web

import (
	"testing"

	"lixiv/engine/notebook"
)

// The engine names a setting in its limit messages as the page labels it.
func TestLimitMessagesUsePageLabels(t *testing.T) {
	for _, key := range []string{"draws", "bootstrap", "series_bootstrap"} {
		if got, want := notebook.SettingName(key), SettingLabel(key)+" ("+key+")"; got != want {
			t.Errorf("%s: the engine says %q, the page labels it %q", key, got, want)
		}
	}
}
