# METADATA
# title: Health and mortality
# description: |
#   Deaths, weights, body condition, clinical signs, abnormal behaviour and veterinary cases per
#   animal; mortality per building and calendar month on the facility document. Go measures
#   (hours, days, masses, counts, animal-days); these rules compare with data.limits.health.
#   Day numbers (day, from_day, ...) count days since 1970-01-01.
#   Input (animal): {id, ref, species, left_on, left_reason, deaths_recorded, left_in_period,
#     deaths: [{on, at, ref, in_period, found_by, cause, vet_notified_at, notify_hours, necropsy, necropsy_ref}],
#     weights: [{n, on, day, at, kg, ref, in_period}]   every weighing up to the period's end, n = order,
#     conditions: [{on, score, ref}]                   body condition scores in the period,
#     signs: [{on, day, at, ref, in_period, signs, vet_informed,
#       answers: [{purpose, hours, ref}]               first handling of each purpose at or after the observation,
#       case: {id, days, ref} | null}]                 first case opened on or after the observation's day,
#     cases: [{id, ref, opened_on, closed_on, outcome, diagnosis, period_from_day, period_until_day,
#       intervals: [{from, from_day, by, ref, next_day, next}]}]}  from one review to the next (or closing, or period end + 1).
#   Input (facility): {..., mortality: [{building, month, on, deaths, death_list: [{animal, on, ref}],
#     animal_days, days_in_month}]}  mean daily population = animal_days / days_in_month.
#   The response to a sick or dead animal is the attending veterinarian's to decide.
# scope: package
# custom:
#   subjects: [animal, facility]
package welfare.health

lim := data.limits.health

defer := "The attending veterinarian decides the care; the animal-care committee and local law set the response."

# METADATA
# title: Veterinarian not notified of a death
# description: A death with vet_notified_at empty or more than notify_vet_within_hours after found_dead_at.
# custom:
#   id: health.death.vet_not_notified
#   severity: significant
#   source: common practice
#   needs: [deaths.csv]
findings contains f if {
	some d in input.deaths
	d.in_period
	not notified_in_time(d)
	f := {
		"check": "health.death.vet_not_notified",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("found dead %s; %s (limit %v h)", [d.at, notified_text(d), lim.notify_vet_within_hours]),
		"evidence": [d.ref],
	}
}

notified_in_time(d) if {
	d.notify_hours != null
	d.notify_hours <= lim.notify_vet_within_hours
}

notified_text(d) := "no vet_notified_at recorded" if d.notify_hours == null

else := sprintf("the veterinarian was told %s, %.1f h later", [d.vet_notified_at, d.notify_hours])

# METADATA
# title: Death unexplained
# description: A death whose suspected_cause is empty or unknown and with no necropsy.
# custom:
#   id: health.death.unexplained
#   severity: minor
#   source: "common practice: necropsy of unexplained deaths (Guide for the Care and Use of Laboratory Animals, 8th ed., ch. 4) (from memory)"
#   needs: [deaths.csv]
findings contains f if {
	some d in input.deaths
	d.in_period
	d.cause in {null, "unknown"}
	not d.necropsy
	f := {
		"check": "health.death.unexplained",
		"subject": input.id,
		"on": d.on,
		"message": sprintf("found dead %s with no suspected cause and no necropsy. %s", [d.at, defer]),
		"evidence": [d.ref],
	}
}

# METADATA
# title: Monthly mortality high
# description: A building's deaths (deaths.csv, not culls) in a calendar month are at least mortality.min_deaths and above mortality.monthly_pct of its mean daily population that month.
# custom:
#   id: health.mortality.high
#   severity: minor
#   source: facility choice
#   needs: [deaths.csv]
findings contains f if {
	some m in input.mortality
	m.deaths >= lim.mortality.min_deaths
	m.animal_days > 0
	(m.deaths * 100) * m.days_in_month > lim.mortality.monthly_pct * m.animal_days
	mean := m.animal_days / m.days_in_month
	f := {
		"check": "health.mortality.high",
		"subject": m.building,
		"on": m.on,
		"message": sprintf("%d deaths in %s against a mean daily population of %.1f (%d animal-days / %d days): %.1f %%, above %v %%. %s", [
			m.deaths, m.month, mean, m.animal_days, m.days_in_month, (m.deaths * 100) / mean, lim.mortality.monthly_pct, defer,
		]),
		"evidence": [d.ref | some d in m.death_list],
	}
}

# Each weighing in the period at least weight_loss_pct below the highest
# weighing of the preceding weight_loss_days (the weighings before it, by n,
# at most weight_loss_days earlier); the peak is the earliest weighing at
# that highest mass. A loss needs a heavier weighing before it (masses are
# above 0 kg and weight_loss_pct above 0 %), so a weighing at the animal's
# heaviest mass is passed over before the look-back.
losses contains x if {
	varies
	dips
	some i, w in input.weights
	w.in_period
	w.kg < heaviest
	b := block_of[i]
	since := w.day - lim.weight_loss_days # the first day of the look-back
	prior := [p |
		some c in [b - 1, b]
		some p in weighings_in_block[c]
		p.n < w.n
		p.day >= since
	]
	count(prior) > 0
	top := max([p.kg | some p in prior])
	w.kg < top # a plain comparison before the arithmetic: a growing animal has no heavier weighing before
	(top - w.kg) * 100 >= lim.weight_loss_pct * top
	peak := sort([[p.n, p] | some p in prior; p.kg == top])[0][1]
	x := {"on": w.on, "pct": ((top - w.kg) * 100) / top, "w": w, "peak": peak}
}

