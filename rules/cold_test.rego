package welfare.cold_test

import data.welfare.cold

# Limits (shipped limits.yaml): water_check_below_c 0 and water_checks_min 2 (common
# practice), bedding_wind_chill -20 and bedding_days 7 (facility choice),
# shelter_wind_chill -20 (common practice), frostbite_wind_chill -28 (Environment and
# Climate Change Canada: exposed skin can freeze in 10–30 min at -28 and colder).

enc(cold_facts) := {"kind": "enclosure", "id": "SHED1-03", "ref": "enclosures.csv:4", "cold": object.union(
	{
		"exposure": "outdoor", "weather_site": "YARD", "nest_box": false,
		"days_at_or_below_water_limits_by_checks": [], "days_at_or_past_bedding_limits": [],
		"days_at_or_below_shelter_limit_without_nest_box": [], "days_without_weather": [],
	},
	cold_facts,
)}

# day is one day's coldest reading at the site (an invented reading).
day(on, wc) := {
	"on": on, "min_wind_chill_c": wc, "wind_chill_display": round(wc), "air_c": -14.5, "wind_kmh": 30,
	"band": "low (risk of hypothermia with long exposure)", "ref": sprintf("weather.csv:%d", [day_row[on]]),
}

day_row := {"2026-01-11": 38, "2026-01-12": 39, "2026-01-13": 40, "2026-01-15": 42}

# Two equally cold days in a row: the run's coldest reading is the first's.
two_days(wc) := [day("2026-01-12", wc), day("2026-01-13", wc)]

bedding_days(days, last, since) := [object.union(d, {
	"last_bedding": last, "days_since_bedding": plus_days(since, i),
	"evidence": ["enclosures.csv:4", d.ref],
}) |
	some i, d in days
]

plus_days(since, i) := since + i if since != null

else := null

shelter_days(days, needs) := [object.union(d, {"needs_nest_box": needs, "evidence": ["enclosures.csv:4", d.ref]}) | some d in days]

site(days) := {"kind": "site", "id": "YARD", "cold": {"readings_recorded": true, "days_at_or_below_frostbite_limit": days, "days_without_readings": []}}

staff(stint) := {"kind": "staff", "id": "K-ORVO", "cold": {"stints": [stint]}}

# −35 °C with an 8 km/h wind, moderate work: 40 min and 4 warm-up breaks
# (ACGIH TLV / Saskatchewan work/warm-up schedule, a table cell; the schedule's published
# example is the light-work one: −35 °C, no noticeable wind → 40/4).
stint(minutes, emergency) := {
	"on": "2026-01-13", "ref": "outdoor_work.csv:7", "site": "YARD",
	"started_at": "2026-01-13 07:10", "ended_at": "2026-01-13 07:50", "minutes": minutes,
	"activity": "moderate", "emergency": emergency,
	"reading": {
		"ref": "weather.csv:41", "at": "2026-01-13 07:00", "air_c": -35, "wind_kmh": 8,
		"wind_chill_c": -43.9, "wind_chill_display": -44, "hours_before_start": 0.17,
	},
	"step": {
		"kind": "limit", "text": "max 40 min work, 4 warm-up breaks (row -35 °C, 8 km/h column)",
		"cell": "40/4", "max_work_min": 40, "breaks": 4, "row_warmest_c": -35, "column_kmh": 8,
		"air_row_c": -35, "light_shift": false,
	},
}

cease_stint(emergency) := object.union(stint(20, emergency), {"step": {
	"kind": "cease", "text": "non-emergency work should cease (row -35 °C, 24 km/h column)",
	"cell": "C", "max_work_min": null, "breaks": null, "row_warmest_c": -35, "column_kmh": 24,
	"air_row_c": -35, "light_shift": false,
}})

test_clean_enclosure_no_findings if {
	count(cold.findings) == 0 with input as enc({})
}

# Water: at least 2 checks below 0 °C (common practice).
water(air, checks) := {"days_at_or_below_water_limits_by_checks": [{"checks": checks, "on": ["2026-01-12"], "min_air_c": [air], "air_refs": ["weather.csv:38"]}]}

test_one_water_check_on_freezing_day_fires if {
	some f in cold.findings with input as enc(water(-0.5, 1))
	f.check == "cold.water.checks_insufficient"
	f.on == "2026-01-12"
	f.evidence == ["enclosures.csv:4", "weather.csv:38"]
	contains(f.message, "1 water check recorded")
	contains(f.message, "-0.5 °C")
}

test_exactly_two_water_checks_is_quiet if {
	count(cold.findings) == 0 with input as enc(water(-12, 2))
}

test_water_at_exactly_zero_is_quiet if {
	# "below 0 °C": a day whose minimum is exactly 0 does not need two checks.
	count(cold.findings) == 0 with input as enc(water(0, 0))
}

