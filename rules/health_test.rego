package welfare.health_test

import data.welfare.health

# Day numbers count days since 1970-01-01: 2026-01-01 is day 20454.
animal(facts) := object.union(
	{
		"kind": "animal", "id": "RF-101", "ref": "animals.csv:2", "species": "vulpes_vulpes",
		"left_on": null, "left_reason": null, "deaths_recorded": true, "left_in_period": false,
		"deaths": [], "weights": [], "conditions": [], "signs": [], "cases": [],
	},
	facts,
)

checks(fs) := {f.check | some f in fs}

test_nothing_recorded_is_quiet if {
	count(health.findings) == 0 with input as animal({})
}

# ---- deaths: notify_vet_within_hours 24 [C]

death(extra) := object.union(
	{
		"on": "2026-01-13", "at": "2026-01-13 07:40", "ref": "deaths.csv:2", "in_period": true, "found_by": "ST-01",
		"cause": "cold", "vet_notified_at": "2026-01-14 07:40", "notify_hours": 24, "necropsy": false, "necropsy_ref": null,
	},
	extra,
)

test_vet_told_at_exactly_24_h_is_in_time if {
	count(health.findings) == 0 with input as animal({"deaths": [death({})]})
}

test_vet_told_after_24_h_fires if {
	fs := health.findings with input as animal({"deaths": [death({"vet_notified_at": "2026-01-14 07:46", "notify_hours": 24.1})]})
	checks(fs) == {"health.death.vet_not_notified"}
	some f in fs
	f.on == "2026-01-13"
	f.evidence == ["deaths.csv:2"]
}

test_vet_never_told_fires if {
	fs := health.findings with input as animal({"deaths": [death({"vet_notified_at": null, "notify_hours": null})]})
	some f in fs
	contains(f.message, "no vet_notified_at recorded")
}

test_death_outside_the_period_is_not_judged if {
	count(health.findings) == 0 with input as animal({"deaths": [death({"in_period": false, "notify_hours": null, "cause": null})]})
}

test_unknown_cause_without_necropsy_fires if {
	checks(health.findings) == {"health.death.unexplained"} with input as animal({"deaths": [death({"cause": null})]})
	checks(health.findings) == {"health.death.unexplained"} with input as animal({"deaths": [death({"cause": "unknown"})]})
}

test_necropsy_explains if {
	count(health.findings) == 0 with input as animal({"deaths": [death({"cause": "unknown", "necropsy": true})]})
}

# ---- weight: weight_loss_pct 10, weight_loss_significant_pct 20, weight_loss_days 30 [C]

weigh(n, day, kg) := {
	"n": n, "on": sprintf("2026-01-%02d", [day]), "day": 20453 + day, "at": sprintf("2026-01-%02d 09:00", [day]),
	"kg": kg, "ref": sprintf("observations.csv:%d", [n + 2]), "in_period": true,
}

test_loss_of_exactly_10_pct_fires_minor if {
	fs := health.findings with input as animal({"weights": [weigh(0, 2, 10), weigh(1, 20, 9)]})
	some f in fs
	f.check == "health.weight.loss"
	f.on == "2026-01-20"
	f.severity == "minor"
	f.evidence == ["observations.csv:2", "observations.csv:3"]
}

test_loss_under_10_pct_is_quiet if {
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 2, 10), weigh(1, 20, 9.01)]})
}

test_loss_of_exactly_20_pct_is_significant if {
	some f in health.findings with input as animal({"weights": [weigh(0, 2, 10), weigh(1, 20, 8)]})
	f.severity == "significant"
}

test_highest_of_the_window_counts if {
	some f in health.findings with input as animal({"weights": [weigh(0, 1, 9.5), weigh(1, 8, 10), weigh(2, 15, 9.2), weigh(3, 22, 9)]})
	f.on == "2026-01-22"
	f.evidence == ["observations.csv:3", "observations.csv:5"]
}

test_peak_exactly_30_days_before_counts if {
	some f in health.findings with input as animal({"weights": [weigh(0, 1, 10), weigh(1, 31, 9)]})
	f.check == "health.weight.loss"
}

