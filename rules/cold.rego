# METADATA
# title: Cold season
# description: |
#   Water, bedding and nest boxes for animals in outdoor and sheltered buildings, the
#   work/warm-up schedule for keepers' outdoor stints, and frostbite weather at each site.
#   Wind chill is the 2001 North American index (°C, km/h) of each reading, unrounded; a
#   reading without wind counts as calm (wind chill = air temperature). A day's figures are
#   the minimum over its readings. The facts select the days with the limits in force and
#   give their figures; these rules compare the figures against data.limits.cold again and
#   word the messages. Days with no reading at the site are not judged by the checks that
#   need the weather: they are listed as days_without_weather / days_without_readings.
#   Input (site): {id, cold: {readings_recorded, frostbite: [RUN], days_without_readings: [{from, until, days}]}}.
#   Input (enclosure, outdoor or sheltered buildings only): {id, ref, ..., cold: {exposure,
#     weather_site, nest_box, sheltered, water: [{on, min_air_c, checks, evidence}] (occupied days
#     below water_check_below_c with fewer than water_checks_min water checks), bedding_stale: [RUN +
#     last_bedding, min_air_c, bedding_below_c, more_bedding_at_or_below_c, evidence],
#     shelter_missing: [RUN + evidence], days_without_weather: [{from, until, days}]}}.
#   sheltered: a nest box, or a building of exposure sheltered (a dog's shelter under 9 CFR §3.4(b)).
#   bedding_below_c / more_bedding_at_or_below_c: the occupants' species' outdoor limits (dogs,
#   9 CFR §3.4(b)(4)), null when none applies; min_air_c is the run's lowest daily minimum air.
#   RUN = {from, until, days, min_wind_chill_c, wind_chill_display, air_c, wind_kmh, coldest_on,
#     coldest_ref, band}: the coldest reading of the run.
#   Input (staff): {id, cold: {stints: [{on, ref, site, started_at, ended_at, minutes, activity,
#     emergency, reading: null | {ref, at, air_c, wind_kmh, wind_chill_c, wind_chill_display,
#     hours_before_start}, step: {kind (no_limit, limit, cease, unknown), text, cell, max_work_min,
#     breaks, row_warmest_c, column_kmh, air_row_c, light_shift}}]}}.
# scope: package
# custom:
#   subjects: [site, enclosure, staff]
package welfare.cold

lim := data.limits.cold

wind_text(kmh) := sprintf("wind %v km/h", [kmh]) if kmh != null

else := "wind not recorded"

# conditions describes the coldest reading of a run for a keeper.
conditions(r) := sprintf("coldest wind chill %d on %s (air %v °C, %s)", [r.wind_chill_display, r.coldest_on, r.air_c, wind_text(r.wind_kmh)])

# METADATA
# title: Too few water checks on a freezing day
# description: An occupied enclosure in an outdoor or sheltered building had fewer rounds recording a water state than the limit on a day whose minimum air temperature was below the limit.
# custom:
#   id: cold.water.checks_insufficient
#   severity: minor
#   source: common practice
#   needs: [daily_care.csv, weather.csv]
findings contains f if {
	some w in input.cold.water
	w.min_air_c < lim.water_check_below_c
	w.checks < lim.water_checks_min
	f := {
		"check": "cold.water.checks_insufficient",
		"subject": input.id,
		"on": w.on,
		"message": sprintf("%d water check(s) recorded on a day down to %v °C air; below %v °C at least %d are needed so frozen water is found", [w.checks, w.min_air_c, lim.water_check_below_c, lim.water_checks_min]),
		"evidence": w.evidence,
	}
}

# METADATA
# title: Bedding not refreshed in the cold
# description: An occupied enclosure in an outdoor or sheltered building had no bedding added in the limit's number of days up to days whose minimum wind chill was at or below the limit, or - for a species with an outdoor bedding limit (dogs, 9 CFR §3.4(b)(4)) in an outdoor building - whose minimum air temperature was below that limit (10 °C).
# custom:
#   id: cold.bedding.stale
#   severity: minor
#   source: "facility choice; dogs outdoors: 9 CFR §3.4(b)(4), bedding below 50 °F (10 °C)"
#   runs: true
#   needs: [daily_care.csv, weather.csv]
findings contains f if {
	some r in input.cold.bedding_stale
	why := bedding_cold(r)
	f := {
		"check": "cold.bedding.stale",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("no bedding added in the %d days up to each of %d day(s) %s; %s; %s", [lim.bedding_days, r.days, why, conditions(r), last_bedding(r)]),
		"evidence": r.evidence,
	}
}

