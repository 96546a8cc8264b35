package reports_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
	"welfare/reports"
)

func morningDay(t *testing.T, s string) records.Day {
	t.Helper()
	d, err := records.ParseDay(s)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// morningResult is an invented Birchfall cold week at two sites. The day
// minima are cells of the Environment Canada wind chill table, so the
// printed wind chill and band can be checked against it.
func morningResult(t *testing.T) *checker.Result {
	d := func(s string) records.Day { return morningDay(t, s) }
	return &checker.Result{
		Facility: "Birchfall Fur Research Station",
		Period:   checker.Period{From: d("2026-01-10"), To: d("2026-01-13")},
		Weather: []checker.SiteDays{
			{Site: "YARD", Days: []checker.DayCold{
				{Day: d("2026-01-10"), MinAirC: 0, MinWindChillC: cold.WindChillC(0, 10), Readings: 2},
				{Day: d("2026-01-12"), MinAirC: -25, MinWindChillC: cold.WindChillC(-25, 20), Readings: 3},
				{Day: d("2026-01-13"), MinAirC: -40, MinWindChillC: cold.WindChillC(-40, 10), Readings: 3},
			}},
			{Site: "LAKE", Days: []checker.DayCold{
				{Day: d("2026-01-10"), MinAirC: 5, MinWindChillC: cold.WindChillC(5, 5), Readings: 1},
				{Day: d("2026-01-13"), Readings: 0},
			}},
		},
		Findings: []checker.Finding{
			{Check: "cold.water.checks_insufficient", Domain: "cold", Subject: "N-02", On: d("2026-01-13"), Severity: checker.Minor,
				Title: "Too few water checks on a freezing day", Message: "1 water check(s) recorded on a day down to -40 °C air"},
			{Check: "cold.frostbite.risk", Domain: "cold", Subject: "YARD", On: d("2026-01-12"), Until: d("2026-01-13"), Severity: checker.Note,
				Title: "Frostbite weather", Message: "wind chill at or below -28 on 2 day(s)"},
			{Check: "cold.shelter.missing", Domain: "cold", Subject: "N-02", On: d("2026-01-11"), Until: d("2026-01-13"), Severity: checker.Significant,
				Title: "No nest box in hard cold", Message: "no nest box recorded\nfor nest-box animals"},
			{Check: "cold.work.over_limit", Domain: "cold", Subject: "K-ORVO", On: d("2026-01-12"), Severity: checker.Significant,
				Title: "Outdoor stint longer than the work/warm-up schedule allows", Message: "a day earlier: not shown on the 13th"},
			{Check: "care.observation.missed", Domain: "care", Subject: "B-01", On: d("2026-01-13"), Severity: checker.Minor,
				Message: "no round observed the animals on 1 day(s) in a row"},
		},
	}
}

func TestWriteMorning(t *testing.T) {
	tests := []struct {
		name string
		day  string
		want string
	}{
		{
			// Environment Canada table: (0,10)→−3 and (5,5)→4; ECCC bands:
			// 0 to −9 low, above 0 no band.
			name: "calm mild day",
			day:  "2026-01-10",
			want: `Birchfall Fur Research Station: morning check for 2026-01-10

Weather (lowest of the day's readings):
  YARD: air 0 °C, wind chill -3 (low; 2 reading(s))
  LAKE: air 5 °C, wind chill 4 (above 0: no wind chill hazard band; 1 reading(s))

All clear: no problems recorded for 2026-01-10.

` + reports.MorningCaution + "\n",
		},
		{
			// Environment Canada table: (−40,10)→−51, in the ECCC band −48
			// to −54 "exposed skin can freeze in 2–5 min".
			name: "coldest windy day",
			day:  "2026-01-13",
			want: `Birchfall Fur Research Station: morning check for 2026-01-13

Weather (lowest of the day's readings):
  YARD: air -40 °C, wind chill -51 (exposed skin can freeze in 2–5 min; 3 reading(s))
  LAKE: no readings on 2026-01-13; checks that need the weather were not judged for that day

Fix now (4):
  SIGNIFICANT N-02: No nest box in hard cold (since 2026-01-11): no nest box recorded for nest-box animals
  MINOR       B-01: care.observation.missed: no round observed the animals on 1 day(s) in a row
  MINOR       N-02: Too few water checks on a freezing day: 1 water check(s) recorded on a day down to -40 °C air
  NOTE        YARD: Frostbite weather (since 2026-01-12): wind chill at or below -28 on 2 day(s)

` + reports.MorningCaution + "\n",
		},
		{
			// Environment Canada worked example: (−25,20)→−37, band −28 to −39.
			name: "a run on its first day and a one-day stint finding",
			day:  "2026-01-12",
			want: `Birchfall Fur Research Station: morning check for 2026-01-12

Weather (lowest of the day's readings):
  YARD: air -25 °C, wind chill -37 (exposed skin can freeze in 10–30 min; 3 reading(s))
  LAKE: no readings on 2026-01-12; checks that need the weather were not judged for that day

Fix now (3):
  SIGNIFICANT N-02: No nest box in hard cold (since 2026-01-11): no nest box recorded for nest-box animals
  SIGNIFICANT K-ORVO: Outdoor stint longer than the work/warm-up schedule allows: a day earlier: not shown on the 13th
  NOTE        YARD: Frostbite weather: wind chill at or below -28 on 2 day(s)

` + reports.MorningCaution + "\n",
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			if err := reports.WriteMorning(&b, morningResult(t), morningDay(t, tc.day)); err != nil {
				t.Fatalf("WriteMorning: %v", err)
			}
			if diff := cmp.Diff(tc.want, b.String()); diff != "" {
				t.Errorf("morning view (-want +got):\n%s", diff)
			}
		})
	}
}