test_peak_31_days_before_is_out_of_the_window if {
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 1, 10), weigh(1, 31, 9)]}) with data.limits.health.weight_loss_days as 29
}

test_weighing_before_the_period_is_a_peak_not_a_finding if {
	fs := health.findings with input as animal({"weights": [object.union(weigh(0, 1, 10), {"in_period": false}), weigh(1, 2, 10)]})
	count(fs) == 0
}

# The look-back reads the weighing's block of 31 days (weight_loss_days + 1)
# and the block before; blocks start on days divisible by 31: day 20460
# (2026-01-07), 20491 (2026-02-07). weighed(n, day, kg) is at an absolute day.
weighed(n, day, kg) := {
	"n": n, "on": on_day(day), "day": day, "at": sprintf("%s 09:00", [on_day(day)]),
	"kg": kg, "ref": sprintf("observations.csv:%d", [n + 2]), "in_period": true,
}

on_day(day) := time.format([(day * 86400) * 1000000000, "UTC", "2006-01-02"])

loss_checks(ws) := [[f.on, f.evidence] | some f in health.findings with input as animal({"weights": ws}); f.check == "health.weight.loss"]

test_window_of_exactly_30_days_at_block_edges if {
	# peak on a block's first day, loss on its last (same block)
	loss_checks([weighed(0, 20460, 10), weighed(1, 20490, 9)]) == [["2026-02-06", ["observations.csv:2", "observations.csv:3"]]]

	# peak on a block's last day, loss 30 days later in the next block
	loss_checks([weighed(0, 20459, 10), weighed(1, 20489, 9)]) == [["2026-02-05", ["observations.csv:2", "observations.csv:3"]]]
	loss_checks([weighed(0, 20490, 10), weighed(1, 20520, 9)]) == [["2026-03-08", ["observations.csv:2", "observations.csv:3"]]]
}

test_window_of_31_days_is_out_at_block_edges if {
	loss_checks([weighed(0, 20460, 10), weighed(1, 20491, 9)]) == []
	loss_checks([weighed(0, 20459, 10), weighed(1, 20490, 9)]) == []

	# two blocks back
	loss_checks([weighed(0, 20429, 10), weighed(1, 20491, 9)]) == []
}

test_two_weighings_on_one_day if {
	# the later weighing of the day is measured against the earlier one
	loss_checks([weighed(0, 20470, 10), weighed(1, 20470, 9)]) == [["2026-01-17", ["observations.csv:2", "observations.csv:3"]]]

	# not the other way round: the earlier has no weighing before it
	loss_checks([weighed(0, 20470, 9), weighed(1, 20470, 10)]) == []
}

test_the_earliest_of_two_peaks_is_the_evidence if {
	loss_checks([weighed(0, 20465, 10), weighed(1, 20475, 10), weighed(2, 20485, 9)]) == [["2026-02-01", ["observations.csv:2", "observations.csv:4"]]]
}

test_list_order_does_not_matter if {
	# n orders the weighings, not their place in the list
	ws := [weighed(0, 20459, 9.5), weighed(1, 20465, 10), weighed(2, 20475, 10), weighed(3, 20485, 9), weighed(4, 20500, 8.5)]
	want := loss_checks(ws)
	count(want) == 2
	loss_checks([ws[3], ws[0], ws[4], ws[2], ws[1]]) == want
	loss_checks([ws[4], ws[3], ws[2], ws[1], ws[0]]) == want
}

# The look-back as first written, scanning every weighing of the animal for
# each: the reference the two-block look-back must agree with.
reference_losses(ws) := {x |
	some w in ws
	w.in_period
	prior := [p | some p in ws; p.n < w.n; w.day - p.day <= data.limits.health.weight_loss_days]
	count(prior) > 0
	top := max([p.kg | some p in prior])
	(top - w.kg) * 100 >= data.limits.health.weight_loss_pct * top
	peak := [p | some p in prior; p.kg == top][0]
	x := {"on": w.on, "pct": ((top - w.kg) * 100) / top, "w": w, "peak": peak}
}

