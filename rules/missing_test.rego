package welfare.missing_test

import data.welfare.missing

# A 31 kg dam with litter whose length was not recorded: the 9 CFR §3.6(c)(1) formula
# ((length in inches + 6)² / 144 ft²) cannot be worked out, so her floor space is not judged.
dog_enclosure(missing_value) := {
	"kind": "enclosure", "id": "K-09", "ref": "enclosures.csv:9",
	"occupancy": [{
		"from": "2026-01-03", "until": "2026-01-09", "evidence": ["enclosures.csv:9", "animals.csv:40"],
		"occupants": [{"animal": "DG-09", "species": "canis_familiaris", "stage": "dam_with_litter", "required_m2": null, "missing_value": missing_value, "animal_ref": "animals.csv:40"}],
	}],
}

test_dog_without_length_fires if {
	fs := missing.findings with input as dog_enclosure("length_cm")
	fs == {{
		"check": "records.value.missing", "subject": "K-09", "on": "2026-01-03", "until": "2026-01-09",
		"message": "floor space (enclosure.space.insufficient) not judged: no length_cm recorded for DG-09, so the area the occupants need is unknown",
		"evidence": ["enclosures.csv:9", "animals.csv:40"],
	}}
}

test_dog_with_length_is_quiet if {
	count(missing.findings) == 0 with input as dog_enclosure(null)
}

# Stints: limits cold.reading_within_hours (default 3 h); "within 3 h" includes a reading
# exactly 3 h before (checks.md, second-set clarifications).
stint(reading) := {
	"on": "2026-01-13", "ref": "outdoor_work.csv:7", "site": "YARD",
	"started_at": "2026-01-13 09:00", "ended_at": "2026-01-13 09:40", "minutes": 40,
	"activity": "moderate", "emergency": false, "reading": reading,
	"step": {"kind": "unknown", "text": "not judged"},
}

reading(hours, wind) := {
	"ref": "weather.csv:41", "at": "2026-01-13 06:00", "air_c": -35, "wind_kmh": wind,
	"wind_chill_c": null, "wind_chill_display": null, "hours_before_start": hours,
}

staff(s) := {"kind": "staff", "id": "K-ORVO", "cold": {"readings_recorded": true, "stints": [s]}}

test_stint_reading_exactly_3h_before_is_quiet if {
	count(missing.findings) == 0 with input as staff(stint(reading(3, 8)))
}

test_stint_reading_3h_1min_before_fires if {
	some f in missing.findings with input as staff(stint(reading(3 + (1 / 60), 8)))
	f.subject == "K-ORVO"
	f.on == "2026-01-13"
	contains(f.message, "cold.work.over_limit")
	contains(f.message, "no reading of the site within 3 h before the start (the latest, 2026-01-13 06:00, is 3 h before)")
	f.evidence == ["outdoor_work.csv:7", "weather.csv:41"]
}

test_stint_without_any_reading_fires if {
	some f in missing.findings with input as staff(stint(null))
	f.evidence == ["outdoor_work.csv:7"]
	contains(f.message, "no reading of the site within 3 h")
}

test_stint_reading_without_wind_fires if {
	some f in missing.findings with input as staff(stint(reading(1, null)))
	contains(f.message, "the reading at 2026-01-13 06:00 has no wind")
}

test_emergency_stint_is_quiet if {
	count(missing.findings) == 0 with input as staff(object.union(stint(null), {"emergency": true}))
}

test_stints_without_weather_file_are_not_evaluated if {
	count(missing.findings) == 0 with input as {"kind": "staff", "id": "K-ORVO", "cold": {"readings_recorded": false, "stints": [stint(null)]}}
}

building(site) := {
	"kind": "building", "id": "S9", "ref": "facility.yaml:30", "exposure": "outdoor",
	"weather": {"weather_site": site, "occupied_days": [{"from": "2026-01-01", "until": "2026-01-31", "days": 31}]},
}

test_outdoor_building_without_weather_site_fires if {
	fs := missing.findings with input as building(null)
	fs == {{
		"check": "records.value.missing", "subject": "S9", "on": "2026-01-01", "until": "2026-01-31",
		"message": "cold and heat checks of the outdoor building's enclosures not judged on 31 days: facility.yaml names no weather_site for it",
		"evidence": ["facility.yaml:30"],
	}}
}

test_building_with_weather_site_is_quiet if {
	count(missing.findings) == 0 with input as building("MAST")
}

site(runs) := {"kind": "site", "id": "YARD", "cold": {
	"readings_recorded": true, "days_at_or_below_frostbite_limit": [], "days_without_readings": [],
	"days_without_wind_readings": runs,
}}

test_site_days_without_wind_fire if {
	fs := missing.findings with input as site([{"from": "2026-01-05", "until": "2026-01-06", "days": 2, "days_with_readings_without_wind": 2, "evidence": ["weather.csv:20"]}])
	some f in fs
	f.on == "2026-01-05"
	f.until == "2026-01-06"
	contains(f.message, "cold.frostbite.risk")
	f.message == "wind-chill checks (cold.bedding.stale, cold.shelter.missing, cold.frostbite.risk) not judged on 2 days without a reading with wind (every reading without wind)"
}

test_site_with_wind_every_day_is_quiet if {
	count(missing.findings) == 0 with input as site([])
}

test_site_day_without_any_reading_says_so if {
	some f in missing.findings with input as site([{"from": "2026-01-14", "until": "2026-01-14", "days": 1, "days_with_readings_without_wind": 0, "evidence": []}])
	f.message == "wind-chill checks (cold.bedding.stale, cold.shelter.missing, cold.frostbite.risk) not judged on 1 day without a reading with wind (no reading at all)"
	f.evidence == []
}
