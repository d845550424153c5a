//go:build browser

package browsertest

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// workbook writes a minimal one-sheet .xlsx (Office Open XML, ECMA-376
// part 1): numbers as number cells, everything else as inline strings.
func workbook(t testing.TB, rows [][]string) []byte {
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
	var sh strings.Builder
	sh.WriteString(`<worksheet ` + main + `><sheetData>`)
	for r, rec := range rows {
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
	put("[Content_Types].xml", `<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">`+
		`<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>`+
		`<Default Extension="xml" ContentType="application/xml"/></Types>`)
	put("_rels/.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/officeDocument" Target="xl/workbook.xml"/></Relationships>`)
	put("xl/workbook.xml", `<workbook `+main+` xmlns:r="`+rel+`"><sheets><sheet name="Samples" sheetId="1" r:id="rId1"/></sheets></workbook>`)
	put("xl/_rels/workbook.xml.rels", `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`+
		`<Relationship Id="rId1" Type="`+rel+`/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`)
	put("xl/worksheets/sheet1.xml", sh.String())
	put("xl/styles.xml", `<styleSheet `+main+`><cellXfs count="1"><xf numFmtId="0"/></cellXfs></styleSheet>`)
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// TestOpenSamplesWorkbook opens an .xlsx workbook of three samples through
// the file picker: asked, the user puts them into the demo, where they
// replace the samples table, as a CSV file would.
func TestOpenSamplesWorkbook(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	block := samplesBlock(t, ctx, "BOOK-1", "BOOK-2", "BOOK-3")
	cols := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr:first-child input")].map(e => e.value)`)
	units := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr.units input")].map(e => e.value)`)
	rows := [][]string{cols, units}
	for _, l := range strings.Split(strings.TrimSpace(block), "\n") {
		rows = append(rows, strings.Split(l, "\t"))
	}
	file := filepath.Join(t.TempDir(), "new-samples.xlsx")
	if err := os.WriteFile(file, workbook(t, rows), 0o644); err != nil {
		t.Fatal(err)
	}
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
		t.Fatal(err)
	}
	intoDemo(t, ctx)
	waitGen(t, ctx, gen)
	if got := eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`); !strings.HasPrefix(got, "3 rows") {
		t.Errorf("samples table after opening the workbook: got %q, want 3 rows", got)
	}
	if got := eval[string](t, ctx, `document.querySelector("section.kind-samples table.data tbody tr:first-child input").value`); got != "BOOK-1" {
		t.Errorf("first sample: got %q, want BOOK-1", got)
	}
	notes := eval[string](t, ctx, `document.querySelector("section.kind-samples .notes").textContent`)
	if !strings.Contains(notes, "new-samples.xlsx") {
		t.Errorf("import note: got %q, want the file named", notes)
	}
}
