package main

import (
	"archive/zip"
	"bytes"
	"encoding/csv"
	"encoding/xml"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// writeXLSX writes a minimal workbook (Office Open XML, ECMA-376 part 1)
// with one sheet per name, cells from records: numbers as number cells,
// everything else as inline strings.
func writeXLSX(t *testing.T, path string, names []string, sheets [][][]string) {
	t.Helper()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	put := func(name, body string) {
		w, err := zw.Create(name)
		if err == nil {
			_, err = w.Write([]byte(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>` + "\n" + body))
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	const main = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	const rel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
	var wb, rels strings.Builder
	wb.WriteString(`<workbook ` + main + ` xmlns:r="` + rel + `"><sheets>`)
	rels.WriteString(`<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`)
	for i, name := range names {
		n := strconv.Itoa(i + 1)
		fmt.Fprintf(&wb, `<sheet name="%s" sheetId="%s" r:id="rId%s"/>`, name, n, n)
		fmt.Fprintf(&rels, `<Relationship Id="rId%s" Type="%s/worksheet" Target="worksheets/sheet%s.xml"/>`, n, rel, n)
		var sh strings.Builder
		sh.WriteString(`<worksheet ` + main + `><sheetData>`)
		for r, rec := range sheets[i] {
			fmt.Fprintf(&sh, `<row r="%d">`, r+1)
			for c, v := range rec {
				ref := string(rune('A'+c)) + strconv.Itoa(r+1)
				if _, err := strconv.ParseFloat(v, 64); err == nil {
					fmt.Fprintf(&sh, `<c r="%s"><v>%s</v></c>`, ref, v)
					continue
				}
				var esc bytes.Buffer
				xml.EscapeText(&esc, []byte(v))
				fmt.Fprintf(&sh, `<c r="%s" t="inlineStr"><is><t>%s</t></is></c>`, ref, esc.String())
			}
			sh.WriteString(`</row>`)
		}
		sh.WriteString(`</sheetData></worksheet>`)
		put("xl/worksheets/sheet"+n+".xml", sh.String())
	}
	wb.WriteString(`</sheets></workbook>`)
	rels.WriteString(`</Relationships>`)
	put("[Content_Types].xml", `<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">`+
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>`+
		`<Default Extension="xml" ContentType="application/xml"/></Types>`)
	put("_rels/.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	put("xl/workbook.xml", wb.String())
	put("xl/_rels/workbook.xml.rels", rels.String())
	put("xl/styles.xml", `<styleSheet `+main+`><cellXfs count="1"><xf numFmtId="0"/></cellXfs></styleSheet>`)
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestQuickXLSX runs quick on the samples of quick-samples.csv saved as a
// workbook: the output is the CSV's golden output, the file name aside.
func TestQuickXLSX(t *testing.T) {
	f, err := os.Open("testdata/quick-samples.csv")
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	book := filepath.Join(dir, "quick-samples.xlsx")
	notes := [][]string{{"Corrie Vale field notes"}, {"no samples on this sheet"}}
	writeXLSX(t, book, []string{"Notes", "Chemistry"}, [][][]string{notes, recs})
	want, err := os.ReadFile("testdata/quick-per-sample.stdout")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		args []string
		err  string // part of the error message; "" for success
		out  string // part of stdout; "" for the golden output
	}{
		{"sheet by name", []string{"quick", "-samples", book, "-sheet", "Chemistry"}, "", ""},
		// The budget is printed, and the exit status says its cells have problems.
		{"first sheet by default, which holds no samples", []string{"quick", "-samples", book}, "samples (problem)", "samples (samples): problem"},
		{"missing sheet", []string{"quick", "-samples", book, "-sheet", "Rain"}, `sheet "Rain" is not in the workbook, which holds "Notes", "Chemistry"`, ""},
		{"not a workbook", []string{"quick", "-samples", filepath.Join(dir, "fake.xlsx")}, "fake.xlsx: not an .xlsx workbook", ""},
	}
	os.WriteFile(filepath.Join(dir, "fake.xlsx"), []byte("sample,Na (mg/L)\nA,1\n"), 0o644)
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			err := run(tt.args, &stdout, &stderr)
			if tt.err != "" {
				if err == nil || !strings.Contains(err.Error(), tt.err) {
					t.Fatalf("error %v, want one containing %q", err, tt.err)
				}
			} else if err != nil {
				t.Fatal(err)
			}
			if tt.err != "" || tt.out != "" {
				if !strings.Contains(stdout.String(), tt.out) {
					t.Errorf("stdout does not say %q:\n%s", tt.out, stdout.String())
				}
				return
			}
			got := strings.ReplaceAll(stdout.String(), book, "testdata/quick-samples.csv")
			got = strings.ReplaceAll(got, "quick-samples.xlsx", "quick-samples.csv")
			if !bytes.Equal(normalise([]byte(got)), normalise(want)) {
				t.Errorf("output differs from quick-per-sample.stdout:\n%s", got)
			}
		})
	}
}