# Series of weighings in time order, numbered n = 0, 1, ...: gaps of 0 to 62
# days (the same day, the window's edge, beyond it) and masses that fall and
# rise, shifted per series so that they meet the block edges differently.
gaps := [0, 1, 29, 30, 31, 32, 7, 0, 62, 15, 30, 1, 3]

masses := [10, 9, 9.5, 10.2, 8.9, 9.18, 10, 8, 9.9, 8.91, 7.5, 9, 9]

series(s) := [weighed(k, day, kg) |
	some k in numbers.range(0, count(gaps) - 1)
	day := (20440 + s) + sum([gaps[(i + s) % count(gaps)] | some i in numbers.range(0, k)])
	kg := masses[((k + 2) * s) % count(masses)]
]

test_two_block_lookback_agrees_with_scanning_every_weighing if {
	found := [count(reference_losses(series(s))) | some s in numbers.range(0, 40)]
	sum(found) > 40 # the series do have losses to agree on
	every s in numbers.range(0, 40) {
		health.losses == reference_losses(series(s)) with input as animal({"weights": series(s)})
	}
	every s in numbers.range(0, 40) {
		health.losses == reference_losses(series(s)) with input as animal({"weights": series(s)}) with data.limits.health.weight_loss_days as 7
	}
}

# ---- body condition: poor at 2 or below, significant at 1 [C]

test_condition_scores if {
	count(health.findings) == 0 with input as animal({"conditions": [{"on": "2026-01-05", "score": 3, "ref": "observations.csv:2"}]})
	some minor in health.findings with input as animal({"conditions": [{"on": "2026-01-05", "score": 2, "ref": "observations.csv:2"}]})
	minor.severity == "minor"
	some sig in health.findings with input as animal({"conditions": [{"on": "2026-01-05", "score": 1, "ref": "observations.csv:2"}]})
	sig.severity == "significant"
}

# An animal is gone through weighing by weighing only when its lightest mass is
# weight_loss_pct below its heaviest: a growing animal's masses vary that much
# without a loss, a steady one's just under it has none, and at exactly 10 %
# the loss fires whichever weighing of the animal is the lightest or heaviest.
test_growing_animal_varies_without_a_loss if {
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 2, 2), weigh(1, 9, 4), weigh(2, 16, 6)]})
}

# A list that only rises (by n, masses equal or heavier) is not gone through
# weighing by weighing; one dip in it, or a list out of n order, is.
test_rising_list_is_quiet_and_a_dip_in_it_fires if {
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 2, 2), weigh(1, 9, 6), weigh(2, 16, 6), weigh(3, 23, 7)]})
	fs := health.findings with input as animal({"weights": [weigh(0, 2, 2), weigh(1, 9, 10), weigh(2, 16, 9), weigh(3, 23, 11)]})
	[[f.on, f.evidence] | some f in fs] == [["2026-01-16", ["observations.csv:3", "observations.csv:4"]]]
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 2, 2), weigh(1, 9, 10), weigh(2, 16, 9.01), weigh(3, 23, 11)]})
}

test_list_rising_in_its_order_but_falling_by_n_fires if {
	fs := health.findings with input as animal({"weights": [weigh(1, 20, 9), weigh(0, 2, 10)]})
	[[f.on, f.evidence] | some f in fs] == [["2026-01-20", ["observations.csv:2", "observations.csv:3"]]]
}

test_steady_animal_just_under_the_loss_is_quiet if {
	count(health.findings) == 0 with input as animal({"weights": [weigh(0, 2, 10), weigh(1, 9, 9.01), weigh(2, 16, 9.5), weigh(3, 23, 9.01)]})
}

test_loss_of_exactly_10_pct_fires_before_a_later_peak if {
	fs := health.findings with input as animal({"weights": [weigh(0, 2, 10), weigh(1, 9, 9), weigh(2, 16, 12)]})
	[[f.on, f.evidence] | some f in fs] == [["2026-01-09", ["observations.csv:2", "observations.csv:3"]]]
}

