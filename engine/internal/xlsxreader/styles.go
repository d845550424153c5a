package xlsxreader

import (
	"archive/zip"
	"encoding/xml"
	"fmt"
	"strings"
	"unicode/utf8"
)

// styleSheet defines a struct containing the information we care about from the styles.xml file.
type styleSheet struct {
	NumberFormats []numberFormat `xml:"numFmts>numFmt,omitempty"`
	CellStyles    []cellStyle    `xml:"cellXfs>xf,omitempty"`
}

// numberFormat defines a struct containing the format strings for numerical styles.
type numberFormat struct {
	NumberFormatID int    `xml:"numFmtId,attr,omitempty"`
	FormatCode     string `xml:"formatCode,attr,omitempty"`
}

// cellStyle defines a struct containing style information for a cell.
type cellStyle struct {
	NumberFormatID int `xml:"numFmtId,attr"`
}

// getFormatCode returns the format string for a given format ID.
// If the format code is not found, it returns an empty string.
func getFormatCode(ID int, numberFormats []numberFormat) string {
	for _, nf := range numberFormats {
		if nf.NumberFormatID == ID {
			return nf.FormatCode
		}
	}

	return ""
}

// isDateFormatCode determines whether a format code is for a date: it
// holds one of the letters dmhysDMHYS outside bracketed groups ("[Red]",
// "[$-409]"), escaped characters ("\\d") and quoted text ("\"days\""),
// each taken leftmost-first and shortest, as the regular expression
// `\[.+?\]|\\.|".*?"` did (none of the three spans a new line).
func isDateFormatCode(formatCode string) bool {
	s := formatCode
	for i := 0; i < len(s); {
		switch s[i] {
		case '[':
			// at least one character inside, so the search starts at i+2
			if j := closing(s, i+2, ']'); j >= 0 && i+1 < len(s) && s[i+1] != '\n' {
				i = j + 1
				continue
			}
		case '\\':
			if i+1 < len(s) && s[i+1] != '\n' {
				_, n := utf8.DecodeRuneInString(s[i+1:])
				i += 1 + n
				continue
			}
		case '"':
			if j := closing(s, i+1, '"'); j >= 0 {
				i = j + 1
				continue
			}
		}
		if strings.IndexByte("dmhysDMHYS", s[i]) >= 0 {
			return true
		}
		i++
	}
	return false
}

// closing returns the index of the first c in s from index from on, or -1
// when a new line or the end of s comes first.
func closing(s string, from int, c byte) int {
	for j := from; j < len(s); j++ {
		switch s[j] {
		case c:
			return j
		case '\n':
			return -1
		}
	}
	return -1
}

// getDateStylesFromStyleSheet populates a map of all date related styles, based on their
// style sheet index.
func getDateStylesFromStyleSheet(ss *styleSheet) *map[int]bool {
	dateStyles := map[int]bool{}

	for i, style := range ss.CellStyles {
		if 14 <= style.NumberFormatID && style.NumberFormatID <= 22 {
			dateStyles[i] = true
		}
		if 164 <= style.NumberFormatID {
			formatCode := getFormatCode(style.NumberFormatID, ss.NumberFormats)
			if isDateFormatCode(formatCode) {
				dateStyles[i] = true
			}
		}
	}

	return &dateStyles
}

// getDateFormatStyles reads the styles XML, and returns a map of all styles that relate to date
// fields.
// If the styles sheet cannot be found, or cannot be read, then an error is returned.
func getDateFormatStyles(files []*zip.File) (*map[int]bool, error) {
	stylesFile, err := getFileForName(files, "xl/styles.xml")
	if err != nil {
		return nil, fmt.Errorf("unable to get styles file: %w", err)
	}

	data, err := readFile(stylesFile)
	if err != nil {
		return nil, fmt.Errorf("unable to read styles file: %w", err)
	}

	var ss styleSheet
	err = xml.Unmarshal(data, &ss)
	if err != nil {
		return nil, fmt.Errorf("unable to parse styles file: %w", err)
	}

	return getDateStylesFromStyleSheet(&ss), nil
}
