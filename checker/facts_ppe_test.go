package checker

import (
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

func TestPPEFacts(t *testing.T) {
	set := peopleSet(t)
	// A second check of G1 on the same day as its first: the later row is
	// the latest word. A check after the day of use is not yet known.
	set.PPEChecks = append(set.PPEChecks,
		set.PPEChecks[0],
	)
	set.PPEChecks[2].Ref, set.PPEChecks[2].Condition, set.PPEChecks[2].Action = "ppe_checks.csv:4", "worn", "kept"
	set.PPEChecks = append(set.PPEChecks, set.PPEChecks[0])
	set.PPEChecks[3].Ref, set.PPEChecks[3].CheckedOn = "ppe_checks.csv:5", pday(t, "2026-01-20")
	f := newFacts(set, peopleLimits(t), peoplePeriod)
	f.ppeFacts()

	lastG1 := func(days int) map[string]any {
		return map[string]any{"on": "2026-01-05", "ref": "ppe_checks.csv:4", "condition": "worn", "action": "kept", "days_before": days}
	}
	want := map[string]any{
		"G1": map[string]any{"uses": []any{
			map[string]any{"on": "2026-01-10", "refs": []any{"handling.csv:2"}, "kind": "glove", "last_check": lastG1(5)},
			map[string]any{"on": "2026-01-11", "refs": []any{"handling.csv:3"}, "kind": "glove", "last_check": lastG1(6)},
			map[string]any{"on": "2026-01-12", "refs": []any{"handling.csv:4"}, "kind": "glove", "last_check": lastG1(7)},
		}},
		"G2": map[string]any{"uses": []any{
			map[string]any{"on": "2026-01-14", "refs": []any{"handling.csv:5"}, "kind": "gauntlet", "last_check": map[string]any{
				"on": "2026-01-13", "ref": "ppe_checks.csv:3", "condition": "damaged", "action": nil, "days_before": 1}},
		}},
	}
	got := map[string]any{}
	for id, d := range f.docs["item"] {
		got[id] = d["ppe"]
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("ppe facts (-want +got):\n%s", diff)
	}
}

func TestPPECheckOnTheDayOfUse(t *testing.T) {
	// The inspection window runs "up to and including the day of use"
	// (facility choice, 7 days): a check that day is the latest word, and
	// here it replaced a damaged glove.
	set := peopleSet(t)
	set.PPEChecks = append(set.PPEChecks,
		records.PPECheck{Ref: "ppe_checks.csv:4", CheckedOn: pday(t, "2026-01-14"), ItemID: "G2", Item: "gauntlet", Condition: "damaged", Action: "replaced"})
	f := newFacts(set, peopleLimits(t), peoplePeriod)
	f.ppeFacts()
	uses := f.docs["item"]["G2"]["ppe"].(map[string]any)["uses"].([]any)
	want := map[string]any{"on": "2026-01-14", "ref": "ppe_checks.csv:4", "condition": "damaged", "action": "replaced", "days_before": 0}
	if diff := cmp.Diff(want, uses[0].(map[string]any)["last_check"]); diff != "" {
		t.Errorf("last check (-want +got):\n%s", diff)
	}
}