test_water_group_judges_each_day_with_its_own_reading if {
	# One group of days with one check each: the day at exactly 0 °C is quiet, the day below
	# fires with its own temperature and reading; a group with two checks is quiet however cold.
	facts := {"days_at_or_below_water_limits_by_checks": [
		{"checks": 1, "on": ["2026-01-11", "2026-01-12"], "min_air_c": [0, -3], "air_refs": ["weather.csv:30", "weather.csv:38"]},
		{"checks": 2, "on": ["2026-01-13"], "min_air_c": [-30], "air_refs": ["weather.csv:46"]},
	]}
	fs := [f | some f in cold.findings with input as enc(facts)]
	count(fs) == 1
	fs[0].on == "2026-01-12"
	fs[0].evidence == ["enclosures.csv:4", "weather.csv:38"]
	contains(fs[0].message, "down to -3 °C")
}

# Bedding: wind chill at or below −20 (facility choice), none added in 7 days.
test_bedding_stale_at_exactly_minus_20_fires if {
	some f in cold.findings with input as enc({"days_at_or_past_bedding_limits": bedding_days(two_days(-20), "2026-01-02", 10)})
	f.check == "cold.bedding.stale"
	f.on == "2026-01-12"
	f.until == "2026-01-13"
	f.evidence == ["enclosures.csv:4", "weather.csv:39"]
	contains(f.message, "each of 2 days")
	contains(f.message, "bedding last added 2026-01-02")
	contains(f.message, "coldest wind chill -20 °C on 2026-01-12")
}

test_bedding_just_above_minus_20_is_quiet if {
	count(cold.findings) == 0 with input as enc({"days_at_or_past_bedding_limits": bedding_days([day("2026-01-13", -19.9)], "2026-01-02", 10)})
}

test_bedding_added_6_days_before_is_fresh if {
	count(cold.findings) == 0 with input as enc({"days_at_or_past_bedding_limits": bedding_days([day("2026-01-13", -30)], "2026-01-07", 6)})
}

test_bedding_added_7_days_before_is_stale if {
	some f in cold.findings with input as enc({"days_at_or_past_bedding_limits": bedding_days([day("2026-01-13", -30)], "2026-01-06", 7)})
	f.check == "cold.bedding.stale"
	f.on == "2026-01-13"
}

test_bedding_turns_stale_within_a_cold_spell if {
	# 6 days on the 12th (fresh), 7 on the 13th (stale): the run starts on the 13th.
	some f in cold.findings with input as enc({"days_at_or_past_bedding_limits": bedding_days(two_days(-25), "2026-01-06", 6)})
	f.on == "2026-01-13"
	f.until == "2026-01-13"
}

test_bedding_never_added_says_so if {
	some f in cold.findings with input as enc({"days_at_or_past_bedding_limits": bedding_days(two_days(-25), null, null)})
	contains(f.message, "no bedding added on record")
}

# Shelter: nest box at or below −20 (common practice).
test_shelter_missing_at_exactly_minus_20_fires if {
	some f in cold.findings with input as enc({"days_at_or_below_shelter_limit_without_nest_box": shelter_days(two_days(-20), true)})
	f.check == "cold.shelter.missing"
	f.on == "2026-01-12"
	f.until == "2026-01-13"
}

test_shelter_just_above_minus_20_is_quiet if {
	count(cold.findings) == 0 with input as enc({"days_at_or_below_shelter_limit_without_nest_box": shelter_days([day("2026-01-13", -19.99)], true)})
}

test_shelter_with_nest_box_is_quiet if {
	count(cold.findings) == 0 with input as enc({"nest_box": true, "days_at_or_below_shelter_limit_without_nest_box": shelter_days(two_days(-30), true)})
}

test_shelter_for_animals_without_nest_box_need_is_quiet if {
	count(cold.findings) == 0 with input as enc({"days_at_or_below_shelter_limit_without_nest_box": shelter_days(two_days(-30), false)})
}

# Frostbite: −28 and colder (Environment and Climate Change Canada hazard bands).
test_frostbite_at_exactly_minus_28_fires if {
	some f in cold.findings with input as site(two_days(-28))
	f.check == "cold.frostbite.risk"
	f.subject == "YARD"
	f.on == "2026-01-12"
	f.until == "2026-01-13"
	f.evidence == ["weather.csv:39"]
	contains(f.message, "on 2 days")
	contains(f.message, "low (risk of hypothermia with long exposure)")
}

test_frostbite_just_above_minus_28_is_quiet if {
	count(cold.findings) == 0 with input as site([day("2026-01-13", -27.9)])
}

test_frostbite_days_apart_are_two_runs if {
	found := {[f.on, f.until] | some f in cold.findings} with input as site([day("2026-01-12", -30), day("2026-01-13", -31), day("2026-01-15", -29)])
	found == {["2026-01-12", "2026-01-13"], ["2026-01-15", "2026-01-15"]}
}

test_coldest_of_equal_days_is_the_first if {
	some f in cold.findings with input as site([day("2026-01-12", -30), day("2026-01-13", -30)])
	f.evidence == ["weather.csv:39"]
}

