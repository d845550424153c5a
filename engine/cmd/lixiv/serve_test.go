package main

import (
	"bytes"
	"compress/gzip"
	"io"
	"math/rand/v2"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/andybalholm/brotli"
)

// TestServeEncodings checks that the page server sends the brotli twin of
// a file to a browser that accepts brotli, the gzip twin to one that
// accepts only gzip and the file itself otherwise, each with its content
// type, Content-Encoding and Vary, and that every answer decodes to the
// same bytes.
func TestServeEncodings(t *testing.T) {
	dir := t.TempDir()
	// A stand-in module: the WebAssembly header and compressible bytes.
	rng := rand.New(rand.NewPCG(1, 2))
	module := []byte("\x00asm\x01\x00\x00\x00")
	for range 20000 {
		module = append(module, byte(rng.IntN(16)))
	}
	page := []byte("<!doctype html><title>page</title>" + strings.Repeat("<p>A paragraph of the page.</p>", 20))
	writeTwins(t, dir, "main.wasm", module)
	writeTwins(t, dir, "index.html", page)
	h := pageHandler(dir)
	for _, tc := range []struct {
		path, accept, encoding, ctype string
		want                          []byte
	}{
		{"/main.wasm", "gzip, deflate, br, zstd", "br", "application/wasm", module},
		{"/main.wasm", "br", "br", "application/wasm", module},
		{"/main.wasm", "gzip, deflate", "gzip", "application/wasm", module},
		{"/main.wasm", "br;q=0, gzip;q=0.5", "gzip", "application/wasm", module},
		{"/main.wasm", "*", "br", "application/wasm", module},
		{"/main.wasm", "*, br;q=0", "gzip", "application/wasm", module},
		{"/main.wasm", "", "", "application/wasm", module},
		{"/main.wasm", "identity", "", "application/wasm", module},
		{"/main.wasm", "gzip;q=0, deflate", "", "application/wasm", module},
		{"/main.wasm", "BR", "br", "application/wasm", module},
		{"/", "gzip, br", "br", "text/html; charset=utf-8", page},
		{"/", "gzip", "gzip", "text/html; charset=utf-8", page},
	} {
		t.Run(tc.path+" "+tc.accept, func(t *testing.T) {
			req := httptest.NewRequest(http.MethodGet, tc.path, nil)
			if tc.accept != "" {
				req.Header.Set("Accept-Encoding", tc.accept)
			}
			rec := httptest.NewRecorder()
			h.ServeHTTP(rec, req)
			resp := rec.Result()
			if resp.StatusCode != http.StatusOK {
				t.Fatalf("status %d", resp.StatusCode)
			}
			if got := resp.Header.Get("Content-Encoding"); got != tc.encoding {
				t.Errorf("Content-Encoding %q, want %q", got, tc.encoding)
			}
			if got := resp.Header.Get("Content-Type"); got != tc.ctype {
				t.Errorf("Content-Type %q, want %q", got, tc.ctype)
			}
			if got := resp.Header.Get("Vary"); got != "Accept-Encoding" {
				t.Errorf("Vary %q, want Accept-Encoding", got)
			}
			body := rec.Body.Bytes()
			if tc.encoding != "" && len(body) >= len(tc.want) {
				t.Errorf("%s body of %d bytes for a file of %d", tc.encoding, len(body), len(tc.want))
			}
			if got := decode(t, tc.encoding, body); !bytes.Equal(got, tc.want) {
				t.Errorf("the body decodes to %d bytes that differ from the file's %d", len(got), len(tc.want))
			}
		})
	}
}

// writeTwins writes name and its brotli and gzip twins into dir, as the
// build does.
func writeTwins(t *testing.T, dir, name string, raw []byte) {
	t.Helper()
	var br, gz bytes.Buffer
	bw := brotli.NewWriterLevel(&br, brotli.BestCompression)
	gw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
	for _, w := range []io.WriteCloser{bw, gw} {
		if _, err := w.Write(raw); err != nil {
			t.Fatal(err)
		}
		if err := w.Close(); err != nil {
			t.Fatal(err)
		}
	}
	for suffix, b := range map[string][]byte{"": raw, ".br": br.Bytes(), ".gz": gz.Bytes()} {
		if err := os.WriteFile(filepath.Join(dir, name+suffix), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func decode(t *testing.T, encoding string, body []byte) []byte {
	t.Helper()
	var r io.Reader = bytes.NewReader(body)
	switch encoding {
	case "br":
		r = brotli.NewReader(r)
	case "gzip":
		zr, err := gzip.NewReader(r)
		if err != nil {
			t.Fatal(err)
		}
		r = zr
	}
	out, err := io.ReadAll(r)
	if err != nil {
		t.Fatalf("decoding %s: %v", encoding, err)
	}
	return out
}

// TestServeIndexRedirect checks that .../index.html is still sent on to
// .../ as a plain redirect, whatever the browser accepts.
func TestServeIndexRedirect(t *testing.T) {
	dir := t.TempDir()
	writeTwins(t, dir, "index.html", []byte("<!doctype html><title>page</title>"))
	req := httptest.NewRequest(http.MethodGet, "/index.html", nil)
	req.Header.Set("Accept-Encoding", "gzip, br")
	rec := httptest.NewRecorder()
	pageHandler(dir).ServeHTTP(rec, req)
	if rec.Code != http.StatusMovedPermanently || rec.Header().Get("Location") != "./" || rec.Header().Get("Content-Encoding") != "" {
		t.Errorf("got %d to %q with Content-Encoding %q; want 301 to ./, not encoded", rec.Code, rec.Header().Get("Location"), rec.Header().Get("Content-Encoding"))
	}
}
