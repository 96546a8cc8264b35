# METADATA
# title: Warm season
# description: |
#   Water checks and shade for animals in outdoor and sheltered buildings on hot days, and
#   heat-index weather at each site. The heat index is the NWS formula (Steadman's simple
#   form below 80 °F, else the Rothfusz regression with the NWS adjustments) of each reading,
#   computed in °F and compared in °C, unrounded; a day's figure is the maximum over its
#   readings. A reading without humidity has no heat index: its air temperature stands, and
#   the messages say so. The enclosure days are selected with the limits in force; these rules
#   compare their figures against data.limits.heat again and word the messages.
#   DAY = {on, readings, max_air_c, max_heat_index_c, max_heat_index_f, band (none, caution,
#     extreme_caution, danger, extreme_danger), band_wording, peak_at, peak_air_c,
#     peak_humidity_pct, humidity_recorded, readings_without_humidity, evidence, run}.
#   run: null, or the figures of the day's run of consecutive days at or above the check's
#     limit (danger_heat_index_c for sites, hot_day_c for enclosures): {from, until, days,
#     hottest_on, max_heat_index_c, max_heat_index_f, band_wording, peak_at, peak_air_c,
#     peak_humidity_pct, humidity_recorded, days_without_humidity: [day]}. A run finding keeps
#     its first day's message, so messages describe the run.
#   Input (site): {id, heat: {readings_recorded, days: [DAY]}} (every day with readings).
#   Input (enclosure, outdoor or sheltered buildings only): {id, ref, ..., heat: {exposure,
#     weather_site, shade, shade_recorded, hot_days: [DAY + water_checks], fewest_water_checks}}
#     (occupied days whose maximum air temperature or heat index reaches hot_day_c; the fewest
#     water checks of any of them, null without one).
#   The heat index describes how hot it feels to a person in the shade; for animals it is a
#   guide, and the attending veterinarian decides what the animals need.
# scope: package
# custom:
#   subjects: [site, enclosure]
package welfare.heat

lim := data.limits.heat

# run_text describes the hottest moment of a run of hot days, in the NWS band, and says on
# which days the air temperature stood for the heat index because no humidity was recorded.
run_text(r) := sprintf("hottest %s: heat index %v °C (%v °F), NWS %s, at %s (air %v °C, humidity %s)%s", [r.hottest_on, round(r.max_heat_index_c * 10) / 10, round(r.max_heat_index_f), r.band_wording, r.peak_at, r.peak_air_c, pct(r.peak_humidity_pct), humidity_note(r)])

# run_of is the day's run; a day given without one stands as a run of one day.
run_of(d) := d.run if d.run != null

else := {
	"days": 1, "hottest_on": d.on, "max_heat_index_c": d.max_heat_index_c, "max_heat_index_f": d.max_heat_index_f,
	"band_wording": d.band_wording, "peak_at": d.peak_at, "peak_air_c": d.peak_air_c,
	"peak_humidity_pct": d.peak_humidity_pct, "days_without_humidity": no_humidity(d),
}

no_humidity(d) := [] if d.humidity_recorded

else := [d.on]

humidity_note(r) := "" if count(r.days_without_humidity) == 0

else := sprintf("; no humidity recorded on %s: the air temperature stands for the heat index there", [concat(", ", r.days_without_humidity)])

# METADATA
# title: Too few water checks on a hot day
# description: An occupied enclosure in an outdoor or sheltered building had fewer rounds recording a water state than the limit on a day whose maximum air temperature reached hot_day_c.
# custom:
#   id: heat.water.checks_insufficient
#   severity: minor
#   source: common practice
#   needs: [daily_care.csv, weather.csv]
findings contains f if {
	# The limits are read once, not once per day: a year has about 50 hot days per enclosure.
	# Most enclosures have no day with too few checks: the fewest checks of any day (the facts
	# count it), compared first, spares them the walk over their days (a day below the limit
	# makes the fewest below). An input without that count has its days walked (the default is
	# below the limit); null, no hot day, has no day to walk.
	checks_min := lim.water_checks_min
	object.get(input.heat, "fewest_water_checks", checks_min - 1) < checks_min
	days := input.heat.hot_days
	hot_c := lim.hot_day_c
	some i
	days[i].water_checks < checks_min
	d := days[i]
	d.max_air_c >= hot_c
	f := {
		"check": "heat.water.checks_insufficient",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("%s recorded on a day up to %v °C air; from %v °C at least %d are needed so empty water is found", [count_of(d.water_checks, "water check", "water checks"), d.max_air_c, lim.hot_day_c, lim.water_checks_min]),
		"evidence": d.evidence,
	}
}

# METADATA
# title: No shade on a hot day
# description: An occupied enclosure in an outdoor building has no shade recorded on days whose maximum heat index reached hot_day_c.
# custom:
#   id: heat.shade.missing
#   severity: significant
#   source: "9 CFR §3.4(b): shade from direct sun for dogs housed outdoors; other species common practice"
#   runs: true
#   needs: [weather.csv]
findings contains f if {
	input.heat.exposure == "outdoor"
	not input.heat.shade
	hot_c := lim.hot_day_c
	some d in input.heat.hot_days
	d.max_heat_index_c >= hot_c
	f := {
		"check": "heat.shade.missing",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("%s on %s with heat index at or above %v °C; %s; outdoor animals need shade from direct sun", [shade_text(input.heat), count_of(run_of(d).days, "day", "days"), lim.hot_day_c, run_text(run_of(d))]),
		"evidence": d.evidence,
	}
}

shade_text(h) := "no shade recorded" if not h.shade_recorded

else := "enclosure recorded without shade"

# METADATA
# title: Heat index in the extreme caution band or above
# description: A weather site's maximum heat index of the day reached the limit (32 °C, the NWS extreme caution band, by default). A note for the keepers' and the animals' protection; the message names the band.
# custom:
#   id: heat.danger
#   severity: note
#   source: "NWS heat index bands: 27–32 °C caution, 32–39 extreme caution, 39–51 danger, 52 and above extreme danger"
#   runs: true
#   needs: [weather.csv]
findings contains f if {
	days := input.heat.days
	danger_c := lim.danger_heat_index_c
	some d in days
	d.max_heat_index_c >= danger_c
	f := {
		"check": "heat.danger",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("heat index at or above %v °C on %s; %s", [lim.danger_heat_index_c, count_of(run_of(d).days, "day", "days"), run_text(run_of(d))]),
		"evidence": d.evidence,
	}
}

pct(p) := sprintf("%v %%", [p]) if p != null

else := "not recorded"

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
