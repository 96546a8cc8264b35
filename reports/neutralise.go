package reports

// Neutralise prefixes a single quote to a cell a spreadsheet would run as a
// formula or shift into another cell (OWASP "CSV Injection"). A cell is
// dangerous when its first character that is not a space, a non-breaking or
// zero-width space, a byte-order mark or a quotation mark is one of
// = + - @ (or their full-width forms ＝ ＋ － ＠), or a tab or carriage
// return: spreadsheets skip such leading characters, or quietly map the
// full-width forms, before deciding that a cell is a formula.
//
// Only the start of the cell matters: "wind chill −31 °C, limit -20" is left
// alone, "-20 °C" becomes "'-20 °C" and " \u00a0=1" becomes "' \u00a0=1".
// The true minus sign − (U+2212) is not a formula character.
func Neutralise(cell string) string {
	for _, c := range cell {
		switch {
		case isFormulaStart(c):
			return "'" + cell
		case isLeadingFiller(c):
			continue
		}
		return cell
	}
	return cell
}

// isFormulaStart reports whether c, as the first meaningful character of a
// cell, makes a spreadsheet read the cell as a formula or a new cell.
func isFormulaStart(c rune) bool {
	switch c {
	case '=', '+', '-', '@', '\t', '\r',
		'＝', '＋', '－', '＠': // U+FF1D, U+FF0B, U+FF0D, U+FF20
		return true
	}
	return false
}

// isLeadingFiller reports whether c is a character a spreadsheet may skip at
// the start of a cell: white space of any width (the non-breaking spaces
// included), zero-width characters, the byte-order mark and quotation marks.
func isLeadingFiller(c rune) bool {
	switch c {
	case ' ', '\n', '\v', '\f',
		'\u0085', '\u00a0', '\u1680', '\u2028', '\u2029', '\u202f', '\u205f', '\u3000', // spaces, non-breaking ones included
		'\u200b', '\u200c', '\u200d', '\u2060', '\u180e', '\u00ad', // zero-width characters and the soft hyphen
		'\ufeff',                                                                                       // byte-order mark (zero-width no-break space)
		'"', '\'', '`', '\u2018', '\u2019', '\u201a', '\u201b', '\u201c', '\u201d', '\u201e', '\u201f', // quotation marks
		'\u00ab', '\u00bb', '\u2039', '\u203a', '\uff02', '\uff07':
		return true
	}
	return c >= '\u2000' && c <= '\u200a' // en quad … hair space
}
