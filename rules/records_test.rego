package welfare.records_test

import data.welfare.records

test_rejected_row_uses_its_date if {
	fs := records.findings with input as {"kind": "facility", "id": "Test", "period": {"from": "2026-01-01", "until": "2026-01-31"}, "rejected": [{"ref": "weather.csv:9", "on": "2026-01-04", "message": "weather.csv:9: air_temp_c: bad"}]}
	fs == {{"check": "records.row.rejected", "subject": "weather.csv:9", "on": "2026-01-04", "message": "weather.csv:9: air_temp_c: bad", "evidence": ["weather.csv:9"]}}
}

test_rejected_row_without_date_falls_on_period_start if {
	some f in records.findings with input as {"kind": "facility", "id": "Test", "period": {"from": "2026-01-01", "until": "2026-01-31"}, "rejected": [{"ref": "animals.csv:3", "on": null, "message": "m"}]}
	f.on == "2026-01-01"
}

animal := {"kind": "animal", "id": "F1", "ref": "animals.csv:2", "species": "vulpes_vulpes", "arrived_on": "2025-05-01", "left_on": "2026-01-10", "left_reason": "culled", "culls_recorded": true, "outside_stay": [], "culls": [{"on": "2026-01-10", "ref": "culls.csv:2"}]}

test_matching_cull_is_quiet if {
	count(records.findings) == 0 with input as animal
}

test_cull_on_other_day_fires if {
	fs := records.findings with input as object.union(animal, {"left_on": "2026-01-11"})
	some f in fs
	f.check == "records.cull.mismatch"
	f.on == "2026-01-10"
}

test_cull_with_other_reason_fires if {
	fs := records.findings with input as object.union(animal, {"left_reason": "died"})
	count(fs) == 1
}

test_culled_without_cull_row_fires if {
	fs := records.findings with input as object.union(animal, {"culls": []})
	some f in fs
	f.on == "2026-01-10"
	f.check == "records.cull.mismatch"
}

test_culled_without_culls_file_is_not_judged if {
	count(records.findings) == 0 with input as object.union(animal, {"culls": [], "culls_recorded": false})
}

test_event_after_departure_fires if {
	fs := records.findings with input as object.union(animal, {"outside_stay": [{"on": "2026-01-12", "what": "handling (weighing)", "ref": "handling.csv:40"}]})
	some f in fs
	f.check == "records.event.after_departure"
	f.evidence == ["handling.csv:40", "animals.csv:2"]
}

died := object.union(animal, {"left_on": "2026-01-13", "left_reason": "died", "culls": [], "deaths_recorded": true, "left_in_period": true, "deaths": [{"on": "2026-01-13", "ref": "deaths.csv:2", "in_period": true}]})

test_matching_death_is_quiet if {
	count(records.findings) == 0 with input as died
}

test_death_of_an_animal_recorded_as_culled_fires if {
	some f in records.findings with input as object.union(died, {"left_reason": "culled", "culls": [{"on": "2026-01-13", "ref": "culls.csv:2"}]})
	f.check == "records.death.mismatch"
	f.evidence == ["deaths.csv:2", "animals.csv:2"]
}

test_death_on_another_day_fires if {
	some f in records.findings with input as object.union(died, {"left_on": "2026-01-14"})
	f.check == "records.death.mismatch"
	f.on == "2026-01-13"
}

test_died_without_death_row_fires if {
	some f in records.findings with input as object.union(died, {"deaths": []})
	f.check == "records.death.mismatch"
	f.on == "2026-01-13"
}

test_died_without_deaths_file_is_not_judged if {
	count(records.findings) == 0 with input as object.union(died, {"deaths": [], "deaths_recorded": false})
}

# An animal without health records has no deaths key at all: nothing to compare, no finding.
test_animal_without_deaths_key_is_quiet if {
	count(records.findings) == 0 with input as object.remove(died, ["deaths", "deaths_recorded", "left_in_period"])
}

test_died_without_deaths_key_but_file_read_fires if {
	some f in records.findings with input as object.remove(died, ["deaths"])
	f.check == "records.death.mismatch"
	contains(f.message, "deaths.csv has no row")
}