# The look-back reads two blocks of weighings, not all of them. Days are cut
# into blocks of weight_loss_days + 1 days; a weighing's day and the
# weight_loss_days before it span at most its own block and the one before.
# This relies on the weighings' order: the facts (checker/facts_health.go)
# number an animal's weighings in time order, so one with a smaller n lies
# on the same day or earlier, never in a later block. Only Go guarantees it;
# the input schema does not order the list, and the rules do not need the
# list itself in order.
loss_block(day) := floor(day / (lim.weight_loss_days + 1))

# The animal's masses, each once, and the heaviest of all, found once per animal.
masses := {k | k := input.weights[_].kg}

heaviest := max(masses)

# The animal's masses vary enough for a loss: its lightest weighing is at
# least weight_loss_pct below its heaviest. A loss compares a weighing with
# a heavier one before it, both among the animal's weighings, and the loss
# the rule computes, (top - kg) * 100 against weight_loss_pct * top, only
# grows with a heavier top (weight_loss_pct is below 100) and a lighter kg;
# so an animal whose masses vary less (an adult weighed at a steady mass)
# has none, and its weighings are not looked at one by one.
# A single mass, weighed again and again, needs no arithmetic to tell.
varies if {
	count(masses) > 1
	least := min(masses)
	(heaviest - least) * 100 >= lim.weight_loss_pct * heaviest
}

# Some weighing is lighter than one before it, or the list is not in order:
# the weighings one after another in the list are not all later (by n) and
# no lighter. A loss compares a weighing with a heavier one before it (by n),
# so an animal whose list only rises, a growing cub, has none, and its
# weighings are not looked at one by one. The list in n order (the facts
# give it so) is not assumed: a list out of order is gone through as any
# other with a dip.
dips if count([i |
	some i, w in input.weights
	p := input.weights[i - 1]
	p.n < w.n
	p.kg <= w.kg
]) != count(input.weights) - 1

# Each weighing's block (by its index in the list), computed once per weighing.
block_of := {i: loss_block(w.day) | some i, w in input.weights}

# The animal's weighings per block, found once per animal, in the list's
# order: each block's weighings are picked by the blocks computed above, not
# by computing every weighing's block again for every block.
weighings_in_block := {b: ws |
	some b in {c | some c in block_of}
	ws := [input.weights[i] | some i, c in block_of; c == b]
}

# METADATA
# title: Weight loss
# description: A recorded mass at least weight_loss_pct below the animal's highest mass recorded in the preceding weight_loss_days; significant at weight_loss_significant_pct. Weights come from observations.csv.
# custom:
#   id: health.weight.loss
#   severity: minor
#   escalation: "significant from a loss of 20 % by default (limit weight_loss_significant_pct)"
#   source: common practice (weight loss as a welfare and humane-endpoint signal)
#   needs: [observations.csv]
findings contains f if {
	some on in {x.on | some x in losses}
	ranked := sort([[x.pct, x.w.n, x] | some x in losses; x.on == on])
	x := ranked[count(ranked) - 1][2]
	f := {
		"check": "health.weight.loss",
		"subject": input.id,
		"on": on,
		"severity": loss_severity(x),
		"severity_reason": sprintf("significant: %.1f %% lost, at or above %v %%", [x.pct, lim.weight_loss_significant_pct]),
		"message": sprintf("weighed %.2f kg on %s, %.1f %% below %.2f kg on %s (limit %v %% within %d days). %s", [
			x.w.kg, x.w.on, x.pct, x.peak.kg, x.peak.on, lim.weight_loss_pct, lim.weight_loss_days, defer,
		]),
		"evidence": [x.peak.ref, x.w.ref],
	}
}

loss_severity(x) := "significant" if {
	(x.peak.kg - x.w.kg) * 100 >= lim.weight_loss_significant_pct * x.peak.kg
} else := "minor"

# Some body condition score is poor: each distinct score is compared once,
# and the scores are gone through by day only when one is.
some_poor if {
	some score in {s | s := input.conditions[_].score}
	score <= lim.condition_poor_max
}

