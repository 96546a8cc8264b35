# METADATA
# title: Values missing for a check
# description: |
#   A check in force needed a value that was not recorded, so it could not judge
#   (checks.md "Never pass what was not judged"). One finding per subject and run of days;
#   the message names the check that could not be made and the missing value. A check whose
#   record file is absent is "not evaluated" instead: these rules fire only where the file is
#   there (readings_recorded).
#   Input (enclosure): {id, ref, occupancy: [{from, until, evidence, occupants: [{animal,
#     missing_value (null, length_cm or mass_kg), animal_ref, ...}], ...}]} (see enclosure.rego).
#   Input (staff): {id, cold: {readings_recorded, stints: [{on, ref, site, started_at, emergency,
#     reading: null | {ref, at, wind_kmh, hours_before_start, ...}, ...}]}} (see cold.rego).
#   Input (building, outdoor or sheltered): {id, ref, exposure, weather: {weather_site (null:
#     none), occupied_days: [{from, until, days}]}}.
#   Input (site): {id, cold: {readings_recorded, days_without_wind_readings: [{from, until, days,
#     days_with_readings_without_wind, evidence}], ...}} (see cold.rego).
# scope: package
# custom:
#   subjects: [enclosure, staff, building, site]
package welfare.missing

lim := data.limits.cold

# METADATA
# title: Value missing for a check
# description: "A check in force needed a value that was not recorded, so it could not judge: a dog's length (or mass, for the group figure) for the floor space; a reading within cold.reading_within_hours before a non-emergency outdoor stint, with wind, for the work/warm-up schedule; an outdoor or sheltered building's weather_site for the cold and heat checks; a reading with wind on a site-day for the wind-chill checks."
# custom:
#   id: records.value.missing
#   severity: minor
#   source: common practice (an audit states what it could not verify)
#   runs: true
findings contains f if {
	some s in input.occupancy
	gaps := [o | some o in s.occupants; o.missing_value != null]
	count(gaps) > 0
	f := {
		"check": "records.value.missing",
		"subject": input.id,
		"on": s.from,
		"until": s.until,
		"message": sprintf("floor space (enclosure.space.insufficient) not judged: no %s recorded for %s, so the area the occupants need is unknown", [
			concat(" or ", sort({o.missing_value | some o in gaps})),
			concat(", ", sort({o.animal | some o in gaps})),
		]),
		"evidence": array.concat([input.ref], [o.animal_ref | some o in gaps]),
	}
}

findings contains f if {
	input.cold.readings_recorded
	some s in input.cold.stints
	not s.emergency
	why := stint_gap(s)
	f := {
		"check": "records.value.missing",
		"subject": input.id,
		"on": s.on,
		"message": sprintf("work/warm-up schedule (cold.work.over_limit, cold.work.should_cease) not judged for the %v-min stint at %s from %s: %s", [s.minutes, s.site, s.started_at, why]),
		"evidence": stint_evidence(s),
	}
}

stint_gap(s) := sprintf("no reading of the site within %v h before the start", [lim.reading_within_hours]) if {
	s.reading == null
} else := sprintf("no reading of the site within %v h before the start (the latest, %s, is %v h before)", [lim.reading_within_hours, s.reading.at, round(s.reading.hours_before_start * 10) / 10]) if {
	s.reading.hours_before_start > lim.reading_within_hours
} else := sprintf("the reading at %s has no wind", [s.reading.at]) if {
	s.reading.wind_kmh == null
}

stint_evidence(s) := [s.ref] if s.reading == null

else := [s.ref, s.reading.ref]

findings contains f if {
	is_null(input.weather.weather_site)
	some r in input.weather.occupied_days
	f := {
		"check": "records.value.missing",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("cold and heat checks of the %s building's enclosures not judged on %s: facility.yaml names no weather_site for it", [input.exposure, days_text(r.days)]),
		"evidence": building_evidence,
	}
}

building_evidence := [input.ref] if input.ref != null

else := []

findings contains f if {
	input.cold.readings_recorded
	some r in input.cold.days_without_wind_readings
	f := {
		"check": "records.value.missing",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("wind-chill checks (cold.bedding.stale, cold.shelter.missing, cold.frostbite.risk) not judged on %s without a reading with wind (%s)", [days_text(r.days), windless_text(r)]),
		"evidence": r.evidence,
	}
}

days_text(n) := "1 day" if n == 1

else := sprintf("%d days", [n])

windless_text(r) := "no reading at all" if r.days_with_readings_without_wind == 0

else := "every reading without wind" if r.days_with_readings_without_wind == r.days

else := sprintf("%d with readings, none with wind; the others without any reading", [r.days_with_readings_without_wind])
