# METADATA
# title: People
# description: |
#   Training, rabies pre-exposure prophylaxis, respirator fit and employment of the people named
#   in the records. A handler is the staff_id of a handling row; cull operators are checked for
#   euthanasia training. The rabies checks cover everyone who works with a rabies-risk species:
#   handlers, cull operators, and keepers on care rounds of enclosures such a species occupies.
#   Input (staff): {id, name, ref, staff: {active_from, active_to,
#     handled: [{on, refs, training: {trained_on, trained_after_event, valid_until},
#                respirator: null | {refs, fit_on, fit_after_event, valid_until}}],
#     culled: [{on, refs, methods, untrained_methods, trained_on, trained_after_event, valid_until}],
#     outside_active: [{on, rows, refs}],
#     rabies: [{on, refs, work: {handlings, culls, care_rounds}, category,
#               primary_on, titer_on, titer_iu_ml, booster_on}]}}
#   One entry per person per day. Where a day's rows can number hundreds (outside_active, rabies),
#   rows and work count them all and refs lists the first 10 as evidence. valid_until is the last day a training or fit test covers (the
#   same date N months later); null when there was none on or before the day. rabies has an entry
#   for each day the person worked with a rabies-risk species, with the pre-exposure series, the
#   latest titer and the latest booster recorded on or before the day (null: none) and the person's
#   ACIP 2022 risk category (rabies_risk_category in staff.csv, else the limits' category); these
#   rules judge the record by ACIP 2022 for that category. Rabies questions go to the attending
#   physician or occupational health.
# scope: package
# custom:
#   subjects: [staff]
package welfare.staff

s := input.staff

evidence(e) := array.concat([input.ref], e.refs)

rabies := data.limits.staff.rabies

# date_plus(day, years, months, days) is a calendar date that far after day (Go's normalisation: 31 Aug + 6 months = 3 Mar).
date_plus(day, y, m, d) := time.format([time.add_date(time.parse_ns("2006-01-02", day), y, m, d), "UTC", "2006-01-02"])

# rabies_status judges a person's rabies pre-exposure record r on day on by ACIP 2022 (MMWR
# 2022;71(18):619-627) for the person's risk category r.category: {status: protected|unprotected|
# overdue|not_required, reason}.
# The series is complete on rabies_primary_on (the day-7 dose); ACIP counts the titer and booster
# windows from it.
rabies_status(r, on) := {"status": "not_required", "reason": ""} if {
	# Category 5: risk no greater than the general population's; no pre-exposure prophylaxis.
	r.category == 5
} else := {"status": "unprotected", "reason": "no rabies pre-exposure series recorded"} if {
	r.primary_on == null
} else := {"status": "unprotected", "reason": sprintf("rabies pre-exposure series completed only on %s", [r.primary_on])} if {
	r.primary_on > on
} else := {"status": "protected", "reason": ""} if {
	# Category 4: the primary series only.
	r.category == 4
} else := {"status": "overdue", "reason": sprintf("titer %v IU/mL on %s is below %v IU/mL and no booster was given after it", [r.titer_iu_ml, r.titer_on, rabies.min_titer_iu_ml])} if {
	# In every category a titer below the minimum calls for a booster.
	r.titer_iu_ml != null
	r.titer_iu_ml < rabies.min_titer_iu_ml
	not booster_since(r, r.titer_on)
} else := periodic_titer(r, on) if {
	r.category in {1, 2}
} else := category_3(r, on) if {
	r.category == 3
} else := {"status": "protected", "reason": ""}

booster_since(r, day) if {
	r.booster_on != null
	r.booster_on >= day
}

# Categories 1 and 2: a titer every titer_every_months, counted from the series or the last titer after it.
periodic_titer(r, on) := {"status": "overdue", "reason": reason} if {
	months := object.get(rabies, ["titer_every_months", sprintf("%d", [r.category])], acip_titer_months[r.category])
	[since, what] := last_titer_or_series(r)
	due := date_plus(since, 0, months, 0)
	on > due
	reason := sprintf("risk category %d needs a titer every %d months; none since %s (%s), due by %s", [r.category, months, what, since, due])
} else := {"status": "protected", "reason": ""}

