package reports_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
	"welfare/reports"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/golden")

// golden compares got with testdata/golden/DIR/NAME (from the module root),
// or rewrites it with -update.
func golden(t *testing.T, dir, name string, got []byte) {
	t.Helper()
	path := filepath.Join("..", "testdata", "golden", dir, name)
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run: go test ./reports -run Golden -update)", err)
	}
	if diff := cmp.Diff(string(want), string(got)); diff != "" {
		t.Errorf("%s/%s differs from the golden file (-want +got):\n%s\nIf the change is intended: go test ./reports -run Golden -update", dir, name, diff)
	}
}

// smallResult is a small, fixed, hand-built result of the invented
// Birchfall station that exercises every part of every output: a rejected
// row and a file not used, a run of days, a finding without evidence, a
// multi-line message, a committee's own domain, a check not evaluated, a
// warning, limits, care coverage and one weather site. The wind chills are
// cells of the Environment Canada wind chill table (cold.WindChillC).
func smallResult() *checker.Result {
	day := func(d int) records.Day { return records.MakeDay(2026, 1, d) }
	return &checker.Result{
		Facility:    "Birchfall Fur Research Station",
		Period:      checker.Period{From: day(10), To: day(14)},
		Fingerprint: "3f9a1c07be52d4e8a6103f7c2b9e5d4a8c1f06e7d2b3a9c5e8f1d0a7b6c4e2f9",
		Accounting: []records.FileCount{
			{File: "animals.csv", Read: 12, Accepted: 12},
			{File: "daily_care.csv", Read: 40, Accepted: 39, Rejected: 1},
			{File: "weather.csv", Read: 0, Failed: "no header row"},
		},
		Warnings: []records.Warning{{File: "daily_care.csv", Column: "mood", Message: "unknown column, not read"}},
		Findings: []checker.Finding{
			{Check: "care.water.unavailable", Domain: "care", Subject: "N-04", On: day(12), Severity: checker.Significant,
				Message: "water found frozen at 07:10 and not restored", Evidence: []records.Ref{"daily_care.csv:27", "daily_care.csv:28"},
				Title: "Water unavailable", Source: "OLAW: inoperative watering is a significant deficiency"},
			{Check: "cold.shelter.missing", Domain: "cold", Subject: "N-02", On: day(12), Until: day(14), Severity: checker.Significant,
				Message: "no nest box recorded\nfor nest-box animals", Evidence: []records.Ref{"enclosures.csv:3"},
				Title: "No nest box in hard cold", Source: "common practice"},
			{Check: "records.row.rejected", Domain: "records", Subject: "daily_care.csv:31", On: day(10), Severity: checker.Minor,
				Message: `water: "frozn" is not one of ok, frozen, empty, not_checked`, Evidence: []records.Ref{"daily_care.csv:31"},
				Title: "Row rejected", Source: "common practice"},
			{Check: "care.observation.missed", Domain: "care", Subject: "N-07", On: day(13), Severity: checker.Minor,
				Message: "-no round observed the animals", Title: "Animals not observed", Source: "common practice"},
			{Check: "cold.frostbite.risk", Domain: "cold", Subject: "MAST", On: day(13), Until: day(14), Severity: checker.Note,
				Message: "wind chill at or below -28 on 2 day(s)", Evidence: []records.Ref{"weather.csv:40"},
				Title: "Frostbite weather", Source: "Environment and Climate Change Canada"},
			{Check: "committee.logbook.unsigned", Subject: "LOG-1", On: day(11), Severity: checker.Note,
				Message: "=logbook page not signed", Title: "Logbook unsigned", Source: "facility choice"},
		},
		Checks: []checker.CheckInfo{
			{ID: "care.observation.missed", Domain: "care", Title: "Animals not observed", Severity: checker.Minor, Source: "common practice",
				Package: "welfare.care", File: "care.rego", Needs: []string{"daily_care.csv"}, Runs: true},
			{ID: "care.water.unavailable", Domain: "care", Title: "Water unavailable", Severity: checker.Significant,
				Source: "OLAW: inoperative watering is a significant deficiency", Package: "welfare.care", File: "care.rego"},
			{ID: "cold.frostbite.risk", Domain: "cold", Title: "Frostbite weather", Severity: checker.Note,
				Source: "Environment and Climate Change Canada", Package: "welfare.cold", File: "cold.rego", Subjects: []string{"site"}},
			{ID: "cold.shelter.missing", Domain: "cold", Title: "No nest box in hard cold", Severity: checker.Significant,
				Source: "common practice", Package: "welfare.cold", File: "cold.rego"},
			{ID: "committee.logbook.unsigned", Domain: "committee", Title: "Logbook unsigned", Severity: checker.Note,
				Source: "facility choice", Package: "welfare.committee", File: "extra/logbook.rego"},
			{ID: "ppe.inspection.overdue", Domain: "ppe", Title: "Glove not inspected", Severity: checker.Minor,
				Source: "facility choice", Package: "welfare.ppe", File: "ppe.rego", Needs: []string{"ppe_checks.csv"}},
			{ID: "records.row.rejected", Domain: "records", Title: "Row rejected", Severity: checker.Minor,
				Source: "common practice", Package: "welfare.records", File: "records.rego"},
		},
		NotEvaluated: []checker.Skipped{{Check: "ppe.inspection.overdue", Reason: "ppe_checks.csv is absent"}},
		Limits: []checker.LimitLine{
			{Key: "cold.bedding_wind_chill_c", Value: "-20", Source: "[F] facility choice"},
			{Key: "cold.frostbite_wind_chill_c", Value: "-28", Source: "[P] Environment and Climate Change Canada"},
		},
		Care: checker.CareCoverage{OccupiedDays: 20, CompleteDays: 17},
		Weather: []checker.SiteDays{{Site: "MAST", Days: []checker.DayCold{
			{Day: day(10), MinAirC: 0, MinWindChillC: cold.WindChillC(0, 10), Readings: 8, WindReadings: 8},
			{Day: day(11), MinAirC: -15, MinWindChillC: cold.WindChillC(-15, 20), Readings: 8, WindReadings: 8},
			{Day: day(13), MinAirC: -25, MinWindChillC: cold.WindChillC(-25, 30), Readings: 8, WindReadings: 8},
			{Day: day(14), MinAirC: -35, MinWindChillC: cold.WindChillC(-35, 10), Readings: 7, WindReadings: 7},
		}}},
		ColdLines: checker.ColdLines{Bedding: -20, Shelter: -20, Frostbite: -28},
	}
}

// The small result's outputs, byte for byte.
func TestGoldenSmall(t *testing.T) {
	r := smallResult()
	tests := []struct {
		name  string
		write func(*bytes.Buffer) error
	}{
		{"summary.txt", func(b *bytes.Buffer) error { return reports.WriteText(b, r, reports.TextOptions{MaxPerCheck: 1}) }},
		{"findings.json", func(b *bytes.Buffer) error { return reports.WriteJSON(b, r) }},
		{"findings.csv", func(b *bytes.Buffer) error { return reports.WriteCSV(b, r) }},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var b bytes.Buffer
			if err := tt.write(&b); err != nil {
				t.Fatal(err)
			}
			golden(t, "small", tt.name, b.Bytes())
		})
	}
}
