package sample

import (
	"archive/zip"
	"bytes"
	"io"
	"testing"
)

// TestStoredZip: the archive storedZip writes is read back by archive/zip
// with its one file's name, method, date and content (the reader checks
// the CRC as it reaches the end of the file).
func TestStoredZip(t *testing.T) {
	for _, data := range []string{"", "a", `<?xml version="1.0"?><styleSheet/>`} {
		b := storedZip("xl/styles.xml", []byte(data))
		r, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
		if err != nil {
			t.Fatalf("%q: %v", data, err)
		}
		if len(r.File) != 1 {
			t.Fatalf("%q: %d files", data, len(r.File))
		}
		f := r.File[0]
		if f.Name != "xl/styles.xml" || f.Method != zip.Store || f.Modified.Year() != 1980 {
			t.Errorf("%q: name %q, method %d, date %v", data, f.Name, f.Method, f.Modified)
		}
		rc, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		got, err := io.ReadAll(rc)
		if err != nil {
			t.Fatalf("%q: %v", data, err)
		}
		if string(got) != data {
			t.Errorf("read back %q, want %q", got, data)
		}
	}
	// A wrong checksum is caught: the archive's CRC is the content's.
	b := storedZip("x", []byte("abc"))
	b[30+len("x")] ^= 1 // the content's first byte, after the 30-byte local header and the name
	r, err := zip.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	rc, _ := r.File[0].Open()
	if _, err := io.ReadAll(rc); err == nil {
		t.Error("a changed content passed the checksum")
	}
}