# Each day's scores are gone through only when a score is poor (2 or below [C]):
# one poor score among good ones fires on its own day only.
test_one_poor_score_among_good_ones if {
	fs := health.findings with input as animal({"conditions": [
		{"on": "2026-01-05", "score": 3, "ref": "observations.csv:2"},
		{"on": "2026-01-06", "score": 2, "ref": "observations.csv:3"},
		{"on": "2026-01-06", "score": 4, "ref": "observations.csv:4"},
		{"on": "2026-01-07", "score": 3, "ref": "observations.csv:5"},
	]})
	[[f.on, f.evidence] | some f in fs] == [["2026-01-06", ["observations.csv:3", "observations.csv:4"]]]
}

# ---- signs: answered within 48 h, or a case within 2 days [C]

sign(signs, answers, kase) := {
	"on": "2026-01-15", "day": 20468, "at": "2026-01-15 08:00", "ref": "observations.csv:9", "in_period": true,
	"signs": signs, "vet_informed": false, "answers": answers, "case": kase,
}

test_lameness_seen_at_exactly_48_h_is_answered if {
	count(health.findings) == 0 with input as animal({"signs": [sign(["lameness"], [{"purpose": "health_check", "hours": 48, "ref": "handling.csv:4"}], null)]})
}

test_lameness_seen_after_48_h_fires if {
	fs := health.findings with input as animal({"signs": [sign(["lameness"], [{"purpose": "vet_exam", "hours": 48.5, "ref": "handling.csv:4"}], null)]})
	some f in fs
	f.check == "health.signs.unattended"
	f.on == "2026-01-15"
}

test_a_weighing_does_not_answer_a_sign if {
	some f in health.findings with input as animal({"signs": [sign(["wound"], [{"purpose": "weighing", "hours": 1, "ref": "handling.csv:4"}], null)]})
	f.check == "health.signs.unattended"
}

test_case_opened_within_2_days_answers if {
	count(health.findings) == 0 with input as animal({"signs": [sign(["wound"], [], {"id": "C-1", "days": 2, "ref": "treatments.csv:2"})]})
	some f in health.findings with input as animal({"signs": [sign(["wound"], [], {"id": "C-1", "days": 3, "ref": "treatments.csv:2"})]})
	f.check == "health.signs.unattended"
}

test_sign_not_needing_a_vet_is_quiet if {
	count(health.findings) == 0 with input as animal({"signs": [sign(["fur_loss"], [], null)]})
}

# The signs rules skip an animal with no observation of signs; one whose first
# observation needs no veterinarian is still gone through to its last.
test_sign_after_a_quiet_observation_fires if {
	some f in health.findings with input as animal({"signs": [sign(["fur_loss"], [], null), sign(["wound"], [], null)]})
	f.check == "health.signs.unattended"
	count(health.findings) == 0 with input as animal({"signs": []})
}

# ---- behaviour: 3 within 30 days, then not again for 30 days [C]

date_of(day) := sprintf("2026-01-%02d", [day]) if day <= 31

else := sprintf("2026-02-%02d", [day - 31])

beh(day) := {
	"on": date_of(day), "day": 20453 + day,
	"at": sprintf("day %02d", [day]), "ref": sprintf("observations.csv:%d", [day + 1]), "in_period": true,
	"signs": ["stereotypy"], "vet_informed": false, "answers": [], "case": null,
}

behaviour_days(fs) := {f.on | some f in fs; f.check == "health.behaviour.abnormal"}

test_behaviour_fires_on_the_third_and_not_again_within_30_days if {
	fs := health.findings with input as animal({"signs": [beh(4), beh(12), beh(20), beh(27)]})
	behaviour_days(fs) == {"2026-01-20"}
}

test_behaviour_fires_again_30_days_after_it_fired if {
	# Jan 4, 12, 20 -> fires Jan 20; Feb 5 and Feb 10 complete windows too but fall within
	# 30 days of Jan 20; Feb 19 (day 50) is 30 days after Jan 20 and fires.
	fs := health.findings with input as animal({"signs": [beh(4), beh(12), beh(20), beh(36), beh(41), beh(50)]})
	behaviour_days(fs) == {"2026-01-20", "2026-02-19"}
}

