package welfare.protocol_test

import data.welfare.protocol

# Invented protocol BF-07, approved for all of 2025 and 2026.
base := {"approved_on": "2025-01-01", "expires_on": "2026-12-31", "expires_after_period_by": 334, "max_animals": 40, "procedures": ["weighing", "health_check"], "euthanasia_methods": ["barbiturate_overdose"], "species": ["vulpes_lagopus"], "personnel": ["S1", "S3"], "last_reviewed_on": null, "pain_category": "C", "days": [], "animals": {"count": 12, "exceeded_on": null, "over_refs": [], "over_animals": []}}

day := {"on": "2026-01-12", "in_force": true, "refs": ["handling.csv:2"], "purposes": {"weighing": ["handling.csv:2"]}, "methods": {}, "species": {"vulpes_lagopus": ["handling.csv:2"]}, "staff": {"S1": ["handling.csv:2"]}}

proto(sect) := {"kind": "protocol", "id": "BF-07", "name": "Cold tolerance of arctic fox cubs", "ref": "protocols.csv:2", "protocol": object.union(base, sect)}

checks(sect) := {f.check | some f in protocol.findings with input as proto(sect)}

test_approved_work_is_quiet if {
	checks({"days": [day]}) == set()
}

test_work_after_expiry_fires if {
	some f in protocol.findings with input as proto({"expires_on": "2026-01-11", "days": [object.union(day, {"in_force": false})]})
	f.check == "protocol.inactive"
	contains(f.message, "after it expired on 2026-01-11")
}

test_work_before_approval_fires if {
	some f in protocol.findings with input as proto({"approved_on": "2026-02-01", "days": [object.union(day, {"in_force": false})]})
	contains(f.message, "before its approval on 2026-02-01")
}

test_unapproved_procedure_fires_with_its_rows_only if {
	some f in protocol.findings with input as proto({"days": [object.union(day, {"refs": ["handling.csv:2", "handling.csv:3"], "purposes": {"weighing": ["handling.csv:2"], "sampling": ["handling.csv:3"]}})]})
	f.check == "protocol.procedure.unapproved"
	f.evidence == ["protocols.csv:2", "handling.csv:3"]
}

test_protocol_without_procedures_is_not_judged if {
	checks({"procedures": [], "days": [object.union(day, {"purposes": {"sampling": ["handling.csv:3"]}})]}) == set()
}

test_unapproved_method_fires if {
	checks({"days": [object.union(day, {"purposes": {}, "methods": {"gunshot": ["culls.csv:2"]}})]}) == {"protocol.method.unapproved"}
	checks({"days": [object.union(day, {"purposes": {}, "methods": {"barbiturate_overdose": ["culls.csv:2"]}})]}) == set()
}

test_animal_count_over_limit_fires_on_first_day_over if {
	some f in protocol.findings with input as proto({"animals": {"count": 41, "exceeded_on": "2026-03-02", "over_refs": ["animals.csv:44"], "over_animals": ["AF41"]}})
	f.check == "protocol.animals.exceeded"
	f.on == "2026-03-02"
}

test_expiring_within_30_days if {
	# 30 days: common practice (limits.yaml expiring_within_days); day 30 is inside, 31 outside.
	checks({"expires_after_period_by": 30}) == {"protocol.expiring"}
	checks({"expires_after_period_by": 31}) == set()
	checks({"expires_after_period_by": 0}) == {"protocol.expiring"}
	checks({"expires_after_period_by": -1}) == set()
}

# checks.md "protocol — additions".
test_species_not_approved_fires if {
	d := object.union(day, {"refs": ["handling.csv:2", "handling.csv:3"], "species": {"vulpes_lagopus": ["handling.csv:2"], "vulpes_vulpes": ["handling.csv:3"]}})
	some f in protocol.findings with input as proto({"days": [d]})
	f.check == "protocol.species.unapproved"
	f.on == "2026-01-12"
	f.evidence == ["protocols.csv:2", "handling.csv:3"]
	checks({"species": [], "days": [d]}) == set()
}

test_unlisted_person_fires if {
	d := object.union(day, {"staff": {"S1": ["handling.csv:2"], "S9": ["culls.csv:4"]}})
	some f in protocol.findings with input as proto({"days": [d]})
	f.check == "protocol.personnel.unlisted"
	contains(f.message, "S9 worked under protocol BF-07")
	f.evidence == ["protocols.csv:2", "culls.csv:4"]
	checks({"personnel": [], "days": [d]}) == set()
}

# PHS Policy IV.F.3 (NIH notice NOT-OD-05-034, from memory): the six protocol noncompliance
# checks are reported to the institutional official, and their messages say so.
test_reportable_findings_say_report_to_the_institutional_official if {
	fs := protocol.findings with input as proto({
		"max_animals": 1, "animals": {"count": 2, "exceeded_on": "2026-01-05", "over_refs": ["animals.csv:3"], "over_animals": ["AF-9"]},
		"days": [
			object.union(day, {"in_force": false, "on": "2027-01-02"}),
			object.union(day, {"purposes": {"sampling": ["handling.csv:2"]}, "methods": {"gunshot": ["culls.csv:2"]}, "species": {"canis_familiaris": ["handling.csv:2"]}, "staff": {"S9": ["handling.csv:2"]}}),
		],
	})
	{f.check | some f in fs} == {
		"protocol.inactive", "protocol.procedure.unapproved", "protocol.method.unapproved",
		"protocol.animals.exceeded", "protocol.species.unapproved", "protocol.personnel.unlisted",
	}
	every f in fs {
		contains(f.message, "Report to the institutional official")
	}
}

# PHS Policy IV.C.5: at least once every 3 years (36 months, the default); the last day covered
# is the same date 36 months later, so an event on it is in time and the day after is overdue.
test_review_36_months_exactly_is_in_time if {
	checks({"approved_on": "2023-01-12", "days": [day]}) == set()
	some f in protocol.findings with input as proto({"approved_on": "2023-01-11", "days": [day]})
	f.check == "protocol.review.overdue"
	contains(f.message, "approval (no continuing review recorded) on 2023-01-11")
}

# 9 CFR §2.31(d)(5): at least annually — a committee sets review_every_months 12. 12 months exactly
# after the last review is in time; a day later is overdue.
test_review_12_months_exactly_is_in_time if {
	checks({"last_reviewed_on": "2025-01-12", "days": [day]}) == set() with data.limits.protocol.review_every_months as 12
	{"protocol.review.overdue"} == checks({"last_reviewed_on": "2025-01-11", "days": [day]}) with data.limits.protocol.review_every_months as 12
}

test_review_not_judged_outside_the_approval if {
	checks({"approved_on": "2020-01-01", "expires_on": "2026-01-11", "days": [object.union(day, {"in_force": false})]}) == {"protocol.inactive"}
}
