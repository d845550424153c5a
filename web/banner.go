package web

import (
	"fmt"

	"lixiv/engine/notebook"
)

// BannerView is what the import banner shows: which cell took the file,
// what it took each column as (notebook.Reading), and what the import
// could not read, substituted, inferred or left out, in the engine's
// messages about the table (notebook.Output.Messages, placed as beside
// the table).
type BannerView struct {
	Title   string // "The Samples cell took sallowmere-samples.csv"
	Cell    string // the cell's id, for the link; "" for a budget file
	Link    string // the link's text
	Lines   []string
	Columns []notebook.ColumnReading
	Notes   []TableProblem // what the import did, from the cell's messages about its table (the first few)
	More    string         // how many more are listed beside the table
	Reading bool           // the cell has not read the table yet
	Problem string
	Unused  int // columns not used
}

// bannerNotes is how many of the messages about a table the banner lists.
const bannerNotes = 8

// bannerView gathers the banner from the document; nil without a banner.
func (c *Root) bannerView() *BannerView {
	b := c.Banner
	if b == nil || c.S == nil {
		return nil
	}
	if b.Cell == "" {
		return &BannerView{
			Title: fmt.Sprintf("Opened the budget file %s", b.File),
			Lines: []string{fmt.Sprintf("%s. Its stored results are compared with the rerun at the foot of the page.", plural(b.Cells, "cell"))},
		}
	}
	cell := c.S.Doc.Cell(b.Cell)
	if cell == nil {
		return nil
	}
	title := cell.Title
	if title == "" {
		title = KindLabel(cell.Kind)
	}
	v := &BannerView{Cell: b.Cell, Link: "Go to the " + title + " cell"}
	switch {
	case b.File == "":
		v.Title = fmt.Sprintf("The %s cell took the pasted rows", title)
	default:
		v.Title = fmt.Sprintf("The %s cell took %s", title, b.File)
	}
	o := c.S.Doc.Output(b.Cell)
	if o == nil {
		v.Reading = true
		v.Lines = []string{"Reading the table…"}
		return v
	}
	if _, err := c.S.Doc.Status(b.Cell); err != nil {
		v.Problem = err.Error()
	}
	r := o.Reading
	if r == nil {
		return v
	}
	v.Columns = r.Columns
	for _, cv := range c.Cells {
		if cv.ID != b.Cell {
			continue
		}
		v.Notes = cv.TableProblems
		if n := len(v.Notes) - bannerNotes; n > 0 {
			v.Notes, v.More = v.Notes[:bannerNotes], fmt.Sprintf("and %d more, listed beside the table", n)
		}
	}
	for _, col := range r.Columns {
		if !col.Used {
			v.Unused++
		}
	}
	line := fmt.Sprintf("%s of %s.", plural(r.Rows, "row"), plural(len(r.Columns), "column"))
	if v.Unused > 0 {
		line = fmt.Sprintf("%s of %s, %d of them not used.", plural(r.Rows, "row"), plural(len(r.Columns), "column"), v.Unused)
	}
	v.Lines = []string{line}
	return v
}

// ColumnClass styles a column of the banner: muted when it is not used.
func ColumnClass(col notebook.ColumnReading) string {
	if col.Used {
		return "col-read"
	}
	return "col-read unused"
}
