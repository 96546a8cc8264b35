# METADATA
# title: Inside buildings
# description: |
#   Temperature, humidity and ammonia in indoor and sheltered buildings, from environment.csv.
#   Input (building, indoor or sheltered): {id, ref, exposure, environment: {readings_recorded,
#     temperature: [{species, min_c, max_c, from, until, started_at, ended_at, hours,
#       back_in_range, direction, peak_c, evidence}],
#     days: [{on, readings, humidity_pct: [number], humidity_refs: [ref], min_humidity_pct,
#       max_humidity_pct (null when none recorded),
#       max_ammonia_ppm (null when none recorded), ammonia_ref}]}}.
#   temperature lists, for each species housed there with an indoor_temp_c range, the spells of
#   consecutive readings outside the range while the species was housed there: from the first
#   reading outside to the first reading back inside, or to the last reading outside when none
#   follows. days lists the days the building housed animals and had readings; humidity
#   readings are given for indoor buildings only.
# scope: package
# custom:
#   subjects: [building]
package welfare.environment

lim := data.limits.environment

# METADATA
# title: Temperature outside the species' range for too long
# description: An indoor or sheltered building housing a species with an indoor_temp_c range had readings outside it for strictly more than hours_outside consecutive hours.
# custom:
#   id: environment.temperature.out_of_range
#   severity: significant
#   source: "9 CFR §3.3(a): dogs not below 7.2 °C (45 °F) nor above 29.5 °C (85 °F) for more than 4 consecutive hours; other species facility choice"
#   runs: true
#   needs: [environment.csv]
findings contains f if {
	some s in input.environment.temperature
	s.hours > lim.hours_outside
	f := {
		"check": "environment.temperature.out_of_range",
		"subject": input.id,
		"on": s.from,
		"until": s.until,
		"message": sprintf("air %s the %v–%v °C range for %s for %v h (%s to %s%s; peak %v °C); more than %v h in a row is too long", [s.direction, s.min_c, s.max_c, s.species, round(s.hours * 10) / 10, s.started_at, s.ended_at, back(s), s.peak_c, lim.hours_outside]),
		"evidence": s.evidence,
	}
}

back(s) := ", back in range then" if s.back_in_range

else := ", last reading outside"

# METADATA
# title: Humidity outside the range
# description: An indoor building housing animals had readings of relative humidity outside humidity_pct on a day.
# custom:
#   id: environment.humidity.out_of_range
#   severity: minor
#   source: "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), Table 3.1: relative humidity 30–70 %"
#   runs: true
#   needs: [environment.csv]
findings contains f if {
	input.exposure == "indoor"
	some d in humid_days
	outside := [i | some i, h in d.humidity_pct; out_of_range(h)]
	count(outside) > 0
	values := [d.humidity_pct[i] | some i in outside]
	f := {
		"check": "environment.humidity.out_of_range",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("%d of %s outside %v–%v %% (from %v to %v %%)", [count(outside), count_of(count(d.humidity_pct), "humidity reading", "humidity readings"), lim.humidity_pct.min, lim.humidity_pct.max, min(values), max(values)]),
		"evidence": [d.humidity_refs[i] | some i in outside],
	}
}

humidity_min := lim.humidity_pct.min

humidity_max := lim.humidity_pct.max

out_of_range(h) if h < humidity_min

out_of_range(h) if h > humidity_max

# The days with a humidity reading outside the range, found from each day's
# lowest and highest reading (null: none), so that only their readings are
# gone through one by one.
humid_days contains d if {
	some d in input.environment.days
	d.max_humidity_pct > humidity_max # null is below every number
}

humid_days contains d if {
	some d in input.environment.days
	d.min_humidity_pct != null
	d.min_humidity_pct < humidity_min
}

# METADATA
# title: Ammonia above the limit
# description: A reading in an indoor or sheltered building housing animals found ammonia above ammonia_ppm_max.
# custom:
#   id: environment.ammonia.high
#   severity: minor
#   source: common practice
#   runs: true
#   needs: [environment.csv]
findings contains f if {
	most := lim.ammonia_ppm_max
	some d in input.environment.days
	d.max_ammonia_ppm > most # null is below every number: no reading
	f := {
		"check": "environment.ammonia.high",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("ammonia up to %v ppm, above %v ppm: check ventilation and cleaning", [d.max_ammonia_ppm, lim.ammonia_ppm_max]),
		"evidence": [d.ammonia_ref],
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
