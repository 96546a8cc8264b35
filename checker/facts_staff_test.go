package checker

import (
	"bytes"
	"context"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// peopleLimits are the shipped default limits.
func peopleLimits(t testing.TB) *rules.Limits {
	t.Helper()
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return lim
}

// pday reads YYYY-MM-DD or fails the test.
func pday(t testing.TB, s string) records.Day {
	t.Helper()
	if s == "" {
		return 0
	}
	d, err := records.ParseDay(s)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// ptime reads "YYYY-MM-DD HH:MM" in UTC, the facility's zone in these tests.
func ptime(t testing.TB, s string) time.Time {
	t.Helper()
	at, err := time.ParseInLocation("2006-01-02 15:04", s, time.UTC)
	if err != nil {
		t.Fatal(err)
	}
	return at
}

func iu(v float64) *float64 { return &v }

func TestRabiesStatus(t *testing.T) {
	// Timings and thresholds from ACIP 2022 (MMWR 2022;71(18):619-627): 2-dose series on
	// days 0 and 7; category 3: one titer in years 1-3 after the series or one booster from
	// day 21 to year 3; booster when a titer is < 0.5 IU/mL; category 1 titer every 6 months,
	// category 2 every 2 years; category 4 primary series only. The series here was
	// completed (day 7) on 2022-01-10.
	const primary = "2022-01-10"
	tests := []struct {
		name     string
		category int
		titerOn  string
		titer    *float64
		booster  string
		event    string
		want     string
	}{
		{name: "day before the day-7 dose: series not complete", category: 3, event: "2022-01-09", want: "unprotected"},
		{name: "on the day-7 dose: series complete", category: 3, event: primary, want: "protected"},
		{name: "no series recorded", category: 3, event: "2022-01-10", want: "unprotected"},
		{name: "exactly 3 years on, nothing needed yet", category: 3, event: "2025-01-10", want: "protected"},
		{name: "3 years and a day, no titer or booster", category: 3, event: "2025-01-11", want: "overdue"},
		{name: "titer at 1 year - 1 day does not count", category: 3, titerOn: "2023-01-09", titer: iu(2), event: "2025-02-01", want: "overdue"},
		{name: "titer at 1 year counts", category: 3, titerOn: "2023-01-10", titer: iu(2), event: "2025-02-01", want: "protected"},
		{name: "titer at 3 years counts", category: 3, titerOn: "2025-01-10", titer: iu(2), event: "2025-02-01", want: "protected"},
		{name: "titer at 3 years + 1 day does not count", category: 3, titerOn: "2025-01-11", titer: iu(2), event: "2025-02-01", want: "overdue"},
		{name: "titer of exactly 0.5 IU/mL protects", category: 3, titerOn: "2024-01-10", titer: iu(0.5), event: "2025-02-01", want: "protected"},
		{name: "titer of 0.49 IU/mL without booster is overdue at once", category: 3, titerOn: "2023-06-01", titer: iu(0.49), event: "2023-07-01", want: "overdue"},
		{name: "low titer answered by a booster", category: 3, titerOn: "2023-06-01", titer: iu(0.49), booster: "2023-06-20", event: "2025-02-01", want: "protected"},
		{name: "booster on day 20 does not count", category: 3, booster: "2022-01-30", event: "2025-02-01", want: "overdue"},
		{name: "booster on day 21 counts", category: 3, booster: "2022-01-31", event: "2025-02-01", want: "protected"},
		{name: "booster at 3 years counts", category: 3, booster: "2025-01-10", event: "2025-02-01", want: "protected"},
		{name: "titer taken after the event is not yet known", category: 3, titerOn: "2025-03-01", titer: iu(2), event: "2025-02-01", want: "overdue"},
		{name: "category 1: titer 6 months old is due that day", category: 1, titerOn: "2025-01-10", titer: iu(1), event: "2025-07-10", want: "protected"},
		{name: "category 1: titer 6 months and a day old", category: 1, titerOn: "2025-01-10", titer: iu(1), event: "2025-07-11", want: "overdue"},
		{name: "category 1: no titer 6 months after the series", category: 1, event: "2022-07-11", want: "overdue"},
		{name: "category 2: titer 24 months old", category: 2, titerOn: "2025-01-10", titer: iu(1), event: "2027-01-10", want: "protected"},
		{name: "category 2: titer 24 months and a day old", category: 2, titerOn: "2025-01-10", titer: iu(1), event: "2027-01-11", want: "overdue"},
		{name: "category 2: low titer needs a booster", category: 2, titerOn: "2025-01-10", titer: iu(0.3), event: "2025-02-01", want: "overdue"},
		{name: "category 4: primary series only", category: 4, event: "2031-01-01", want: "protected"},
	}
	// The facts give the record as known on the day; the shipped staff rules
	// judge it: no finding is protected, staff.rabies.unprotected and
	// staff.rabies.followup_overdue are the other two.
	status := map[string]string{"staff.rabies.unprotected": "unprotected", "staff.rabies.followup_overdue": "overdue"}
	engines := map[int]*Engine{}
	for _, c := range []int{1, 2, 3, 4} {
		lim := peopleLimits(t)
		lim.Staff.Rabies.RiskCategory = c
		data, err := lim.Data()
		if err != nil {
			t.Fatal(err)
		}
		if engines[c], err = NewEngine(context.Background(), []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{}); err != nil {
			t.Fatal(err)
		}
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := &records.Staff{ID: "S1", RabiesTiterOn: pday(t, tt.titerOn), RabiesTiterIUmL: tt.titer, RabiesBoosterOn: pday(t, tt.booster)}
			if tt.name != "no series recorded" {
				s.RabiesPrimaryOn = pday(t, primary)
			}
			day := pday(t, tt.event)
			// The person's own category (staff.csv rabies_risk_category) is on the entry.
			rab := rabiesRecord(s, day, []records.Ref{"handling.csv:2"})
			rab["on"], rab["category"] = day.String(), tt.category
			rab["work"] = map[string]any{"handlings": 1, "culls": 0, "care_rounds": 0}
			doc := map[string]any{"kind": "staff", "id": "S1", "name": "Ilse Varga", "ref": "staff.csv:2", "staff": map[string]any{
				"active_from": nil, "active_to": nil, "culled": []any{}, "outside_active": []any{},
				"handled": []any{map[string]any{
					"on": day.String(), "refs": []any{"handling.csv:2"}, "respirator": nil,
					"training": map[string]any{"trained_on": "2021-12-01", "trained_after_event": false, "valid_until": day.String()},
				}},
				"rabies": []any{rab},
			}}
			found, err := engines[tt.category].Evaluate(context.Background(), "staff", []map[string]any{doc})
			if err != nil {
				t.Fatal(err)
			}
			got, msg := "protected", ""
			for _, f := range found {
				if st, ok := status[f.Check]; ok {
					got, msg = st, f.Message
				}
			}
			if got != tt.want {
				t.Errorf("status = %q (%s), want %q", got, msg, tt.want)
			}
		})
	}
}

