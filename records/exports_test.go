package records

import (
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// The corpus of spreadsheet exports (testdata/exports, records.md
// "Spreadsheets and exports"): each folder gives one clear, positioned
// message per problem kind, with the count of rows it affects, and the
// accounting still holds every row.
func TestExportCorpus(t *testing.T) {
	tests := []struct {
		dir      string
		want     []string // the terminal's grouped lines (GroupProblems)
		rejected int
	}{
		{"semicolon", []string{
			"weather.csv:1: columns are separated by semicolons, but commas are expected: export the sheet again as comma-separated values (or save it as a .xlsx workbook); its 12 rows are not read",
		}, 12},
		{"tab", []string{
			"daily_care.csv:1: columns are separated by tabs, but commas are expected: export the sheet again as comma-separated values (or save it as a .xlsx workbook); its 5 rows are not read",
		}, 5},
		{"decimal-comma", []string{
			`weather.csv:2: air_temp_c: "-31,5" has a decimal comma: write -31.5 (numbers use a point)` +
				"\n… and 11 more rows like it: lines 3–13",
		}, 12},
		{"day-first", []string{
			`daily_care.csv:2: checked_at: "13/01/2026 08:00" is a day-first date: write 2026-01-13T08:00 (YYYY-MM-DDTHH:MM)` +
				"\n… and 11 more rows like it: lines 3–13",
		}, 12},
		{"windows-1252", []string{
			`staff.csv:4: name: "Zo\xE9 Lef\xE8vre" is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export)` +
				"\n… and 1 more row like it: line 5",
		}, 2},
		{"columns-missing", []string{
			"animals.csv:1: animal_id, species, arrived_on: 3 required columns are missing; the header has id, kind, arrival, pen; its 2 rows are not read",
		}, 2},
		{"unknown-site", []string{
			`weather.csv:2: site_id: "YARD" is not a weather site: add it under weather_sites in facility.yaml` +
				"\n… and 8 more rows like it: lines 3–10",
		}, 9},
	}
	for _, tt := range tests {
		t.Run(tt.dir, func(t *testing.T) {
			s := mustLoad(t, os.DirFS("../testdata/exports/"+tt.dir))
			var got []string
			for _, g := range GroupProblems(s.Problems) {
				got = append(got, g.String())
			}
			if d := cmp.Diff(tt.want, got); d != "" {
				t.Errorf("messages (-want +got):\n%s", d)
			}
			if s.Rejected() != tt.rejected {
				t.Errorf("rejected %d rows, want %d", s.Rejected(), tt.rejected)
			}
		})
	}
}

// facility.yaml with three mistakes: all three at once, each with its line,
// in words rather than Go types.
func TestExportCorpusFacility(t *testing.T) {
	_, err := Load(os.DirFS("../testdata/exports/facility-three-mistakes"), testSpecies)
	var le *LoadError
	if !errors.As(err, &le) {
		t.Fatalf("Load = %v, want a *LoadError", err)
	}
	want := []string{
		`facility.yaml:2: time_zone: "Winnipeg" is not an IANA time zone name (such as America/Winnipeg)`,
		`facility.yaml:4: buildings[0]: "S1" is text, but a building: a block of keys (id, exposure, weather_site) belongs here`,
		`facility.yaml:6: buildings[1].exposure: "inside" is not one of outdoor, sheltered, indoor`,
	}
	if d := cmp.Diff(want, strings.Split(err.Error(), "\n")); d != "" {
		t.Errorf("facility.yaml problems (-want +got):\n%s", d)
	}
	if strings.Contains(err.Error(), "records.") || strings.Contains(err.Error(), "!!") {
		t.Errorf("a message speaks Go: %v", err)
	}
}

func TestHeaderNotUTF8(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{"staff.csv": "staff_id,name,r\xf4le\nK1,Ilse Marrow,keeper\n"}))
	want := []string{"staff.csv:1: the header row is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export); its 1 row is not read"}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
}

func TestFacilityNotUTF8(t *testing.T) {
	_, err := Load(folder(map[string]string{"facility.yaml": "time_zone: UTC\nname: Station Lef\xe8vre\n"}), testSpecies)
	want := "facility.yaml:2: is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 file)"
	if err == nil || err.Error() != want {
		t.Errorf("Load error = %v, want %q", err, want)
	}
}

