# METADATA
# title: Daily care
# description: |
#   Observation, feeding, water and health concerns, per enclosure.
#   Input (enclosure): {id, ref, building, exposure, ..., care: {
#     unobserved: [{from, until, days}],                 runs of occupied days with no observed round
#     unfed: [{from, until, days, every_days, due_on}],   runs of occupied days with no feeding
#     water_unavailable: [{on, state, restored, ref}],    rounds that found water empty or frozen
#     concerns: [{on, ref, animal, answered_ref, answered_after_hours}]}}
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.care

# A run of missed days is significant once it reaches the limit's length.
run_severity(days) := "significant" if {
	days >= data.limits.care.significant_run_days
} else := "minor"

# Why a run's severity is what it is, said on the finding when it departs from the default.
run_reason(days) := sprintf("significant: %d days in a row, at or above the limit of %d", [days, data.limits.care.significant_run_days])

# METADATA
# title: Animals not observed
# description: An occupied enclosure had no round with every animal observed on a day.
# custom:
#   id: care.observation.missed
#   severity: minor
#   escalation: "significant from 2 days in a row by default (limit significant_run_days)"
#   source: "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112: animals observed at least daily"
#   runs: true
#   needs: [daily_care.csv]
findings contains f if {
	some r in input.care.unobserved
	f := {
		"check": "care.observation.missed",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"severity": run_severity(r.days),
		"severity_reason": run_reason(r.days),
		"message": sprintf("no round observed the animals on %s in a row", [count_of(r.days, "day", "days")]),
		"evidence": [input.ref],
	}
}

# METADATA
# title: Feeding not recorded
# description: An occupied enclosure went without a recorded feeding for as long as the species may.
# custom:
#   id: care.feeding.missed
#   severity: minor
#   escalation: "significant from 2 unfed days in a row by default (limit significant_run_days)"
#   source: common practice
#   runs: true
#   needs: [daily_care.csv]
findings contains f if {
	some r in input.care.unfed
	r.days >= r.every_days
	f := {
		"check": "care.feeding.missed",
		"subject": input.id,
		"on": r.due_on,
		"until": r.until,
		"severity": run_severity(r.days),
		"severity_reason": run_reason(r.days),
		"message": sprintf("no feeding recorded for %s in a row (%s to %s); the species is fed every %s", [count_of(r.days, "day", "days"), r.from, r.until, count_of(r.every_days, "day", "days")]),
		"evidence": [input.ref],
	}
}

# METADATA
# title: Water unavailable
# description: A round found water empty or frozen and did not record it restored before leaving.
# custom:
#   id: care.water.unavailable
#   severity: significant
#   source: "OLAW: inoperative watering systems are a significant deficiency (US PHS Policy IV.B)"
#   needs: [daily_care.csv]
findings contains f if {
	some w in input.care.water_unavailable
	not w.restored
	f := {
		"check": "care.water.unavailable",
		"subject": input.id,
		"on": w.on,
		"message": sprintf("water found %s and not recorded as restored", [w.state]),
		"evidence": [w.ref],
	}
}

# METADATA
# title: Health concern not followed up
# description: A round raised a health concern and no health check, vet exam or treatment of the animal followed within the limit.
# custom:
#   id: care.health.unattended
#   severity: significant
#   source: common practice
#   needs: [daily_care.csv, handling.csv]
findings contains f if {
	some c in input.care.concerns
	not answered_in_time(c)
	f := {
		"check": "care.health.unattended",
		"subject": input.id,
		"on": c.on,
		"message": sprintf("health concern%s not followed by %s within %v h%s", [about(c), concat(" or ", data.limits.care.concern_answered_by), data.limits.care.concern_response_hours, late(c)]),
		"evidence": array.concat([c.ref], answered_refs(c)),
	}
}

answered_in_time(c) if {
	c.answered_after_hours != null
	c.answered_after_hours <= data.limits.care.concern_response_hours
}

about(c) := sprintf(" about %s", [c.animal]) if c.animal != null

else := ""

late(c) := sprintf(" (first after %.1f h)", [c.answered_after_hours]) if c.answered_after_hours != null

else := ""

answered_refs(c) := [c.answered_ref] if c.answered_ref != null

else := []

# METADATA
# title: Cleaning overdue
# description: An occupied enclosure had no round with cleaned yes for more than clean_every_days, counted from the later of its first care round and the start of its occupancy. Not evaluated when daily_care.csv has no cleaned column.
# custom:
#   id: care.cleaning.overdue
#   severity: minor
#   source: "9 CFR §3.11(b)(2): primary enclosures for dogs sanitized at least every 2 weeks; other species facility choice"
#   needs: ["daily_care.csv:cleaned"]
findings contains f if {
	# The limit is read once, not once per gap: a year has about 50 gaps per enclosure. Most
	# enclosures have no gap too long: the longest gap (the facts measure it), compared first,
	# spares them the walk over their gaps (a gap over the limit makes the longest over it). An
	# input without that figure has its gaps walked (the default is over the limit); null, no gap,
	# compares below every number.
	n := data.limits.care.clean_every_days
	object.get(input.cleaning, "longest_gap_days", n + 1) > n
	gaps := input.cleaning.gaps
	some i
	gaps[i].days > n
	g := gaps[i]
	due := time.format([time.add_date(time.parse_ns("2006-01-02", g.from), 0, 0, n + 1), "UTC", "2006-01-02"])
	f := {
		"check": "care.cleaning.overdue",
		"subject": input.id,
		"on": later(due, g.period_from),
		"message": sprintf("no cleaning recorded for more than %d days: %s, %s without one up to %s", [n, since_text(g), count_of(g.days, "day", "days"), g.until]),
		"evidence": g.evidence,
	}
}

later(a, b) := a if a >= b

else := b

since_text(g) := sprintf("last cleaned %s", [g.from]) if g.since == "cleaned"

else := sprintf("none since the first care round on %s", [g.from]) if g.since == "first_round"

else := sprintf("none since the enclosure was occupied on %s", [g.from])

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
