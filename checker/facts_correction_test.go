package checker

import (
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// The correction facts measure days; the rules compare them with the limits.
func TestCorrectionFacts(t *testing.T) {
	d := func(s string) records.Day { return followDay(t, s) }
	p := Period{From: d("2026-01-01"), To: d("2026-01-31")}
	set := &records.Set{CorrectiveActions: []records.CorrectiveAction{
		{Ref: "corrective_actions.csv:2", Check: "care.water.unavailable", Subject: "S2-11", FoundOn: d("2025-12-09"),
			Plan: "heated drinker", DueOn: d("2025-12-19"), ClosedOn: d("2026-01-05")},
		{Ref: "corrective_actions.csv:3", Check: "enclosure.height.insufficient", Subject: "AB-05",
			Plan: "raise the roof", DueOn: d("2026-01-20")},
	}}
	prev := &Previous{Findings: []Finding{
		{Check: "care.water.unavailable", Subject: "S2-11", On: d("2025-12-09"), Severity: Significant, Message: "frozen"},
		{Check: "enclosure.height.insufficient", Subject: "AB-05", On: d("2025-12-01"), Until: d("2025-12-31"), Severity: Minor, Message: "low"},
		{Check: "correction.overdue", Subject: "x y", On: d("2025-12-01"), Severity: Significant, Message: "about a plan"},
	}}
	found := []Finding{
		// A run from before the closing into the days after: back the day after closing.
		{Check: "care.water.unavailable", Subject: "S2-11", On: d("2026-01-03"), Until: d("2026-01-07"), Severity: Significant, Evidence: []records.Ref{"daily_care.csv:9"}},
		// Before the closing: not a recurrence.
		{Check: "care.water.unavailable", Subject: "S2-11", On: d("2026-01-02"), Severity: Minor, Evidence: []records.Ref{}},
		{Check: "enclosure.height.insufficient", Subject: "AB-05", On: d("2026-01-01"), Until: d("2026-01-31"), Severity: Significant, Evidence: []records.Ref{}},
	}
	docs := correctionFacts(set, prev, p, found)
	// TestCorrectionFactsMatchSchema: the documents are what rules/schemas/correction.json says.
	sch, err := rules.InputSchema(correctionKind)
	if err != nil {
		t.Fatal(err)
	}
	for _, doc := range docs {
		for _, problem := range sch.Validate(doc) {
			t.Errorf("correction document %v: %s", doc["id"], problem)
		}
	}
	got := map[string]map[string]any{}
	for _, doc := range docs {
		got[doc["id"].(string)] = doc
	}
	if _, ok := got["correction.overdue x y"]; ok {
		t.Error("a correction finding of the previous review got a document: plans answer problems, not plans")
	}
	water := got["care.water.unavailable S2-11"]["actions"].([]any)[0].(map[string]any)
	want := map[string]any{
		"ref": "corrective_actions.csv:2", "plan": "heated drinker", "owner": "", "verified_by": "",
		"found_on": "2025-12-09", "due_on": "2025-12-19", "closed_on": "2026-01-05",
		"answers_severity": "significant", // the December finding it answers; January's are other days
		"open_at_end":      false, "days_past_due_at_end": 43, "closed_in_period": true, "days_closed_after_due": 17,
		"after_closed": []any{map[string]any{"on": "2026-01-06", "finding_on": "2026-01-03", "severity": "significant",
			"days_after_closed": 1, "evidence": []any{"daily_care.csv:9"}}},
	}
	if diff := cmp.Diff(want, water); diff != "" {
		t.Errorf("S2-11's action (-want +got):\n%s", diff)
	}
	height := got["enclosure.height.insufficient AB-05"]["actions"].([]any)[0].(map[string]any)
	// found_on empty answers every finding of the problem: the highest
	// severity of December's (minor) and January's (significant).
	if height["answers_severity"] != "significant" || height["open_at_end"] != true || height["days_past_due_at_end"] != 11 ||
		height["days_closed_after_due"] != nil {
		t.Errorf("AB-05's action = %v", height)
	}
	prevDocs := got["enclosure.height.insufficient AB-05"]["previous"].([]any)
	if n := prevDocs[0].(map[string]any)["answering_actions"]; n != 1 {
		t.Errorf("AB-05's December finding answered by %v actions, want 1", n)
	}
}
