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

# The glove checks test the glove and its thickness before the species: a
# thin or unaccepted glove on an animal that is not a bite risk (dogs,
# bite_risk false, limits.yaml) stays quiet, on a fox it fires, and an
# accepted glove of the minimum is quiet on both.
test_glove_checks_read_the_species_after_the_glove if {
	dog := {"species": "canis_familiaris"}
	count(handling.findings) == 0 with input as object.union(fox(object.union(ev, {"glove_thickness_mm": 1.5})), dog)
	count(handling.findings) == 0 with input as object.union(fox(object.union(ev, {"glove": null})), dog)
	checks(object.union(ev, {"glove_thickness_mm": 1.99})) == {"handling.glove.inadequate"}
	checks(object.union(ev, {"glove": "gauntlet", "glove_thickness_mm": 2})) == set()
	count(handling.findings) == 0 with input as object.union(fox(object.union(ev, {"glove": "gauntlet", "glove_thickness_mm": 2})), dog)
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

# The checks compare the distinct values the rows record and go back to the
# rows only for a value that fails: each failing row gives its own finding,
# and a row sharing a failing value but passing otherwise gives none.
animal(rows) := {"kind": "animal", "id": "F1", "ref": "animals.csv:2", "species": "vulpes_vulpes", "handling": rows}

found(rows) := {[f.check, f.evidence[0]] | some f in handling.findings with input as animal(rows)}

row(n, patch) := object.union(ev, object.union({"ref": sprintf("handling.csv:%d", [n])}, patch))

test_leather_glove_fires_only_on_the_conscious_rows if {
	found([
		row(2, {"glove": "leather"}),
		row(3, {}),
		row(4, {"glove": "leather", "restraint": "anaesthesia"}),
		row(5, {"glove": "leather", "restraint": null}),
	]) == {["handling.glove.inadequate", "handling.csv:2"], ["handling.glove.inadequate", "handling.csv:5"]}
}

test_thin_glove_fires_only_on_conscious_rows_with_an_accepted_glove if {
	# min_glove_thickness_mm 2: facility choice (limits.yaml).
	found([
		row(2, {"glove_thickness_mm": 1.5}),
		row(3, {"glove_thickness_mm": 1.5, "restraint": "sedation"}),
		row(4, {"glove_thickness_mm": 1.5, "glove": "gauntlet"}),
		row(5, {"glove_thickness_mm": null}),
		row(6, {"glove_thickness_mm": 2}),
	]) == {["handling.glove.inadequate", "handling.csv:2"], ["handling.glove.inadequate", "handling.csv:4"]}
}

test_ppe_list_short_for_one_purpose_only if {
	# A committee's own list for transfers (limits: required_ppe per purpose, default for the rest).
	found([
		row(2, {"purpose": "transfer", "ppe": ["coverall"]}),
		row(3, {"ppe": ["coverall"]}),
		row(4, {"purpose": "transfer", "ppe": ["coverall", "gown"]}),
	]) == {["handling.ppe.missing", "handling.csv:2"]} with data.limits.handling.required_ppe as {"default": ["coverall"], "transfer": ["coverall", "gown"]}
}

test_no_required_ppe_is_quiet if {
	found([row(2, {"ppe": []})]) == set() with data.limits.handling.required_ppe as {"default": []}
}

test_duration_against_its_own_purpose_not_the_shortest_maximum if {
	# health_check 15 min, weighing 5 min (facility choice, limits.yaml): 10 min passes a
	# health check and fails a weighing; a purpose without a maximum passes any length.
	found([
		row(2, {"purpose": "health_check", "duration_min": 10}),
		row(3, {"duration_min": 10}),
		row(4, {"purpose": "health_check", "duration_min": 15.5}),
		row(5, {"purpose": "vet_exam", "duration_min": 10}),
		row(6, {"duration_min": null}),
	]) == {["handling.duration.exceeded", "handling.csv:3"], ["handling.duration.exceeded", "handling.csv:4"]}
}

test_no_duration_maximum_is_quiet if {
	# A limits file whose max_duration_min: is left empty (null) sets no maximum.
	found([row(2, {"duration_min": 90})]) == set() with data.limits.handling.max_duration_min as null
}

test_each_wound_row_is_judged_once if {
	found([
		row(2, {"bite": true, "scratch": true}),
		row(3, {"scratch": true, "wound_washed": true, "reported_after_hours": 1}),
		row(4, {"bite": true, "wound_washed": true}),
		row(5, {}),
	]) == {
		["handling.bite.not_washed", "handling.csv:2"],
		["handling.bite.not_reported", "handling.csv:2"],
		["handling.bite.not_reported", "handling.csv:4"],
	}
	count(handling.findings) == 2 with input as animal([row(2, {"bite": true, "scratch": true})])
}
