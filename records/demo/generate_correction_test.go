package demo

// The follow-up plantings (checks.md "correction — follow-up of earlier
// findings"): an earlier review of the station (December 2025, a findings
// file made by hand in the format `welfare check --json` writes) and the
// committee's corrective_actions.csv for January, with plans on time, one
// overdue, one closed whose problem came back, one verified whose problem
// is gone, and one significant December finding nobody planned for.

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"testing"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
	"welfare/rules"
)

// previousDir holds the December findings file shipped with the demo.
const (
	previousDir  = "birchfall-previous"
	previousFile = "findings-2025-12.json"
)

// The follow-up checks, in checks.md order, come after the first set in
// the answer key; corrective_actions.csv is one of the demo's files.
func init() {
	catalogue = append(catalogue, "correction.overdue", "correction.recurred", "correction.plan.missing")
	requiredColumns["corrective_actions.csv"] = []string{"check", "subject", "plan", "due_on"}
}

// december is the earlier review: check, subject, on, until, severity and
// message of each finding. The severities are the checks' own (their
// METADATA and the run rules: a two-day unobserved run is significant).
var december = []struct{ check, subject, on, until, severity, message string }{
	{"care.water.unavailable", "S2-11", "2025-12-09", "", "significant", "water frozen at the 07:40 round and not restored"},
	{"care.observation.missed", "S1-04", "2025-12-06", "2025-12-07", "significant", "not observed for 2 days in a row"},
	{"enclosure.space.insufficient", "K-01", "2025-12-01", "2025-12-31", "significant", "floor space of the run below the 9 CFR §3.6(c)(1) formula for DG-01"},
	{"enclosure.height.insufficient", "AB-05", "2025-12-01", "2025-12-31", "significant", "cage lower than the species' minimum height"},
	{"enclosure.platform.missing", "S2-05", "2025-12-01", "2025-12-31", "minor", "no resting platform for red foxes"},
	{"cold.shelter.missing", "K-02", "2025-12-14", "2025-12-20", "significant", "no nest box in an outdoor run at a wind chill of −27 °C"},
	{"staff.rabies.followup_overdue", "ST-07", "2025-12-13", "", "minor", "rabies titer due since 2025-11-10 (ACIP category 3)"},
	{"ppe.inspection.overdue", "GL-03", "2025-12-15", "", "minor", "bite gloves used 9 days after their last inspection"},
	{"environment.ammonia.high", "KB", "2025-12-05", "", "minor", "ammonia 31 ppm in the dog room"},
}

// correctionActions are the committee's plans, as corrective_actions.csv
// rows: check, subject, found_on, plan, owner, due_on, closed_on, verified_by.
var correctionActions = [][]string{
	{"care.water.unavailable", "S2-11", "2025-12-09", "Replace the drinker of S2-11 with a heated one", "ST-05", "2025-12-19", "2025-12-18", ""},
	{"care.observation.missed", "S1-04", "2025-12-06", "A second keeper covers the weekend rounds", "ST-01", "2025-12-20", "2025-12-10", "ST-02"},
	{"enclosure.space.insufficient", "K-01", "", "Move DG-01 to the larger run being built in the kennel", "ST-01", "2026-02-15", "", ""},
	{"enclosure.height.insufficient", "AB-05", "", "Raise the roof of AB-05 to 75 cm", "ST-04", "2026-01-20", "", ""},
	{"staff.rabies.followup_overdue", "ST-07", "2025-12-13", "Book Priya's rabies titer", "ST-02", "2026-01-31", "", ""},
}

// correctionTables writes corrective_actions.csv and plants what the
// checks find in January against the December review.
func (s *scenario) correctionTables() {
	t := &table{name: "corrective_actions.csv", header: []string{"check", "subject", "found_on", "plan", "owner", "due_on", "closed_on", "verified_by"}}
	for _, r := range correctionActions {
		t.add(r...)
	}
	s.tables = append(s.tables, t)
	s.plant("correction.overdue", "enclosure.height.insufficient AB-05", "2026-01-20", "",
		"The plan to raise the roof of AB-05 (corrective_actions.csv:5) was due Jan 20 and is still open on Jan 31; the December finding was significant, so the overdue plan is significant.")
	s.plant("correction.recurred", "care.water.unavailable S2-11", janDate(8), "",
		"The heated drinker for S2-11 (corrective_actions.csv:2) was closed on Dec 18, and its water was found frozen and not restored again on Jan 8.")
	s.plant("correction.plan.missing", "cold.shelter.missing K-02", "2025-12-14", "",
		"December's significant finding that DG-02's run K-02 has no shelter has no row in corrective_actions.csv.")
	s.explain("correction.overdue", "K-01's plan is due Feb 15 and ST-07's on Jan 31, the period's last day: both on schedule, no finding.")
	s.explain("correction.plan.missing", "S1-04's plan was closed Dec 10 and verified by the veterinarian; the problem is gone in January (resolved). December's minor findings need no plan.")
}

// previousReview renders the December findings file as `welfare check
// --json` writes it, with the shipped rules' checks. It is made by hand, not
// checked from records, so its fingerprint is empty and it accounts no rows.
func previousReview(t *testing.T) []byte {
	t.Helper()
	ctx := context.Background()
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	eng, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	info := map[string]checker.CheckInfo{}
	for _, c := range eng.Checks() {
		info[c.ID] = c
	}
	day := func(s string) records.Day {
		if s == "" {
			return 0
		}
		d, err := records.ParseDay(s)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	res := &checker.Result{Facility: "Birchfall Fur Research Station",
		Period: checker.Period{From: day("2025-12-01"), To: day("2025-12-31")}, Checks: eng.Checks()}
	for _, f := range december {
		c, ok := info[f.check]
		if !ok {
			t.Fatalf("December finding of %s: not a shipped check", f.check)
		}
		res.Findings = append(res.Findings, checker.Finding{Check: f.check, Domain: c.Domain, Subject: f.subject,
			On: day(f.on), Until: day(f.until), Severity: checker.Severity(f.severity), Message: f.message,
			Evidence: []records.Ref{}, Title: c.Title, Source: c.Source, Reportable: c.Reportable})
	}
	checker.SortFindings(res.Findings)
	var b bytes.Buffer
	if err := reports.WriteJSON(&b, res); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// TestDemoPreviousUpToDate compares the shipped December findings file,
// both copies, with what the generator makes.
func TestDemoPreviousUpToDate(t *testing.T) {
	want := previousReview(t)
	dirs := []string{previousDir, filepath.Join(testdataDir, "previous")}
	if *update {
		for _, dir := range dirs {
			writeDir(t, dir, map[string][]byte{previousFile: want})
		}
	}
	for _, dir := range dirs {
		got, err := os.ReadFile(filepath.Join(dir, previousFile))
		if err != nil || !bytes.Equal(got, want) {
			t.Errorf("%s/%s differs from the generator's output (%v); run: go test ./records/demo -update", dir, previousFile, err)
		}
	}
}
