package welfare.ppe_test

import data.welfare.ppe

check(days, cond, action) := {"on": "2026-01-05", "ref": "ppe_checks.csv:4", "condition": cond, "action": action, "days_before": days}

glove(last) := {"kind": "item", "id": "G7", "ppe": {"uses": [{"on": "2026-01-12", "refs": ["handling.csv:2"], "kind": "glove", "last_check": last}]}}

checks(last) := {f.check | some f in ppe.findings with input as glove(last)}

test_recent_good_check_is_quiet if {
	checks(check(0, "good", "kept")) == set()
}

test_inspection_window_includes_the_day_of_use if {
	# Facility choice, 7 days up to and including the day of use: 6 days before is inside, 7 is outside.
	checks(check(6, "good", null)) == set()
	checks(check(7, "good", null)) == {"ppe.inspection.overdue"}
}

test_never_inspected_fires if {
	some f in ppe.findings with input as glove(null)
	f.check == "ppe.inspection.overdue"
	contains(f.message, "never inspected")
	f.evidence == ["handling.csv:2"]
}

test_kind_without_interval_is_not_judged if {
	count(ppe.findings) == 0 with input as {"kind": "item", "id": "C1", "ppe": {"uses": [{"on": "2026-01-12", "refs": ["handling.csv:2"], "kind": "coverall", "last_check": null}]}}
}

test_damaged_not_repaired_fires if {
	checks(check(1, "damaged", null)) == {"ppe.damaged.used"}
	checks(check(1, "damaged", "kept")) == {"ppe.damaged.used"}
}

test_damaged_then_repaired_or_replaced_is_quiet if {
	checks(check(1, "damaged", "repaired")) == set()
	checks(check(1, "damaged", "replaced")) == set()
}

test_withdrawn_item_fires if {
	checks(check(1, "worn", "withdrawn")) == {"ppe.damaged.used"}
}

test_worn_but_kept_is_quiet if {
	checks(check(1, "worn", "kept")) == set()
}
