# METADATA
# title: Follow-up of earlier findings
# description: |
#   The committee's corrective actions (corrective_actions.csv) judged against the previous
#   review's findings (--previous) and this period's. Evaluated in a second pass, after every
#   other package, on one document per problem (a check and a subject).
#   Input (correction): {id: "CHECK SUBJECT", check, subject, period: {from, until},
#     previous: [{on, severity, message, answering_actions}],
#     actions: [{ref, plan, owner, verified_by, found_on, due_on, closed_on (null while open),
#       answers_severity (the highest severity of the findings it answers, previous review or
#       this period; null when none), open_at_end, days_past_due_at_end (period end − due_on),
#       closed_in_period, days_closed_after_due (closed_on − due_on; null while open),
#       after_closed: [{on (first day of the finding after closed_on), finding_on, severity,
#         days_after_closed, evidence}]}]}.
#   An action answers a finding when check and subject are equal and found_on equals the
#   finding's on or is empty; previous[].answering_actions counts the actions answering it.
# scope: package
# custom:
#   subjects: [correction]
package welfare.correction

lim := data.limits.correction

sev(a) := "significant" if a.answers_severity == "significant"

else := "minor"

# METADATA
# title: Corrective action overdue
# description: A corrective action still open at the end of the period more than overdue_after_days after its due date, or closed inside the period more than overdue_after_days after it.
# custom:
#   id: correction.overdue
#   severity: minor
#   source: "9 CFR §2.31(c)(3): a significant deficiency not corrected by the date in its plan is reported within 15 business days; PHS Policy IV.B.3: a reasonable and specific plan and schedule for correction"
#   needs: [corrective_actions.csv]
#   period: review
findings contains f if {
	some a in input.actions
	a.open_at_end
	a.days_past_due_at_end > lim.overdue_after_days
	f := {
		"check": "correction.overdue",
		"subject": input.id,
		"on": a.due_on,
		"severity": sev(a),
		"message": sprintf("the plan %q was due %s and is still open at the end of the period, %d days late", [a.plan, a.due_on, a.days_past_due_at_end]),
		"evidence": [a.ref],
	}
}

findings contains f if {
	some a in input.actions
	a.closed_in_period
	a.days_closed_after_due > lim.overdue_after_days
	f := {
		"check": "correction.overdue",
		"subject": input.id,
		"on": a.due_on,
		"severity": sev(a),
		"message": sprintf("the plan %q was due %s and was closed %s, %d days late", [a.plan, a.due_on, a.closed_on, a.days_closed_after_due]),
		"evidence": [a.ref],
	}
}

# METADATA
# title: Problem came back after its correction was closed
# description: A finding of the problem appears more than recurred_after_days after the day its corrective action was closed; on is the first such day, the severity the new finding's.
# custom:
#   id: correction.recurred
#   severity: minor
#   source: common practice
#   needs: [corrective_actions.csv]
#   period: review
findings contains f if {
	some a in input.actions
	a.closed_on != null
	later := [x | some x in a.after_closed; x.days_after_closed > lim.recurred_after_days]
	count(later) > 0
	first := min({x.on | some x in later})
	some x in later
	x.on == first
	f := {
		"check": "correction.recurred",
		"subject": input.id,
		"on": first,
		"severity": x.severity,
		"message": sprintf("found again on %s after the plan %q was closed %s", [first, a.plan, a.closed_on]),
		"evidence": array.concat([a.ref], x.evidence),
	}
}

# METADATA
# title: No corrective plan for a significant finding
# description: A significant finding of the previous review (--previous) that no corrective action answers.
# custom:
#   id: correction.plan.missing
#   severity: minor
#   source: "PHS Policy IV.B.3: a reasonable and specific plan and schedule for correction of each deficiency"
#   needs: ["--previous"]
#   period: review
findings contains f if {
	some p in input.previous
	p.severity == "significant"
	p.answering_actions == 0
	f := {
		"check": "correction.plan.missing",
		"subject": input.id,
		"on": p.on,
		"message": sprintf("the significant finding of %s (%s) has no corrective action: add a row with its plan, owner and due date to corrective_actions.csv", [p.on, p.message]),
		"evidence": [],
	}
}