func TestTrainedAt(t *testing.T) {
	tests := []struct {
		name        string
		on, event   string
		months      int
		wantUntil   any
		wantAfter   bool
		wantTrained any
	}{
		// OSHA 29 CFR 1910.134(f)(2), annual fit test: a fit on 2025-01-10 covers 2026-01-10.
		{name: "annual fit test", on: "2025-01-10", event: "2026-01-10", months: 12, wantUntil: "2026-01-10", wantTrained: "2025-01-10"},
		// Facility choice: 12-month handling refresher, same reading of "older than 12 months".
		{name: "trained the same day", on: "2026-03-01", event: "2026-03-01", months: 12, wantUntil: "2027-03-01", wantTrained: "2026-03-01"},
		{name: "trained after the event", on: "2026-03-02", event: "2026-03-01", months: 12, wantUntil: nil, wantAfter: true, wantTrained: "2026-03-02"},
		{name: "never trained", on: "", event: "2026-03-01", months: 12, wantUntil: nil, wantTrained: nil},
		// time.AddDate normalisation: 31 Aug + 6 months is 3 March (2026 is not a leap year).
		{name: "month end normalises", on: "2025-08-31", event: "2026-01-01", months: 6, wantUntil: "2026-03-03", wantTrained: "2025-08-31"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := trainedAt(pday(t, tt.on), tt.months, pday(t, tt.event))
			want := map[string]any{"trained_on": tt.wantTrained, "trained_after_event": tt.wantAfter, "valid_until": tt.wantUntil}
			if diff := cmp.Diff(want, got); diff != "" {
				t.Errorf("trainedAt (-want +got):\n%s", diff)
			}
		})
	}
}

