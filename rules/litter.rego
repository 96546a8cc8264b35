# METADATA
# title: Litters
# description: |
#   Weaning age and losses of each litter weaned in the period, on its dam's document.
#   Input (animal): {id, ..., litters: [{id, ref, species, whelped_on, weaned_on, age_days,
#     born, born_alive, weaned}]}  age_days = weaned_on - whelped_on; species is the dam's.
# scope: package
# custom:
#   subjects: [animal]
package welfare.litter

lim := data.limits.litter

# METADATA
# title: Weaned early
# description: weaned_on - whelped_on is less than the species' min_weaning_days.
# custom:
#   id: litter.weaning.early
#   severity: significant
#   source: "Council of Europe fur-animal recommendation (1999): young not separated from the dam before 8 weeks (from memory)"
#   needs: [litters.csv]
findings contains f if {
	some l in input.litters
	min_days := lim.min_weaning_days[l.species]
	l.age_days < min_days
	f := {
		"check": "litter.weaning.early",
		"subject": l.id,
		"on": l.weaned_on,
		"message": sprintf("litter of %s whelped %s, weaned %s at %d days; the minimum for %s is %d days", [
			input.id, l.whelped_on, l.weaned_on, l.age_days, l.species, min_days,
		]),
		"evidence": [l.ref],
	}
}

# METADATA
# title: Litter losses high
# description: (born - weaned) / born above litter_loss_pct.
# custom:
#   id: litter.losses.high
#   severity: minor
#   source: facility choice
#   needs: [litters.csv]
findings contains f if {
	some l in input.litters
	l.born > 0
	l.weaned != null
	(l.born - l.weaned) * 100 > lim.litter_loss_pct * l.born
	f := {
		"check": "litter.losses.high",
		"subject": l.id,
		"on": l.weaned_on,
		"message": sprintf("litter of %s: %d born, %d weaned, %.1f %% lost (limit %v %%)", [
			input.id, l.born, l.weaned, ((l.born - l.weaned) * 100) / l.born, lim.litter_loss_pct,
		]),
		"evidence": [l.ref],
	}
}
