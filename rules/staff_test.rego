package welfare.staff_test

import data.welfare.staff

# Invented keeper; one day of handling with training, rabies and respirator all in order.
trained := {"trained_on": "2025-03-01", "trained_after_event": false, "valid_until": "2026-03-01"}

day := {"on": "2026-01-12", "refs": ["handling.csv:2"], "training": trained, "respirator": null}

rab := {"on": "2026-01-12", "refs": ["handling.csv:2"], "work": {"handlings": 1, "culls": 0, "care_rounds": 0}, "status": "protected", "reason": "", "category": 3, "primary_on": "2024-05-07"}

keeper(sect) := {"kind": "staff", "id": "S1", "staff": object.union({"ref": "staff.csv:2", "name": "Ilse Varga", "active_from": "2024-01-01", "active_to": null, "handled": [], "culled": [], "outside_active": [], "rabies": []}, sect)}

checks(sect) := {f.check | some f in staff.findings with input as keeper(sect)}

test_clean_day_is_quiet if {
	checks({"handled": [day]}) == set()
}

test_handling_on_the_training_anniversary_is_covered if {
	# Facility choice (12 months): valid_until is the anniversary itself; "older than 12 months" starts the day after.
	checks({"handled": [object.union(day, {"on": "2026-03-01"})]}) == set()
	checks({"handled": [object.union(day, {"on": "2026-03-02"})]}) == {"staff.handling.untrained"}
}

test_no_training_fires if {
	some f in staff.findings with input as keeper({"handled": [object.union(day, {"training": {"trained_on": null, "trained_after_event": false, "valid_until": null}})]})
	f.check == "staff.handling.untrained"
	contains(f.message, "no handling training recorded")
	f.evidence == ["staff.csv:2", "handling.csv:2"]
}

test_training_after_the_event_fires if {
	checks({"handled": [object.union(day, {"training": {"trained_on": "2026-02-01", "trained_after_event": true, "valid_until": null}})]}) == {"staff.handling.untrained"}
}

test_rabies_unprotected_fires if {
	# ACIP 2022: a completed primary series is the minimum for category 1-4 handlers.
	checks({"handled": [day], "rabies": [object.union(rab, {"status": "unprotected", "reason": "no rabies pre-exposure series recorded", "primary_on": null})]}) == {"staff.rabies.unprotected"}
	checks({"handled": [day], "rabies": [rab]}) == set()
}

test_rabies_overdue_fires_as_minor_followup if {
	checks({"handled": [day], "rabies": [object.union(rab, {"status": "overdue", "reason": "r", "primary_on": "2021-05-07"})]}) == {"staff.rabies.followup_overdue"}
}

# checks.md "Corrections to the first set": the rabies checks cover cull operators and keepers on
# care rounds of occupied enclosures, not only handlers (ACIP 2022: people who work with reservoir species).
test_rabies_covers_care_rounds_and_culls if {
	care := object.union(rab, {"refs": ["daily_care.csv:7"], "work": {"handlings": 0, "culls": 0, "care_rounds": 2}, "status": "unprotected", "reason": "no rabies pre-exposure series recorded", "primary_on": null})
	some f in staff.findings with input as keeper({"rabies": [care]})
	f.check == "staff.rabies.unprotected"
	contains(f.message, "2 care round(s) of occupied enclosures")
	f.evidence == ["staff.csv:2", "daily_care.csv:7"]
	cull := object.union(care, {"refs": ["culls.csv:3"], "work": {"handlings": 0, "culls": 1, "care_rounds": 0}})
	checks({"rabies": [cull]}) == {"staff.rabies.unprotected"}
}

test_rabies_category_5_needs_nothing if {
	checks({"rabies": [object.union(rab, {"status": "not_required", "category": 5, "primary_on": null})]}) == set()
}

resp(fit, until) := {"refs": ["handling.csv:2"], "fit_on": fit, "fit_after_event": false, "valid_until": until}

test_osha_annual_fit_test if {
	# OSHA 29 CFR 1910.134(f)(2): fit on 2025-01-10 covers use on 2026-01-10, not 2026-01-11.
	checks({"handled": [object.union(day, {"on": "2026-01-10", "respirator": resp("2025-01-10", "2026-01-10")})]}) == set()
	checks({"handled": [object.union(day, {"on": "2026-01-11", "respirator": resp("2025-01-10", "2026-01-10")})]}) == {"staff.respirator.fit_overdue"}
}

test_respirator_without_fit_test_fires if {
	checks({"handled": [object.union(day, {"respirator": resp(null, null)})]}) == {"staff.respirator.fit_overdue"}
}

cull := {"on": "2026-01-20", "refs": ["culls.csv:2"], "methods": ["barbiturate_overdose"], "untrained_methods": [], "trained_on": "2025-06-01", "trained_after_event": false, "valid_until": "2026-06-01"}

test_trained_operator_is_quiet if {
	checks({"culled": [cull]}) == set()
}

test_operator_untrained_for_method_fires if {
	some f in staff.findings with input as keeper({"culled": [object.union(cull, {"methods": ["gunshot"], "untrained_methods": ["gunshot"]})]})
	f.check == "staff.euthanasia.untrained"
	contains(f.message, "not recorded as trained for gunshot")
	contains(f.message, "attending veterinarian")
}

test_operator_training_lapsed_fires if {
	checks({"culled": [object.union(cull, {"on": "2026-06-02"})]}) == {"staff.euthanasia.untrained"}
	checks({"culled": [object.union(cull, {"on": "2026-06-01"})]}) == set()
}

test_operator_without_training_date_fires if {
	checks({"culled": [object.union(cull, {"trained_on": null, "valid_until": null})]}) == {"staff.euthanasia.untrained"}
}

test_row_outside_employment_fires if {
	some f in staff.findings with input as keeper({"active_to": "2025-12-31", "outside_active": [{"on": "2026-01-03", "refs": ["daily_care.csv:7", "daily_care.csv:8"]}]})
	f.check == "staff.inactive"
	f.on == "2026-01-03"
	contains(f.message, "2024-01-01 to 2025-12-31")
}
