package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"mime"
	"net"
	"net/http"
	"os"
	"path"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// pagePolicy is the content security policy of the notebook page. It keeps
// every request on the page's own origin; the page's index.html carries the
// same policy as a meta tag. 'wasm-unsafe-eval' lets the page compile its
// WebAssembly; nothing else may evaluate code.
const pagePolicy = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; connect-src 'self'; " +
	"img-src 'self' data: blob:; style-src 'self'; worker-src 'self'; object-src 'none'; " +
	"base-uri 'none'; form-action 'none'; frame-ancestors 'none'"

// runServe serves the built page folder on a loopback address.
func runServe(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", "127.0.0.1:8080", "loopback address to listen on (host:port; port 0 picks a free one)")
	dir := fs.String("dir", "web/dist", "folder holding the built page")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if err := checkLoopback(*addr); err != nil {
		return err
	}
	if st, err := os.Stat(filepath.Join(*dir, "index.html")); err != nil || st.IsDir() {
		return fmt.Errorf("serve: %s has no index.html; build the page first (make build)", *dir)
	}
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		return fmt.Errorf("serve: %w", err)
	}
	fmt.Fprintf(stdout, "Lixiv notebook at http://%s/\n", ln.Addr())
	srv := &http.Server{Handler: pageHandler(*dir), ReadHeaderTimeout: 10 * time.Second}
	return srv.Serve(ln)
}

// checkLoopback refuses any address that is not on the loopback interface:
// the notebook is a personal tool and never listens on a network.
func checkLoopback(addr string) error {
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return fmt.Errorf("serve: address %q: %w", addr, err)
	}
	if host == "localhost" {
		return nil
	}
	ip := net.ParseIP(host)
	if ip == nil || !ip.IsLoopback() {
		return errors.New("serve: the notebook listens on loopback only (127.0.0.1, ::1 or localhost), not " + addr)
	}
	return nil
}

// pageHandler serves the files of dir: WebAssembly with its own mime type,
// the brotli- or gzip-compressed twin of a file (name.br, name.gz, written
// by the build) when the browser accepts that encoding, no caching by the
// browser (the service worker caches), and the content security policy.
func pageHandler(dir string) http.Handler {
	// A system mime.types may map .wasm elsewhere; instantiateStreaming
	// accepts only application/wasm.
	_ = mime.AddExtensionType(".wasm", "application/wasm")
	_ = mime.AddExtensionType(".js", "text/javascript; charset=utf-8")
	_ = mime.AddExtensionType(".json", "application/json")
	_ = mime.AddExtensionType(".lixiv", "application/json")
	files := http.FileServer(http.Dir(dir))
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("Content-Security-Policy", pagePolicy)
		h.Set("Cache-Control", "no-cache")
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("Referrer-Policy", "no-referrer")
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
			return
		}
		// What a file is sent as depends on Accept-Encoding, for every
		// file, so that no cache hands one browser another's encoding.
		h.Add("Vary", "Accept-Encoding")
		name := path.Clean("/" + r.URL.Path)
		if strings.HasSuffix(r.URL.Path, "/") {
			name = path.Join(name, "index.html")
		}
		for _, enc := range twins {
			// .../index.html is redirected to .../ by the file server.
			if strings.HasSuffix(r.URL.Path, "/index.html") || !accepts(r.Header.Get("Accept-Encoding"), enc.coding) {
				continue
			}
			file := filepath.Join(dir, filepath.FromSlash(name)+enc.suffix)
			if st, err := os.Stat(file); err != nil || st.IsDir() {
				continue
			}
			if ct := mime.TypeByExtension(path.Ext(name)); ct != "" {
				h.Set("Content-Type", ct)
			}
			h.Set("Content-Encoding", enc.coding)
			http.ServeFile(w, r, file)
			return
		}
		files.ServeHTTP(w, r)
	})
}

// twins are the compressed copies the build writes beside a file, in the
// order the server prefers them.
var twins = []struct{ coding, suffix string }{
	{"br", ".br"},
	{"gzip", ".gz"},
}

// accepts reports whether an Accept-Encoding header allows coding: named
// (or "*") with a weight above zero.
func accepts(header, coding string) bool {
	ok := false
	for _, item := range strings.Split(header, ",") {
		name, params, _ := strings.Cut(item, ";")
		name = strings.ToLower(strings.TrimSpace(name))
		if name != coding && name != "*" {
			continue
		}
		allowed := true
		for _, p := range strings.Split(params, ";") {
			k, v, _ := strings.Cut(p, "=")
			if strings.EqualFold(strings.TrimSpace(k), "q") {
				q, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
				allowed = err == nil && q > 0
			}
		}
		if name == coding {
			return allowed // the coding's own entry rules over "*"
		}
		ok = allowed
	}
	return ok
}
