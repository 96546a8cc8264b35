# Test policy for the engine, not a shipped rule. Input: one enclosure's
# facts as
#   {"id": "E-01", "days": [{"day": "2026-01-05", "occupied": true,
#     "observed": false, "fed": false, "unfed_run": 1,
#     "water": "frozen", "refs": ["daily_care.csv:4"]}, ...]}

# METADATA
# title: Daily care (engine test policy)
# description: Exercises runs, severity precedence and evidence merging.
# schemas:
#   - input: {type: object}
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.care

import data.welfare.lib

# METADATA
# title: Observation missed
# description: An occupied enclosure had no observation round that day.
# custom:
#   id: care.observation.missed
#   severity: minor
#   source: Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112
#   runs: true
#   needs: [daily_care.csv]
findings contains f if {
	some d in input.days
	d.occupied
	not d.observed
	f := {
		"check": "care.observation.missed",
		"subject": input.id,
		"on": d.day,
		"message": sprintf("%s was not observed", [input.id]),
		"evidence": d.refs,
	}
}

# METADATA
# title: Feeding missed
# description: An occupied enclosure was not fed; significant from the second unfed day.
# custom:
#   id: care.feeding.missed
#   severity: minor
#   source: common practice
#   needs: [daily_care.csv, animals.csv]
findings contains f if {
	some d in input.days
	d.occupied
	not d.fed
	f := object.union(
		{
			"check": "care.feeding.missed",
			"subject": input.id,
			"on": d.day,
			"message": sprintf("%s unfed for %d day(s)", [input.id, d.unfed_run]),
			"evidence": d.refs,
		},
		lib.severity_if(d.unfed_run >= 2, "significant"),
	)
}

# A second body of the same check: rounds that say "not fed" in words.
findings contains f if {
	some d in input.days
	d.occupied
	d.note == "not fed"
	f := {
		"check": "care.feeding.missed",
		"subject": input.id,
		"on": d.day,
		"message": sprintf("%s: round note says not fed", [input.id]),
		"evidence": d.refs,
	}
}

# METADATA
# title: Water unavailable
# description: A round found water empty or frozen and it was not restored.
# custom:
#   id: care.water.unavailable
#   severity: significant
#   source: OLAW, inoperative watering is a significant deficiency
findings contains f if {
	some d in input.days
	d.water in {"empty", "frozen"}
	f := {
		"check": "care.water.unavailable",
		"subject": input.id,
		"on": d.day,
		"message": sprintf("water %s", [d.water]),
		"evidence": d.refs,
	}
}
