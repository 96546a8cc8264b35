package records

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Spreadsheet exports the loader recognises and refuses with the fix rather
// than misreading (records.md, "Spreadsheets and exports"). Each problem
// has a Kind, so that a terminal shows one message per file with the count
// of rows (GroupProblems) while every rejected row is still listed.

// The problem kinds that repeat over many rows of one file.
const (
	KindDecimalComma = "decimal_comma"
	KindDateOrder    = "date_order"
	KindNotUTF8      = "not_utf8"
	KindUnknownRef   = "unknown_reference"
	KindDelimiter    = "delimiter"
)

// delimiterIssue recognises a header cut on the wrong character: a file
// whose only column holds semicolons or tabs was exported with that
// separator.
func delimiterIssue(head []string) *headerIssue {
	if len(head) != 1 {
		return nil
	}
	for _, d := range []struct{ sep, name string }{{";", "semicolons"}, {"\t", "tabs"}} {
		if n := strings.Count(head[0], d.sep); n > 0 {
			return &headerIssue{reason: fmt.Sprintf("columns are separated by %s, but commas are expected: "+
				"export the sheet again as comma-separated values (or save it as a .xlsx workbook)", d.name)}
		}
	}
	return nil
}

// numberReason explains a cell that is not a number, recognising a
// decimal comma ("-35,5").
func (d *decoder) numberReason(cell, what string) string {
	if fixed, ok := decimalComma(cell); ok {
		d.kind = KindDecimalComma
		i := strings.IndexByte(cell, ',')
		if whole := strings.TrimLeft(cell[:i], "+-"); len(cell)-i-1 == 3 && whole != "0" && len(whole) <= 3 {
			// 1,234 may be a thousands separator as well as a decimal comma.
			return fmt.Sprintf("%q has a comma: write %s if it is a decimal comma, or %s if it separates thousands (numbers use a point and no separators)",
				cell, fixed, strings.Replace(cell, ",", "", 1))
		}
		return fmt.Sprintf("%q has a decimal comma: write %s (numbers use a point)", cell, fixed)
	}
	return fmt.Sprintf("%q is not %s", cell, what)
}

// decimalComma reports whether s is a number written with one decimal
// comma, and returns it with a point.
func decimalComma(s string) (string, bool) {
	i := strings.IndexByte(s, ',')
	if i < 0 || strings.Count(s, ",") != 1 || i == len(s)-1 {
		return "", false
	}
	fixed := s[:i] + "." + s[i+1:]
	if _, err := strconv.ParseFloat(fixed, 64); err != nil || strings.ContainsAny(fixed, "eExXpP_") {
		return "", false
	}
	return fixed, true
}

// dateReason explains a cell that is not a date or date-time, recognising
// the day-first and month-first forms spreadsheets write (15/01/2026,
// 01/15/2026, 15.01.2026, with or without a time).
func (d *decoder) dateReason(cell string, err error) string {
	date, rest, _ := strings.Cut(cell, " ")
	a, b, y, ok := slashDate(date)
	if !ok {
		return err.Error()
	}
	d.kind = KindDateOrder
	tail := ""
	if rest = strings.TrimSpace(rest); rest != "" {
		tail = "T" + rest
	}
	iso := func(m, dd int) string { return fmt.Sprintf("%04d-%02d-%02d%s", y, m, dd, tail) }
	form := "YYYY-MM-DD"
	if tail != "" {
		form = "YYYY-MM-DDTHH:MM"
	}
	switch {
	case a > 12 && b <= 12:
		return fmt.Sprintf("%q is a day-first date: write %s (%s)", cell, iso(b, a), form)
	case b > 12 && a <= 12:
		return fmt.Sprintf("%q is a month-first date: write %s (%s)", cell, iso(a, b), form)
	}
	return fmt.Sprintf("%q is a day-first or month-first date: write it as %s (%s if day first, %s if month first)",
		cell, form, iso(b, a), iso(a, b))
}

// slashDate reads N/N/YYYY with /, . or - between the parts.
func slashDate(s string) (a, b, y int, ok bool) {
	parts := strings.FieldsFunc(s, func(r rune) bool { return r == '/' || r == '.' || r == '-' })
	if len(parts) != 3 || len(parts[2]) != 4 || len(parts[0]) > 2 || len(parts[1]) > 2 {
		return 0, 0, 0, false
	}
	var ok1, ok2, ok3 bool
	a, ok1 = digits(parts[0], 0, len(parts[0]))
	b, ok2 = digits(parts[1], 0, len(parts[1]))
	y, ok3 = digits(parts[2], 0, 4)
	if !ok1 || !ok2 || !ok3 || a < 1 || b < 1 || a > 31 || b > 31 || (a > 12 && b > 12) {
		return 0, 0, 0, false
	}
	return a, b, y, true
}

// notUTF8 finds the first cell of a record that is not UTF-8 text: a file
// saved in a legacy encoding (Windows-1252, Latin-1). The row is refused,
// never read with replacement characters.
func notUTF8(p *plan, rec []string) *cellError {
	for ci, c := range rec {
		if utf8.ValidString(c) {
			continue
		}
		shown := escapeInvalid(c)
		ce := &cellError{field: -1, value: shown, kind: KindNotUTF8,
			reason: `"` + shown + `" is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export)`}
		if ci < len(p.cols) {
			ce.field, ce.column = p.cols[ci].field, p.cols[ci].header
		}
		return ce
	}
	return nil
}

// escapeInvalid shows the bytes that are not UTF-8 as \xNN, keeping the rest.
func escapeInvalid(s string) string {
	var b strings.Builder
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && n == 1 {
			fmt.Fprintf(&b, `\x%02X`, s[i])
		} else {
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}

// firstInvalidLine is the line of the first byte that is not UTF-8, 0 when
// all of data is UTF-8.
func firstInvalidLine(data []byte) int {
	if utf8.Valid(data) {
		return 0
	}
	line := 1
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n == 1 {
			return line
		}
		if r == '\n' {
			line++
		}
		i += n
	}
	return line
}