test_site_without_cold_days_is_quiet if {
	count(cold.findings) == 0 with input as site([])
}

# Work/warm-up: 40 min allowed in the published example cell.
test_stint_exactly_at_maximum_is_fine if {
	count(cold.findings) == 0 with input as staff(stint(40, false))
}

test_stint_one_minute_over_fires if {
	some f in cold.findings with input as staff(stint(41, false))
	f.check == "cold.work.over_limit"
	f.subject == "K-ORVO"
	f.on == "2026-01-13"
	f.evidence == ["outdoor_work.csv:7", "weather.csv:41"]
	contains(f.message, "41-min")
	contains(f.message, "longer than the 40 min")
	contains(f.message, "wind chill -44 °C")
}

test_emergency_stint_over_limit_is_exempt if {
	count(cold.findings) == 0 with input as staff(stint(90, true))
}

test_stint_in_cease_conditions_fires if {
	fs := cold.findings with input as staff(cease_stint(false))
	count(fs) == 1
	some f in fs
	f.check == "cold.work.should_cease"
	contains(f.message, "should cease")
}

test_emergency_stint_in_cease_conditions_is_exempt if {
	count(cold.findings) == 0 with input as staff(cease_stint(true))
}

test_stint_without_reading_is_not_judged if {
	s := object.union(stint(300, false), {"reading": null, "step": {"kind": "unknown", "text": "no reading at the site: not judged"}})
	count(cold.findings) == 0 with input as staff(s)
}

test_normal_breaks_no_limit if {
	s := object.union(stint(240, false), {"step": {"kind": "no_limit", "text": "normal breaks", "cell": "N", "max_work_min": null}})
	count(cold.findings) == 0 with input as staff(s)
}

# 9 CFR §3.4(b)(4) (references.md "Dogs in the cold"): clean, dry bedding for dogs outdoors when
# the ambient temperature is below 50 °F (10 °C); more at or below 35 °F (1.7 °C).
dog_bedding_days(air) := [object.union(d, {"min_air_c": air, "air_c": air, "bedding_below_c": 10, "more_bedding_at_or_below_c": 1.7}) |
	some d in bedding_days([day("2026-01-13", -3)], "2026-01-02", 11)
]

test_dog_bedding_below_10_c_fires if {
	some f in cold.findings with input as enc({"days_at_or_past_bedding_limits": dog_bedding_days(9.9)})
	f.check == "cold.bedding.stale"
	contains(f.message, "air below 10 °C")
	contains(f.message, "9 CFR §3.4(b)(4)")
}

test_dog_bedding_at_exactly_10_c_is_quiet if {
	count(cold.findings) == 0 with input as enc({"days_at_or_past_bedding_limits": dog_bedding_days(10)})
}

# 9 CFR §3.4(b): a dog enclosure in an outdoor building without a nest box has no shelter; the
# rule judges it by the same wind-chill limit and speaks of shelter. A sheltered building counts.
dog_shelter_days := [object.union(d, {"needs_shelter": true}) | some d in shelter_days(two_days(-20), false)]

test_dog_without_shelter_fires if {
	some f in cold.findings with input as enc({"sheltered": false, "days_at_or_below_shelter_limit_without_nest_box": dog_shelter_days})
	f.check == "cold.shelter.missing"
	contains(f.message, "no nest box or other shelter")
}

test_dog_in_a_sheltered_building_is_quiet if {
	count(cold.findings) == 0 with input as enc({"sheltered": true, "days_at_or_below_shelter_limit_without_nest_box": dog_shelter_days})
}

# checks.md "Corrections to the first set": cold.frostbite.risk speaks of people - the
# Environment and Climate Change Canada freeze times are for human skin.
test_frostbite_message_speaks_of_people if {
	some f in cold.findings with input as site(two_days(-30))
	f.check == "cold.frostbite.risk"
	contains(f.message, "for people working outdoors")
	contains(f.message, "human skin")
}

# "Within 3 h" includes a reading exactly 3 h before (checks.md, second-set clarifications;
# limits cold.reading_within_hours, default 3 h).
aged_stint(hours) := object.union(stint(41, false), {"reading": {"hours_before_start": hours}})

test_stint_reading_exactly_3h_before_is_judged if {
	some f in cold.findings with input as staff(aged_stint(3))
	f.check == "cold.work.over_limit"
}

test_stint_reading_3h_1min_before_is_not_judged if {
	count(cold.findings) == 0 with input as staff(aged_stint(3 + (1 / 60)))
}

# A reading without wind is not calm: the stint is not judged on the schedule's calm column.
test_stint_reading_without_wind_is_not_judged if {
	s := object.union(cease_stint(false), {"reading": {"wind_kmh": null, "wind_chill_c": null, "wind_chill_display": null}})
	count(cold.findings) == 0 with input as staff(s)
}
