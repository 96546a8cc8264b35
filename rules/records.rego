# METADATA
# title: Record keeping
# description: |
#   Rows the loader rejected, events dated outside an animal's stay, and culls
#   whose bookkeeping does not match the animal's departure.
#   Input (facility): {id, period: {from, until}, rejected: [{ref, file, line, column, value, reason, on, message}]}.
#   Input (animal): {id, ref, species, arrived_on, left_on, left_reason, culls_recorded,
#   outside_stay: [{on, what, ref}], culls: [{on, ref}],
#   deaths_recorded, left_in_period, deaths: [{on, ref, in_period, ...}]} (the death keys only on
#   animals with health records or recorded as died in the period; see health.rego).
# scope: package
# custom:
#   subjects: [facility, animal]
package welfare.records

# METADATA
# title: Row rejected
# description: A row failed parsing, validation or a reference check; it was not used by any other check.
# custom:
#   id: records.row.rejected
#   severity: minor
#   source: common practice
findings contains f if {
	some r in input.rejected
	f := {
		"check": "records.row.rejected",
		"subject": r.ref,
		"on": row_day(r),
		"message": r.message,
		"evidence": [r.ref],
	}
}

# A row whose date could not be read is placed on the first day of the period.
row_day(r) := r.on if r.on != null

else := input.period.from

# METADATA
# title: Event outside the animal's stay
# description: A handling, cull, health-concern or observation row names an animal on a day before it arrived or after it left (a death's day is its last).
# custom:
#   id: records.event.after_departure
#   severity: significant
#   source: common practice
findings contains f if {
	some e in input.outside_stay
	f := {
		"check": "records.event.after_departure",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s recorded on %s, but the animal was at the facility from %s to %s", [e.what, e.on, input.arrived_on, stay_end]),
		"evidence": [e.ref, input.ref],
	}
}

stay_end := input.left_on if input.left_on != null

else := "now"

# METADATA
# title: Cull and departure records disagree
# description: A cull row exists but the animal's left_reason is not culled or its left_on is not the cull date; or the animal is recorded as culled with no cull row.
# custom:
#   id: records.cull.mismatch
#   severity: minor
#   source: common practice
#   needs: [culls.csv]
findings contains f if {
	some c in input.culls
	not departure_matches(c)
	f := {
		"check": "records.cull.mismatch",
		"subject": input.id,
		"on": c.on,
		"message": sprintf("culled on %s, but animals.csv says left_on %s, left_reason %s", [c.on, shown(input.left_on), shown(input.left_reason)]),
		"evidence": [c.ref, input.ref],
	}
}

findings contains f if {
	input.culls_recorded
	input.left_reason == "culled"
	count(input.culls) == 0
	f := {
		"check": "records.cull.mismatch",
		"subject": input.id,
		"on": input.left_on,
		"message": sprintf("animals.csv says culled on %s, but culls.csv has no row for this animal", [input.left_on]),
		"evidence": [input.ref],
	}
}

departure_matches(c) if {
	input.left_reason == "culled"
	input.left_on == c.on
}

shown(x) := "(empty)" if x == null

else := x

# METADATA
# title: Death and departure records disagree
# description: A deaths.csv row whose animal's left_reason is not died or whose left_on is not the death's date; or the animal is recorded as died in the period with no deaths row (when deaths.csv is present).
# custom:
#   id: records.death.mismatch
#   severity: minor
#   source: common practice
#   needs: [deaths.csv]
findings contains f if {
	some d in input.deaths # absent on an animal without health records: no finding
	d.in_period
	not death_matches(d)
	f := {
		"check": "records.death.mismatch",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("found dead on %s, but animals.csv says left_on %s, left_reason %s", [d.on, shown(input.left_on), shown(input.left_reason)]),
		"evidence": [d.ref, input.ref],
	}
}

findings contains f if {
	input.left_reason == "died" # first: most animals did not die
	object.get(input, "deaths_recorded", false)
	object.get(input, "left_in_period", false)
	count(object.get(input, "deaths", [])) == 0
	f := {
		"check": "records.death.mismatch",
		"subject": input.id,
		"on": input.left_on,
		"message": sprintf("animals.csv says died on %s, but deaths.csv has no row for this animal", [input.left_on]),
		"evidence": [input.ref],
	}
}

death_matches(d) if {
	input.left_reason == "died"
	input.left_on == d.on
}
