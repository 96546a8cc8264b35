package welfare.care_test

import data.welfare.care

day(d, observed) := {"day": d, "occupied": true, "observed": observed, "fed": true, "unfed_run": 0, "refs": ["daily_care.csv:2"]}

test_observed_day_gives_no_finding if {
	count(care.findings) == 0 with input as {"id": "E-01", "days": [day("2026-01-05", true)]}
}

test_missed_observation_is_found if {
	fs := care.findings with input as {"id": "E-01", "days": [day("2026-01-05", false)]}
	some f in fs
	f.check == "care.observation.missed"
	f.on == "2026-01-05"
}

test_limits_are_data if {
	data.limits.cold.frostbite_wind_chill_c == -28
}
