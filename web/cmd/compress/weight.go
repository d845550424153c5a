package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
)

// weight is what the page's first visit transfers, file by file.
type weight struct {
	Files []fileWeight
	Total int64 // bytes, the sum of Sent
}

// fileWeight is one file the page fetches: its size and the bytes sent for
// it to a browser that accepts brotli.
type fileWeight struct {
	Name      string
	Raw, Sent int64
	Encoding  string // "br", "gzip" or "" (sent as it is)
}

func (w weight) String() string {
	var b strings.Builder
	for _, f := range w.Files {
		enc := f.Encoding
		if enc == "" {
			enc = "plain"
		}
		fmt.Fprintf(&b, "  %-18s %9d bytes, %9d sent (%s)\n", f.Name, f.Raw, f.Sent, enc)
	}
	fmt.Fprintf(&b, "  %-18s %9s        %9d bytes on the first load\n", "page", "", w.Total)
	return b.String()
}

// filesList finds the service worker's list of the page's files, which is
// every file the page fetches on its first load.
var filesList = regexp.MustCompile(`(?s)const FILES = \[(.*?)\];`)

// pageFiles returns the files of the page, as the service worker lists them
// in dir/sw.js, with sw.js itself ("./" is index.html).
func pageFiles(dir string) ([]string, error) {
	sw, err := os.ReadFile(filepath.Join(dir, "sw.js"))
	if err != nil {
		return nil, err
	}
	m := filesList.FindSubmatch(sw)
	if m == nil {
		return nil, errors.New("sw.js has no list of the page's files (const FILES = [...])")
	}
	names := []string{"sw.js"}
	for _, item := range strings.Split(string(m[1]), ",") {
		item = strings.TrimSpace(item)
		if item == "" {
			continue
		}
		name, err := strconv.Unquote(item)
		if err != nil {
			return nil, fmt.Errorf("sw.js: the file %s of its list is not a quoted name", item)
		}
		if name == "./" {
			name = "index.html"
		}
		if !slices.Contains(names, name) {
			names = append(names, name)
		}
	}
	return names, nil
}

// measure returns the weight of the page built in dir: for each file the
// page fetches, its smallest encoding the server holds.
func measure(dir string) (weight, error) {
	names, err := pageFiles(dir)
	if err != nil {
		return weight{}, err
	}
	var w weight
	for _, name := range names {
		st, err := os.Stat(filepath.Join(dir, name))
		if err != nil {
			return weight{}, fmt.Errorf("the page fetches %s, which the build did not write: %w", name, err)
		}
		f := fileWeight{Name: name, Raw: st.Size(), Sent: st.Size()}
		for _, enc := range []struct{ suffix, name string }{{".br", "br"}, {".gz", "gzip"}} {
			if st, err := os.Stat(filepath.Join(dir, name+enc.suffix)); err == nil && st.Size() < f.Sent {
				f.Sent, f.Encoding = st.Size(), enc.name
			}
		}
		w.Files = append(w.Files, f)
		w.Total += f.Sent
	}
	return w, nil
}
