package checker

import (
	"bytes"
	"context"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// An invented indoor building with two cages, checked over three January
// days. E1's water is found frozen on the 2nd and not restored.
var followFolder = fstest.MapFS{
	"facility.yaml": {Data: []byte("name: Birchfall Fur Research Station\ntime_zone: America/Winnipeg\nbuildings:\n  - id: B2\n    exposure: indoor\n")},
	"animals.csv": {Data: []byte("animal_id,species,sex,arrived_on,enclosure_id\n" +
		"A1,vulpes_vulpes,f,2024-05-01,E1\nA2,vulpes_vulpes,m,2024-05-01,E2\n")},
	"enclosures.csv": {Data: []byte("enclosure_id,building_id,kind,length_cm,width_cm,height_cm,nest_box,platform\n" +
		"E1,B2,cage,120,85,78,yes,yes\nE2,B2,cage,120,85,78,yes,yes\n")},
	"staff.csv": {Data: []byte("staff_id,name,role\nK1,Ilse Marrow,keeper\n")},
	"daily_care.csv": {Data: []byte("checked_at,building_id,enclosure_id,staff_id,observed,fed,water,water_restored\n" +
		"2026-01-01T08:00,B2,,K1,yes,yes,ok,\n" +
		"2026-01-02T08:00,B2,,K1,yes,yes,ok,\n" +
		"2026-01-02T09:00,,E1,K1,yes,yes,frozen,no\n" +
		"2026-01-03T08:00,B2,,K1,yes,yes,ok,\n")},
	"corrective_actions.csv": {Data: []byte("check,subject,found_on,plan,owner,due_on,closed_on,verified_by\n" +
		"care.water.unavailable,E1,,Heated drinkers,K1,2025-12-20,2025-12-28,\n" +
		"care.observation.missed,E2,2025-12-05,Second keeper on weekends,K1,2026-01-02,,\n" +
		"cold.bedding.stale,E9,,Straw delivery,K1,2026-01-10,,\n" +
		"care.nothing.here,E1,,Not a check,K1,2026-01-10,,\n")},
}

func followDay(t *testing.T, s string) records.Day {
	t.Helper()
	d, err := records.ParseDay(s)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// The previous review (December): the same problem in E1, a problem of E2
// that is gone, a cold problem (no weather.csv now: not evaluated), an
// ammonia problem (no environment.csv now), a committee check no longer in
// force, and a significant finding nobody planned for.
func followPrevious(t *testing.T) *Previous {
	f := func(check, subject, on string, sev Severity) Finding {
		return Finding{Check: check, Domain: check[:index(check, '.')], Subject: subject, On: followDay(t, on), Severity: sev, Message: "found"}
	}
	return &Previous{File: "december.json", Facility: "Birchfall Fur Research Station",
		Period: Period{From: followDay(t, "2025-12-01"), To: followDay(t, "2025-12-31")},
		Findings: []Finding{
			f("care.water.unavailable", "E1", "2025-12-12", Significant),
			f("care.observation.missed", "E2", "2025-12-05", Significant),
			f("cold.bedding.stale", "E1", "2025-12-20", Significant),
			f("environment.ammonia.high", "B2", "2025-12-03", Minor),
			f("committee.noise.high", "B2", "2025-12-04", Minor),
			f("care.feeding.missed", "E2", "2025-12-09", Significant),
		}}
}

func index(s string, c byte) int {
	for i := 0; i < len(s); i++ {
		if s[i] == c {
			return i
		}
	}
	return len(s)
}

func followCheck(t *testing.T, only []string, prev *Previous) *Result {
	t.Helper()
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(followFolder, records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	eng := shippedEngine(t, lim)
	res, err := Check(context.Background(), Config{Records: set, Limits: lim, Engine: eng, Only: only, Previous: prev,
		Period: Period{From: followDay(t, "2026-01-01"), To: followDay(t, "2026-01-03")}})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

type pastRow struct{ Problem, Why string }

func pastRows(ps []PastProblem) []pastRow {
	out := []pastRow{}
	for _, p := range ps {
		out = append(out, pastRow{p.Problem(), p.Why})
	}
	return out
}

func TestFollowUp(t *testing.T) {
	res := followCheck(t, nil, followPrevious(t))
	type row struct{ Key, Severity, Class string }
	var got []row
	for i := range res.Findings {
		f := &res.Findings[i]
		if f.Domain == "care" || f.Domain == "correction" || f.Domain == "records" {
			got = append(got, row{f.Key(), string(f.Severity), res.ClassOf(f)})
		}
	}
	want := []row{
		{"care.water.unavailable E1 2026-01-02", "significant", "recurring"},
		// Open past its due day at the period's end; the answered December
		// finding was significant. The action on E9 due 2026-01-10 is not
		// yet due on 2026-01-03: no finding.
		{"correction.overdue care.observation.missed E2 2026-01-02", "significant", "new"},
		// Closed 2025-12-28, frozen again 2026-01-02: the new finding's severity.
		{"correction.recurred care.water.unavailable E1 2026-01-02", "significant", "new"},
		// Significant in December, no action answers them.
		{"correction.plan.missing care.feeding.missed E2 2025-12-09", "minor", "new"},
		{"correction.plan.missing cold.bedding.stale E1 2025-12-20", "minor", "new"},
		// care.nothing.here is not a check in force: the row is rejected.
		{"records.row.rejected corrective_actions.csv:5 2026-01-10", "minor", "new"},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings and classes (-want +got):\n%s", diff)
	}
	for _, c := range res.Accounting {
		if c.File == "corrective_actions.csv" && (c.Read != 4 || c.Accepted != 3 || c.Rejected != 1) {
			t.Errorf("corrective_actions.csv accounting = %+v, want 4 read, 3 accepted, 1 rejected", c)
		}
	}
	fu := res.FollowUp
	if diff := cmp.Diff([]pastRow{{"care.feeding.missed E2", ""}, {"care.observation.missed E2", ""}}, pastRows(fu.Resolved)); diff != "" {
		t.Errorf("resolved (-want +got):\n%s", diff)
	}
	wantNot := []pastRow{
		{"cold.bedding.stale E1", "not re-checked: not evaluated: no weather.csv in the records folder"},
		{"committee.noise.high B2", "not re-checked: the check is not in force"},
		{"environment.ammonia.high B2", "not re-checked: not evaluated: no environment.csv in the records folder"},
	}
	if diff := cmp.Diff(wantNot, pastRows(fu.NotRechecked)); diff != "" {
		t.Errorf("not re-checked (-want +got):\n%s", diff)
	}
	type act struct{ Problem, Status string }
	var acts []act
	for _, a := range fu.Actions {
		acts = append(acts, act{a.Problem(), a.Status})
	}
	wantActs := []act{
		{"care.observation.missed E2", "overdue"},
		{"cold.bedding.stale E9", "on schedule"},
		{"care.water.unavailable E1", "closed"},
	}
	if diff := cmp.Diff(wantActs, acts); diff != "" {
		t.Errorf("actions (-want +got):\n%s", diff)
	}
}

// A problem whose check was not evaluated this time is never resolved:
// with --only cold, every care problem of December is "not re-checked".
func TestFollowUpNeverResolvesWhatWasNotChecked(t *testing.T) {
	res := followCheck(t, []string{"cold"}, followPrevious(t))
	for _, p := range res.FollowUp.Resolved {
		t.Errorf("resolved although not re-checked: %s", p.Problem())
	}
	got := pastRows(res.FollowUp.NotRechecked)
	want := []pastRow{
		{"care.feeding.missed E2", "not re-checked: left out by --only"},
		{"care.observation.missed E2", "not re-checked: left out by --only"},
		{"care.water.unavailable E1", "not re-checked: left out by --only"},
		{"cold.bedding.stale E1", "not re-checked: not evaluated: no weather.csv in the records folder"},
		{"committee.noise.high B2", "not re-checked: the check is not in force"},
		{"environment.ammonia.high B2", "not re-checked: left out by --only"},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("not re-checked (-want +got):\n%s", diff)
	}
	// --only keeps the report to cold, but the plans are still judged on
	// every domain's findings: E2's plan is overdue all the same.
	for _, a := range res.FollowUp.Actions {
		if a.Problem() == "care.observation.missed E2" && a.Status != StatusOverdue {
			t.Errorf("E2's plan is %q with --only cold, want overdue", a.Status)
		}
	}
	for _, f := range res.Findings {
		// Rejected rows are listed whatever --only says (issue: nothing lost).
		if f.Domain != "cold" && f.Check != RejectedCheck {
			t.Errorf("--only cold reported %s", f.Key())
		}
	}
}

// Without --previous the plan check is not evaluated and no finding is classed.
func TestFollowUpWithoutPrevious(t *testing.T) {
	res := followCheck(t, nil, nil)
	var why string
	for _, s := range res.NotEvaluated {
		if s.Check == "correction.plan.missing" {
			why = s.Reason
		}
	}
	if why != "no previous findings file (--previous)" {
		t.Errorf("correction.plan.missing not evaluated reason = %q", why)
	}
	for i := range res.Findings {
		if c := res.ClassOf(&res.Findings[i]); c != "" {
			t.Errorf("%s classed %q without a previous review", res.Findings[i].Key(), c)
		}
	}
}

// TestActionForIndexed: the index by check and subject picks, for every
// finding of the demo, the action a scan of every action picks (the
// demo's plans include one per finding day and one for a whole problem).
func TestActionForIndexed(t *testing.T) {
	res := followCheck(t, nil, followPrevious(t))
	if res.FollowUp.byProblem == nil {
		t.Fatal("the follow-up has no action index")
	}
	scan := *res
	fu := *res.FollowUp
	fu.byProblem = nil
	scan.FollowUp = &fu
	answered := 0
	for i := range res.Findings {
		f := &res.Findings[i]
		got, want := res.ActionFor(f), scan.ActionFor(f)
		if (got == nil) != (want == nil) || (got != nil && got.Action != want.Action) {
			t.Errorf("%s: indexed %v, scanned %v", f.Key(), got, want)
		}
		if got != nil {
			answered++
		}
	}
	if answered == 0 {
		t.Fatal("no demo finding has an action: the comparison tested nothing")
	}
}
