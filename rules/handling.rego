# METADATA
# title: Handling events
# description: |
#   Gloves, protective clothing, duration and bite/scratch follow-up of each handling of an animal.
#   Input (animal): {id, ref, species, ..., handling: [{on, at, ref, staff, purpose, restraint,
#     glove, glove_thickness_mm, ppe: [..], duration_min, bite, scratch, wound_washed,
#     reported_after_hours}]}  (null where the row recorded nothing; reported_after_hours is
#     the time from handled_at to exposure_reported_at).
#   Bites and scratches from foxes carry a rabies and infection risk: the attending veterinarian
#   and occupational health decide on wound care and post-exposure prophylaxis.
# scope: package
# custom:
#   subjects: [animal]
package welfare.handling

lim := data.limits.handling

# Post-exposure advice cites the post-exposure recommendations, not the 2022 pre-exposure report.
pep := "ACIP post-exposure recommendations, MMWR 2008;57(RR-3), updated 2010, MMWR 2010;59(RR-2) (from memory)"

# An animal may have hundreds of handlings, most of them in order, so each
# check first compares the few distinct values the rows record (gloves,
# thicknesses, PPE lists, durations) with the limits, once per value, and
# goes back to the rows only for a value that fails. Reading one field of
# every row (input.handling[_].glove) is the cheapest pass OPA makes over
# them; a built-in call or a negation per row costs several times more.

# The animal could bite: its species is a bite risk. Computed once per animal.
bite_risk if data.limits.species[input.species].bite_risk

unconscious := {r | some r in lim.unconscious_restraint}

# The handling left the animal conscious: its restraint is not one that
# leaves it unable to bite.
conscious(e) if not unconscious[e.restraint]

shown(x) := "none recorded" if x == null

else := x

# The gloves the rows record (null for none), each once.
gloves := {g | g := input.handling[_].glove}

# METADATA
# title: Inadequate gloves for a conscious animal
# description: A conscious animal of a bite-risk species was handled without an accepted bite-resistant glove, or with a glove thinner than the minimum.
# custom:
#   id: handling.glove.inadequate
#   severity: significant
#   source: "common practice: bite-resistant gloves for conscious carnivores; minimum thickness: facility choice"
#   needs: [handling.csv]
findings contains f if {
	some g in gloves
	not g in lim.accepted_gloves
	bite_risk
	some e in input.handling
	e.glove == g
	conscious(e)
	f := {
		"check": "handling.glove.inadequate",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s handled conscious (%s) by %s with glove %s; accepted: %s", [e.purpose, shown(e.restraint), e.staff, shown(e.glove), concat(", ", lim.accepted_gloves)]),
		"evidence": [e.ref],
	}
}

# The glove thicknesses the rows record, each once.
thicknesses := {t | t := input.handling[_].glove_thickness_mm}

findings contains f if {
	some t in thicknesses
	t != null
	t < lim.min_glove_thickness_mm
	bite_risk
	some e in input.handling
	e.glove_thickness_mm == t
	e.glove in lim.accepted_gloves
	conscious(e)
	f := {
		"check": "handling.glove.inadequate",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s handled conscious by %s with a %v mm glove; the minimum is %v mm", [e.purpose, e.staff, e.glove_thickness_mm, lim.min_glove_thickness_mm]),
		"evidence": [e.ref],
	}
}

# The items a purpose requires.
required_ppe(purpose) := object.get(lim.required_ppe, purpose, object.get(lim.required_ppe, "default", []))

# The PPE lists the rows record, each once.
kits := {k | k := input.handling[_].ppe}

# The PPE lists that lack an item some purpose requires.
short_kits contains k if {
	some k in kits
	some list in lim.required_ppe
	some p in list
	not p in k
}

# METADATA
# title: Protective clothing missing
# description: An item the limits require for the handling's purpose is not in the row's ppe.
# custom:
#   id: handling.ppe.missing
#   severity: minor
#   source: "facility choice: dedicated clothing against fox tapeworm eggs in fur and faeces (PHAC pathogen safety data sheet)"
#   needs: [handling.csv]
findings contains f if {
	some k in short_kits
	some e in input.handling
	e.ppe == k
	missing := [p | some p in required_ppe(e.purpose); not p in k]
	count(missing) > 0
	f := {
		"check": "handling.ppe.missing",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s by %s without %s", [e.purpose, e.staff, concat(", ", missing)]),
		"evidence": [e.ref],
	}
}

# The durations the rows record that exceed the shortest maximum of any
# purpose: only these can exceed their own purpose's.
long := {d |
	shortest := min([m | some m in lim.max_duration_min])
	d := input.handling[_].duration_min
	d > shortest
}

# METADATA
# title: Handling too long
# description: The handling lasted longer than the maximum the limits set for its purpose.
# custom:
#   id: handling.duration.exceeded
#   severity: minor
#   source: facility choice
#   needs: [handling.csv]
findings contains f if {
	some d in long
	some e in input.handling
	e.duration_min == d
	most := lim.max_duration_min[e.purpose]
	d > most
	f := {
		"check": "handling.duration.exceeded",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s lasted %v min; the limit is %v min", [e.purpose, e.duration_min, most]),
		"evidence": [e.ref],
	}
}

# The rows (by index) that left a bite or scratch, found once for both wound checks.
wounds contains i if input.handling[i].bite

wounds contains i if input.handling[i].scratch

injury(e) := "bite" if e.bite

else := "scratch"

# METADATA
# title: Bite or scratch not washed
# description: A bite or scratch is recorded without the wound being washed.
# custom:
#   id: handling.bite.not_washed
#   severity: significant
#   source: "WHO rabies position paper (2018): immediate thorough washing of the wound with soap and water"
#   needs: [handling.csv]
findings contains f if {
	some i in wounds
	e := input.handling[i]
	not e.wound_washed
	f := {
		"check": "handling.bite.not_washed",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s to %s at %s not recorded as washed: wash at once for about 15 minutes with soap and water, and seek the attending physician's advice on rabies post-exposure prophylaxis (%s)", [injury(e), e.staff, e.at, pep]),
		"evidence": [e.ref],
	}
}

reported_in_time(e) if {
	e.reported_after_hours != null
	e.reported_after_hours >= 0
	e.reported_after_hours <= lim.report_within_hours
}

report_state(e) := "never reported" if e.reported_after_hours == null

else := sprintf("reported %.1f h after the handling", [e.reported_after_hours])

# METADATA
# title: Bite or scratch not reported in time
# description: A bite or scratch was not reported for medical assessment within the limit (24 h by default).
# custom:
#   id: handling.bite.not_reported
#   severity: significant
#   source: "common practice: prompt medical assessment for rabies post-exposure prophylaxis (ACIP post-exposure recommendations 2008, updated 2010, from memory)"
#   needs: [handling.csv]
findings contains f if {
	some i in wounds
	e := input.handling[i]
	not reported_in_time(e)
	f := {
		"check": "handling.bite.not_reported",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s to %s at %s %s; it must be reported within %v h (the limits' handling.report_within_hours, which the cautions quote) so a physician can decide on post-exposure prophylaxis (%s)", [injury(e), e.staff, e.at, report_state(e), lim.report_within_hours, pep]),
		"evidence": [e.ref],
	}
}
