# METADATA
# title: Cold season
# description: |
#   Water, bedding and nest boxes for animals in outdoor and sheltered buildings, the
#   work/warm-up schedule for keepers' outdoor stints, and frostbite weather at each site.
#   Wind chill is the 2001 North American index (°C, km/h) of each reading, unrounded; a
#   reading without wind has none (it is not calm). A day's minimum wind chill is taken over
#   its readings with wind, its minimum air over all its readings; a day with no reading with
#   wind is not judged by the wind-chill checks (bedding, shelter, frostbite) and ends a run
#   (records.value.missing says so, see missing.rego). The facts pre-select the days that could be findings, comparing
#   with the limits in force inclusively (the field names say which), and give each day's figures;
#   these rules make the deciding comparisons against data.limits.cold on each day, group the days
#   they judge into runs of consecutive days and word the messages. Days with no reading at the
#   site are not judged by the checks that need the weather: they are listed as
#   days_without_weather / days_without_readings.
#   DAY = {on, min_wind_chill_c, wind_chill_display, air_c, wind_kmh, band, ref}: the day's coldest reading.
#   Input (site): {id, cold: {readings_recorded, days_at_or_below_frostbite_limit: [DAY],
#     days_without_readings: [{from, until, days}], days_without_wind_readings: [{from, until,
#     days, days_with_readings_without_wind, evidence}]}}.
#   Input (enclosure, outdoor or sheltered buildings only): {id, ref, ..., cold: {exposure,
#     weather_site, nest_box, sheltered, days_at_or_below_water_limits_by_checks: [{checks, on: [day],
#     min_air_c: [°C], air_refs: [ref]}] (one group per number of water checks, fewest first; the
#     days of a group in day order, its arrays parallel: the i-th day's lowest air temperature and
#     the reading that gave it),
#     days_at_or_past_bedding_limits: [DAY + min_air_c, bedding_below_c, more_bedding_at_or_below_c,
#     last_bedding, days_since_bedding, evidence],
#     days_at_or_below_shelter_limit_without_nest_box: [DAY + needs_nest_box, needs_shelter, evidence],
#     days_without_weather: [{from, until, days}]}}.
#   sheltered: a nest box, or a building of exposure sheltered (a dog's shelter under 9 CFR §3.4(b)).
#   needs_shelter: an occupant's species needs a shelter outdoors (dogs, 9 CFR §3.4(b)).
#   bedding_below_c / more_bedding_at_or_below_c: the occupants' species' outdoor bedding limits
#   (dogs, 9 CFR §3.4(b)(4)), null when none applies; bedding days are pre-selected when the wind
#   chill is at or below the bedding limit or the day's minimum air is at or below bedding_below_c.
#   Input (staff): {id, cold: {readings_recorded, stints: [{on, ref, site, started_at, ended_at,
#     minutes, activity, emergency, reading: null | {ref, at, air_c, wind_kmh, wind_chill_c,
#     wind_chill_display, hours_before_start}, step: {kind (no_limit, limit, cease, unknown), text,
#     cell, max_work_min, breaks, row_warmest_c, column_kmh, air_row_c, light_shift}}]}}.
#   reading: the latest reading of the site at or before the start, whatever its age; a stint
#   is judged only when it is at most cold.reading_within_hours old (exactly that many hours
#   counts) and has wind (step kind unknown without wind). Otherwise records.value.missing.
# scope: package
# custom:
#   subjects: [site, enclosure, staff]
package welfare.cold

lim := data.limits.cold

wind_text(kmh) := sprintf("wind %v km/h", [kmh]) if kmh != null

else := "wind not recorded"

# day_n numbers a day, so that consecutive days differ by one.
day_n(on) := time.parse_ns("2006-01-02", on) / 86400000000000

