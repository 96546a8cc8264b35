package checker

import (
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

// Evidence sorts by file, sheet and line or row as numbers, whatever form
// the loader gave its refs: CSV and YAML lines, workbook rows and cells.
func TestSortRefsEveryForm(t *testing.T) {
	got := sortRefs([]records.Ref{
		"records.xlsx:daily_care!E10", "daily_care.csv:10", "records.xlsx:daily_care!9",
		"facility.yaml:7", "daily_care.csv:9", "records.xlsx:animals!3", "daily_care.csv",
		"records.xlsx:daily_care!12", "daily_care.csv:9",
	})
	want := []records.Ref{
		"daily_care.csv", // the whole file, before its lines
		"daily_care.csv:9", "daily_care.csv:10",
		"facility.yaml:7",
		"records.xlsx:animals!3",
		"records.xlsx:daily_care!9", "records.xlsx:daily_care!E10", "records.xlsx:daily_care!12",
	}
	if d := cmp.Diff(want, got); d != "" {
		t.Errorf("sortRefs (-want +got):\n%s", d)
	}
}

// A finding's evidence must name a row of a file read, in a form the
// loader makes.
func TestRefNamesNoRow(t *testing.T) {
	lines := map[string]int{"daily_care.csv": 20, "facility.yaml": 30, "records.xlsx": 0}
	for ref, want := range map[string]string{
		"daily_care.csv:20":          "",
		"daily_care.csv":             "",
		"facility.yaml:7":            "",
		"records.xlsx:daily_care!12": "",
		"records.xlsx:daily_care!E4": "",
		"daily_care.csv:21":          "daily_care.csv has 20 lines",
		"daily_care.csv:0":           "it is not FILE:LINE",
		"daily_care.csv:s!4":         "it is not FILE:LINE",
		"records.xlsx:daily_care!":   "it is not FILE:LINE",
		"records.xlsx:!4":            "it is not FILE:LINE",
		"notes.txt:1":                "notes.txt is not a record file that was read",
		"notes.txt":                  "notes.txt is not a record file that was read",
		"a:b.csv:3":                  "a:b.csv is not a record file that was read",
	} {
		if got := refNamesNoRow(ref, lines); got != want {
			t.Errorf("refNamesNoRow(%q) = %q, want %q", ref, got, want)
		}
	}
}