func TestStaffFacts(t *testing.T) {
	set := peopleSet(t)
	// A second handling by S2 on the same day: one day entry, both rows.
	extra := set.Handling[2]
	extra.Ref, extra.AnimalID = "handling.csv:8", "M1"
	set.Handling = append(set.Handling, extra)
	f := newFacts(set, peopleLimits(t), peoplePeriod)
	f.staffFacts()

	// Name and row are where every document has them.
	if got := [2]any{f.docs["staff"]["S2"]["name"], f.docs["staff"]["S2"]["ref"]}; got != [2]any{"Oskar Lind", "staff.csv:3"} {
		t.Errorf("S2 name and ref = %v, want Oskar Lind, staff.csv:3", got)
	}
	s2 := f.docs["staff"]["S2"]["staff"].(map[string]any)
	want := map[string]any{
		"active_from": "2025-01-01", "active_to": "2026-01-05",
		"handled": []any{map[string]any{
			"on": "2026-01-12", "refs": []any{"handling.csv:4", "handling.csv:8"},
			"training":   map[string]any{"trained_on": nil, "trained_after_event": false, "valid_until": nil},
			"respirator": nil,
		}},
		// checks.md "Corrections to the first set": rabies covers care rounds of
		// occupied enclosures (E1 holds foxes on 6 January) as well as handlings.
		// Only the fox is a rabies-risk species (limits: mink rabies_risk false).
		"rabies": []any{
			map[string]any{"on": "2026-01-06", "refs": []any{"daily_care.csv:2"},
				"work":     map[string]any{"handlings": 0, "culls": 0, "care_rounds": 1},
				"category": 3, "primary_on": nil, "titer_on": nil, "titer_iu_ml": nil, "booster_on": nil},
			map[string]any{"on": "2026-01-12", "refs": []any{"handling.csv:4"},
				"work":     map[string]any{"handlings": 1, "culls": 0, "care_rounds": 0},
				"category": 3, "primary_on": nil, "titer_on": nil, "titer_iu_ml": nil, "booster_on": nil},
		},
		"culled": []any{},
		"outside_active": []any{
			map[string]any{"on": "2026-01-06", "rows": 1, "refs": []any{"daily_care.csv:2"}},
			map[string]any{"on": "2026-01-12", "rows": 2, "refs": []any{"handling.csv:4", "handling.csv:8"}},
		},
	}
	if diff := cmp.Diff(want, s2); diff != "" {
		t.Errorf("S2 staff facts (-want +got):\n%s", diff)
	}

	s3 := f.docs["staff"]["S3"]["staff"].(map[string]any)
	wantCulled := []any{
		map[string]any{"on": "2026-01-20", "refs": []any{"culls.csv:2"}, "methods": []any{"barbiturate_overdose"}, "untrained_methods": []any{},
			"trained_on": "2025-06-01", "trained_after_event": false, "valid_until": "2026-06-01"},
		map[string]any{"on": "2026-01-21", "refs": []any{"culls.csv:3"}, "methods": []any{"penetrating_captive_bolt"}, "untrained_methods": []any{"penetrating_captive_bolt"},
			"trained_on": "2025-06-01", "trained_after_event": false, "valid_until": "2026-06-01"},
	}
	if diff := cmp.Diff(wantCulled, s3["culled"]); diff != "" {
		t.Errorf("S3 culls (-want +got):\n%s", diff)
	}
	// S1 wore a respirator on 10 and 11 January: fit test 2025-01-10 covers until 2026-01-10 (OSHA annual).
	s1 := f.docs["staff"]["S1"]["staff"].(map[string]any)["handled"].([]any)
	gotResp := s1[0].(map[string]any)["respirator"]
	wantResp := map[string]any{"refs": []any{"handling.csv:2"}, "fit_on": "2025-01-10", "fit_after_event": false, "valid_until": "2026-01-10"}
	if diff := cmp.Diff(wantResp, gotResp); diff != "" {
		t.Errorf("S1 respirator (-want +got):\n%s", diff)
	}
}

