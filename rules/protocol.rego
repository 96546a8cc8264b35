# METADATA
# title: Protocol approvals
# description: |
#   Handlings and culls against the approved protocol they fall under (the row's protocol_id, else
#   the animal's), and the protocol's animal count and expiry.
#   Input (protocol): {id, name (the title), ref, protocol: {approved_on, expires_on, expires_after_period_by,
#     max_animals, procedures, euthanasia_methods, species, personnel, last_reviewed_on (null when
#     not recorded), pain_category (B, C, D, E or null),
#     days: [{on, in_force, refs, purposes: {purpose: [refs]}, methods: {method: [refs]},
#             species: {species: [refs]}, staff: {staff_id: [refs]}}],
#     animals: {count, exceeded_on, over_refs, over_animals}}}
#   days has one entry per day of the period with a handling or cull under the protocol; in_force
#   is approved_on <= on <= expires_on (the last day is in force). animals counts, cumulatively over
#   the approval up to the period end, the animals held under the protocol: animals.csv protocol_id
#   from the first day of their stay inside the approval, and animals on rows naming the protocol
#   from that row's day. exceeded_on is the first day the count went over max_animals.
#   expires_after_period_by is expires_on minus the period's last day, in days.
#   Checks marked custom.reportable are noncompliance the institution reports: every output marks
#   them "report to the institutional official" (PHS Policy IV.F.3).
# scope: package
# custom:
#   subjects: [protocol]
package welfare.protocol

p := input.protocol

when(d) := sprintf("before its approval on %s", [p.approved_on]) if d < p.approved_on

else := sprintf("after it expired on %s", [p.expires_on])

# Said by every reportable finding's message (PHS Policy IV.F.3); the reports mark them too.
report := "Report to the institutional official (PHS Policy IV.F.3)"

# METADATA
# title: Work outside the protocol's approval
# description: A handling or cull under the protocol falls before approved_on or after expires_on.
# custom:
#   id: protocol.inactive
#   severity: significant
#   source: "common practice; reportable noncompliance: PHS Policy IV.F.3, NIH notice NOT-OD-05-034 (from memory)"
#   reportable: true
#   needs: [protocols.csv]
findings contains f if {
	some e in p.days
	not e.in_force
	f := {
		"check": "protocol.inactive",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s under protocol %s on %s, %s. %s", [count_of(count(e.refs), "handling or cull row", "handling or cull rows"), input.id, e.on, when(e.on), report]),
		"evidence": array.concat([input.ref], e.refs),
	}
}

# METADATA
# title: Procedure not approved
# description: A handling's purpose is not among the protocol's listed procedures (a protocol that lists none is not judged).
# custom:
#   id: protocol.procedure.unapproved
#   severity: significant
#   source: "common practice; reportable noncompliance: PHS Policy IV.F.3, NIH notice NOT-OD-05-034 (from memory)"
#   reportable: true
#   needs: [protocols.csv, handling.csv]
findings contains f if {
	count(p.procedures) > 0
	some e in p.days
	bad := sort([k | some k, _ in e.purposes; not k in p.procedures])
	count(bad) > 0
	f := {
		"check": "protocol.procedure.unapproved",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s under protocol %s, which approves only %s. %s", [concat(", ", bad), input.id, concat(", ", p.procedures), report]),
		"evidence": array.concat([input.ref], [r | some k in bad; some r in e.purposes[k]]),
	}
}

# METADATA
# title: Euthanasia method not approved
# description: A cull's method is not among the protocol's listed euthanasia methods (a protocol that lists none is not judged).
# custom:
#   id: protocol.method.unapproved
#   severity: significant
#   source: "common practice; reportable noncompliance: PHS Policy IV.F.3, NIH notice NOT-OD-05-034 (from memory)"
#   reportable: true
#   needs: [protocols.csv, culls.csv]
findings contains f if {
	count(p.euthanasia_methods) > 0
	some e in p.days
	bad := sort([k | some k, _ in e.methods; not k in p.euthanasia_methods])
	count(bad) > 0
	f := {
		"check": "protocol.method.unapproved",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("cull by %s under protocol %s, which approves only %s; the attending veterinarian and the committee decide on any change of method. %s", [concat(", ", bad), input.id, concat(", ", p.euthanasia_methods), report]),
		"evidence": array.concat([input.ref], [r | some k in bad; some r in e.methods[k]]),
	}
}

