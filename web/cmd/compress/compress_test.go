package main

import (
	"bytes"
	"compress/gzip"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/andybalholm/brotli"
)

// TestRun compresses a small page and checks its twins (each decoding to
// the file, none larger than it) and its weight against limits on either
// side of it.
func TestRun(t *testing.T) {
	dir := t.TempDir()
	files := map[string]string{
		"sw.js":      strings.Repeat("// the offline cache\n", 20) + `const FILES = ["./", "index.html", "app.css",` + "\n" + ` "main.wasm"];`,
		"index.html": "<!doctype html>" + strings.Repeat("<p>text</p>", 50),
		"app.css":    "x",
		"main.wasm":  "\x00asm" + strings.Repeat("\x01\x02\x03", 3000),
		"other.txt":  strings.Repeat("not fetched ", 100),
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	var out bytes.Buffer
	if err := run(dir, 1<<20, &out); err != nil {
		t.Fatal(err)
	}
	for name, text := range files {
		for _, suffix := range []string{".br", ".gz"} {
			z, err := os.ReadFile(filepath.Join(dir, name+suffix))
			if name == "app.css" {
				if err == nil {
					t.Errorf("%s%s written, larger than the file", name, suffix)
				}
				continue
			}
			if err != nil {
				t.Fatal(err)
			}
			if got := unpack(t, suffix, z); got != text {
				t.Errorf("%s%s decodes to %d bytes that differ from the file's %d", name, suffix, len(got), len(text))
			}
		}
	}
	w, err := measure(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	var total int64
	for _, f := range w.Files {
		names = append(names, f.Name)
		total += f.Sent
		br, _ := os.Stat(filepath.Join(dir, f.Name+".br"))
		if f.Name != "app.css" && (f.Encoding != "br" || f.Sent != br.Size()) {
			t.Errorf("%s sent as %q, %d bytes; want br, %d", f.Name, f.Encoding, f.Sent, br.Size())
		}
	}
	if got := strings.Join(names, " "); got != "sw.js index.html app.css main.wasm" {
		t.Errorf("page files %q", got)
	}
	if total != w.Total || !strings.Contains(out.String(), "bytes on the first load") {
		t.Errorf("total %d, files add up to %d; printed:\n%s", w.Total, total, out.String())
	}
	if err := run(dir, w.Total-1, io.Discard); err == nil {
		t.Errorf("a page of %d bytes passed a limit of %d", w.Total, w.Total-1)
	}
	if err := run(dir, w.Total, io.Discard); err != nil {
		t.Errorf("a page of %d bytes failed a limit of as much: %v", w.Total, err)
	}
}

// TestPageFilesNeedsList checks that a service worker without its list of
// files is an error, not a page of no weight.
func TestPageFilesNeedsList(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "sw.js"), []byte("// nothing"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := measure(dir); err == nil {
		t.Error("no error for a service worker without FILES")
	}
}

func unpack(t *testing.T, suffix string, z []byte) string {
	t.Helper()
	var r io.Reader = brotli.NewReader(bytes.NewReader(z))
	if suffix == ".gz" {
		zr, err := gzip.NewReader(bytes.NewReader(z))
		if err != nil {
			t.Fatal(err)
		}
		r = zr
	}
	b, err := io.ReadAll(r)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}
