package delimiter

import (
	"bytes"
	"strings"
	"testing"
)

func lines(s string) [][]byte {
	var out [][]byte
	for _, l := range strings.Split(s, "\n") {
		if l != "" {
			out = append(out, []byte(l))
		}
	}
	return out
}

// The cases are the importers' own: sample tables (engine/sample) and
// discharge records (engine/discharge).
func TestDetect(t *testing.T) {
	tests := []struct {
		name  string
		in    string
		mark  Mark
		delim byte
		ok    bool
	}{
		{"sample csv", "Sample,Ca (mg/L),Mg (mg/L)\nS1,12.5,3.1\nS2,11,2.9\n", AnyMark, ',', true},
		{"sample pasted from a spreadsheet", "Sample\tCa (mg/L)\tNa (mg/L)\nS1\t12,5\t3,1\n", AnyMark, '\t', true},
		{"sample semicolons and decimal commas", "Sample;Ca (mg/L);Mg (mg/L)\nS1;12,5;3,1\nS2;11,25;2,9\n", AnyMark, ';', true},
		{"sample quoted commas in a semicolon file", "Sample;Site\n\"S1, upper\";\"A, B\"\n\"S2, lower\";\"C, D\"\n", AnyMark, ';', true},
		{"sample quoted semicolons in a comma file", "Sample,Note\nS1,\"a; b; c\"\nS2,\"d; e\"\n", AnyMark, ',', true},
		{"sample quoted line break", "Sample,Note\nS1,\"two\nlines\"\nS2,one\n", AnyMark, ',', true},
		{"discharge csv", "Date,Q (m3/s)\n2021-10-01,1.5\n2021-10-02,2\n", AnyMark, ',', true},
		{"discharge tabs", "2021-10-01\t1.5\n2021-10-02\t2\n", AnyMark, '\t', true},
		{"discharge semicolon decimal comma, mark unknown", "2021-01-01;1,5\n2021-01-02;2,25\n", AnyMark, ';', true},
		{"discharge semicolon decimal comma, mark known", "2021-01-01;1,5\n2021-01-02;2,25\n", CommaMark, ';', true},
		{"discharge spaces", "2021-01-01 1\n2021-01-02 2\n", AnyMark, 0, false},
		{"discharge spaces, decimal comma known", "2021-01-01 1,5\n2021-01-02 2,5\n", CommaMark, 0, false},
		{"discharge spaces, decimal mark unknown", "2021-01-01 1,5\n2021-01-02 2,5\n", AnyMark, ',', true},
		// Split at commas, the column of decimal commas gives more records
		// of one width than the header split at its semicolon: only the
		// known mark keeps the semicolon.
		{"header over decimal commas, mark unknown", "Date;Q\n1,5\n2,25\n", AnyMark, ',', true},
		{"header over decimal commas, mark known", "Date;Q\n1,5\n2,25\n", CommaMark, ';', true},
		{"decimal point known keeps the comma", "Date,Q\n2021-01-01,1.5\n", PointMark, ',', true},
		{"one column", "Sample\nS1\nS2\n", AnyMark, 0, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d, ok := Detect(lines(tt.in), tt.mark)
			if d != tt.delim || ok != tt.ok {
				t.Errorf("Detect = %q, %v; want %q, %v", d, ok, tt.delim, tt.ok)
			}
		})
	}
}

func TestSplit(t *testing.T) {
	tests := []struct {
		in    string
		delim byte
		want  []string
	}{
		{"a,b,c", ',', []string{"a", "b", "c"}},
		{"a,,c,", ',', []string{"a", "", "c", ""}},
		{`"a, b",c`, ',', []string{"a, b", "c"}},
		{`  "say ""hi""";x`, ';', []string{`say "hi"`, "x"}},
		{`"q"tail,x`, ',', []string{"qtail", "x"}},
		{`a"b,c`, ',', []string{`a"b`, "c"}},
		{"x\ty", '\t', []string{"x", "y"}},
	}
	for _, tt := range tests {
		var scratch []byte
		got := Split([]byte(tt.in), tt.delim, nil, &scratch)
		if len(got) != len(tt.want) {
			t.Errorf("Split(%q) = %q, want %q", tt.in, got, tt.want)
			continue
		}
		for i := range got {
			if string(got[i]) != tt.want[i] {
				t.Errorf("Split(%q) = %q, want %q", tt.in, got, tt.want)
				break
			}
		}
	}
}

func TestJoinRecords(t *testing.T) {
	got := JoinRecords(lines("a,\"one\ntwo\nthree\",b\nc,d\n"), ',')
	want := []string{"a,\"one\ntwo\nthree\",b", "c,d"}
	if len(got) != len(want) {
		t.Fatalf("JoinRecords = %q, want %q", got, want)
	}
	for i := range got {
		if string(got[i]) != want[i] {
			t.Errorf("record %d = %q, want %q", i, got[i], want[i])
		}
	}
}

// FuzzSplit checks that detection and splitting take any text, and that
// a record without quotes splits into fields that join back into it.
func FuzzSplit(f *testing.F) {
	for _, s := range []string{"a,b\n1,2", "2021-01-01;1,5", "\"a\nb\",c", "x\ty", `"unclosed,`} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		ls := lines(s)
		for _, mark := range []Mark{AnyMark, PointMark, CommaMark} {
			d, ok := Detect(ls, mark)
			if ok && bytes.IndexByte(Candidates, d) < 0 || !ok && d != 0 {
				t.Fatalf("Detect(%q) = %q, %v", s, d, ok)
			}
			if ok && d == ',' && mark == CommaMark {
				t.Fatalf("Detect(%q) chose a comma with a decimal comma", s)
			}
		}
		for _, l := range JoinRecords(ls, ',') {
			var scratch []byte
			fs := Split(l, ',', nil, &scratch)
			if bytes.IndexByte(l, '"') < 0 && string(bytes.Join(fs, []byte{','})) != string(l) {
				t.Fatalf("Split(%q) = %q does not join back", l, fs)
			}
		}
	})
}
