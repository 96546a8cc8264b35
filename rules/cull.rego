# METADATA
# title: Euthanasia
# description: |
#   The method and death confirmation of each cull, against the species' method lists in the limits.
#   The method lists are recalled from the AVMA Guidelines for the Euthanasia of Animals (2020)
#   from memory: verify them with the current edition, the attending veterinarian and the
#   animal-care committee before relying on them.
#   Input (animal): {id, ref, species, ..., euthanasia: [{on, ref, staff, method,
#     class: acceptable|conditional|unacceptable|unlisted,
#     conditions: {sedation, general_anaesthesia, secondary_method, note}, sedated, anaesthetised,
#     death_confirmed, confirmation: [signs], signs}]}  (signs = number of distinct confirmation entries).
#   A method needing general anaesthesia (potassium chloride) is met only by anaesthetised: yes;
#   sedation is not enough.
# scope: package
# custom:
#   subjects: [animal]
package welfare.cull

defer := "Follow the attending veterinarian and the AVMA Guidelines for the Euthanasia of Animals"

# METADATA
# title: Euthanasia method unacceptable
# description: The cull's method is listed as unacceptable for the species, or not listed for it at all.
# custom:
#   id: cull.method.unacceptable
#   severity: significant
#   source: "AVMA Guidelines for the Euthanasia of Animals (2020) (from memory)"
#   needs: [culls.csv]
findings contains f if {
	some e in input.euthanasia
	e.class in {"unacceptable", "unlisted"}
	f := {
		"check": "cull.method.unacceptable",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("culled by %s, which the limits %s for %s. %s", [e.method, listed(e.class), input.species, defer]),
		"evidence": [e.ref],
	}
}

listed(class) := "list as unacceptable" if class == "unacceptable"

else := "do not list as acceptable"

# METADATA
# title: Conditions of the euthanasia method not met
# description: A method acceptable only with conditions was used without them - general anaesthesia not recorded (anaesthetised yes) for a method that needs it (potassium chloride; sedation is not enough), sedation or anaesthesia not recorded for a method that needs sedation, or no secondary method recorded in the confirmation.
# custom:
#   id: cull.method.conditions_unmet
#   severity: significant
#   source: "AVMA Guidelines for the Euthanasia of Animals (2020) (from memory)"
#   needs: [culls.csv]
findings contains f if {
	some e in input.euthanasia
	e.class == "conditional"
	unmet := [w | some w in unmet_conditions(e)]
	count(unmet) > 0
	f := {
		"check": "cull.method.conditions_unmet",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("culled by %s without %s%s. %s", [e.method, concat(" or ", sort(unmet)), note(e), defer]),
		"evidence": [e.ref],
	}
}

unmet_conditions(e) := ({w |
	e.conditions.general_anaesthesia
	not e.anaesthetised
	w := "general anaesthesia (anaesthetised: yes)"
} | {w |
	e.conditions.sedation
	not e.sedated
	not e.anaesthetised
	w := "prior sedation or anaesthesia (sedated: yes or anaesthetised: yes)"
}) | {w |
	e.conditions.secondary_method
	not "secondary_method" in e.confirmation
	w := "a secondary method to ensure death"
}

note(e) := sprintf(" (%s)", [e.conditions.note]) if e.conditions.note != null

else := ""

# The AVMA (2020) rule as recalled: no single sign but rigor mortis confirms
# death, so without rigor mortis or a secondary method at least
# data.limits.cull.death_confirmation_min_signs signs must be recorded.
min_signs := data.limits.cull.death_confirmation_min_signs

confirmed(e) if {
	e.death_confirmed
	"rigor_mortis" in e.confirmation
}

confirmed(e) if {
	e.death_confirmed
	"secondary_method" in e.confirmation
}

confirmed(e) if {
	e.death_confirmed
	e.signs >= min_signs
}

unconfirmed_reason(e) := "death_confirmed is not yes" if not e.death_confirmed

else := sprintf("only %d of the %d signs the limits require recorded (%s); no single sign but rigor mortis confirms death", [e.signs, min_signs, concat(", ", e.confirmation)])

# METADATA
# title: Death not confirmed
# description: death_confirmed is not yes, or the confirmation records neither rigor mortis nor a secondary method and fewer signs than the limits' death_confirmation_min_signs (default 2).
# custom:
#   id: cull.death.unconfirmed
#   severity: significant
#   source: "AVMA Guidelines for the Euthanasia of Animals (2020): no single sign but rigor mortis confirms death (from memory)"
#   needs: [culls.csv]
findings contains f if {
	some e in input.euthanasia
	not confirmed(e)
	f := {
		"check": "cull.death.unconfirmed",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("cull by %s: %s. %s", [e.method, unconfirmed_reason(e), defer]),
		"evidence": [e.ref],
	}
}
