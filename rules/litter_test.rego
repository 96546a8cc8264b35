package welfare.litter_test

import data.welfare.litter

dam(l) := {"kind": "animal", "id": "RF-101", "ref": "animals.csv:2", "species": "vulpes_vulpes", "litters": [object.union(
	{"id": "L-25-01", "ref": "litters.csv:2", "species": "vulpes_vulpes", "whelped_on": "2025-05-04", "weaned_on": "2025-06-29", "age_days": 56, "born": 6, "born_alive": 6, "weaned": 6},
	l,
)]}

# Council of Europe fur-animal recommendation (1999): young not separated from the dam before
# 8 weeks (from memory) = 56 days.
test_weaned_at_8_weeks_is_quiet if {
	count(litter.findings) == 0 with input as dam({})
}

test_weaned_at_55_days_fires if {
	fs := litter.findings with input as dam({"weaned_on": "2025-06-28", "age_days": 55})
	some f in fs
	f.check == "litter.weaning.early"
	f.subject == "L-25-01"
	f.on == "2025-06-28"
}

test_mink_weaned_at_6_weeks_fires if {
	some f in litter.findings with input as dam({"species": "neogale_vison", "age_days": 42})
	f.check == "litter.weaning.early"
}

test_losses_of_exactly_25_pct_are_not_above if {
	count(litter.findings) == 0 with input as dam({"born": 8, "born_alive": 7, "weaned": 6})
}

test_losses_above_25_pct_fire if {
	some f in litter.findings with input as dam({"born": 8, "born_alive": 7, "weaned": 5})
	f.check == "litter.losses.high"
	contains(f.message, "37.5 %")
}

test_no_births_no_loss if {
	count(litter.findings) == 0 with input as dam({"born": 0, "born_alive": 0, "weaned": 0})
}
