package checker

import (
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

// Care runs: building rounds count for every enclosure of the building, a
// run ends on a good day, and only occupied days count.
func TestCareRuns(t *testing.T) {
	day := records.MakeDay(2026, time.January, 1)
	loc := time.UTC
	round := func(d int, enc, bld string, observed, fed records.Bool) records.CareRound {
		dd := day + records.Day(d)
		return records.CareRound{Ref: records.Ref("daily_care.csv:" + itoa(d+2)), At: dd.In(loc).Add(8 * time.Hour), Day: dd,
			EnclosureID: enc, BuildingID: bld, Observed: observed, Fed: fed}
	}
	set := &records.Set{
		Animals:    []records.Animal{{ID: "RF-1", Species: "vulpes_vulpes", ArrivedOn: day - 100, EnclosureID: "S1-01"}},
		Enclosures: []records.Enclosure{{ID: "S1-01", BuildingID: "S1", Ref: "enclosures.csv:2"}, {ID: "S1-02", BuildingID: "S1"}},
		Care: []records.CareRound{
			round(0, "", "S1", records.Yes, records.Yes), // building round covers S1-01
			round(1, "S1-01", "", records.Yes, records.No),
			// days 2 and 3: nothing recorded
			round(4, "S1-01", "", records.NotRecorded, records.Yes), // not recorded counts as not done
			round(5, "", "S1", records.Yes, records.Yes),
		},
		Present: map[string]bool{"daily_care.csv": true},
	}
	f := newFacts(set, defaultLimits(t), Period{From: day, To: day + 5})
	f.careFacts()
	got := f.docs["enclosure"]["S1-01"]["care"].(map[string]any)
	want := map[string]any{
		"rounds_recorded":   true,
		"unobserved":        []any{map[string]any{"from": "2026-01-03", "until": "2026-01-05", "days": 3}},
		"unfed":             []any{map[string]any{"from": "2026-01-02", "until": "2026-01-04", "days": 3, "every_days": 1, "due_on": "2026-01-02"}},
		"water_unavailable": []any{},
		"concerns":          []any{},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("care facts of S1-01 (-want +got):\n%s", diff)
	}
	// The empty cage S1-02 has no runs: unoccupied days are not judged.
	empty := f.docs["enclosure"]["S1-02"]["care"].(map[string]any)
	if len(empty["unobserved"].([]any)) != 0 {
		t.Errorf("unoccupied enclosure has unobserved runs: %v", empty["unobserved"])
	}
	// 6 occupied days, complete (observed and fed) on days 1 and 6.
	if want := (CareCoverage{OccupiedDays: 6, CompleteDays: 2}); f.coverage != want {
		t.Errorf("coverage = %+v, want %+v", f.coverage, want)
	}
}

// A building round's health concern about a named animal lands on the
// enclosure the animal occupied that day, after a move.
func TestBuildingConcernFindsTheAnimalsEnclosure(t *testing.T) {
	day := records.MakeDay(2026, time.January, 1)
	set := &records.Set{
		Animals:    []records.Animal{{ID: "RF-1", Species: "vulpes_vulpes", ArrivedOn: day - 100}},
		Enclosures: []records.Enclosure{{ID: "S1-01", BuildingID: "S1"}, {ID: "S1-02", BuildingID: "S1"}},
		Housing: []records.Housing{
			{AnimalID: "RF-1", EnclosureID: "S1-01", MovedInOn: day - 100, MovedOutOn: day + 2},
			{AnimalID: "RF-1", EnclosureID: "S1-02", MovedInOn: day + 2},
		},
		Care: []records.CareRound{{Ref: "daily_care.csv:9", At: (day + 3).In(time.UTC), Day: day + 3, BuildingID: "S1",
			Observed: records.Yes, HealthConcern: records.Yes, ConcernAnimalID: "RF-1"}},
		Present: map[string]bool{"housing.csv": true, "daily_care.csv": true},
	}
	f := newFacts(set, defaultLimits(t), Period{From: day, To: day + 5})
	f.careFacts()
	for enc, want := range map[string]int{"S1-01": 0, "S1-02": 1} {
		got := len(f.docs["enclosure"][enc]["care"].(map[string]any)["concerns"].([]any))
		if got != want {
			t.Errorf("%s has %d concerns, want %d", enc, got, want)
		}
	}
}
