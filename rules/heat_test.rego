package welfare.heat_test

import data.welfare.heat

# Limits (shipped limits.yaml): hot_day_c 25 and water_checks_min 2 (common practice),
# danger_heat_index_c 32 (NWS heat index bands: extreme caution from 32 °C / 90 °F).

day(air, hi) := {
	"on": "2026-07-14", "readings": 8, "max_air_c": air, "max_heat_index_c": hi,
	"max_heat_index_f": (hi * 1.8) + 32, "band": "extreme_caution", "band_wording": "extreme caution",
	"peak_at": "2026-07-14 15:00", "peak_air_c": air, "peak_humidity_pct": 55,
	"humidity_recorded": true, "readings_without_humidity": 0,
	"evidence": ["enclosures.csv:4", "weather.csv:120"], "run": null,
}

# in_run puts a day in a run of three days whose hottest day had no humidity recorded.
in_run(d) := object.union(d, {"run": {
	"from": "2026-07-14", "until": "2026-07-16", "days": 3, "hottest_on": "2026-07-16",
	"max_heat_index_c": 35, "max_heat_index_f": 95, "band_wording": "extreme caution",
	"peak_at": "2026-07-16 15:00", "peak_air_c": 35, "peak_humidity_pct": null, "humidity_recorded": false,
	"days_without_humidity": ["2026-07-16"],
}})

hot_day(air, hi, checks) := object.union(day(air, hi), {"water_checks": checks})

enc(heat_facts) := {"kind": "enclosure", "id": "S1-03", "ref": "enclosures.csv:4", "heat": object.union(
	{"exposure": "outdoor", "weather_site": "MAST", "shade": false, "shade_recorded": true, "hot_days": []},
	heat_facts,
)}

site(days) := {"kind": "site", "id": "MAST", "heat": {"readings_recorded": true, "days": days}}

test_no_hot_days_no_findings if {
	count(heat.findings) == 0 with input as enc({})
}

# Water: at least 2 checks from 25 °C (common practice).
test_one_water_check_at_exactly_25_fires if {
	some f in heat.findings with input as enc({"shade": true, "hot_days": [hot_day(25, 24.6, 1)]})
	f.check == "heat.water.checks_insufficient"
	f.on == "2026-07-14"
	contains(f.message, "1 water check recorded")
	f.evidence == ["enclosures.csv:4", "weather.csv:120"]
}

test_one_water_check_just_below_25_is_quiet if {
	count(heat.findings) == 0 with input as enc({"shade": true, "hot_days": [hot_day(24.9, 25.2, 1)]})
}

# Among a year's hot days only those with fewer than 2 checks and air from 25 °C fire, wherever
# they fall in the list (the rule first compares the fewest checks of all the days).
test_only_the_days_with_too_few_checks_fire if {
	days := [
		object.union(hot_day(30, 31, 3), {"on": "2026-07-14"}),
		object.union(hot_day(28, 29, 1), {"on": "2026-07-15"}),
		object.union(hot_day(24.9, 25.5, 0), {"on": "2026-07-16"}),
		object.union(hot_day(27, 27, 2), {"on": "2026-07-17"}),
	]
	found := heat.findings with input as enc({"shade": true, "hot_days": days})
	{[f.check, f.on] | some f in found} == {["heat.water.checks_insufficient", "2026-07-15"]}
}

# The facts give the fewest checks of any hot day too (fewest_water_checks): 2 or more spares
# the walk over the days, fewer walks them; null (no hot day) is quiet; an input without it is
# walked as above.
test_the_fewest_checks_given_below_2_fires if {
	found := heat.findings with input as enc({"shade": true, "hot_days": [hot_day(28, 29, 3), hot_day(28, 29, 1)], "fewest_water_checks": 1})
	{f.check | some f in found} == {"heat.water.checks_insufficient"}
	count(found) == 1
}

test_the_fewest_checks_given_at_2_is_quiet if {
	count(heat.findings) == 0 with input as enc({"shade": true, "hot_days": [hot_day(28, 29, 3), hot_day(28, 29, 2)], "fewest_water_checks": 2})
}

test_no_hot_day_and_null_fewest_checks_is_quiet if {
	count(heat.findings) == 0 with input as enc({"fewest_water_checks": null})
}

test_two_water_checks_is_quiet if {
	count(heat.findings) == 0 with input as enc({"shade": true, "hot_days": [hot_day(31, 33, 2)]})
}

# Shade: outdoor, heat index at or above 25 °C (9 CFR §3.4(b) for dogs; common practice).
test_no_shade_at_heat_index_exactly_25_fires if {
	some f in heat.findings with input as enc({"hot_days": [hot_day(24.9, 25, 2)]})
	f.check == "heat.shade.missing"
	contains(f.message, "enclosure recorded without shade on 1 day with heat index at or above 25 °C")
	contains(f.message, "NWS extreme caution")
}

test_no_shade_just_below_25_is_quiet if {
	count(heat.findings) == 0 with input as enc({"hot_days": [hot_day(25, 24.99, 2)]})
}

test_shade_is_quiet if {
	count(heat.findings) == 0 with input as enc({"shade": true, "hot_days": [hot_day(30, 34, 2)]})
}

test_sheltered_building_needs_no_shade if {
	count(heat.findings) == 0 with input as enc({"exposure": "sheltered", "hot_days": [hot_day(30, 34, 2)]})
}

test_shade_not_recorded_says_so if {
	some f in heat.findings with input as enc({"shade_recorded": false, "hot_days": [hot_day(30, 34, 2)]})
	f.check == "heat.shade.missing"
	contains(f.message, "no shade recorded")
}

test_no_humidity_says_air_temperature_stands if {
	d := object.union(hot_day(27, 27, 2), {"humidity_recorded": false, "peak_humidity_pct": null})
	some f in heat.findings with input as enc({"hot_days": [d]})
	f.check == "heat.shade.missing"
	contains(f.message, "no humidity recorded on 2026-07-14: the air temperature stands for the heat index")
}

# A run finding keeps its first day's message: it names the run's hottest day and the days
# without humidity even when the first day had humidity.
test_run_message_speaks_for_the_run if {
	some f in heat.findings with input as site([in_run(day(30, 33))])
	f.check == "heat.danger"
	contains(f.message, "on 3 days")
	contains(f.message, "hottest 2026-07-16: heat index 35 °C (95 °F), NWS extreme caution")
	contains(f.message, "humidity not recorded")
	contains(f.message, "no humidity recorded on 2026-07-16")
}

# Danger note: heat index from 32 °C (NWS extreme caution).
test_heat_index_exactly_32_fires if {
	some f in heat.findings with input as site([day(30, 32)])
	f.check == "heat.danger"
	f.subject == "MAST"
	contains(f.message, "NWS extreme caution")
	contains(f.message, "humidity 55 %")
}

test_heat_index_just_below_32_is_quiet if {
	count(heat.findings) == 0 with input as site([day(30, 31.99)])
}

test_danger_without_humidity_says_so if {
	d := object.union(day(33, 33), {"humidity_recorded": false, "peak_humidity_pct": null})
	some f in heat.findings with input as site([d])
	contains(f.message, "humidity not recorded")
	contains(f.message, "the air temperature stands")
}
