package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// followJSON is the part of findings.json the follow-up tests read.
type followJSON struct {
	Findings []struct {
		Check, Subject, On, Severity, Key, Problem, Class string
		Action                                            *struct{ Plan, Status string }
	}
	FollowUp *struct {
		Resolved     []struct{ Problem string }
		NotRechecked []struct{ Problem, Reason string } `json:"not_rechecked"`
		Actions      []struct{ Problem, Status string } `json:"corrective_actions"`
	} `json:"follow_up"`
}

func checkFollow(t *testing.T, args ...string) (followJSON, int, string) {
	t.Helper()
	jsonPath := filepath.Join(t.TempDir(), "f.json")
	code, _, stderr := runMain(t, append([]string{"check", "--fail-on", "never", "--json", jsonPath}, args...)...)
	var doc followJSON
	if code != exitOK {
		return doc, code, stderr
	}
	b, err := os.ReadFile(jsonPath)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return doc, code, stderr
}

// answerKey reads the tables of testdata/demo/FOLLOWUP.md by section: the
// rows of each "## " section's table, cells joined with "|".
func answerKey(t *testing.T) map[string][]string {
	t.Helper()
	b, err := os.ReadFile("../../testdata/demo/FOLLOWUP.md")
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]string{}
	section := ""
	header := true
	for _, line := range strings.Split(string(b), "\n") {
		switch {
		case strings.HasPrefix(line, "## "):
			section, header = strings.TrimPrefix(line, "## "), true
		case strings.HasPrefix(line, "|---"):
			header = false
		case strings.HasPrefix(line, "|") && !header:
			var cells []string
			for _, c := range strings.Split(strings.Trim(line, "|"), "|") {
				cells = append(cells, strings.TrimSpace(c))
			}
			out[section] = append(out[section], strings.Join(cells, "|"))
		}
	}
	return out
}

// On the demo, the classes, the resolved and not re-checked problems, the
// correction findings and the actions' status equal the hand-made key.
func TestDemoFollowUpAnswerKey(t *testing.T) {
	doc, code, stderr := checkFollow(t, "--from", "2026-01-01", "--to", "2026-01-31", "--previous", demoPrevious, demoRecords)
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, stderr)
	}
	key := answerKey(t)
	got := map[string][]string{}
	for _, f := range doc.Findings {
		switch f.Class {
		case "recurring":
			got["Recurring"] = append(got["Recurring"], f.Key)
		case "new":
		default:
			t.Errorf("%s: class %q, want new or recurring", f.Key, f.Class)
		}
		if strings.HasPrefix(f.Check, "correction.") {
			got["Correction findings"] = append(got["Correction findings"], strings.Join([]string{f.Check, f.Subject, f.On, f.Severity}, "|"))
		}
	}
	for _, p := range doc.FollowUp.Resolved {
		got["Resolved"] = append(got["Resolved"], p.Problem)
	}
	for _, p := range doc.FollowUp.NotRechecked {
		got["Not re-checked"] = append(got["Not re-checked"], p.Problem)
	}
	for _, a := range doc.FollowUp.Actions {
		got["Corrective actions at the period's end, overdue first"] = append(got["Corrective actions at the period's end, overdue first"], a.Status+"|"+a.Problem)
	}
	for _, s := range []string{"Recurring", "Resolved", "Not re-checked", "Correction findings"} {
		sort.Strings(key[s])
		sort.Strings(got[s])
	}
	if diff := cmp.Diff(key, got); diff != "" {
		t.Errorf("follow-up differs from testdata/demo/FOLLOWUP.md (-key +got):\n%s", diff)
	}
}

// A problem whose check was not evaluated this time is never resolved:
// with --only cold, December's care, enclosure, staff and ppe problems are
// not re-checked, and only cold problems can be resolved.
func TestDemoOnlyNeverResolvesUncheckedProblems(t *testing.T) {
	doc, code, stderr := checkFollow(t, "--from", "2026-01-01", "--to", "2026-01-31", "--only", "cold", "--previous", demoPrevious, demoRecords)
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, stderr)
	}
	if len(doc.FollowUp.Resolved) != 0 {
		t.Errorf("resolved with --only cold: %+v", doc.FollowUp.Resolved)
	}
	var got []string
	for _, p := range doc.FollowUp.NotRechecked {
		got = append(got, p.Problem)
	}
	want := []string{"care.observation.missed S1-04", "care.water.unavailable S2-11", "enclosure.height.insufficient AB-05",
		"enclosure.platform.missing S2-05", "enclosure.space.insufficient K-01", "environment.ammonia.high KB",
		"ppe.inspection.overdue GL-03", "staff.rabies.followup_overdue ST-07"}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("not re-checked (-want +got):\n%s", diff)
	}
}