func TestWriteMorningNotEvaluated(t *testing.T) {
	r := &checker.Result{
		Facility:     "Birchfall Fur Research Station",
		NotEvaluated: []checker.Skipped{{Check: "cold.frostbite.risk", Reason: "no weather.csv in the records folder"}},
	}
	var b bytes.Buffer
	if err := reports.WriteMorning(&b, r, morningDay(t, "2026-01-10")); err != nil {
		t.Fatal(err)
	}
	want := `Birchfall Fur Research Station: morning check for 2026-01-10

Weather (lowest of the day's readings):
  no weather sites in the records

Not checked (records missing):
  cold.frostbite.risk: no weather.csv in the records folder

No problems found by the checks that ran for 2026-01-10, but 1 check(s) could not run: this is not an all-clear.

` + reports.MorningCaution + "\n"
	if diff := cmp.Diff(want, b.String()); diff != "" {
		t.Errorf("morning view (-want +got):\n%s", diff)
	}
}

// The caution is part of every morning view; its words are the ones the
// project's rules ask for, so a rewording must be deliberate.
func TestMorningCautionWording(t *testing.T) {
	for _, must := range []string{"cold injury", "work/warm-up schedule", "not a veterinary judgement",
		"attending veterinarian", "animal-care committee", "local law"} {
		if !bytes.Contains([]byte(reports.MorningCaution), []byte(must)) {
			t.Errorf("MorningCaution lacks %q", must)
		}
	}
}

// A day with no weather reading is not an all-clear: the cold checks that
// need the weather were not judged.
func TestWriteMorningNoReadingIsNoAllClear(t *testing.T) {
	day := morningDay(t, "2026-01-10")
	r := &checker.Result{
		Facility: "Birchfall Fur Research Station",
		Weather:  []checker.SiteDays{{Site: "MAST", Days: []checker.DayCold{{Day: day, Readings: 0}}}},
	}
	var b bytes.Buffer
	if err := reports.WriteMorning(&b, r, day); err != nil {
		t.Fatal(err)
	}
	got := b.String()
	if strings.Contains(got, "All clear") || !strings.Contains(got, "this is not an all-clear") {
		t.Errorf("a day without readings read as all clear:\n%s", got)
	}
}
