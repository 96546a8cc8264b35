package records

import (
	"strings"
	"testing"
)

// TestParseRef: every form of ref the loader makes parses into its place
// and back into the same text; malformed refs are refused with the reason.
func TestParseRef(t *testing.T) {
	tests := []struct {
		ref  string
		want RefPlace
		err  string // a part of the error; "" for a good ref
	}{
		// The loader's forms.
		{ref: "daily_care.csv:212", want: RefPlace{File: "daily_care.csv", Line: 212}},
		{ref: "facility.yaml:7", want: RefPlace{File: "facility.yaml", Line: 7}},
		{ref: "records.xlsx:daily_care!212", want: RefPlace{File: "records.xlsx", Sheet: "daily_care", Line: 212}},
		{ref: "records.xlsx:daily_care!E4", want: RefPlace{File: "records.xlsx", Sheet: "daily_care", Column: "E", Line: 4}},
		{ref: "daily_care.xlsx:daily care!XFD1048576", want: RefPlace{File: "daily_care.xlsx", Sheet: "daily care", Column: "XFD", Line: 1048576}},
		// A file name may hold a colon; a sheet name cannot (Excel refuses it).
		{ref: "a:b.csv:3", want: RefPlace{File: "a:b.csv", Line: 3}},
		{ref: "odd!name.csv:9", want: RefPlace{File: "odd!name.csv", Line: 9}},
		{ref: "x.xlsx:Sheet!1!2", want: RefPlace{File: "x.xlsx", Sheet: "Sheet!1", Line: 2}},
		// Malformed.
		{ref: "daily_care.csv", err: "is not a record reference (FILE:LINE"},
		{ref: "", err: "is not a record reference (FILE:LINE"},
		{ref: ":3", err: "is not a record reference (FILE:LINE"},
		{ref: "x:", err: "the line after the colon is not a number from 1"},
		{ref: "x:0", err: "the line after the colon is not a number from 1"},
		{ref: "x:01", err: "the line after the colon is not a number from 1"},
		{ref: "x:-1", err: "the line after the colon is not a number from 1"},
		{ref: "x:+1", err: "the line after the colon is not a number from 1"},
		{ref: "x:two", err: "the line after the colon is not a number from 1"},
		{ref: "x:99999999999", err: "the line after the colon is not a number from 1"},
		{ref: "x:E4", err: "the line after the colon is not a number from 1"}, // a cell needs its sheet
		{ref: "x.xlsx:!5", err: "the sheet name before its ! is missing"},
		{ref: "x.xlsx:daily_care!", err: "the row after the sheet is not a number from 1"},
		{ref: "x.xlsx:daily_care!E", err: "the row after the sheet is not a number from 1"},
		{ref: "x.xlsx:daily_care!e4", err: "the row after the sheet is not a number from 1"},
		{ref: "x.xlsx:daily_care!E0", err: "the row after the sheet is not a number from 1"},
		{ref: "x.xlsx:daily_care!4E", err: "the row after the sheet is not a number from 1"},
		{ref: "x.xlsx:daily_care!XFE4", err: `"XFE" is not a column of a sheet`},
		{ref: "x.xlsx:daily_care!ABCD4", err: `"ABCD" is not a column of a sheet`},
	}
	for _, tt := range tests {
		got, err := ParseRef(tt.ref)
		switch {
		case tt.err != "":
			if err == nil || !strings.Contains(err.Error(), tt.err) {
				t.Errorf("ParseRef(%q) = %+v, %v; want an error with %q", tt.ref, got, err, tt.err)
			}
		case err != nil:
			t.Errorf("ParseRef(%q): %v", tt.ref, err)
		case got != tt.want:
			t.Errorf("ParseRef(%q) = %+v, want %+v", tt.ref, got, tt.want)
		case string(got.Ref()) != tt.ref:
			t.Errorf("ParseRef(%q).Ref() = %q", tt.ref, got.Ref())
		}
	}
}
