package welfare.handling_test

import data.welfare.handling

# A clean, conscious weighing of a red fox (invented demo animal).
ev := {"on": "2026-01-12", "at": "2026-01-12 09:00", "ref": "handling.csv:2", "staff": "S1", "purpose": "weighing", "restraint": "gloved_hand", "glove": "bite_resistant", "glove_thickness_mm": 3, "ppe": ["coverall"], "duration_min": 4, "bite": false, "scratch": false, "wound_washed": false, "reported_after_hours": null}

fox(e) := {"kind": "animal", "id": "F1", "ref": "animals.csv:2", "species": "vulpes_vulpes", "handling": [e]}

checks(e) := {f.check | some f in handling.findings with input as fox(e)}

test_clean_handling_is_quiet if {
	count(handling.findings) == 0 with input as fox(ev)
}

test_leather_glove_on_conscious_fox_fires if {
	checks(object.union(ev, {"glove": "leather"})) == {"handling.glove.inadequate"}
}

test_no_glove_recorded_fires if {
	checks(object.union(ev, {"glove": null})) == {"handling.glove.inadequate"}
}

test_sedated_fox_needs_no_bite_glove if {
	checks(object.union(ev, {"glove": "nitrile", "restraint": "sedation"})) == set()
}

test_thin_glove_fires_and_minimum_passes if {
	# min_glove_thickness_mm 2: facility choice (limits.yaml).
	checks(object.union(ev, {"glove_thickness_mm": 1.5})) == {"handling.glove.inadequate"}
	checks(object.union(ev, {"glove_thickness_mm": 2})) == set()
}

test_dog_is_not_a_bite_risk_by_default if {
	count(handling.findings) == 0 with input as object.union(fox(object.union(ev, {"glove": "nitrile"})), {"species": "canis_familiaris"})
}

test_missing_coverall_fires if {
	some f in handling.findings with input as fox(object.union(ev, {"ppe": ["boots"]}))
	f.check == "handling.ppe.missing"
	f.message == "weighing by S1 without coverall"
}

test_duration_over_purpose_limit if {
	# weighing: 5 min maximum (facility choice); 5 passes, 5.5 fires.
	checks(object.union(ev, {"duration_min": 5})) == set()
	checks(object.union(ev, {"duration_min": 5.5})) == {"handling.duration.exceeded"}
}

test_purpose_without_maximum_is_quiet if {
	checks(object.union(ev, {"purpose": "vet_exam", "duration_min": 90})) == set()
}

bitten := object.union(ev, {"bite": true, "wound_washed": true, "reported_after_hours": 2})

test_washed_and_reported_bite_is_quiet if {
	checks(bitten) == set()
}

test_unwashed_bite_fires if {
	# WHO rabies position paper (2018): wash the wound immediately.
	checks(object.union(bitten, {"wound_washed": false})) == {"handling.bite.not_washed"}
}

test_scratch_counts_like_a_bite if {
	checks(object.union(ev, {"scratch": true, "wound_washed": false, "reported_after_hours": null})) == {"handling.bite.not_washed", "handling.bite.not_reported"}
}

test_report_at_exactly_24_hours_is_in_time if {
	# 24 h report window: common practice (limits.yaml report_within_hours).
	checks(object.union(bitten, {"reported_after_hours": 24})) == set()
}

test_report_after_24_hours_fires if {
	checks(object.union(bitten, {"reported_after_hours": 24.02})) == {"handling.bite.not_reported"}
}

test_unreported_bite_fires if {
	some f in handling.findings with input as fox(object.union(bitten, {"reported_after_hours": null}))
	f.check == "handling.bite.not_reported"
	contains(f.message, "never reported")
}

# checks.md "Corrections to the first set": the rule and the cautions use one limit
# (handling.report_within_hours, 24 h by default, common practice); the message quotes it and
# cites the ACIP post-exposure recommendations (2008, updated 2010; from memory), not ACIP 2022.
test_bite_report_follows_the_one_limit if {
	checks(object.union(bitten, {"reported_after_hours": 13})) == {"handling.bite.not_reported"} with data.limits.handling.report_within_hours as 12
	checks(object.union(bitten, {"reported_after_hours": 12})) == set() with data.limits.handling.report_within_hours as 12
	some f in handling.findings with input as fox(object.union(bitten, {"reported_after_hours": 30}))
	f.check == "handling.bite.not_reported"
	contains(f.message, "within 24 h (the limits' handling.report_within_hours")
	contains(f.message, "ACIP post-exposure recommendations, MMWR 2008")
	not contains(f.message, "2022")
}
