package main

import (
	"bytes"
	"compress/gzip"
	"os"
	"path/filepath"
	"strings"

	"github.com/andybalholm/brotli"
)

// encodings are the compressed twins, by file suffix, in the order the
// server prefers them.
var encodings = []struct {
	suffix string
	encode func([]byte) ([]byte, error)
}{
	{".br", encodeBrotli},
	{".gz", encodeGzip},
}

// twinAll writes the twins of every plain file of dir (not of twins), and
// removes stale twins a larger encoding would leave.
func twinAll(dir string) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	for _, e := range entries {
		if !e.Type().IsRegular() || isTwin(e.Name()) {
			continue
		}
		if err := twin(filepath.Join(dir, e.Name())); err != nil {
			return err
		}
	}
	return nil
}

func isTwin(name string) bool {
	for _, enc := range encodings {
		if strings.HasSuffix(name, enc.suffix) {
			return true
		}
	}
	return false
}

// twin writes file's compressed twins, each only where it is smaller than
// the file (a server would otherwise send more than the plain bytes).
func twin(file string) error {
	raw, err := os.ReadFile(file)
	if err != nil {
		return err
	}
	for _, enc := range encodings {
		z, err := enc.encode(raw)
		if err != nil {
			return err
		}
		name := file + enc.suffix
		if len(z) >= len(raw) {
			if err := os.Remove(name); err != nil && !os.IsNotExist(err) {
				return err
			}
			continue
		}
		if err := os.WriteFile(name, z, 0o644); err != nil {
			return err
		}
	}
	return nil
}

// encodeBrotli compresses at brotli's best: quality 11 and the largest
// window the format allows without its large-window extension (2^24 bytes),
// which browsers do not decode.
func encodeBrotli(raw []byte) ([]byte, error) {
	var b bytes.Buffer
	w := brotli.NewWriterOptions(&b, brotli.WriterOptions{Quality: brotli.BestCompression, LGWin: 24})
	if _, err := w.Write(raw); err != nil {
		return nil, err
	}
	if err := w.Close(); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func encodeGzip(raw []byte) ([]byte, error) {
	var b bytes.Buffer
	w, err := gzip.NewWriterLevel(&b, gzip.BestCompression)
	if err != nil {
		return nil, err
	}
	if _, err := w.Write(raw); err != nil {
		return nil, err
	}
	if err := w.Close(); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}