// TestStaffDayRefsCapped: a keeper's day of hundreds of rows (care rounds of
// an enclosure foxes occupy, after the keeper's last day) counts them all
// and lists the first maxRefs as evidence, the handling before the rounds.
func TestStaffDayRefsCapped(t *testing.T) {
	set := peopleSet(t)
	const rounds = 300
	base := set.Care[0] // S2 on E1, 2026-01-06: foxes live there, S2 left on 2026-01-05
	set.Care = nil
	for i := range rounds {
		r := base
		r.Ref = records.Ref(fmt.Sprintf("daily_care.csv:%d", i+2))
		set.Care = append(set.Care, r)
	}
	h := set.Handling[2]                                         // S2 handles fox F1 ...
	h.Ref, h.At = "handling.csv:9", ptime(t, "2026-01-06 10:00") // ... on the same day
	set.Handling = append(set.Handling, h)
	f := newFacts(set, peopleLimits(t), peoplePeriod)
	f.staffFacts()
	s2 := f.docs["staff"]["S2"]["staff"].(map[string]any)

	wantRefs := []any{"handling.csv:9"}
	for i := range maxRefs - 1 {
		wantRefs = append(wantRefs, fmt.Sprintf("daily_care.csv:%d", i+2))
	}
	rab := s2["rabies"].([]any)[0].(map[string]any)
	if rab["on"] != "2026-01-06" {
		t.Fatalf("first rabies day = %v, want 2026-01-06", rab["on"])
	}
	if diff := cmp.Diff(map[string]any{"handlings": 1, "culls": 0, "care_rounds": rounds}, rab["work"]); diff != "" {
		t.Errorf("rabies work (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff(wantRefs, rab["refs"]); diff != "" {
		t.Errorf("rabies refs (-want +got):\n%s", diff)
	}
	out := s2["outside_active"].([]any)[0].(map[string]any)
	if out["on"] != "2026-01-06" || out["rows"] != rounds+1 || len(out["refs"].([]any)) != maxRefs {
		t.Errorf("outside_active = on %v, %v rows, %d refs; want 2026-01-06, %d rows, %d refs", out["on"], out["rows"], len(out["refs"].([]any)), rounds+1, maxRefs)
	}
}

func TestRabiesCoversEveryoneWhoWorksWithRiskSpecies(t *testing.T) {
	// checks.md "Corrections to the first set": handlers, cull operators and keepers on
	// care rounds of occupied enclosures; the ACIP 2022 risk category is per person
	// (staff.csv rabies_risk_category), defaulting to the limits' category (3).
	cat := func(n int) *int { return &n }
	tests := []struct {
		name     string
		category *int
		cull     string // animal culled on 2026-01-20 by S3
		round    string // enclosure of a round by S3 on 2026-01-20 ("" none; "B1" a building round)
		wantWork map[string]any
		wantCat  int
		want     []string // rabies findings of S3 from the shipped staff rules
	}{
		{"fox cull", nil, "F2", "", map[string]any{"handlings": 0, "culls": 1, "care_rounds": 0}, 3, []string{"staff.rabies.followup_overdue"}},
		{"mink cull is not rabies work", nil, "M1", "", nil, 0, nil},
		{"care round of an enclosure foxes occupy", nil, "", "E1", map[string]any{"handlings": 0, "culls": 0, "care_rounds": 1}, 3, []string{"staff.rabies.followup_overdue"}},
		{"building round covers its enclosures", nil, "", "B1", map[string]any{"handlings": 0, "culls": 0, "care_rounds": 1}, 3, []string{"staff.rabies.followup_overdue"}},
		{"care round of an empty enclosure", nil, "", "E2", nil, 0, nil},
		// ACIP 2022 category 4: primary series only, so nothing is overdue.
		{"person's own category 4", cat(4), "F2", "", map[string]any{"handlings": 0, "culls": 1, "care_rounds": 0}, 4, nil},
		// ACIP 2022 category 5: no pre-exposure prophylaxis recommended.
		{"person's own category 5", cat(5), "F2", "", map[string]any{"handlings": 0, "culls": 1, "care_rounds": 0}, 5, nil},
	}
	lim := peopleLimits(t)
	eng := shippedEngine(t, lim)
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			set := peopleSet(t)
			set.Handling = nil
			set.Care = nil
			set.Enclosures = append(set.Enclosures, records.Enclosure{Ref: "enclosures.csv:3", ID: "E2", BuildingID: "B1", Kind: "pen", HeightCm: 200})
			// S3: primary series 2020-03-01, titer 2022-03-01 (inside years 1-3): for
			// category 3 that suffices; make it too early so category 3 is overdue.
			set.Staff[2].RabiesTiterOn = pday(t, "2020-06-01")
			set.Staff[2].RabiesRiskCategory = tt.category
			set.Culls = nil
			if tt.cull != "" {
				set.Culls = []records.Cull{{Ref: "culls.csv:2", At: ptime(t, "2026-01-20 11:00"), AnimalID: tt.cull, StaffID: "S3", Method: "barbiturate_overdose"}}
			}
			if tt.round != "" {
				r := records.CareRound{Ref: "daily_care.csv:2", At: ptime(t, "2026-01-20 08:00"), Day: pday(t, "2026-01-20"), StaffID: "S3", Observed: records.Yes}
				if tt.round == "B1" {
					r.BuildingID = "B1"
				} else {
					r.EnclosureID = tt.round
				}
				set.Care = []records.CareRound{r}
			}
			res, err := Check(context.Background(), Config{Records: set, Limits: lim, Engine: eng, Period: peoplePeriod, Only: []string{"staff"}})
			if err != nil {
				t.Fatal(err)
			}
			var rabies []string
			for _, fd := range res.Findings {
				if fd.Subject == "S3" && strings.HasPrefix(fd.Check, "staff.rabies.") {
					rabies = append(rabies, fd.Check)
				}
			}
			if diff := cmp.Diff(tt.want, rabies); diff != "" {
				t.Errorf("rabies findings (-want +got):\n%s", diff)
			}
			f := newFacts(set, lim, peoplePeriod)
			f.staffFacts()
			doc := f.docs["staff"]["S3"]
			var got []any
			if doc != nil {
				got = doc["staff"].(map[string]any)["rabies"].([]any)
			}
			if tt.wantWork == nil {
				if len(got) != 0 {
					t.Fatalf("rabies days = %v, want none", got)
				}
				return
			}
			if len(got) != 1 {
				t.Fatalf("rabies days = %v, want one", got)
			}
			e := got[0].(map[string]any)
			if diff := cmp.Diff([]any{tt.wantWork, tt.wantCat}, []any{e["work"], e["category"]}); diff != "" {
				t.Errorf("work, category (-want +got):\n%s", diff)
			}
		})
	}
}
