# METADATA
# title: Protective equipment
# description: |
#   Inspection and condition of the protective items (gloves, gauntlets) named by handling rows.
#   Input (item): {id, ppe: {uses: [{on, refs, kind,
#     last_check: null | {on, ref, condition, action, days_before}}]}}
#   One use per item per day. last_check is the item's latest inspection on or before the day of
#   use (days_before 0 = the same day); kind is the item kind from ppe_checks.csv (glove when the
#   item was never inspected, gauntlet when the handling row says so).
# scope: package
# custom:
#   subjects: [item]
package welfare.ppe

# METADATA
# title: Protective item not inspected
# description: An item used in handling had no inspection in the N days up to and including the day of use (N by item kind; gloves and gauntlets 7 by default).
# custom:
#   id: ppe.inspection.overdue
#   severity: minor
#   source: facility choice
#   needs: [handling.csv, ppe_checks.csv]
findings contains f if {
	some u in input.ppe.uses
	n := data.limits.ppe.inspection_days[u.kind]
	why := not_inspected(u, n)
	f := {
		"check": "ppe.inspection.overdue",
		"subject": input.id,
		"on": u.on,
		"message": sprintf("%s %s used on %s: %s; it must be inspected within %d days of use", [u.kind, input.id, u.on, why, n]),
		"evidence": array.concat(u.refs, check_ref(u)),
	}
}

not_inspected(u, _) := "never inspected" if u.last_check == null

not_inspected(u, n) := sprintf("last inspected %s, %d days before", [u.last_check.on, u.last_check.days_before]) if {
	u.last_check != null
	u.last_check.days_before >= n
}

check_ref(u) := [u.last_check.ref] if u.last_check != null

else := []

# The latest inspection left the item unfit: damaged and neither repaired
# nor replaced, or withdrawn from use.
unfit(c) := sprintf("found %s and withdrawn", [c.condition]) if c.action == "withdrawn"

else := "found damaged and not repaired or replaced" if {
	c.condition == "damaged"
	not c.action in {"repaired", "replaced"}
}

# METADATA
# title: Damaged protective item used
# description: An item was used on a day when its latest inspection up to that day found it damaged without repair or replacement, or withdrew it.
# custom:
#   id: ppe.damaged.used
#   severity: significant
#   source: common practice
#   needs: [handling.csv, ppe_checks.csv]
findings contains f if {
	some u in input.ppe.uses
	c := u.last_check
	c != null
	why := unfit(c)
	f := {
		"check": "ppe.damaged.used",
		"subject": input.id,
		"on": u.on,
		"message": sprintf("%s %s used on %s in %s, but the inspection on %s %s", [u.kind, input.id, u.on, count_of(count(u.refs), "handling", "handlings"), c.on, why]),
		"evidence": array.concat(u.refs, [c.ref]),
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