func TestGroupProblems(t *testing.T) {
	p := func(line int, col, reason, kind, value string) Problem {
		return Problem{File: "weather.csv", Line: line, Column: col, Reason: reason, Kind: kind, Value: value}
	}
	ps := []Problem{
		{File: "staff.csv", Reason: "required file is missing"},
		p(2, "site_id", `"YARD" is not a weather site`, KindUnknownRef, "YARD"),
		p(3, "site_id", `"ROOF" is not a weather site`, KindUnknownRef, "ROOF"),
		p(4, "site_id", `"YARD" is not a weather site`, KindUnknownRef, "YARD"),
		p(5, "site_id", `"YARD" is not a weather site`, KindUnknownRef, "YARD"),
		p(9, "site_id", `"YARD" is not a weather site`, KindUnknownRef, "YARD"),
		p(10, "air_temp_c", `"-3,5" has a decimal comma`, KindDecimalComma, "-3,5"),
		p(11, "air_temp_c", `"-4,5" has a decimal comma`, KindDecimalComma, "-4,5"),
		p(12, "wind_kmh", `"x" is not a number`, "", "x"),
	}
	var got []string
	n := 0
	for _, g := range GroupProblems(ps) {
		got = append(got, g.String())
		n += g.Rows()
	}
	want := []string{
		"staff.csv: required file is missing",
		"weather.csv:2: site_id: \"YARD\" is not a weather site\n… and 3 more rows like it: lines 4–5, 9",
		"weather.csv:3: site_id: \"ROOF\" is not a weather site",
		"weather.csv:10: air_temp_c: \"-3,5\" has a decimal comma\n… and 1 more row like it: line 11",
		"weather.csv:12: wind_kmh: \"x\" is not a number",
	}
	if d := cmp.Diff(want, got); d != "" {
		t.Errorf("groups (-want +got):\n%s", d)
	}
	if n != len(ps) {
		t.Errorf("groups stand for %d problems, want all %d", n, len(ps))
	}
}

func TestExportCellReasons(t *testing.T) {
	d := &decoder{}
	for _, tt := range []struct {
		cell, want, kind string
		date             bool
	}{
		{cell: "-35,5", want: `"-35,5" has a decimal comma: write -35.5 (numbers use a point)`, kind: KindDecimalComma},
		{cell: "1,250", want: `"1,250" has a comma: write 1.250 if it is a decimal comma, or 1250 if it separates thousands (numbers use a point and no separators)`, kind: KindDecimalComma},
		{cell: "-0,125", want: `"-0,125" has a decimal comma: write -0.125 (numbers use a point)`, kind: KindDecimalComma},
		{cell: "1,250,000", want: `"1,250,000" is not a number`},
		{cell: "12,", want: `"12," is not a number`},
		{cell: "15/01/2026", date: true, want: `"15/01/2026" is a day-first date: write 2026-01-15 (YYYY-MM-DD)`, kind: KindDateOrder},
		{cell: "01/15/2026", date: true, want: `"01/15/2026" is a month-first date: write 2026-01-15 (YYYY-MM-DD)`, kind: KindDateOrder},
		{cell: "15.01.2026", date: true, want: `"15.01.2026" is a day-first date: write 2026-01-15 (YYYY-MM-DD)`, kind: KindDateOrder},
		{cell: "03/04/2026", date: true, want: `"03/04/2026" is a day-first or month-first date: write it as YYYY-MM-DD (2026-04-03 if day first, 2026-03-04 if month first)`, kind: KindDateOrder},
		{cell: "2026/01/15", date: true, want: `"2026/01/15" is not a date (YYYY-MM-DD)`},
		{cell: "32/13/2026", date: true, want: `"32/13/2026" is not a date (YYYY-MM-DD)`},
	} {
		d.kind = ""
		var got string
		if tt.date {
			_, err := parseDate(tt.cell)
			got = d.dateReason(tt.cell, err)
		} else {
			got = d.numberReason(tt.cell, "a number")
		}
		if got != tt.want || d.kind != tt.kind {
			t.Errorf("%q: got %q (kind %q), want %q (kind %q)", tt.cell, got, d.kind, tt.want, tt.kind)
		}
	}
}
