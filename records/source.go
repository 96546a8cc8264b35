package records

import (
	"fmt"
	"io"
	"io/fs"
	"slices"
	"strings"
	"unicode/utf8"
)

var errEOF = io.EOF

// rowReader gives a file's records one at a time, the header first, with
// the line (or spreadsheet row) each starts on. A *csv.ParseError is one
// bad record; any other error ends the file. A record's cells may be
// views of the reader's buffer, reused once it reads on (rowBatch): what
// is kept of them must be copied.
type rowReader interface {
	next() (rec []string, line int, err error)
	refBase() string // what a row's Ref starts with: "daily_care.csv:"
}

// newCSVRows reads the rows of the CSV file f through br (f with its byte
// order mark skipped). A file of prefetchMinBytes or more is tokenized on a
// goroutine of its own while the loader decodes (prefetchRows); a smaller
// one directly. Either way call stopRows when done with the reader.
func newCSVRows(f any, br io.Reader, file string) rowReader {
	r := newCSVReader(br)
	if csvSize(f) >= prefetchMinBytes {
		return newPrefetchRows(r, file+":", batchRows, batchBytes)
	}
	return &csvRows{r: r, base: file + ":"}
}

// csvSize is the size of an opened record file, or -1 when unknown.
func csvSize(f any) int64 {
	var st fs.FileInfo
	var err error
	switch f := f.(type) {
	case *capped:
		st, err = f.f.Stat()
	case interface{ Stat() (fs.FileInfo, error) }:
		st, err = f.Stat()
	default:
		return -1
	}
	if err != nil {
		return -1
	}
	return st.Size()
}

// stopRows ends a reader's work: a prefetching reader's goroutine has ended
// when it returns, even when the file was not read to its end.
func stopRows(r rowReader) {
	if p, ok := r.(*prefetchRows); ok {
		p.stop()
	}
}

// csvRows reads a CSV file's rows with the bounded csvReader.
// Its cells are views of the reader's buffer, valid until the next row.
type csvRows struct {
	r    *csvReader
	base string
	text bool // the row just read is text (csvReader.rowText)
}

func (c *csvRows) next() ([]string, int, error) {
	if poisonCells {
		for i := range c.r.recBuf {
			c.r.recBuf[i] = '#'
		}
	}
	c.text = false
	if err := c.r.readRaw(); err != nil {
		return nil, 0, err
	}
	c.text = c.r.rowText()
	return c.r.views(), c.r.start, nil
}

func (c *csvRows) refBase() string { return c.base }

// span is the first and last line of the row just read: more than one when a
// quoted cell runs over lines.
func (c *csvRows) span() (int, int) { return c.r.start, c.r.end }

// source is where the rows of one record kind come from.
type source struct {
	file    string // daily_care.csv, daily_care.xlsx or records.xlsx
	sheet   *sheet // the kind's sheet of records.xlsx, read before the files load
	display string // its name in the accounting: "records.xlsx:daily_care" for a sheet
}

func (s *source) csv() bool { return strings.HasSuffix(s.file, ".csv") }

// findSources decides where each record kind is read from: its CSV file,
// its own workbook, or its sheet of records.xlsx. Two of them for one kind
// is an error for the folder, since either could be the keeper's latest.
// Sheets of records.xlsx named after no record kind are warnings.
func findSources(fsys fs.FS, names map[string]bool) (map[string]*source, []Warning, error) {
	out := map[string]*source{}
	var warnings []Warning
	var book map[string]*sheet
	if names[workbookFile] {
		wb, err := openWorkbook(fsys, workbookFile)
		if err != nil {
			return nil, nil, &LoadError{File: workbookFile, Reason: err.Error(), Err: err}
		}
		book = map[string]*sheet{}
		for _, name := range wb.GetSheetList() {
			if fileOrder(name+".csv") >= len(Files) || name+".csv" == facilityFile {
				warnings = append(warnings, Warning{File: workbookFile, Column: name, Message: "sheet not named after a record kind, not read"})
				continue
			}
			sh, err := readSheet(wb, workbookFile, name)
			if err != nil {
				_ = wb.Close()
				return nil, nil, &LoadError{File: workbookFile, Reason: err.Error(), Err: err}
			}
			book[name] = sh
		}
		_ = wb.Close()
	}
	for _, file := range Files[1:] {
		kind := kindOf(file)
		var found []*source
		if names[file] {
			found = append(found, &source{file: file, display: file})
		}
		if names[kind+".xlsx"] {
			found = append(found, &source{file: kind + ".xlsx", display: kind + ".xlsx"})
		}
		if sh, ok := book[kind]; ok {
			found = append(found, &source{file: workbookFile, sheet: sh, display: workbookFile + ":" + kind})
		}
		switch len(found) {
		case 0:
		case 1:
			out[file] = found[0]
		default:
			var where []string
			for _, f := range found {
				where = append(where, f.display)
			}
			return nil, nil, &LoadError{File: found[0].display,
				Reason: fmt.Sprintf("%s records are in both %s: keep one of them", kind, strings.Join(where, " and "))}
		}
	}
	return out, warnings, nil
}

// kindSheet reads a kind's own workbook: its sheet named after the kind,
// else its first sheet.
func kindSheet(fsys fs.FS, file, kind string) (*sheet, error) {
	wb, err := openWorkbook(fsys, file)
	if err != nil {
		return nil, err
	}
	defer wb.Close()
	list := wb.GetSheetList()
	if len(list) == 0 {
		return nil, fmt.Errorf("has no sheet")
	}
	name := list[0]
	if slices.Contains(list, kind) {
		name = kind
	}
	return readSheet(wb, file, name)
}

// IsRecordFile reports whether a path of a records folder is one the
// loader reads: facility.yaml, a record file, its workbook, or
// records.xlsx. A checker fingerprint covers exactly these files.
func IsRecordFile(name string) bool { return isRecordFile(name) }

// isRecordFile reports whether a folder entry is read as records.
func isRecordFile(name string) bool {
	if fileOrder(name) < len(Files) || name == workbookFile {
		return true
	}
	if kind, ok := strings.CutSuffix(name, ".xlsx"); ok {
		return fileOrder(kind+".csv") < len(Files) && kind+".csv" != facilityFile
	}
	return false
}

// kindOrder is the records.md order of the record kind a problem belongs to.
func kindOrder(p *Problem) int {
	if kind, ok := strings.CutSuffix(p.File, ".xlsx"); ok {
		if p.File == workbookFile {
			kind, _, _ = strings.Cut(p.At, "!")
		}
		return fileOrder(kind + ".csv")
	}
	return fileOrder(p.File)
}

// textChecked reports whether the reader has already found every cell of
// the row just read to be text within the cell cap (textIssue), in one
// pass over the row, so the loader need not look again cell by cell.
func textChecked(r rowReader) bool {
	switch r := r.(type) {
	case *prefetchRows:
		return r.textChecked()
	case *csvRows:
		return r.text
	}
	return false
}

func validUTF8(rec []string) bool {
	for _, c := range rec {
		if !utf8.ValidString(c) {
			return false
		}
	}
	return true
}
