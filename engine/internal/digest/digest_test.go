package digest

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"strings"
	"testing"
)

// TestKnownDigests: the examples of the standard (NIST FIPS 180-2,
// appendix B.1 and B.2: "abc" and the 448-bit message; the empty message's
// digest is the one every SHA-256 gives, common practice).
func TestKnownDigests(t *testing.T) {
	for _, tt := range []struct{ in, want string }{
		{"", "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"},
		{"abc", "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"},
		{"abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq", "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1"},
	} {
		h := New()
		h.WriteString(tt.in)
		got := h.Sum()
		if hex.EncodeToString(got[:]) != tt.want {
			t.Errorf("%q: %x, want %s", tt.in, got, tt.want)
		}
	}
}

// TestSameAsTheLibrary: every length from 0 to 300 bytes, written whole
// and in pieces of every size from 1 to 70, digests as crypto/sha256 does.
func TestSameAsTheLibrary(t *testing.T) {
	text := []byte(strings.Repeat("Corrie Vale 2024-03-01 Na 0.41 µmol/L\n", 10))
	for n := 0; n <= 300; n++ {
		want := sha256.Sum256(text[:n])
		for piece := 1; piece <= 70; piece++ {
			h := New()
			for i := 0; i < n; i += piece {
				h.Write(text[i:min(n, i+piece)])
			}
			if got := h.Sum(); got != want {
				t.Fatalf("%d bytes in pieces of %d: %x, want %x", n, piece, got, want)
			}
		}
	}
}

func ExampleNew() {
	h := New()
	h.WriteString("abc")
	d := h.Sum()
	fmt.Println(hex.EncodeToString(d[:]))
	// Output: ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad
}
