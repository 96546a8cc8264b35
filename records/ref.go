package records

import (
	"fmt"
	"strconv"
	"strings"
)

// RefPlace is the place a Ref names, in one of the forms the loader makes:
//
//	daily_care.csv:212            a CSV (or YAML) file's line
//	facility.yaml:7               a line of facility.yaml
//	records.xlsx:daily_care!212   a workbook sheet's row
//	records.xlsx:daily_care!E4    a workbook sheet's cell (column letters, then row)
type RefPlace struct {
	File   string // the record file; never empty
	Sheet  string // a workbook's sheet; empty for a CSV or YAML line
	Column string // a workbook cell's column letters ("E"); empty for a row or line
	Line   int    // the line of a text file, or the row of a sheet; from 1
}

// Ref is the ref that names p, the inverse of ParseRef.
func (p RefPlace) Ref() Ref {
	if p.Sheet == "" {
		return MakeRef(p.File, p.Line)
	}
	return Ref(p.File + ":" + p.Sheet + "!" + p.Column + strconv.Itoa(p.Line))
}

// ParseRef splits a ref into its file, sheet, cell column and line. The
// file is what comes before the last colon (a sheet name cannot hold one)
// and must not be empty. After it comes the line, or a workbook's sheet, an
// exclamation mark and the row, or the cell (one to three capital column
// letters, then the row). A line or row is a decimal number from 1 (no
// sign, no leading zero).
func ParseRef(s string) (RefPlace, error) {
	i := strings.LastIndexByte(s, ':')
	if i <= 0 {
		return RefPlace{}, fmt.Errorf("%s is not a record reference (FILE:LINE, or FILE:SHEET!ROW in a workbook)", shortQuote(s))
	}
	p := RefPlace{File: s[:i]}
	num := s[i+1:]
	if j := strings.LastIndexByte(num, '!'); j >= 0 {
		p.Sheet, num = num[:j], num[j+1:]
		if p.Sheet == "" {
			return RefPlace{}, fmt.Errorf("%s is not a record reference: the sheet name before its ! is missing", shortQuote(s))
		}
		k := 0
		for k < len(num) && num[k] >= 'A' && num[k] <= 'Z' {
			k++
		}
		col := 0
		for _, c := range num[:k] {
			col = col*26 + int(c-'A') + 1
		}
		if col > maxSheetColumn {
			return RefPlace{}, fmt.Errorf("%s is not a record reference: %q is not a column of a sheet (A to XFD)", shortQuote(s), num[:k])
		}
		p.Column, num = num[:k], num[k:]
	}
	n, ok := 0, num != "" && len(num) <= 10 && num[0] != '0'
	if ok {
		n, ok = digits(num, 0, len(num))
	}
	switch {
	case !ok && p.Sheet != "":
		return RefPlace{}, fmt.Errorf("%s is not a record reference: the row after the sheet is not a number from 1", shortQuote(s))
	case !ok:
		return RefPlace{}, fmt.Errorf("%s is not a record reference: the line after the colon is not a number from 1", shortQuote(s))
	}
	p.Line = n
	return p, nil
}

// maxSheetColumn is a sheet's last column, XFD (Office Open XML, ECMA-376).
const maxSheetColumn = 16384

// MakeRef is the ref of a file's line.
func MakeRef(file string, line int) Ref { return Ref(file + ":" + strconv.Itoa(line)) }
