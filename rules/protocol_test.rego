package welfare.protocol_test

import data.welfare.protocol

# Invented protocol BF-07, approved for all of 2025 and 2026.
base := {"approved_on": "2025-01-01", "expires_on": "2026-12-31", "expires_after_period_by": 334, "max_animals": 40, "procedures": ["weighing", "health_check"], "euthanasia_methods": ["barbiturate_overdose"], "days": [], "animals": {"count": 12, "exceeded_on": null, "over_refs": [], "over_animals": []}}

day := {"on": "2026-01-12", "in_force": true, "refs": ["handling.csv:2"], "purposes": {"weighing": ["handling.csv:2"]}, "methods": {}}

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
