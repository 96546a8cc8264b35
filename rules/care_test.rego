package welfare.care_test

import data.welfare.care

enc(care_facts) := {"kind": "enclosure", "id": "S1-01", "ref": "enclosures.csv:2", "care": object.union(
	{"unobserved": [], "unfed": [], "water_unavailable": [], "concerns": []},
	care_facts,
)}

test_no_problems_no_findings if {
	count(care.findings) == 0 with input as enc({})
}

# Guide 8th ed. p. 112: observation at least daily. One missed day is minor,
# two in a row significant (common practice, care.significant_run_days: 2).
test_one_unobserved_day_is_minor if {
	some f in care.findings with input as enc({"unobserved": [{"from": "2026-01-05", "until": "2026-01-05", "days": 1}]})
	f.check == "care.observation.missed"
	f.severity == "minor"
	f.until == "2026-01-05"
}

test_two_unobserved_days_are_significant if {
	some f in care.findings with input as enc({"unobserved": [{"from": "2026-01-05", "until": "2026-01-06", "days": 2}]})
	f.severity == "significant"
}

test_unfed_run_shorter_than_interval_is_quiet if {
	count(care.findings) == 0 with input as enc({"unfed": [{"from": "2026-01-05", "until": "2026-01-05", "days": 1, "every_days": 2, "due_on": "2026-01-06"}]})
}

test_unfed_run_reaching_interval_fires_from_due_day if {
	some f in care.findings with input as enc({"unfed": [{"from": "2026-01-05", "until": "2026-01-07", "days": 3, "every_days": 2, "due_on": "2026-01-06"}]})
	f.check == "care.feeding.missed"
	f.on == "2026-01-06"
	f.until == "2026-01-07"
	f.severity == "significant"
}

test_frozen_water_not_restored_fires if {
	some f in care.findings with input as enc({"water_unavailable": [{"on": "2026-01-09", "state": "frozen", "restored": false, "ref": "daily_care.csv:77"}]})
	f.check == "care.water.unavailable"
	f.evidence == ["daily_care.csv:77"]
}

test_frozen_water_restored_is_quiet if {
	count(care.findings) == 0 with input as enc({"water_unavailable": [{"on": "2026-01-09", "state": "frozen", "restored": true, "ref": "daily_care.csv:77"}]})
}

test_concern_answered_in_time_is_quiet if {
	count(care.findings) == 0 with input as enc({"concerns": [{"on": "2026-01-09", "ref": "daily_care.csv:80", "animal": "F1", "answered_ref": "handling.csv:5", "answered_after_hours": 24}]})
}

test_concern_answered_late_fires if {
	some f in care.findings with input as enc({"concerns": [{"on": "2026-01-09", "ref": "daily_care.csv:80", "animal": "F1", "answered_ref": "handling.csv:5", "answered_after_hours": 24.5}]})
	f.check == "care.health.unattended"
	f.evidence == ["daily_care.csv:80", "handling.csv:5"]
}

test_concern_never_answered_fires if {
	some f in care.findings with input as enc({"concerns": [{"on": "2026-01-09", "ref": "daily_care.csv:80", "animal": null, "answered_ref": null, "answered_after_hours": null}]})
	f.evidence == ["daily_care.csv:80"]
}

# Cleaning: more than 14 days without a round with cleaned yes (9 CFR §3.11(b)(2)
# for dogs: at least every 2 weeks).
gap(from, until, days, since) := {"enclosure": {"kind": "enclosure", "id": "K-01", "ref": "enclosures.csv:30", "cleaning": {"rounds_recorded": true, "gaps": [{
	"from": from, "until": until, "days": days, "since": since, "period_from": "2026-07-01",
	"evidence": ["enclosures.csv:30", "daily_care.csv:100"],
}]}}}

test_cleaning_gap_of_14_days_is_quiet if {
	count(care.findings) == 0 with input as gap("2026-07-02", "2026-07-16", 14, "cleaned").enclosure
}

test_cleaning_gap_of_15_days_fires_on_the_15th if {
	some f in care.findings with input as gap("2026-07-02", "2026-07-17", 15, "cleaned").enclosure
	f.check == "care.cleaning.overdue"
	f.on == "2026-07-17"
	not f.until
	contains(f.message, "last cleaned 2026-07-02")
}

# Among an enclosure's gaps only the one over 14 days fires, wherever it falls in the list (the
# rule first compares the longest gap).
test_only_the_gap_over_14_days_fires if {
	g := gap("2026-07-02", "2026-07-17", 15, "cleaned").enclosure.cleaning.gaps[0]
	gaps := [
		object.union(g, {"from": "2026-06-01", "until": "2026-06-11", "days": 10}),
		g,
		object.union(g, {"from": "2026-07-18", "until": "2026-08-01", "days": 14}),
	]
	found := care.findings with input as {"kind": "enclosure", "id": "K-01", "ref": "enclosures.csv:30", "cleaning": {"rounds_recorded": true, "gaps": gaps}}
	{[f.check, f.on] | some f in found} == {["care.cleaning.overdue", "2026-07-17"]}
}

# The facts give the longest gap too (longest_gap_days): at most 14 days spares the walk over
# the gaps, more walks them; an input without it is walked as above.
test_the_longest_gap_given_over_14_days_fires if {
	g := gap("2026-07-02", "2026-07-17", 15, "cleaned").enclosure
	found := care.findings with input as object.union(g, {"cleaning": {"longest_gap_days": 15}})
	{[f.check, f.on] | some f in found} == {["care.cleaning.overdue", "2026-07-17"]}
}

test_the_longest_gap_given_of_14_days_is_quiet if {
	g := gap("2026-07-02", "2026-07-16", 14, "cleaned").enclosure
	count(care.findings) == 0 with input as object.union(g, {"cleaning": {"longest_gap_days": 14}})
}

test_no_gap_and_a_null_longest_gap_is_quiet if {
	count(care.findings) == 0 with input as {"kind": "enclosure", "id": "K-01", "ref": "enclosures.csv:30", "cleaning": {"rounds_recorded": true, "gaps": [], "longest_gap_days": null}}
}

test_cleaning_gap_from_before_the_period_starts_on_the_first_day if {
	some f in care.findings with input as gap("2026-06-01", "2026-07-10", 39, "first_round").enclosure
	f.on == "2026-07-01"
	contains(f.message, "none since the first care round on 2026-06-01")
}
