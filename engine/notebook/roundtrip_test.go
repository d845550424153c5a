package notebook

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
	"lixiv/engine/sample"
)

// Round trips of a table through each text form it leaves the notebook in:
// text → table → text → table must give the samples cell the same samples.
// Each form is its own fuzz target, seeded with tables that stress the text
// forms (quoted delimiters and line breaks, doubled quotes, decimal commas,
// a units row, comment lines above the header, trailing empty cells) and
// with every input committed for FuzzTableFromText.

// roundTripSeeds are the seed texts of the round-trip fuzz targets.
var roundTripSeeds = []string{
	"sample,date,Na,Ca\n,,mg/L,mg/L\nA,2021-05-01,1.5,<0.01\nB,2021-05-02,2,3\n",
	"sample;date;Na\n;;mg/L\nA;01.05.2021;1,5\n",
	"sample\tdate\tNa (µmol/L)\nA\t2021-05-01\t12\n",
	"# lab report\n# batch 7\nsample,date,Na\nA,2021-05-01,1\n",
	"sample,note,Na\nA,\"two\nlines\",1\nB,\"a, b\",2\nC,\"say \"\"hi\"\"\",3\n",
	"0\n\"\n\",",
	"sample,Na,,\nA,1,,\n\nB,2,,x\n",
	"\ufeffsample,Na\r\nA,1\r\n",
	"sample,Na\nA\xe9,1\n",
}

// fuzzSeeds adds the round-trip seeds and every committed FuzzTableFromText
// input to f.
func fuzzSeeds(f *testing.F) {
	for _, s := range roundTripSeeds {
		f.Add(s)
	}
	files, _ := filepath.Glob("testdata/fuzz/FuzzTableFromText/*")
	for _, name := range files {
		b, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		_, v, _ := strings.Cut(strings.TrimSpace(string(b)), "\n")
		s, err := strconv.Unquote(strings.TrimSuffix(strings.TrimPrefix(v, "string("), ")"))
		if err != nil {
			f.Fatalf("%s: %v", name, err)
		}
		f.Add(s)
	}
}

// cellSamples is what the samples cell reads from t (computeSamples).
func cellSamples(t *Table) string {
	return sample.ParseText(t.TSV(), "f", sample.Options{Comma: '\t'}).SamplesText()
}

// roundTrip checks that the table read from text and the table read back
// from its text form out (CSV or TSV) give the same samples.
func roundTrip(t *testing.T, text string, out func(*Table) string) {
	defer watchdog.Start(text)()
	t1, err := TableFromText(text)
	if err != nil {
		return
	}
	text2 := out(t1)
	t2, err := TableFromText(text2)
	if err != nil {
		t.Fatalf("the table's text does not read back: %v\n%q", err, text2)
	}
	if a, b := cellSamples(t1), cellSamples(t2); a != b {
		t.Fatalf("samples differ after the round trip through\n%q\nfirst:\n%s\nthen:\n%s", text2, a, b)
	}
}

func FuzzRoundTripCSV(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, text string) { roundTrip(t, text, (*Table).CSV) })
}

func FuzzRoundTripTSV(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, text string) { roundTrip(t, text, (*Table).TSV) })
}

// FuzzRoundTripFile saves the table read from text in a budget file and
// loads it back: the same table, and the same samples.
func FuzzRoundTripFile(f *testing.F) {
	fuzzSeeds(f)
	f.Fuzz(func(t *testing.T, text string) {
		defer watchdog.Start(text)()
		t1, err := TableFromText(text)
		if err != nil {
			return
		}
		d := New("f")
		c := NewCell(KindSamples, "s", "")
		c.Table = t1
		if err := d.Insert(c, -1); err != nil {
			t.Fatal(err)
		}
		data := d.Marshal()
		d2, err := Parse(data, "f")
		if err != nil {
			t.Fatalf("the saved budget does not load: %v\n%s", err, data)
		}
		t2 := d2.Cell("s").Table
		if t1.CSV() != t2.CSV() {
			t.Fatalf("the table changed through the file:\n%q\n%q", t1.CSV(), t2.CSV())
		}
		if a, b := cellSamples(t1), cellSamples(t2); a != b {
			t.Fatalf("samples differ after the file round trip:\n%s\nthen:\n%s", a, b)
		}
	})
}
