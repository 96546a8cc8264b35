package welfare.environment_test

import data.welfare.environment

# Limits (shipped limits.yaml): hours_outside 4 (9 CFR §3.3(a)), humidity_pct 30–70
# (Guide, 8th ed., Table 3.1), ammonia_ppm_max 25 (common practice).

bld(env) := {"kind": "building", "id": "KB", "ref": "facility.yaml:20", "exposure": "indoor", "environment": object.union(
	{"readings_recorded": true, "temperature": [], "days": []},
	env,
)}

spell(hours) := {
	"species": "canis_familiaris", "min_c": 7.2, "max_c": 29.5, "from": "2026-07-21", "until": "2026-07-21",
	"started_at": "2026-07-21 12:00", "ended_at": "2026-07-21 17:00", "hours": hours, "back_in_range": true,
	"direction": "above", "peak_c": 31.4, "evidence": ["environment.csv:300", "environment.csv:303"],
}

# The day's lowest and highest humidity are null when none was recorded, as the facts give them.
day(hum, ammonia) := {
	"on": "2026-07-21", "readings": count(hum), "humidity_pct": hum,
	"humidity_refs": [sprintf("environment.csv:%d", [i + 10]) | some i, _ in hum],
	"min_humidity_pct": lowest(hum), "max_humidity_pct": highest(hum),
	"max_ammonia_ppm": ammonia, "ammonia_ref": "environment.csv:12",
}

lowest(hum) := null if count(hum) == 0

else := min(hum)

highest(hum) := null if count(hum) == 0

else := max(hum)

test_quiet_building if {
	count(environment.findings) == 0 with input as bld({"days": [day([30, 50, 70], 25)]})
}

# 9 CFR §3.3(a): "more than 4 consecutive hours".
test_exactly_4_hours_is_quiet if {
	count(environment.findings) == 0 with input as bld({"temperature": [spell(4)]})
}

test_more_than_4_hours_fires if {
	some f in environment.findings with input as bld({"temperature": [spell(4.5)]})
	f.check == "environment.temperature.out_of_range"
	f.on == "2026-07-21"
	f.until == "2026-07-21"
	contains(f.message, "above the 7.2–29.5 °C range for canis_familiaris for 4.5 h")
}

# Guide Table 3.1: 30–70 %; the boundaries are inside.
test_humidity_above_70_fires if {
	some f in environment.findings with input as bld({"days": [day([55, 70.5, 80], 3)]})
	f.check == "environment.humidity.out_of_range"
	contains(f.message, "2 of 3 humidity readings outside 30–70 % (from 70.5 to 80 %)")
	f.evidence == ["environment.csv:11", "environment.csv:12"]
}

test_humidity_below_30_fires if {
	some f in environment.findings with input as bld({"days": [day([29.9], null)]})
	f.check == "environment.humidity.out_of_range"
}

test_humidity_just_outside_both_ends_is_one_finding if {
	# Guide Table 3.1: 30–70 %; 29.9 and 70.1 are outside, 30 and 70 inside.
	fs := [f | some f in environment.findings with input as bld({"days": [day([30, 29.9, 70, 70.1], null)]})]
	count(fs) == 1
	contains(fs[0].message, "2 of 4 humidity readings outside 30–70 % (from 29.9 to 70.1 %)")
	fs[0].evidence == ["environment.csv:11", "environment.csv:13"]
}

test_ammonia_at_25_is_quiet if {
	count(environment.findings) == 0 with input as bld({"days": [day([], 25)]})
}

test_humidity_in_sheltered_building_is_not_judged if {
	count(environment.findings) == 0 with input as object.union(bld({"days": [day([90], null)]}), {"exposure": "sheltered"})
}

# Ammonia: above 25 ppm (common practice).
test_ammonia_above_25_fires if {
	some f in environment.findings with input as bld({"days": [day([], 25.1)]})
	f.check == "environment.ammonia.high"
	contains(f.message, "25.1 ppm")
	f.evidence == ["environment.csv:12"]
}

test_ammonia_not_recorded_is_quiet if {
	count(environment.findings) == 0 with input as bld({"days": [day([], null)]})
}
