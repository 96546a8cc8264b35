package welfare.enclosure_test

import data.welfare.enclosure

seg(over) := object.union(
	{
		"from": "2026-01-01", "until": "2026-01-31", "days": 31, "count": 1,
		"occupants": [{"animal": "F1", "species": "vulpes_vulpes", "stage": "adult", "required_m2": 0.8}],
		"required_m2": 0.8, "required_unknown": [], "min_height_cm": 70, "min_cage_m2": 0.8,
		"needs_nest_box": true, "needs_platform": true, "evidence": ["enclosures.csv:2", "animals.csv:2"],
	},
	over,
)

cage(over, s) := object.union(
	{
		"kind": "enclosure", "id": "S1-01", "ref": "enclosures.csv:2", "area_m2": 0.8, "height_cm": 70,
		"max_occupants": 1, "nest_box": true, "platform": true, "occupancy": [s],
	},
	over,
)

# Council of Europe fur-animal recommendation (1999), Czech Decree 208/2004 §13:
# adult fox 0.8 m² and 70 cm — a cage of exactly that passes.
test_cage_at_the_minimum_is_quiet if {
	count(enclosure.findings) == 0 with input as cage({}, seg({}))
}

test_cage_below_area_fires if {
	some f in enclosure.findings with input as cage({"area_m2": 0.79}, seg({}))
	f.check == "enclosure.space.insufficient"
	f.on == "2026-01-01"
	f.until == "2026-01-31"
}

test_cage_below_height_fires if {
	some f in enclosure.findings with input as cage({"height_cm": 69}, seg({}))
	f.check == "enclosure.height.insufficient"
}

test_over_capacity_fires if {
	some f in enclosure.findings with input as cage({"area_m2": 2, "max_occupants": 1}, seg({"count": 2, "required_m2": 1.6}))
	f.check == "enclosure.capacity.exceeded"
}

test_no_capacity_set_is_quiet if {
	count(enclosure.findings) == 0 with input as cage({"area_m2": 2, "max_occupants": 0}, seg({"count": 2, "required_m2": 1.6}))
}

test_missing_nest_box_and_platform_fire if {
	fs := enclosure.findings with input as cage({"nest_box": false, "platform": false}, seg({}))
	{f.check | some f in fs} == {"enclosure.nest_box.missing", "enclosure.platform.missing"}
}

test_mink_needs_no_platform if {
	count(enclosure.findings) == 0 with input as cage({"platform": false, "area_m2": 0.255, "height_cm": 45}, seg({"required_m2": 0.255, "min_height_cm": 45, "min_cage_m2": 0.255, "needs_platform": false}))
}

# Council of Europe fur-animal recommendation (1999) as implemented in Czech Decree 208/2004
# (before the 2019 ban) and Finnish Decree 1084/2011 (section from memory): 2,550 cm² for two
# weaned mink (0.1275 m² each) and no mink cage below 0.255 m².
mink_juv := {"animal": "M1", "species": "neogale_vison", "stage": "juvenile", "required_m2": 0.1275}

mink_seg(n) := seg({
	"count": count(n), "occupants": n, "required_m2": sum([o.required_m2 | some o in n]),
	"min_height_cm": 45, "min_cage_m2": 0.255, "needs_platform": false,
})

test_two_weaned_mink_in_0_255_exactly_are_quiet if {
	count(enclosure.findings) == 0 with input as cage({"area_m2": 0.255, "height_cm": 45, "max_occupants": 2}, mink_seg([mink_juv, mink_juv]))
}

test_mink_cage_just_under_0_255_fires if {
	checks := {f.check | some f in enclosure.findings with input as cage({"area_m2": 0.2549, "height_cm": 45, "max_occupants": 2}, mink_seg([mink_juv, mink_juv]))}
	checks == {"enclosure.space.insufficient"}
}

test_one_weaned_mink_still_needs_a_0_255_cage if {
	some f in enclosure.findings with input as cage({"area_m2": 0.2, "height_cm": 45}, mink_seg([mink_juv]))
	f.check == "enclosure.space.insufficient"
	contains(f.message, "smaller than 0.255 m²")
	count(enclosure.findings) == 0 with input as cage({"area_m2": 0.255, "height_cm": 45}, mink_seg([mink_juv]))
}

# Same implementations: no fox cage below 0.8 m², even for one weaned cub (0.6 m²).
test_fox_cub_alone_still_needs_0_8 if {
	cub := seg({"occupants": [{"animal": "F1", "species": "vulpes_vulpes", "stage": "juvenile", "required_m2": 0.6}], "required_m2": 0.6})
	{f.check | some f in enclosure.findings with input as cage({"area_m2": 0.79}, cub)} == {"enclosure.space.insufficient"}
	count(enclosure.findings) == 0 with input as cage({"area_m2": 0.8}, cub)
}

# 9 CFR §3.6(c)(1): a dog of 30 in (76.2 cm) needs (30 + 6)² / 144 = 9 ft² = 0.836127 m²;
# the message rounds areas for people (0.836 m², two decimals from 1 m²), and says "1 animal".
test_space_message_rounds_areas_and_counts_in_words if {
	dog := seg({
		"occupants": [{"animal": "D1", "species": "canis_familiaris", "stage": "adult", "required_m2": 1.107546}],
		"required_m2": 1.107546, "min_cage_m2": 0, "min_height_cm": 0, "needs_nest_box": false, "needs_platform": false,
	})
	some f in enclosure.findings with input as cage({"area_m2": 1.045, "nest_box": false, "platform": false}, dog)
	f.check == "enclosure.space.insufficient"
	f.message == "1.04 m² for 1 animal needing 1.11 m²"
}

test_space_message_below_one_square_metre_keeps_three_decimals if {
	dog := seg({
		"occupants": [{"animal": "D1", "species": "canis_familiaris", "stage": "adult", "required_m2": 0.836127}],
		"required_m2": 0.836127, "min_cage_m2": 0, "min_height_cm": 0, "needs_nest_box": false, "needs_platform": false,
	})
	some f in enclosure.findings with input as cage({"area_m2": 0.5, "nest_box": false, "platform": false}, dog)
	f.check == "enclosure.space.insufficient"
	f.message == "0.5 m² for 1 animal needing 0.836 m²"
}
