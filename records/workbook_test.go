package records

import (
	"bytes"
	"errors"
	"fmt"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/xuri/excelize/v2"
)

// book builds a workbook: sheets in order, each a list of rows of cell
// values (string, float64, time.Time with a date format, or formula{}).
type formula struct {
	expr   string
	cached float64
}

type dated struct {
	t      time.Time
	format string // a custom number format; "" for the built-in date format 14
}

func book(t *testing.T, sheets ...any) []byte {
	t.Helper()
	wb := excelize.NewFile()
	for i := 0; i+1 < len(sheets); i += 2 {
		name := sheets[i].(string)
		if i == 0 {
			if err := wb.SetSheetName("Sheet1", name); err != nil {
				t.Fatal(err)
			}
		} else if _, err := wb.NewSheet(name); err != nil {
			t.Fatal(err)
		}
		for r, row := range sheets[i+1].([][]any) {
			for c, v := range row {
				cell, _ := excelize.CoordinatesToCellName(c+1, r+1)
				var err error
				switch v := v.(type) {
				case formula:
					if err = wb.SetCellValue(name, cell, v.cached); err == nil {
						err = wb.SetCellFormula(name, cell, v.expr)
					}
				case dated:
					st := &excelize.Style{NumFmt: 14}
					if v.format != "" {
						st = &excelize.Style{CustomNumFmt: &v.format}
					}
					id, serr := wb.NewStyle(st)
					if serr != nil {
						t.Fatal(serr)
					}
					if err = wb.SetCellValue(name, cell, v.t); err == nil {
						err = wb.SetCellStyle(name, cell, cell, id)
					}
				case nil:
				default:
					err = wb.SetCellValue(name, cell, v)
				}
				if err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	var b bytes.Buffer
	if err := wb.Write(&b); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func day(y, m, d int) dated { return dated{t: time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC)} }

var animalsSheet = [][]any{
	{"animal_id", "species", "sex", "born_on", "arrived_on", "enclosure_id", "mass_kg"},
	{"A1", "vulpes_vulpes", "f", day(2024, 4, 20), day(2024, 4, 20), "E1", formula{"3.1*2", 6.2}},
	{"A2", "vulpes_lagopus", "m", day(2024, 5, 2), day(2024, 9, 1), "E2", 4.1},
	{"A3", "vulpes_lagopus", "m", day(2024, 5, 2), "01/09/2024", "E2", "4,1"},
	{}, {nil, ""}, // trailing empty rows a spreadsheet keeps
}

var enclosuresSheet = [][]any{
	{"enclosure_id", "building_id", "kind", "floor_area_m2", "height_cm"},
	{"E1", "S1", "pen", 4.5, 100.0},
	{"E2", "B2", "pen", 4.5, 100.0},
}

func TestWorkbookRecords(t *testing.T) {
	fsys := folder(map[string]string{"animals.csv": "-", "enclosures.csv": "-"})
	fsys["records.xlsx"] = &fstest.MapFile{Data: book(t, "enclosures", enclosuresSheet, "animals", animalsSheet, "notes", [][]any{{"x"}})}
	s, err := Load(fsys, testSpecies)
	if err != nil {
		t.Fatal(err)
	}
	wantProblems := []string{
		`records.xlsx:animals!E4: arrived_on: "01/09/2024" is a day-first or month-first date: write it as YYYY-MM-DD (2024-09-01 if day first, 2024-01-09 if month first)`,
	}
	if d := cmp.Diff(wantProblems, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	// The date cells are dates, the formula its cached value, the empty rows ignored.
	if len(s.Animals) != 2 || s.Animals[0].ArrivedOn != MakeDay(2024, 4, 20) || *s.Animals[0].MassKg != 6.2 || s.Animals[0].Ref != "records.xlsx:animals!2" {
		t.Errorf("animals = %+v", s.Animals)
	}
	// The rows' refs and the problem's cell parse into their sheet's place.
	for _, a := range s.Animals {
		if p, err := ParseRef(string(a.Ref)); err != nil || p.File != "records.xlsx" || p.Sheet != "animals" || p.Column != "" || p.Ref() != a.Ref {
			t.Errorf("ParseRef(%q) = %+v, %v", a.Ref, p, err)
		}
	}
	for _, pr := range s.Problems {
		cell := pr.File + ":" + pr.At
		if p, err := ParseRef(cell); err != nil || p != (RefPlace{File: "records.xlsx", Sheet: "animals", Column: "E", Line: 4}) {
			t.Errorf("ParseRef(%q) = %+v, %v", cell, p, err)
		}
	}
	wantCount := []FileCount{{File: "records.xlsx:animals", Read: 3, Accepted: 2, Rejected: 1}, {File: "records.xlsx:enclosures", Read: 2, Accepted: 2}, {File: "staff.csv", Read: 2, Accepted: 2}}
	if d := cmp.Diff(wantCount, s.Accounting); d != "" {
		t.Errorf("accounting (-want +got):\n%s", d)
	}
	if !s.Present["animals.csv"] || !s.Present["enclosures.csv"] {
		t.Errorf("present = %v; a kind read from a workbook is present", s.Present)
	}
	if d := cmp.Diff([]Warning{{File: "records.xlsx", Column: "notes", Message: "sheet not named after a record kind, not read"}}, s.Warnings); d != "" {
		t.Errorf("warnings (-want +got):\n%s", d)
	}
}

func TestWorkbookPerKind(t *testing.T) {
	fsys := folder(map[string]string{"animals.csv": "-"})
	// The sheet named after the kind is read, wherever it is.
	fsys["animals.xlsx"] = &fstest.MapFile{Data: book(t, "read me", [][]any{{"x"}}, "animals", animalsSheet)}
	fsys["weather.xlsx"] = &fstest.MapFile{Data: book(t, "Sheet1", [][]any{
		{"observed_at", "site_id", "air_temp_c"},
		{dated{time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC), "yyyy-mm-dd hh:mm"}, "MAST", -31.5},
		{dated{time.Date(2026, 1, 15, 7, 30, 0, 0, time.UTC), "dd/mm/yyyy hh:mm"}, "YARD", "-35,5"},
	})}
	s := mustLoadKinds(t, fsys)
	want := []string{
		`animals.xlsx:animals!E4: arrived_on: "01/09/2024" is a day-first or month-first date: write it as YYYY-MM-DD (2024-09-01 if day first, 2024-01-09 if month first)`,
		`weather.xlsx:Sheet1!C3: air_temp_c: "-35,5" has a decimal comma: write -35.5 (numbers use a point)`,
	}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	// A midnight date-time typed as a spreadsheet date-time is a date-time.
	if len(s.Weather) != 1 || s.Weather[0].At.Format("2006-01-02T15:04") != "2026-01-15T00:00" {
		t.Errorf("weather = %+v", s.Weather)
	}
}

func mustLoadKinds(t *testing.T, fsys fstest.MapFS) *Set {
	t.Helper()
	s, err := Load(fsys, testSpecies)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range s.Accounting {
		if c.Read != c.Accepted+c.Rejected {
			t.Errorf("%s: read %d != accepted %d + rejected %d", c.File, c.Read, c.Accepted, c.Rejected)
		}
	}
	return s
}

func TestWorkbookAndCSVForOneKind(t *testing.T) {
	for _, tt := range []struct {
		name, file, want string
	}{
		{"own workbook", "animals.xlsx", "animals.csv: animals records are in both animals.csv and animals.xlsx: keep one of them"},
		{"records.xlsx", "records.xlsx", "animals.csv: animals records are in both animals.csv and records.xlsx:animals: keep one of them"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			fsys := folder(nil)
			fsys[tt.file] = &fstest.MapFile{Data: book(t, "animals", animalsSheet)}
			_, err := Load(fsys, testSpecies)
			var le *LoadError
			if !errors.As(err, &le) || err.Error() != tt.want {
				t.Errorf("Load error = %v, want %q", err, tt.want)
			}
		})
	}
}

func TestFormatDate(t *testing.T) {
	// Number format codes: ECMA-376 Part 1, §18.8.31 (numFmts).
	for _, tt := range []struct {
		format string
		want   dateForm
	}{
		{"yyyy-mm-dd", dateOnly},
		{"dd/mm/yyyy hh:mm", dateTime},
		{"0.00", notDate},
		{`0.0 "days"`, notDate},
		{"[Red]0.0", notDate},
		{"[$-409]d-mmm-yy", dateOnly},
	} {
		if got := formatDate(tt.format); got != tt.want {
			t.Errorf("formatDate(%q) = %d, want %d", tt.format, got, tt.want)
		}
	}
}

// A year of care rounds of a 100-cage colony typed in a spreadsheet
// (36,500 rows, dates as spreadsheet date-times, numbers as numbers).
func BenchmarkLoadCareWorkbook36k(b *testing.B) {
	const days, pens = 365, 100
	rows := [][]any{{"checked_at", "enclosure_id", "staff_id", "observed", "fed", "feed_g", "water"}}
	start := time.Date(2025, 1, 1, 7, 0, 0, 0, time.UTC)
	for d := range days {
		for p := range pens {
			rows = append(rows, []any{dated{start.AddDate(0, 0, d), "yyyy-mm-dd hh:mm"}, fmt.Sprintf("E%03d", p), "K1", "yes", "yes", float64(200 + p), "ok"})
		}
	}
	enc := "enclosure_id,building_id,kind,floor_area_m2,height_cm\n"
	for p := range pens {
		enc += fmt.Sprintf("E%03d,S1,cage,1.2,80\n", p)
	}
	t := &testing.T{}
	data := book(t, "daily_care", rows)
	fsys := folder(map[string]string{"enclosures.csv": enc, "animals.csv": "animal_id,species,arrived_on\nA1,vulpes_vulpes,2024-05-01\n"})
	fsys["daily_care.xlsx"] = &fstest.MapFile{Data: data}
	b.ResetTimer()
	for b.Loop() {
		s, err := Load(fsys, testSpecies)
		if err != nil || s.CareRounds().Len() != days*pens {
			b.Fatalf("%v: %d rounds, problems %v", err, s.CareRounds().Len(), s.Problems[:min(3, len(s.Problems))])
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*days*pens), "ns/row")
}
