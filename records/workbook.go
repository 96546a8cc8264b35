package records

import (
	"fmt"
	"io/fs"
	"math"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
)

// A workbook may stand in for a CSV file (records.md, "Spreadsheets and
// exports"): daily_care.xlsx (its first sheet, or a sheet named daily_care),
// or one records.xlsx with a sheet per record kind. Its rows are turned into
// the same text cells a CSV file gives and go through the same decoder, so a
// workbook is validated and accounted exactly like the CSV it replaces.

// workbookFile is the one workbook that may hold every record kind.
const workbookFile = "records.xlsx"

// kindOf is the record kind of a file name ("daily_care" for daily_care.csv).
func kindOf(file string) string { return strings.TrimSuffix(file, ".csv") }

// sheet is one worksheet read into text cells, row by row; rows[i] is the
// spreadsheet's row i+1.
type sheet struct {
	file, name string
	rows       [][]string
}

// openWorkbook opens a workbook of the records folder.
func openWorkbook(fsys fs.FS, name string) (*excelize.File, error) {
	f, err := fsys.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	wb, err := excelize.OpenReader(f)
	if err != nil {
		return nil, fmt.Errorf("is not a readable .xlsx workbook (%v)", err)
	}
	return wb, nil
}

// readSheet reads a worksheet's cells as text: numbers as written (the
// cached value, for a formula), spreadsheet dates as YYYY-MM-DD (or
// YYYY-MM-DDTHH:MM[:SS] when the cell holds a time of day), and trailing
// empty rows dropped.
func readSheet(wb *excelize.File, file, name string) (*sheet, error) {
	raw, err := wb.GetRows(name, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, fmt.Errorf("sheet %s cannot be read: %v", name, err)
	}
	date1904 := false
	if p, err := wb.GetWorkbookProps(); err == nil && p.Date1904 != nil {
		date1904 = *p.Date1904
	}
	dateStyle := map[int]dateForm{}
	for r, row := range raw {
		for c, cell := range row {
			if cell == "" {
				continue
			}
			v, err := strconv.ParseFloat(cell, 64)
			if err != nil {
				continue
			}
			axis, _ := excelize.CoordinatesToCellName(c+1, r+1)
			id, err := wb.GetCellStyle(name, axis)
			if err != nil || id == 0 {
				continue
			}
			form, seen := dateStyle[id]
			if !seen {
				form = styleDate(wb, id)
				dateStyle[id] = form
			}
			if form != notDate {
				row[c] = serialText(v, date1904, form == dateTime)
			}
		}
	}
	n := len(raw)
	for n > 0 && blank(raw[n-1]) {
		n--
	}
	return &sheet{file: file, name: name, rows: raw[:n]}, nil
}

// serialText writes a spreadsheet date serial as the records' date or
// date-time text. Times are rounded to the second, as spreadsheets show them.
func serialText(v float64, date1904, withTime bool) string {
	t, err := excelize.ExcelDateToTime(v, date1904)
	if err != nil {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	if !withTime && v == math.Trunc(v) {
		return t.Format("2006-01-02")
	}
	t = t.Round(1e9)
	if t.Second() != 0 {
		return t.Format("2006-01-02T15:04:05")
	}
	return t.Format("2006-01-02T15:04")
}

// dateForm is how a cell style shows a number.
type dateForm uint8

const (
	notDate  dateForm = iota
	dateOnly          // a day
	dateTime          // a day and a time of day
)

// styleDate tells whether a cell style shows numbers as dates: one of the
// built-in date and time formats (ECMA-376 Part 1, §18.8.30: ids 14–22 and
// 45–47; 14–17 are dates alone), or a custom format with a day, month or
// year code outside quoted text and brackets (with an hour code: a time).
func styleDate(wb *excelize.File, id int) dateForm {
	st, err := wb.GetStyle(id)
	if err != nil || st == nil {
		return notDate
	}
	if st.CustomNumFmt != nil {
		return formatDate(*st.CustomNumFmt)
	}
	switch n := st.NumFmt; {
	case n >= 14 && n <= 17:
		return dateOnly
	case n >= 18 && n <= 22, n >= 45 && n <= 47:
		return dateTime
	}
	return notDate
}

func formatDate(f string) dateForm {
	quoted, bracket := false, false
	form := notDate
	for i := 0; i < len(f); i++ {
		c := f[i]
		switch {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '\\':
			i++
		case c == '[':
			bracket = true
		case c == ']':
			bracket = false
		case bracket:
		case c == 'h' || c == 'H' || c == 's' || c == 'S':
			form = dateTime
		case strings.IndexByte("dDmMyY", c) >= 0 && form == notDate:
			form = dateOnly
		}
	}
	return form
}

// sheetReader gives a sheet's rows to the loader, one record at a time.
type sheetReader struct {
	s     *sheet
	i     int
	width int    // the header's
	ref   string // "daily_care.xlsx:daily_care!"
}

func newSheetReader(s *sheet) *sheetReader {
	return &sheetReader{s: s, ref: s.file + ":" + s.name + "!"}
}

func (r *sheetReader) next() ([]string, int, error) {
	if r.i >= len(r.s.rows) {
		return nil, 0, errEOF
	}
	r.i++
	rec := r.s.rows[r.i-1]
	if r.i == 1 {
		rec = fit(rec, 0) // the header: empty cells after the last name
		r.width = len(rec)
		return rec, 1, nil
	}
	return fit(rec, r.width), r.i, nil
}

// at is the place of a cell (column index ci, or -1 for the whole row) of
// a spreadsheet row: "daily_care!C212", or "daily_care!212".
func (r *sheetReader) at(ci, line int) string {
	if ci < 0 {
		return r.s.name + "!" + strconv.Itoa(line)
	}
	col, _ := excelize.ColumnNumberToName(ci + 1)
	return r.s.name + "!" + col + strconv.Itoa(line)
}

func (r *sheetReader) refBase() string { return r.ref }

// fit pads a spreadsheet row to the header's width (a spreadsheet does not
// store the empty cells at the end of a row) and drops empty cells beyond
// it, so only a real extra value makes "row has N cells".
func fit(rec []string, width int) []string {
	for len(rec) > width && strings.TrimSpace(rec[len(rec)-1]) == "" {
		rec = rec[:len(rec)-1]
	}
	for len(rec) < width {
		rec = append(rec, "")
	}
	return rec
}