# METADATA
# title: Protocol's animal number exceeded
# description: More distinct animals have been held under the protocol during its approval, counted cumulatively, than its max_animals; reported on the first day the count went over.
# custom:
#   id: protocol.animals.exceeded
#   severity: significant
#   source: "common practice; reportable noncompliance: PHS Policy IV.F.3, NIH notice NOT-OD-05-034 (from memory)"
#   reportable: true
#   needs: [protocols.csv]
findings contains f if {
	p.max_animals != null
	p.animals.exceeded_on != null
	f := {
		"check": "protocol.animals.exceeded",
		"subject": input.id,
		"on": p.animals.exceeded_on,
		"message": sprintf("%d animals held under protocol %s, which approves %d; the count went over on %s (first over the limit: %s). %s", [p.animals.count, input.id, p.max_animals, p.animals.exceeded_on, concat(", ", p.animals.over_animals), report]),
		"evidence": array.concat([input.ref], p.animals.over_refs),
	}
}

# METADATA
# title: Protocol expiring
# description: The protocol expires within the limit (30 days by default) after the checked period ends, or on its last day.
# custom:
#   id: protocol.expiring
#   severity: note
#   source: common practice
#   needs: [protocols.csv]
findings contains f if {
	p.expires_after_period_by >= 0
	p.expires_after_period_by <= data.limits.protocol.expiring_within_days
	f := {
		"check": "protocol.expiring",
		"subject": input.id,
		"on": p.expires_on,
		"message": sprintf("protocol %s (%s) expires on %s, %s after the checked period; renew it before work continues", [input.id, input.name, p.expires_on, count_of(p.expires_after_period_by, "day", "days")]),
		"evidence": [input.ref],
	}
}

# METADATA
# title: Species not approved
# description: An animal handled or culled under the protocol is of a species not in the protocol's species list (a protocol that lists none is not judged).
# custom:
#   id: protocol.species.unapproved
#   severity: significant
#   source: "common practice; reportable noncompliance: PHS Policy IV.F.3, NIH notice NOT-OD-05-034 (from memory)"
#   reportable: true
#   needs: [protocols.csv]
findings contains f if {
	count(p.species) > 0
	some e in p.days
	bad := sort([k | some k, _ in e.species; not k in p.species])
	count(bad) > 0
	f := {
		"check": "protocol.species.unapproved",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s handled or culled under protocol %s, which approves only %s. %s", [concat(", ", bad), input.id, concat(", ", p.species), report]),
		"evidence": array.concat([input.ref], [r | some k in bad; some r in e.species[k]]),
	}
}

# METADATA
# title: Person not listed on the protocol
# description: A handler or cull operator working under the protocol is not in its personnel list (a protocol that lists none is not judged; care staff are not concerned).
# custom:
#   id: protocol.personnel.unlisted
#   severity: significant
#   source: "PHS Policy IV.C.1: personnel qualified and named (from memory); reportable noncompliance: PHS Policy IV.F.3"
#   reportable: true
#   needs: [protocols.csv]
findings contains f if {
	count(p.personnel) > 0
	some e in p.days
	bad := sort([k | some k, _ in e.staff; not k in p.personnel])
	count(bad) > 0
	f := {
		"check": "protocol.personnel.unlisted",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s worked under protocol %s without being listed on it (listed: %s). %s", [concat(", ", bad), input.id, concat(", ", p.personnel), report]),
		"evidence": array.concat([input.ref], [r | some k in bad; some r in e.staff[k]]),
	}
}

# The last continuing review, or the approval when none is recorded.
reviewed_on := p.last_reviewed_on if p.last_reviewed_on != null

else := p.approved_on

reviewed_what := "last continuing review" if p.last_reviewed_on != null

else := "approval (no continuing review recorded)"

# The last day the review covers: the same date review_every_months later.
review_covers_until := time.format([
	time.add_date(time.parse_ns("2006-01-02", reviewed_on), 0, data.limits.protocol.review_every_months, 0),
	"UTC", "2006-01-02",
])

# METADATA
# title: Continuing review overdue
# description: An event under the protocol, inside its approval, falls more than review_every_months (default 36) after the protocol's last continuing review, or its approval when none is recorded.
# custom:
#   id: protocol.review.overdue
#   severity: minor
#   source: "PHS Policy IV.C.5: continuing review at least once every 3 years; 9 CFR §2.31(d)(5): at least annually for covered species"
#   needs: [protocols.csv]
findings contains f if {
	some e in p.days
	e.in_force
	e.on > review_covers_until
	f := {
		"check": "protocol.review.overdue",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("work under protocol %s on %s, more than %d months after its %s on %s (covered until %s)", [input.id, e.on, data.limits.protocol.review_every_months, reviewed_what, reviewed_on, review_covers_until]),
		"evidence": array.concat([input.ref], e.refs),
	}
}

# count_of is "1 day" or "2 days": messages are read by people.
count_of(n, one, many) := sprintf("%d %s", [n, one]) if n == 1

else := sprintf("%d %s", [n, many])
