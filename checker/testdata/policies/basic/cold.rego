# Test policy for the engine. Input: one weather site's facts as
#   {"id": "S-1", "runs": [{"from": "...", "to": "...", "min_wind_chill_c": -31, "refs": [...]}]}
# or one enclosure's facts (no "runs" key, so no findings).

# METADATA
# title: Cold (engine test policy)
# description: A package that receives two subject kinds and reports runs it computed itself.
# schemas:
#   - input: {type: object}
# scope: package
# custom:
#   subjects: [site, enclosure]
package welfare.cold

# METADATA
# title: Frostbite risk
# description: Minimum wind chill at or below the frostbite limit.
# custom:
#   id: cold.frostbite.risk
#   severity: note
#   source: Environment and Climate Change Canada wind chill hazard bands
#   runs: true
findings contains f if {
	some r in input.runs
	r.min_wind_chill_c <= data.limits.cold.frostbite_wind_chill_c
	f := {
		"check": "cold.frostbite.risk",
		"subject": input.id,
		"on": r.from,
		"until": r.to,
		"message": sprintf("wind chill down to %v", [r.min_wind_chill_c]),
		"evidence": r.refs,
	}
}