# ACIP 2022 titer intervals, for limits that leave titer_every_months out.
acip_titer_months := {1: 6, 2: 24}

last_titer_or_series(r) := [r.titer_on, "the last titer"] if {
	r.titer_on != null
	r.titer_on > r.primary_on
} else := [r.primary_on, "the pre-exposure series"]

# Category 3: after 3 years, a titer of at least the minimum taken in years 1-3, a booster after a
# low titer in that window, or a booster from day 21 to year 3.
category_3(r, on) := {"status": "protected", "reason": ""} if {
	on <= date_plus(r.primary_on, 3, 0, 0)
} else := {"status": "protected", "reason": ""} if {
	titer_in_window(r)
	r.titer_iu_ml >= rabies.min_titer_iu_ml
} else := {"status": "protected", "reason": ""} if {
	titer_in_window(r)
	booster_since(r, r.titer_on)
} else := {"status": "protected", "reason": ""} if {
	booster_since(r, date_plus(r.primary_on, 0, 0, 21))
	r.booster_on <= date_plus(r.primary_on, 3, 0, 0)
} else := {"status": "overdue", "reason": reason} if {
	reason := sprintf("more than 3 years since the pre-exposure series (%s) with no titer of at least %v IU/mL taken %s to %s and no booster given %s to %s", [
		r.primary_on, rabies.min_titer_iu_ml, date_plus(r.primary_on, 1, 0, 0), date_plus(r.primary_on, 3, 0, 0),
		date_plus(r.primary_on, 0, 0, 21), date_plus(r.primary_on, 3, 0, 0),
	])
}

titer_in_window(r) if {
	r.titer_on != null
	r.titer_on >= date_plus(r.primary_on, 1, 0, 0)
	r.titer_on <= date_plus(r.primary_on, 3, 0, 0)
}

# Why a training record does not cover day e.on, or undefined when it does.
lapsed(t, on, what) := sprintf("no %s recorded", [what]) if {
	t.trained_on == null
} else := sprintf("%s dated %s, after this day", [what, t.trained_on]) if {
	t.trained_after_event
} else := sprintf("%s on %s covers only until %s", [what, t.trained_on, t.valid_until]) if {
	on > t.valid_until
}

# METADATA
# title: Handler not trained
# description: The handler's animal-handling training is missing, dated after the handling, or older than the limit (12 months by default) on the day.
# custom:
#   id: staff.handling.untrained
#   severity: significant
#   source: facility choice
#   needs: [handling.csv, staff.csv]
findings contains f if {
	some e in s.handled
	why := lapsed(e.training, e.on, "handling training")
	f := {
		"check": "staff.handling.untrained",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s handled %s: %s (refresher every %d months)", [input.name, count_of(count(e.refs), "animal", "animals"), why, data.limits.staff.handling_training_months]),
		"evidence": evidence(e),
	}
}

# METADATA
# title: Euthanasia operator not trained
# description: A cull operator is not recorded as trained for the method used, or the euthanasia training is missing or older than the limit (12 months by default).
# custom:
#   id: staff.euthanasia.untrained
#   severity: significant
#   source: facility choice
#   needs: [culls.csv, staff.csv]
findings contains f if {
	some e in s.culled
	why := euthanasia_gap(e)
	f := {
		"check": "staff.euthanasia.untrained",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s performed %s by %s: %s. Euthanasia must be done only by people trained for the method, as the attending veterinarian and the AVMA Guidelines direct", [input.name, count_of(count(e.refs), "cull", "culls"), concat(", ", e.methods), why]),
		"evidence": evidence(e),
	}
}

euthanasia_gap(e) := concat("; ", [w | some w in euthanasia_reasons(e)]) if count(euthanasia_reasons(e)) > 0

euthanasia_reasons(e) := {w |
	count(e.untrained_methods) > 0
	w := sprintf("not recorded as trained for %s", [concat(", ", e.untrained_methods)])
} | {w |
	w := lapsed(e, e.on, "euthanasia training")
}

# What the person did with rabies-risk animals that day, in words.
rabies_work(w) := concat(", ", [x |
	some k in ["handlings", "culls", "care_rounds"]
	w[k] > 0
	x := count_of(w[k], work_word[k][0], work_word[k][1])
])