# runs groups days (DAY entries in day order, as the facts give them, that the rule has judged)
# into runs of consecutive days. A run has its first and last day, its length, its first day's
# entry, and the coldest reading of the run (the lowest wind chill; the earliest of equal days).
# It pairs the k-th run start with the k-th run end, so it reads each day a fixed number of times.
runs(days) := {r |
	n := [day_n(d.on) | some d in days]
	starts := [i | some i, _ in days; not follows(n, i)]
	ends := [i | some i, _ in days; not followed(n, i)]
	some k, s in starts
	e := ends[k]
	members := array.slice(days, s, e + 1)
	coldest_wc := min([d.min_wind_chill_c | some d in members])
	c := members[min([i | some i, d in members; d.min_wind_chill_c == coldest_wc])]
	r := {
		"from": days[s].on, "until": days[e].on, "days": count(members), "first": days[s],
		"min_wind_chill_c": c.min_wind_chill_c, "wind_chill_display": c.wind_chill_display,
		"air_c": c.air_c, "wind_kmh": c.wind_kmh, "coldest_on": c.on, "coldest_ref": c.ref, "band": c.band,
	}
}

# follows: day i is the day after day i-1; followed: day i+1 is the day after day i.
follows(n, i) if n[i - 1] == n[i] - 1

followed(n, i) if n[i + 1] == n[i] + 1

# conditions describes the coldest reading of a run for a keeper.
conditions(r) := sprintf("coldest wind chill %d °C on %s (air %v °C, %s)", [r.wind_chill_display, r.coldest_on, r.air_c, wind_text(r.wind_kmh)])

# METADATA
# title: Too few water checks on a freezing day
# description: An occupied enclosure in an outdoor or sheltered building had fewer rounds recording a water state than the limit on a day whose minimum air temperature was below the limit.
# custom:
#   id: cold.water.checks_insufficient
#   severity: minor
#   source: common practice
#   needs: [daily_care.csv, weather.csv]
findings contains f if {
	groups := input.cold.days_at_or_below_water_limits_by_checks
	checks_min := lim.water_checks_min
	below_c := lim.water_check_below_c
	some g in groups
	g.checks < checks_min
	some i, on in g.on
	g.min_air_c[i] < below_c
	f := {
		"check": "cold.water.checks_insufficient",
		"subject": input.id,
		"on": on,
		"message": sprintf("%s recorded on a day down to %v °C air; below %v °C at least %d are needed so frozen water is found", [count_of(g.checks, "water check", "water checks"), g.min_air_c[i], lim.water_check_below_c, lim.water_checks_min]),
		"evidence": [input.ref, g.air_refs[i]],
	}
}

# METADATA
# title: Bedding not refreshed in the cold
# description: An occupied enclosure in an outdoor or sheltered building, on days whose minimum wind chill was at or below the limit (or, for a species with an outdoor bedding limit such as dogs, whose minimum air was below it), had no bedding added in the limit's number of days up to that day.
# custom:
#   id: cold.bedding.stale
#   severity: minor
#   source: "facility choice; dogs outdoors: 9 CFR §3.4(b)(4), bedding below 50 °F (10 °C)"
#   runs: true
#   needs: [daily_care.csv, weather.csv]
findings contains f if {
	days := input.cold.days_at_or_past_bedding_limits
	days[0] # none: nothing to go through (an enclosure's list is most often empty)
	wind_chill_c := lim.bedding_wind_chill
	bedding_days := lim.bedding_days
	stale := [d |
		some d in days
		bedding_cold(d, wind_chill_c)
		bedding_due(d, bedding_days)
	]

	# Most enclosures have no such day: runs is not called for none (here and below).
	count(stale) > 0
	some r in runs(stale)
	f := {
		"check": "cold.bedding.stale",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("no bedding added in the %d days up to each of %s %s; %s; %s", [lim.bedding_days, count_of(r.days, "day", "days"), bedding_why(r.first), conditions(r), last_bedding(r.first)]),
		"evidence": [input.ref, r.coldest_ref],
	}
}

# A day is cold enough for fresh bedding when its wind chill is at or below the limit, or, for a
# species with an outdoor bedding limit (dogs, 9 CFR §3.4(b)(4)), its minimum air is below it.
bedding_cold(d, wind_chill_c) if d.min_wind_chill_c <= wind_chill_c

