package welfare.cull_test

import data.welfare.cull

no_cond := {"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": null}

ev := {"on": "2026-01-20", "ref": "culls.csv:2", "staff": "S3", "method": "barbiturate_overdose", "class": "acceptable", "conditions": no_cond, "sedated": true, "anaesthetised": false, "death_confirmed": true, "confirmation": ["no_heartbeat", "no_corneal_reflex"], "signs": 2}

fox(e) := {"kind": "animal", "id": "F9", "ref": "animals.csv:10", "species": "vulpes_vulpes", "euthanasia": [e]}

checks(e) := {f.check | some f in cull.findings with input as fox(e)}

test_acceptable_confirmed_cull_is_quiet if {
	checks(ev) == set()
}

test_unacceptable_method_fires if {
	# AVMA (2020), from memory: cervical dislocation is not acceptable for foxes.
	some f in cull.findings with input as fox(object.union(ev, {"method": "cervical_dislocation", "class": "unacceptable"}))
	f.check == "cull.method.unacceptable"
	contains(f.message, "attending veterinarian")
}

test_unlisted_method_counts_as_unacceptable if {
	checks(object.union(ev, {"method": "freezing", "class": "unlisted"})) == {"cull.method.unacceptable"}
}

kcl := object.union(ev, {"method": "potassium_chloride", "class": "conditional", "conditions": {"sedation": false, "general_anaesthesia": true, "secondary_method": false, "note": "only under general anaesthesia"}, "sedated": false})

test_potassium_chloride_needs_general_anaesthesia if {
	# AVMA Guidelines for the Euthanasia of Animals (2020), from memory: potassium chloride
	# only under general anaesthesia. checks.md "Corrections to the first set": anaesthetised: yes
	# alone meets the condition; sedated: yes is not enough.
	checks(object.union(kcl, {"anaesthetised": true})) == set()
	checks(object.union(kcl, {"anaesthetised": true, "sedated": true})) == set()
	checks(kcl) == {"cull.method.conditions_unmet"}
	checks(object.union(kcl, {"sedated": true})) == {"cull.method.conditions_unmet"}
}

test_potassium_chloride_message_asks_for_anaesthesia if {
	some f in cull.findings with input as fox(object.union(kcl, {"sedated": true}))
	f.check == "cull.method.conditions_unmet"
	contains(f.message, "without general anaesthesia (anaesthetised: yes)")
	not contains(f.message, "sedated")
}

sed := object.union(ev, {"method": "gunshot", "class": "conditional", "conditions": {"sedation": true, "general_anaesthesia": false, "secondary_method": false, "note": null}, "sedated": false})

test_sedation_condition_met_by_sedation_or_anaesthesia if {
	checks(sed) == {"cull.method.conditions_unmet"}
	checks(object.union(sed, {"sedated": true})) == set()
	checks(object.union(sed, {"anaesthetised": true})) == set()
}

bolt := object.union(ev, {"method": "penetrating_captive_bolt", "class": "conditional", "conditions": {"sedation": false, "secondary_method": true, "note": null}, "sedated": false})

test_captive_bolt_needs_secondary_method if {
	# AVMA (2020), from memory: penetrating captive bolt needs a secondary method.
	checks(bolt) == {"cull.method.conditions_unmet"}
	checks(object.union(bolt, {"confirmation": ["no_heartbeat", "secondary_method"], "signs": 2})) == set()
}

test_death_not_confirmed_fires if {
	checks(object.union(ev, {"death_confirmed": false})) == {"cull.death.unconfirmed"}
}

test_single_sign_does_not_confirm_death if {
	# AVMA (2020), from memory: no single sign except rigor mortis confirms death.
	checks(object.union(ev, {"confirmation": ["no_heartbeat"], "signs": 1})) == {"cull.death.unconfirmed"}
	checks(object.union(ev, {"confirmation": ["no_breathing"], "signs": 1})) == {"cull.death.unconfirmed"}
}

test_rigor_mortis_alone_confirms_death if {
	checks(object.union(ev, {"confirmation": ["rigor_mortis"], "signs": 1})) == set()
}

test_secondary_method_alone_confirms_death if {
	checks(object.union(ev, {"confirmation": ["secondary_method"], "signs": 1})) == set()
}

test_no_signs_fires if {
	checks(object.union(ev, {"confirmation": [], "signs": 0})) == {"cull.death.unconfirmed"}
}

test_confirmation_signs_follow_the_limit if {
	# checks.md "Corrections to the first set": death_confirmation_min_signs is a limit (default 2, common practice).
	two := object.union(ev, {"confirmation": ["no_heartbeat", "no_corneal_reflex"], "signs": 2})
	checks(two) == set()
	checks(two) == set() with data.limits.cull.death_confirmation_min_signs as 2
	checks(two) == {"cull.death.unconfirmed"} with data.limits.cull.death_confirmation_min_signs as 3
	checks(object.union(ev, {"confirmation": ["no_heartbeat"], "signs": 1})) == set() with data.limits.cull.death_confirmation_min_signs as 1
}