work_word := {"handlings": ["handling", "handlings"], "culls": ["cull", "culls"], "care_rounds": ["care round of occupied enclosures", "care rounds of occupied enclosures"]}

# METADATA
# title: Rabies-risk work without pre-exposure vaccination
# description: A person who worked with a rabies-risk species (handling, culling, or a care round of an enclosure it occupies) had not completed the rabies pre-exposure series on the day (rabies_primary_on empty or later).
# custom:
#   id: staff.rabies.unprotected
#   severity: significant
#   source: "ACIP 2022 (MMWR 2022;71(18):619-627): 2-dose pre-exposure series, days 0 and 7"
#   needs: [staff.csv]
findings contains f if {
	some e in s.rabies
	st := rabies_status(e, e.on)
	st.status == "unprotected"
	f := {
		"check": "staff.rabies.unprotected",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s worked with rabies-risk animals (%s): %s. Refer to occupational health; after any bite or scratch the physician decides on post-exposure prophylaxis", [input.name, rabies_work(e.work), st.reason]),
		"evidence": evidence(e),
	}
}

# METADATA
# title: Rabies titer or booster overdue
# description: |
#   The rabies pre-exposure follow-up of the person's ACIP 2022 risk category (rabies_risk_category,
#   else the limits' category) is overdue on a day the person worked with a rabies-risk species:
#   category 3, more than 3 years after the primary series with no titer of at least 0.5 IU/mL taken
#   in years 1 to 3 and no booster from day 21 to year 3; categories 1-2, the latest titer older than
#   6 or 24 months; any category, a titer below 0.5 IU/mL with no later booster.
# custom:
#   id: staff.rabies.followup_overdue
#   severity: minor
#   source: "ACIP 2022 (MMWR 2022;71(18):619-627): risk categories 1-3"
#   needs: [staff.csv]
findings contains f if {
	some e in s.rabies
	st := rabies_status(e, e.on)
	st.status == "overdue"
	f := {
		"check": "staff.rabies.followup_overdue",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s worked with rabies-risk animals (%s): %s (ACIP 2022 risk category %d). Refer to occupational health", [input.name, rabies_work(e.work), st.reason, e.category]),
		"evidence": evidence(e),
	}
}

# METADATA
# title: Respirator fit test overdue
# description: A respirator was worn and the wearer's fit test is missing, dated after the day, or older than the limit (12 months).
# custom:
#   id: staff.respirator.fit_overdue
#   severity: minor
#   source: "OSHA 29 CFR 1910.134(f)(2): fit test before first use and at least annually"
#   needs: [handling.csv, staff.csv]
findings contains f if {
	some e in s.handled
	r := e.respirator
	r != null
	why := lapsed({"trained_on": r.fit_on, "trained_after_event": r.fit_after_event, "valid_until": r.valid_until}, e.on, "respirator fit test")
	f := {
		"check": "staff.respirator.fit_overdue",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s wore a respirator: %s (fit test every %d months)", [input.name, why, data.limits.staff.respirator_fit_months]),
		"evidence": array.concat([input.ref], r.refs),
	}
}

# The employment window in words: "2025-03-01 to 2026-02-28", or
# "from 2025-03-01, open-ended" when no end is recorded.
window := sprintf("%s to %s", [s.active_from, s.active_to]) if {
	s.active_from != null
	s.active_to != null
} else := sprintf("from %s, open-ended", [s.active_from]) if {
	s.active_from != null
} else := sprintf("up to %s", [s.active_to]) if {
	s.active_to != null
} else := "with no dates recorded"

# METADATA
# title: Person named outside employment
# description: A handling, cull, care or outdoor-work row names a person on a day outside active_from to active_to.
# custom:
#   id: staff.inactive
#   severity: minor
#   source: common practice
#   needs: [staff.csv]
findings contains f if {
	some e in s.outside_active
	f := {
		"check": "staff.inactive",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s is named on %s on %s, outside their employment %s", [input.name, count_of(e.rows, "row", "rows"), e.on, window]),
		"evidence": evidence(e),
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
