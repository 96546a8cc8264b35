package reports_test

import (
	"strings"
	"testing"
	"unicode/utf8"

	"welfare/reports"
)

// Cells a spreadsheet runs as formulas: OWASP "CSV Injection" lists = + - @
// tab and CR at the start of a cell; spreadsheets skip leading white space
// (the non-breaking kinds too), zero-width characters, a byte-order mark
// and quotation marks, and map the full-width forms ＝ ＋ － ＠ to their
// ASCII meaning, before they decide (common practice).
func TestNeutralise(t *testing.T) {
	tests := []struct{ name, in, want string }{
		{"equals", "=HYPERLINK(\"http://x\")", "'=HYPERLINK(\"http://x\")"},
		{"plus", "+1", "'+1"},
		{"minus", "-20 °C wind chill", "'-20 °C wind chill"},
		{"at", "@SUM(A1)", "'@SUM(A1)"},
		{"tab", "\tN-01", "'\tN-01"},
		{"carriage return", "\rN-01", "'\rN-01"},
		{"after spaces", "   =1+1", "'   =1+1"},
		{"after a newline", "\n=1", "'\n=1"},
		{"after a no-break space", "\u00a0=1", "'\u00a0=1"},
		{"after a narrow no-break space", "\u202f+1", "'\u202f+1"},
		{"after an ideographic space", "\u3000@A1", "'\u3000@A1"},
		{"after an em space", "\u2003-1", "'\u2003-1"},
		{"after a zero-width space", "\u200b=1", "'\u200b=1"},
		{"after a zero-width joiner", "\u200d=1", "'\u200d=1"},
		{"after a word joiner", "\u2060=1", "'\u2060=1"},
		{"after a byte-order mark", "\ufeff=1", "'\ufeff=1"},
		{"after a double quote", "\"=1", "'\"=1"},
		{"after a single quote", "'=1", "''=1"},
		{"after typographic quotes", "\u201c\u2018@A1", "'\u201c\u2018@A1"},
		{"after a mix", " \u00a0\u200b\ufeff\"-1", "' \u00a0\u200b\ufeff\"-1"},
		{"tab after spaces", "  \tN-01", "'  \tN-01"},
		{"full-width equals", "＝1+1", "'＝1+1"},
		{"full-width plus", "＋1", "'＋1"},
		{"full-width minus", "－1", "'－1"},
		{"full-width at", "＠SUM(A1)", "'＠SUM(A1)"},
		{"full-width after a space", " ＝1", "' ＝1"},
		{"only the start matters", "wind chill −31, limit -20", "wind chill −31, limit -20"},
		{"space then text", "  N-01 =1", "  N-01 =1"},
		{"true minus sign", "−31 (true minus sign)", "−31 (true minus sign)"},
		{"date", "2026-01-14", "2026-01-14"},
		{"id", "N-01", "N-01"},
		{"only spaces", "  \u00a0", "  \u00a0"},
		{"only a quote", "\"", "\""},
		{"empty", "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := reports.Neutralise(tt.in); got != tt.want {
				t.Errorf("Neutralise(%q) = %q, want %q", tt.in, got, tt.want)
			}
		})
	}
}

// leading is what a spreadsheet may skip before it decides that a cell is a
// formula, listed here independently of the package's own list.
const leading = " \n\v\f\u0085\u00a0\u1680\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007\u2008\u2009\u200a" +
	"\u2028\u2029\u202f\u205f\u3000\u200b\u200c\u200d\u2060\ufeff\"'`\u2018\u2019\u201c\u201d\u201e\u00ab\u00bb"

// formula is every character that starts a formula (or a new cell).
const formula = "=+-@\t\r＝＋－＠"

// FuzzNeutralise: whatever the cell, the output either is the input with
// the neutralising apostrophe in front, or, with its leading characters
// stripped, does not start with a formula character. Seeds are in
// testdata/fuzz/FuzzNeutralise.
func FuzzNeutralise(f *testing.F) {
	for _, s := range []string{"", "=1", " \u00a0=1", "N-01"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, in string) {
		out := reports.Neutralise(in)
		if out == "'"+in {
			return
		}
		if out != in {
			t.Fatalf("Neutralise(%q) = %q: neither the input nor its neutralised form", in, out)
		}
		rest := strings.TrimLeft(out, leading)
		if c, _ := utf8.DecodeRuneInString(rest); rest != "" && strings.ContainsRune(formula, c) {
			t.Fatalf("Neutralise(%q) = %q starts with the formula character %q after its leading characters", in, out, c)
		}
	})
}
