package checker_test

import (
	"bytes"
	"context"
	"encoding/csv"
	"io/fs"
	"os"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/xuri/excelize/v2"

	"welfare/checker"
	"welfare/records"
	"welfare/rules"
)

// demoRecords is the demo folder the end-to-end tests check.
const demoRecords = "../testdata/demo/records"

// toWorkbook writes CSV files into one workbook, a sheet per file named
// after it. Cells are typed as a keeper's spreadsheet types them: dates and
// date-times as spreadsheet dates (with a date format), numbers as numbers,
// the rest as text; one number is written as a formula with its cached
// value, as a spreadsheet saves it.
func toWorkbook(t *testing.T, csvs map[string][]byte) []byte {
	t.Helper()
	wb := excelize.NewFile()
	dateStyle, err := wb.NewStyle(&excelize.Style{NumFmt: 14}) // built-in date format (ECMA-376 §18.8.30)
	if err != nil {
		t.Fatal(err)
	}
	custom := "yyyy-mm-dd hh:mm"
	timeStyle, err := wb.NewStyle(&excelize.Style{CustomNumFmt: &custom})
	if err != nil {
		t.Fatal(err)
	}
	first := true
	formulas := 0
	for _, name := range sortedKeys(csvs) {
		sheet := strings.TrimSuffix(name, ".csv")
		if first {
			if err := wb.SetSheetName("Sheet1", sheet); err != nil {
				t.Fatal(err)
			}
			first = false
		} else if _, err := wb.NewSheet(sheet); err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(bytes.NewReader(csvs[name])).ReadAll()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for r, row := range rows {
			for c, v := range row {
				cell, _ := excelize.CoordinatesToCellName(c+1, r+1)
				set := func(val any, style int) {
					if err := wb.SetCellValue(sheet, cell, val); err != nil {
						t.Fatal(err)
					}
					if style != 0 {
						if err := wb.SetCellStyle(sheet, cell, cell, style); err != nil {
							t.Fatal(err)
						}
					}
				}
				switch {
				case r == 0 || v == "":
					if v != "" {
						set(v, 0)
					}
				case isDate(v):
					set(parsed("2006-01-02", v), dateStyle)
				case isLocalTime(v):
					set(parsed("2006-01-02T15:04", strings.Replace(v, " ", "T", 1)), timeStyle)
				case isNumber(v):
					f, _ := strconv.ParseFloat(v, 64)
					set(f, 0)
					if formulas < 3 {
						// The cached value stays; the formula gives the same number.
						if err := wb.SetCellFormula(sheet, cell, v+"*1"); err != nil {
							t.Fatal(err)
						}
						formulas++
					}
				default:
					set(v, 0)
				}
			}
		}
		// A spreadsheet often keeps formatted rows below the data: empty rows to ignore.
		below, _ := excelize.CoordinatesToCellName(1, len(rows)+3)
		if err := wb.SetCellStyle(sheet, below, below, dateStyle); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := wb.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

var (
	dateRe  = regexp.MustCompile(`^\d{4}-\d{2}-\d{2}$`)
	timeRe  = regexp.MustCompile(`^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}$`)
	numRe   = regexp.MustCompile(`^-?\d+(\.\d+)?$`)
	posRe   = regexp.MustCompile(`(?:records\.xlsx:([a-z_]+)|([a-z_]+)\.xlsx:[a-z_]+)!([A-Z]*)(\d+)`)
	csvName = func(m []string) string {
		if m[1] != "" {
			return m[1]
		}
		return m[2]
	}
)

// A value that is not a real date (2026-01-32, planted in the demo) stays
// text, as a spreadsheet keeps it.
func isDate(v string) bool { return dateRe.MatchString(v) && !parsed("2006-01-02", v).IsZero() }
func isLocalTime(v string) bool {
	return timeRe.MatchString(v) && !parsed("2006-01-02T15:04", strings.Replace(v, " ", "T", 1)).IsZero()
}

func parsed(layout, v string) time.Time {
	t, err := time.Parse(layout, v)
	if err != nil {
		return time.Time{}
	}
	return t
}

// isNumber: a number a spreadsheet shows as typed. "-90.0" or an id such as
// "007" would show as -90 or 7 in a number cell, so a keeper keeps them as
// text; so does the converter.
func isNumber(v string) bool {
	f, err := strconv.ParseFloat(v, 64)
	return numRe.MatchString(v) && err == nil && strconv.FormatFloat(f, 'f', -1, 64) == v
}

func sortedKeys(m map[string][]byte) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

// toCSVPositions maps workbook positions back to the CSV file and line they
// came from: "records.xlsx:animals!114" and "animals.xlsx:animals!C114" are
// both "animals.csv:114". The converted workbook keeps every record on the
// row number of its CSV line (the demo has no line breaks inside cells), so
// mapping positions compares everything else exactly.
func toCSVPositions(s string) string {
	return posRe.ReplaceAllStringFunc(s, func(x string) string {
		m := posRe.FindStringSubmatch(x)
		return csvName(m) + ".csv:" + m[4]
	})
}

// findingsOf checks a records folder over the demo's January with the
// shipped rules and default limits, as the end-to-end test does.
func findingsOf(t *testing.T, fsys fs.FS) ([]string, []records.FileCount) {
	t.Helper()
	ctx := context.Background()
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	data, _ := lim.Data()
	engine, err := checker.NewEngine(ctx, []checker.Source{{Name: "rules", FS: rules.FS()}}, data, checker.EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(fsys, records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	from, _ := records.ParseDay("2026-01-01")
	to, _ := records.ParseDay("2026-01-31")
	res, err := checker.Check(ctx, checker.Config{Records: set, Limits: lim, Engine: engine, Period: checker.Period{From: from, To: to}})
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, f := range res.Findings {
		ev := make([]string, len(f.Evidence))
		for i, r := range f.Evidence {
			ev[i] = string(r)
		}
		out = append(out, toCSVPositions(strings.Join([]string{string(f.Severity), f.Check, f.Subject,
			f.On.String(), f.Until.String(), f.Message, strings.Join(ev, " ")}, " | ")))
	}
	return out, set.Accounting
}

func demoCSVs(t *testing.T) (map[string][]byte, []byte) {
	t.Helper()
	entries, err := os.ReadDir(demoRecords)
	if err != nil {
		t.Fatal(err)
	}
	csvs := map[string][]byte{}
	var facility []byte
	for _, e := range entries {
		b, err := os.ReadFile(demoRecords + "/" + e.Name())
		if err != nil {
			t.Fatal(err)
		}
		if e.Name() == "facility.yaml" {
			facility = b
		} else {
			csvs[e.Name()] = b
		}
	}
	return csvs, facility
}

// The demo's CSV files as one records.xlsx, and as one workbook per kind,
// give exactly the findings of the CSV folder, and the same accounting.
func TestWorkbooksGiveTheFindingsOfTheirCSVFiles(t *testing.T) {
	csvs, facility := demoCSVs(t)
	want, wantCount := findingsOf(t, os.DirFS(demoRecords))
	if len(want) == 0 {
		t.Fatal("the demo has no findings to compare")
	}

	one := fstest.MapFS{"facility.yaml": {Data: facility}, "records.xlsx": {Data: toWorkbook(t, csvs)}}
	perKind := fstest.MapFS{"facility.yaml": {Data: facility}}
	for name, b := range csvs {
		perKind[strings.TrimSuffix(name, ".csv")+".xlsx"] = &fstest.MapFile{Data: toWorkbook(t, map[string][]byte{name: b})}
	}
	for _, tt := range []struct {
		name string
		fsys fs.FS
	}{{"one records.xlsx", one}, {"a workbook per kind", perKind}} {
		t.Run(tt.name, func(t *testing.T) {
			got, gotCount := findingsOf(t, tt.fsys)
			if d := cmp.Diff(want, got); d != "" {
				t.Errorf("findings differ from the CSV folder's (-csv +workbook):\n%s", d)
			}
			for i := range gotCount {
				kind := strings.TrimSuffix(strings.TrimPrefix(gotCount[i].File, "records.xlsx:"), ".xlsx")
				gotCount[i].File = kind + ".csv"
			}
			if d := cmp.Diff(wantCount, gotCount); d != "" {
				t.Errorf("accounting differs (-csv +workbook):\n%s", d)
			}
		})
	}

	// The fingerprint covers the workbook's bytes.
	fp := func(fsys fs.FS) string {
		s, err := checker.Fingerprint(fsys, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	changed := fstest.MapFS{"facility.yaml": one["facility.yaml"], "records.xlsx": {Data: append(bytes.Clone(one["records.xlsx"].Data), 0)}}
	if fp(one) == fp(changed) {
		t.Error("fingerprint does not change with the workbook's bytes")
	}
}