test_behaviour_window_edges if {
	# The third 30 days after the first: within the window.
	behaviour_days(health.findings) == {"2026-01-31"} with input as animal({"signs": [beh(1), beh(15), beh(31)]})
	count(health.findings) == 0 with input as animal({"signs": [beh(1), beh(15), beh(32)]})
	count(health.findings) == 0 with input as animal({"signs": [beh(1), beh(15)]})
}

# ---- cases: reviewed at least every 7 days [F]

case_with(intervals) := {
	"id": "C-7", "ref": "treatments.csv:3", "opened_on": "2026-01-01", "closed_on": null, "outcome": null,
	"diagnosis": "ear mites", "period_from_day": 20454, "period_until_day": 20484, "intervals": intervals,
}

iv(from, next) := {"from": sprintf("2026-01-%02d", [from]), "from_day": 20453 + from, "by": "opened", "ref": "treatments.csv:3", "next_day": 20453 + next, "next": "vet_exam"}

test_review_8_days_later_is_in_time if {
	# Reviewed Jan 1, next Jan 9: Jan 2-8 is 7 days without review, not more.
	count(health.findings) == 0 with input as animal({"cases": [case_with([iv(1, 9)])]})
}

test_review_9_days_later_fires_on_the_8th_day if {
	fs := health.findings with input as animal({"cases": [case_with([iv(1, 10)])]})
	some f in fs
	f.check == "health.case.unreviewed"
	f.subject == "C-7"
	f.on == "2026-01-09"
	f.evidence == ["treatments.csv:3"]
}

test_open_case_fires_once_per_gap if {
	fs := health.findings with input as animal({"cases": [case_with([iv(1, 32)])]})
	count(fs) == 1
}

test_gap_ending_after_the_period_is_not_judged_here if {
	count(health.findings) == 0 with input as animal({"cases": [case_with([iv(25, 32)])]})
}

# ---- mortality: min_deaths 2, monthly_pct 2 [F]

facility(months) := {"kind": "facility", "id": "Birchfall Fur Research Station", "mortality": months}

test_mortality_worked_by_hand if {
	# Shed S1, January (31 days): 24 foxes; 21 present all month (21 x 31 = 651 animal-days),
	# one culled on Jan 9 (9 days, the leaving day counts), two found dead on Jan 6 and Jan 13
	# (6 + 13 days): 651 + 9 + 6 + 13 = 679 animal-days; mean daily population 679 / 31 = 21.90.
	# 2 deaths / 21.90 = 9.13 %, above 2 %, and 2 >= min_deaths 2: a finding.
	m := {
		"building": "S1", "month": "2026-01", "on": "2026-01-01", "deaths": 2, "animal_days": 679, "days_in_month": 31,
		"death_list": [{"animal": "RF-105", "on": "2026-01-06", "ref": "deaths.csv:2"}, {"animal": "RF-118", "on": "2026-01-13", "ref": "deaths.csv:3"}],
	}
	fs := health.findings with input as facility([m])
	some f in fs
	f.check == "health.mortality.high"
	f.subject == "S1"
	f.on == "2026-01-01"
	contains(f.message, "2 deaths in 2026-01 against a mean daily population of 21.9 (679 animal-days / 31 days): 9.1 %")
}

test_one_death_is_below_min_deaths if {
	# 8 arctic foxes all month: 248 animal-days, mean 8; 1 death = 12.5 % but fewer than 2 deaths.
	count(health.findings) == 0 with input as facility([{"building": "AB", "month": "2026-01", "on": "2026-01-01", "deaths": 1, "animal_days": 248, "days_in_month": 31, "death_list": []}])
}

test_exactly_2_pct_is_not_above if {
	# Mean 100 (3,100 animal-days / 31): 2 deaths = 2 %, not above 2 %; 3,099 animal-days tips it over.
	count(health.findings) == 0 with input as facility([{"building": "S1", "month": "2026-01", "on": "2026-01-01", "deaths": 2, "animal_days": 3100, "days_in_month": 31, "death_list": []}])
	count(health.findings) == 1 with input as facility([{"building": "S1", "month": "2026-01", "on": "2026-01-01", "deaths": 2, "animal_days": 3099, "days_in_month": 31, "death_list": []}])
}