bedding_cold(r) := sprintf("with wind chill at or below %v", [lim.bedding_wind_chill]) if {
	r.min_wind_chill_c <= lim.bedding_wind_chill
} else := sprintf("with air below %v °C, when 9 CFR §3.4(b)(4) requires clean, dry bedding for dogs outdoors (more at or below %v °C)", [r.bedding_below_c, r.more_bedding_at_or_below_c]) if {
	r.bedding_below_c != null
	r.min_air_c < r.bedding_below_c
}

last_bedding(r) := sprintf("bedding last added %s", [r.last_bedding]) if r.last_bedding != null

else := "no bedding added on record"

# METADATA
# title: No shelter in hard cold
# description: An enclosure in an outdoor or sheltered building, occupied by a species that needs a nest box, has none recorded - or, occupied by dogs in an outdoor building, has neither a nest box nor the shelter of a sheltered building (9 CFR §3.4(b)) - on days whose minimum wind chill was at or below the limit.
# custom:
#   id: cold.shelter.missing
#   severity: significant
#   source: "common practice; dogs outdoors: 9 CFR §3.4(b), shelter from the elements"
#   runs: true
#   needs: [weather.csv]
findings contains f if {
	some r in input.cold.shelter_missing
	not input.cold.nest_box
	r.min_wind_chill_c <= lim.shelter_wind_chill
	f := {
		"check": "cold.shelter.missing",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("no nest box or other shelter recorded for animals that need one on %d day(s) with wind chill at or below %v; %s", [r.days, lim.shelter_wind_chill, conditions(r)]),
		"evidence": r.evidence,
	}
}

# METADATA
# title: Outdoor stint longer than the work/warm-up schedule allows
# description: A non-emergency outdoor stint lasted strictly longer than the maximum work period of the work/warm-up schedule for the conditions at its start.
# custom:
#   id: cold.work.over_limit
#   severity: significant
#   source: ACGIH TLV cold stress, work/warm-up schedule for a 4-hour shift (Saskatchewan origin)
#   needs: [outdoor_work.csv, weather.csv]
findings contains f if {
	some s in input.cold.stints
	not s.emergency
	s.step.kind == "limit"
	s.minutes > s.step.max_work_min
	f := {
		"check": "cold.work.over_limit",
		"subject": input.id,
		"on": s.on,
		"message": sprintf("%v-min %s stint at %s from %s, longer than the %d min the work/warm-up schedule allows before a warm-up break (cell %s: %d warm-up breaks; %s; %s)", [s.minutes, s.activity, s.site, s.started_at, s.step.max_work_min, s.step.cell, s.step.breaks, where(s.step), reading_text(s.reading)]),
		"evidence": [s.ref, s.reading.ref],
	}
}

# METADATA
# title: Outdoor work when it should cease
# description: A non-emergency outdoor stint was worked in conditions where the work/warm-up schedule says non-emergency work should cease.
# custom:
#   id: cold.work.should_cease
#   severity: significant
#   source: ACGIH TLV cold stress, work/warm-up schedule for a 4-hour shift (Saskatchewan origin)
#   needs: [outdoor_work.csv, weather.csv]
findings contains f if {
	some s in input.cold.stints
	not s.emergency
	s.step.kind == "cease"
	f := {
		"check": "cold.work.should_cease",
		"subject": input.id,
		"on": s.on,
		"message": sprintf("%v-min non-emergency %s stint at %s from %s; the work/warm-up schedule says non-emergency work should cease (cell %s; %s; %s)", [s.minutes, s.activity, s.site, s.started_at, s.step.cell, where(s.step), reading_text(s.reading)]),
		"evidence": [s.ref, s.reading.ref],
	}
}

reading_text(r) := sprintf("reading %s: air %v °C, %s, wind chill %d", [r.at, r.air_c, wind_text(r.wind_kmh), r.wind_chill_display])

# where names the schedule cell's row and column.
where(step) := sprintf("row %v °C, %v km/h column%s", [step.row_warmest_c, step.column_kmh, light(step)])

light(step) := ", one row colder for light work" if step.light_shift

else := ""

# METADATA
# title: Frostbite weather
# description: A weather site's minimum wind chill was at or below the frostbite limit; people's exposed skin can freeze within 30 minutes. A note for the protection of the people working outdoors - the Environment and Climate Change Canada freeze times are for human skin, not for animals.
# custom:
#   id: cold.frostbite.risk
#   severity: note
#   source: Environment and Climate Change Canada wind chill hazard bands
#   runs: true
#   needs: [weather.csv]
findings contains f if {
	some r in input.cold.frostbite
	r.min_wind_chill_c <= lim.frostbite_wind_chill
	f := {
		"check": "cold.frostbite.risk",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("wind chill at or below %v on %d day(s); %s: for people working outdoors, %s (Environment and Climate Change Canada times for human skin)", [lim.frostbite_wind_chill, r.days, conditions(r), r.band]),
		"evidence": [r.coldest_ref],
	}
}