# METADATA
# title: Poor body condition
# description: A body condition score at or below condition_poor_max (of 5); significant at or below condition_severe_max.
# custom:
#   id: health.condition.poor
#   severity: minor
#   escalation: "significant at body condition 1 of 5 or below by default (limit condition_severe_max)"
#   source: common practice
#   needs: [observations.csv]
findings contains f if {
	some_poor

	# the days with a poor score; the day's lowest score is then poor too
	some on in {c.on | some c in input.conditions; c.score <= lim.condition_poor_max}
	lowest := min([c.score | some c in input.conditions; c.on == on])
	f := {
		"check": "health.condition.poor",
		"subject": input.id,
		"on": on,
		"severity": condition_severity(lowest),
		"severity_reason": sprintf("significant: body condition %d of 5, at or below %d", [lowest, lim.condition_severe_max]),
		"message": sprintf("body condition %d of 5 (poor at %d or below). %s", [lowest, lim.condition_poor_max, defer]),
		"evidence": [c.ref | some c in input.conditions; c.on == on],
	}
}

condition_severity(score) := "significant" if score <= lim.condition_severe_max

else := "minor"

unattended contains s if {
	some s in input.signs
	s.in_period
	some x in s.signs
	x in lim.needs_vet
	not answered(s)
}

answered(s) if {
	some a in s.answers
	a.purpose in lim.signs_answered_by
	a.hours <= lim.signs_answer_hours
}

answered(s) if {
	s.case != null
	s.case.days <= lim.signs_case_days
}

# METADATA
# title: Clinical sign not attended
# description: An observation with a sign from needs_vet and no handling of a signs_answered_by purpose within signs_answer_hours, nor a treatment case opened within signs_case_days of its date.
# custom:
#   id: health.signs.unattended
#   severity: significant
#   source: common practice
#   needs: [observations.csv]
findings contains f if {
	input.signs[0] # no observation with signs: nothing to go through
	some on in {s.on | some s in unattended}
	obs := [s | some s in unattended; s.on == on]
	signs := {x | some s in obs; some x in s.signs; x in lim.needs_vet}
	f := {
		"check": "health.signs.unattended",
		"subject": input.id,
		"on": on,
		"message": sprintf("%s observed %s; no %s within %v h and no case opened within %s. %s", [
			concat(", ", sort(signs)), concat(", ", sort([s.at | some s in obs])),
			concat(" or ", lim.signs_answered_by), lim.signs_answer_hours, count_of(lim.signs_case_days, "day", "days"), defer,
		]),
		"evidence": [s.ref | some s in obs],
	}
}

# Observations with an abnormal-behaviour sign, and the days on which one
# completes behaviour_count of them within behaviour_days.
behaviour := {s | some s in input.signs; some x in s.signs; x in lim.behaviour_signs}

window(day) := [s | some s in behaviour; s.day <= day; day - s.day <= lim.behaviour_days]

candidates := {s.day | some s in behaviour; count(window(s.day)) >= lim.behaviour_count}

# The first candidate fires; after a firing, the next is the first candidate
# at least behaviour_days later.
following := {c: {n | n := min({x | some x in candidates; x >= c + lim.behaviour_days})} | some c in candidates}

fired := graph.reachable(following, {min(candidates)}) if count(candidates) > 0

# METADATA
# title: Abnormal behaviour
# description: At least behaviour_count observations with a behaviour_signs sign (stereotypy, fur chewing, tail biting) within behaviour_days; fires on the day that completes the count, not again until behaviour_days after it.
# custom:
#   id: health.behaviour.abnormal
#   severity: minor
#   source: "common practice: stereotypies and fur chewing in farmed foxes and mink (EU scientific committee report on fur animals, 2001) (from memory)"
#   needs: [observations.csv]
findings contains f if {
	input.signs[0] # no observation with signs: nothing to go through
	some c in fired
	some s in behaviour
	s.day == c
	s.in_period
	obs := sort([[o.at, o] | some o in window(c)])
	f := {
		"check": "health.behaviour.abnormal",
		"subject": input.id,
		"on": s.on,
		"message": sprintf("%d observations of %s within %d days (%s). %s", [
			count(obs), concat("/", {x | some o in obs; some x in o[1].signs; x in lim.behaviour_signs}),
			lim.behaviour_days, concat(", ", [o[0] | some o in obs]), defer,
		]),
		"evidence": [o[1].ref | some o in obs],
	}
}

add_days(date, n) := time.format([time.add_date(time.parse_ns("2006-01-02", date), 0, 0, n), "UTC", "2006-01-02"])

# METADATA
# title: Veterinary case not reviewed
# description: An open case with no veterinarian's review (its opening, reviewed_on, or a vet_exam handling of the animal) for more than case_review_days; on = the first day more than case_review_days after the last review, once per gap.
# custom:
#   id: health.case.unreviewed
#   severity: minor
#   source: facility choice
#   needs: [treatments.csv]
findings contains f if {
	some c in input.cases
	some iv in c.intervals
	gap_day := (iv.from_day + lim.case_review_days) + 1
	gap_day < iv.next_day
	gap_day >= c.period_from_day
	gap_day <= c.period_until_day
	f := {
		"check": "health.case.unreviewed",
		"subject": c.id,
		"on": add_days(iv.from, lim.case_review_days + 1),
		"message": sprintf("case %s (%s) of %s: last review %s (%s); none for more than %d days", [
			c.id, c.diagnosis, input.id, iv.from, iv.by, lim.case_review_days,
		]),
		"evidence": sort({c.ref, iv.ref}),
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
