// Package validation writes the tables of docs/validation.md from the tests
// that measure them.
//
// A validation test (a simulation with a known truth: coverage of 95 %
// intervals, bias against the truth) asserts its thresholds in every test
// run. When the environment variable LIXIV_VALIDATION names the validation
// page (`make validation` sets it), the test also rewrites its own section
// of that page, the text between the lines
//
//	<!-- begin NAME -->
//	<!-- end NAME -->
//
// so that the page always shows what the tests measured, and nothing else
// on the page is touched. A section that is not on the page yet is appended.
package validation

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// Env is the environment variable naming the page to rewrite.
const Env = "LIXIV_VALIDATION"

// Writing reports whether this test run rewrites the validation page.
func Writing() bool { return os.Getenv(Env) != "" }

// Section replaces the section called name of the validation page with body
// when Writing; otherwise it does nothing. body is Markdown; a trailing
// newline is added when missing.
func Section(t testing.TB, name, body string) {
	t.Helper()
	path := os.Getenv(Env)
	if path == "" {
		return
	}
	if !filepath.IsAbs(path) {
		// Relative to the module root, wherever the test runs.
		path = filepath.Join(moduleRoot(), path)
	}
	old, err := os.ReadFile(path)
	if err != nil && !os.IsNotExist(err) {
		t.Fatal(err)
	}
	out, err := Replace(old, name, body)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	if err := os.WriteFile(path, out, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("validation: wrote section %q of %s", name, path)
}

// Replace returns page with the section called name set to body (appended
// when the page has no such section). It fails when the markers are
// unbalanced.
func Replace(page []byte, name, body string) ([]byte, error) {
	if !strings.HasSuffix(body, "\n") {
		body += "\n"
	}
	begin := []byte("<!-- begin " + name + " -->\n")
	end := []byte("<!-- end " + name + " -->\n")
	i := bytes.Index(page, begin)
	j := bytes.Index(page, end)
	switch {
	case i < 0 && j < 0:
		var b bytes.Buffer
		b.Write(page)
		if len(page) > 0 && !bytes.HasSuffix(page, []byte("\n\n")) {
			if !bytes.HasSuffix(page, []byte("\n")) {
				b.WriteByte('\n')
			}
			b.WriteByte('\n')
		}
		b.Write(begin)
		b.WriteString(body)
		b.Write(end)
		return b.Bytes(), nil
	case i < 0 || j < i:
		return nil, fmt.Errorf("section %q: unbalanced markers", name)
	}
	var b bytes.Buffer
	b.Write(page[:i+len(begin)])
	b.WriteString(body)
	b.Write(page[j:])
	return b.Bytes(), nil
}

// moduleRoot is the folder holding go.mod, found from this file's place.
func moduleRoot() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Clean(filepath.Join(filepath.Dir(file), "..", "..", ".."))
}