bedding_cold(d, _) if {
	d.bedding_below_c != null
	d.min_air_c < d.bedding_below_c
}

bedding_why(d) := sprintf("with wind chill at or below %v °C", [lim.bedding_wind_chill]) if {
	d.min_wind_chill_c <= lim.bedding_wind_chill
} else := sprintf("with air below %v °C, when 9 CFR §3.4(b)(4) requires clean, dry bedding for dogs outdoors (more at or below %v °C)", [d.bedding_below_c, d.more_bedding_at_or_below_c])

# Bedding is due on a day when none was ever added, or the last was the limit's days or more before it.
bedding_due(d, _) if d.days_since_bedding == null

bedding_due(d, bedding_days) if d.days_since_bedding >= bedding_days

last_bedding(d) := sprintf("bedding last added %s", [d.last_bedding]) if d.last_bedding != null

else := "no bedding added on record"

# METADATA
# title: No shelter in hard cold
# description: An enclosure in an outdoor or sheltered building, occupied by a species that needs a nest box (or, in an outdoor building, a species that needs a shelter outdoors, such as dogs under 9 CFR §3.4(b), where a sheltered building also counts), has none recorded on days whose minimum wind chill was at or below the limit.
# custom:
#   id: cold.shelter.missing
#   severity: significant
#   source: "common practice; dogs outdoors: 9 CFR §3.4(b), shelter from the elements"
#   runs: true
#   needs: [weather.csv]
findings contains f if {
	not input.cold.nest_box
	days := input.cold.days_at_or_below_shelter_limit_without_nest_box
	days[0] # none: nothing to go through (an enclosure's list is most often empty)
	wind_chill_c := lim.shelter_wind_chill
	bare := [d |
		some d in days
		needs_shelter(d)
		d.min_wind_chill_c <= wind_chill_c
	]
	count(bare) > 0
	some r in runs(bare)
	f := {
		"check": "cold.shelter.missing",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("no nest box or other shelter recorded for animals that need one on %s with wind chill at or below %v °C; %s", [count_of(r.days, "day", "days"), lim.shelter_wind_chill, conditions(r)]),
		"evidence": [input.ref, r.coldest_ref],
	}
}

# needs_shelter: a nest-box species without a nest box, or a species that needs a shelter
# outdoors (dogs) in a building that is not itself a shelter.
needs_shelter(d) if d.needs_nest_box

needs_shelter(d) if {
	d.needs_shelter
	not input.cold.sheltered
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
	reading_in_force(s)
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
	reading_in_force(s)
	s.step.kind == "cease"
	f := {
		"check": "cold.work.should_cease",
		"subject": input.id,
		"on": s.on,
		"message": sprintf("%v-min non-emergency %s stint at %s from %s; the work/warm-up schedule says non-emergency work should cease (cell %s; %s; %s)", [s.minutes, s.activity, s.site, s.started_at, s.step.cell, where(s.step), reading_text(s.reading)]),
		"evidence": [s.ref, s.reading.ref],
	}
}

# reading_in_force: the stint's reading is at most cold.reading_within_hours before its start
# (exactly that many hours counts) and has wind; otherwise the stint is not judged.
reading_in_force(s) if {
	s.reading.hours_before_start <= lim.reading_within_hours
	s.reading.wind_kmh != null
}

reading_text(r) := sprintf("reading %s: air %v °C, %s, wind chill %d °C", [r.at, r.air_c, wind_text(r.wind_kmh), r.wind_chill_display])

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
	days := input.cold.days_at_or_below_frostbite_limit
	frost := [d |
		some d in days
		d.min_wind_chill_c <= lim.frostbite_wind_chill
	]
	count(frost) > 0
	some r in runs(frost)
	f := {
		"check": "cold.frostbite.risk",
		"subject": input.id,
		"on": r.from,
		"until": r.until,
		"message": sprintf("wind chill at or below %v °C on %s; %s: for people working outdoors, %s (Environment and Climate Change Canada times for human skin)", [lim.frostbite_wind_chill, count_of(r.days, "day", "days"), conditions(r), r.band]),
		"evidence": [r.coldest_ref],
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