// A bad or foreign --previous file is a clear error, exit 2, before any report.
func TestPreviousRefused(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	dec, err := os.ReadFile(demoPrevious)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, file, want string
	}{
		{"missing", filepath.Join(dir, "nope.json"), "no such file"},
		{"not JSON", write("notes.json", "period: december\n"), "notes.json:1:1: is not a findings file written by 'welfare check --json'"},
		{"another tool's JSON", write("other.json", `{"results": []}`), `other.json: is not a findings file written by 'welfare check --json' (no "facility")`},
		{"bad day", write("badday.json", strings.Replace(string(dec), `"on": "2025-12-09"`, `"on": "2025-12-32"`, 1)), "badday.json: findings[1]: on:"},
		{"another facility", write("other-station.json", strings.Replace(string(dec), "Birchfall Fur Research Station", "Elsewhere Station", 1)),
			`the findings of "Elsewhere Station", not of "Birchfall Fur Research Station"`},
		{"not before this period", write("same.json", strings.Replace(string(dec), `"to": "2025-12-31"`, `"to": "2026-01-05"`, 1)),
			"does not end before this period starts (2026-01-01)"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			out := filepath.Join(dir, tt.name+".pdf")
			code, _, stderr := runMain(t, "check", "--from", "2026-01-01", "--to", "2026-01-31", "--previous", tt.file, "--pdf", out, demoRecords)
			if code != exitUsage || !strings.Contains(stderr, tt.want) {
				t.Errorf("exit %d, want %d with %q; stderr:\n%s", code, exitUsage, tt.want, stderr)
			}
			if _, err := os.Stat(out); err == nil {
				t.Errorf("a report was written despite the bad --previous")
			}
		})
	}
}

// welfare plans → the committee edits → check: the starter file lists
// December's significant findings; once filled in and put in the records
// folder, the next check judges the plans.
func TestPlansRoundTrip(t *testing.T) {
	dir := t.TempDir()
	starter := filepath.Join(dir, "plans.csv")
	code, _, stderr := runMain(t, "plans", demoPrevious, "--out", starter)
	if code != exitOK {
		t.Fatalf("plans: exit %d\n%s", code, stderr)
	}
	f, err := os.Open(starter)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	// The December review's significant findings (testdata/demo/FOLLOWUP.md, previous/findings-2025-12.json).
	want := [][]string{
		{"check", "subject", "found_on", "plan", "owner", "due_on", "closed_on", "verified_by"},
		{"care.observation.missed", "S1-04", "2025-12-06", "", "", "", "", ""},
		{"care.water.unavailable", "S2-11", "2025-12-09", "", "", "", "", ""},
		{"cold.shelter.missing", "K-02", "2025-12-14", "", "", "", "", ""},
		{"enclosure.height.insufficient", "AB-05", "2025-12-01", "", "", "", "", ""},
		{"enclosure.space.insufficient", "K-01", "2025-12-01", "", "", "", "", ""},
	}
	if diff := cmp.Diff(want, rows); diff != "" {
		t.Fatalf("starter file (-want +got):\n%s", diff)
	}
	if code, _, stderr := runMain(t, "plans", demoPrevious, "--out", starter); code != exitUsage || !strings.Contains(stderr, "is not overwritten") {
		t.Errorf("plans over an existing file: exit %d\n%s", code, stderr)
	}

	// The committee fills in every plan: K-02's is late, the others due after January.
	for i, r := range rows[1:] {
		r[3], r[4], r[5] = "plan "+r[1], "ST-01", "2026-03-01"
		if r[1] == "K-02" {
			r[5] = "2026-01-10"
		}
		rows[i+1] = r
	}
	recs := filepath.Join(dir, "records")
	if err := os.MkdirAll(recs, 0o755); err != nil {
		t.Fatal(err)
	}
	entries, err := os.ReadDir(demoRecords)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		b, err := os.ReadFile(filepath.Join(demoRecords, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(recs, e.Name()), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	out, err := os.Create(filepath.Join(recs, "corrective_actions.csv"))
	if err != nil {
		t.Fatal(err)
	}
	w := csv.NewWriter(out)
	if err := w.WriteAll(rows); err != nil {
		t.Fatal(err)
	}
	out.Close()

	doc, code, stderr := checkFollow(t, "--from", "2026-01-01", "--to", "2026-01-31", "--previous", demoPrevious, recs)
	if code != exitOK {
		t.Fatalf("check: exit %d\n%s", code, stderr)
	}
	var corr []string
	for _, f := range doc.Findings {
		if strings.HasPrefix(f.Check, "correction.") {
			corr = append(corr, f.Check+" "+f.Subject+" "+f.On)
		}
	}
	// Every significant December finding now has a plan (no plan.missing);
	// K-02's is open past its date at the period's end.
	wantCorr := []string{"correction.overdue cold.shelter.missing K-02 2026-01-10"}
	if diff := cmp.Diff(wantCorr, corr); diff != "" {
		t.Errorf("correction findings (-want +got):\n%s", diff)
	}
	status := map[string]string{}
	for _, a := range doc.FollowUp.Actions {
		status[a.Problem] = a.Status
	}
	if status["cold.shelter.missing K-02"] != "overdue" || status["enclosure.space.insufficient K-01"] != "on schedule" {
		t.Errorf("action status = %v", status)
	}
}
