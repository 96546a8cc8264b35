package welfare.staff_test

import data.welfare.staff

# Invented keeper; one day of handling with training, rabies and respirator all in order.
trained := {"trained_on": "2025-03-01", "trained_after_event": false, "valid_until": "2026-03-01"}

day := {"on": "2026-01-12", "refs": ["handling.csv:2"], "training": trained, "respirator": null}

# One day of work with a rabies-risk species (one handling), ACIP 2022 risk category 3, series complete.
rab := {
	"on": "2026-01-12", "refs": ["handling.csv:2"], "work": {"handlings": 1, "culls": 0, "care_rounds": 0}, "category": 3,
	"primary_on": "2024-05-07", "titer_on": null, "titer_iu_ml": null, "booster_on": null,
}

keeper(sect) := {"kind": "staff", "id": "S1", "name": "Ilse Varga", "ref": "staff.csv:2", "staff": object.union({"active_from": "2024-01-01", "active_to": null, "handled": [], "culled": [], "outside_active": [], "rabies": []}, sect)}

checks(sect) := {f.check | some f in staff.findings with input as keeper(sect)}

test_clean_day_is_quiet if {
	checks({"handled": [day], "rabies": [rab]}) == set()
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
	some f in staff.findings with input as keeper({"handled": [day], "rabies": [object.union(rab, {"primary_on": null})]})
	f.check == "staff.rabies.unprotected"
	contains(f.message, "no rabies pre-exposure series recorded")
}

test_rabies_overdue_fires_as_minor_followup if {
	# ACIP 2022, risk category 3 (shipped limits): more than 3 years after the series with no
	# titer in years 1-3 and no booster from day 21 to year 3.
	some f in staff.findings with input as keeper({"rabies": [object.union(rab, {"primary_on": "2021-05-07"})]})
	f.check == "staff.rabies.followup_overdue"
	contains(f.message, "more than 3 years since the pre-exposure series (2021-05-07) with no titer of at least 0.5 IU/mL taken 2022-05-07 to 2024-05-07 and no booster given 2021-05-28 to 2024-05-07 (ACIP 2022 risk category 3)")
}

test_rabies_category_1_titer_every_6_months if {
	# ACIP 2022: category 1, a titer every 6 months; 2025-07-12 is the day after 6 months.
	# The person's category (staff.csv rabies_risk_category) is on the entry.
	rec := object.union(rab, {"category": 1, "primary_on": "2022-01-10", "titer_on": "2025-07-11", "titer_iu_ml": 1})
	some f in staff.findings with input as keeper({"rabies": [rec]})
	f.check == "staff.rabies.followup_overdue"
	contains(f.message, "risk category 1 needs a titer every 6 months; none since the last titer (2025-07-11), due by 2026-01-11")
}

test_rabies_low_titer_needs_a_booster if {
	# ACIP 2022: a titer below 0.5 IU/mL calls for a booster.
	rec := object.union(rab, {"titer_on": "2025-06-01", "titer_iu_ml": 0.3})
	some f in staff.findings with input as keeper({"rabies": [rec]})
	contains(f.message, "titer 0.3 IU/mL on 2025-06-01 is below 0.5 IU/mL and no booster was given after it")
	checks({"rabies": [object.union(rec, {"booster_on": "2025-06-10"})]}) == set()
}

# checks.md "Corrections to the first set": the rabies checks cover cull operators and keepers on
# care rounds of occupied enclosures, not only handlers (ACIP 2022: people who work with reservoir species).
test_rabies_covers_care_rounds_and_culls if {
	care := object.union(rab, {"refs": ["daily_care.csv:7"], "work": {"handlings": 0, "culls": 0, "care_rounds": 2}, "primary_on": null})
	some f in staff.findings with input as keeper({"rabies": [care]})
	f.check == "staff.rabies.unprotected"
	contains(f.message, "2 care rounds of occupied enclosures")
	f.evidence == ["staff.csv:2", "daily_care.csv:7"]
	cull := object.union(care, {"refs": ["culls.csv:3"], "work": {"handlings": 0, "culls": 1, "care_rounds": 0}})
	checks({"rabies": [cull]}) == {"staff.rabies.unprotected"}
}

# ACIP 2022: category 5 (risk no greater than the general population's) needs no prophylaxis.
test_rabies_category_5_needs_nothing if {
	checks({"rabies": [object.union(rab, {"category": 5, "primary_on": null})]}) == set()
}

# ACIP 2022: category 4 needs the primary series only.
test_rabies_category_4_series_only if {
	checks({"rabies": [object.union(rab, {"category": 4, "primary_on": "2015-01-01"})]}) == set()
	checks({"rabies": [object.union(rab, {"category": 4, "primary_on": null})]}) == {"staff.rabies.unprotected"}
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
	some f in staff.findings with input as keeper({"active_to": "2025-12-31", "outside_active": [{"on": "2026-01-03", "rows": 2, "refs": ["daily_care.csv:7", "daily_care.csv:8"]}]})
	f.check == "staff.inactive"
	f.on == "2026-01-03"
	contains(f.message, "2024-01-01 to 2025-12-31")
}

# A day of many rows lists the first 10 as evidence: the message counts them all.
test_row_outside_employment_counts_every_row if {
	first := [sprintf("daily_care.csv:%d", [n]) | some n in numbers.range(7, 16)]
	some f in staff.findings with input as keeper({"active_to": "2025-12-31", "outside_active": [{"on": "2026-01-03", "rows": 240, "refs": first}]})
	f.check == "staff.inactive"
	contains(f.message, "named on 240 rows on 2026-01-03")
	f.evidence == array.concat(["staff.csv:2"], first)
}
