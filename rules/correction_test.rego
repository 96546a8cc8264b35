package welfare.correction_test

import data.welfare.correction

# Invented problem documents; the boundaries are the limits' defaults
# (overdue_after_days 0: 9 CFR §2.31(c)(3) "corrected by the date in the plan";
# recurred_after_days 0: common practice).

action(a) := object.union(
	{
		"ref": "corrective_actions.csv:2", "plan": "heated drinkers", "owner": "K1", "verified_by": "",
		"found_on": "2025-12-08", "due_on": "2026-01-15", "closed_on": null,
		"answers_severity": "significant", "open_at_end": true, "days_past_due_at_end": 0,
		"closed_in_period": false, "days_closed_after_due": null, "after_closed": [],
	},
	a,
)

problem(actions, previous) := {
	"kind": "correction", "id": "care.water.unavailable S2-11", "check": "care.water.unavailable", "subject": "S2-11",
	"period": {"from": "2026-01-01", "until": "2026-01-31"}, "previous": previous, "actions": actions,
}

found(fs, check) := {f | some f in fs; f.check == check}

test_open_on_its_due_day_is_not_overdue if {
	count(found(correction.findings, "correction.overdue")) == 0 with input as problem([action({"days_past_due_at_end": 0})], [])
}

test_open_a_day_past_due_is_overdue_and_significant if {
	fs := found(correction.findings, "correction.overdue") with input as problem([action({"days_past_due_at_end": 1, "due_on": "2026-01-30"})], [])
	some f in fs
	f.on == "2026-01-30"
	f.severity == "significant"
	f.subject == "care.water.unavailable S2-11"
}

test_overdue_of_a_minor_finding_is_minor if {
	some f in correction.findings with input as problem([action({"days_past_due_at_end": 5, "answers_severity": "minor"})], [])
	f.severity == "minor"
}

test_overdue_of_no_known_finding_is_minor if {
	some f in correction.findings with input as problem([action({"days_past_due_at_end": 5, "answers_severity": null})], [])
	f.severity == "minor"
}

test_closed_on_its_due_day_is_on_time if {
	a := action({"open_at_end": false, "closed_on": "2026-01-15", "closed_in_period": true, "days_closed_after_due": 0})
	count(correction.findings) == 0 with input as problem([a], [])
}

test_closed_a_day_late_is_overdue if {
	a := action({"open_at_end": false, "closed_on": "2026-01-16", "closed_in_period": true, "days_closed_after_due": 1})
	some f in correction.findings with input as problem([a], [])
	f.check == "correction.overdue"
	f.on == "2026-01-15"
}

test_closed_late_before_the_period_was_reported_then if {
	a := action({"open_at_end": false, "closed_on": "2025-12-30", "closed_in_period": false, "days_closed_after_due": 3})
	count(correction.findings) == 0 with input as problem([a], [])
}

closed(after) := action({
	"open_at_end": false, "closed_on": "2026-01-10", "closed_in_period": true,
	"days_closed_after_due": -5, "after_closed": after,
})

test_found_again_after_closing_recurred if {
	a := closed([
		{"on": "2026-01-20", "finding_on": "2026-01-20", "severity": "significant", "days_after_closed": 10, "evidence": ["daily_care.csv:40"]},
		{"on": "2026-01-12", "finding_on": "2026-01-12", "severity": "minor", "days_after_closed": 2, "evidence": ["daily_care.csv:30"]},
	])
	fs := found(correction.findings, "correction.recurred") with input as problem([a], [])
	count(fs) == 1
	some f in fs
	f.on == "2026-01-12"
	f.severity == "minor"
	f.evidence == ["corrective_actions.csv:2", "daily_care.csv:30"]
}

test_found_the_day_after_closing_recurred if {
	a := closed([{"on": "2026-01-11", "finding_on": "2026-01-11", "severity": "significant", "days_after_closed": 1, "evidence": []}])
	some f in correction.findings with input as problem([a], [])
	f.check == "correction.recurred"
}

test_nothing_after_closing_is_quiet if {
	count(correction.findings) == 0 with input as problem([closed([])], [])
}

test_recurred_needs_a_gap_above_the_limit if {
	a := closed([{"on": "2026-01-12", "finding_on": "2026-01-12", "severity": "minor", "days_after_closed": 2, "evidence": []}])
	count(correction.findings) == 0 with input as problem([a], []) with data.limits.correction.recurred_after_days as 2
}

test_significant_previous_finding_without_plan if {
	fs := correction.findings with input as problem([], [{"on": "2025-12-08", "severity": "significant", "message": "water frozen", "answering_actions": 0}])
	some f in fs
	f.check == "correction.plan.missing"
	f.on == "2025-12-08"
}

test_answered_previous_finding_is_quiet if {
	count(correction.findings) == 0 with input as problem([action({})], [{"on": "2025-12-08", "severity": "significant", "message": "water frozen", "answering_actions": 1}])
}

test_minor_previous_finding_needs_no_plan if {
	count(correction.findings) == 0 with input as problem([], [{"on": "2025-12-08", "severity": "minor", "message": "x", "answering_actions": 0}])
}
