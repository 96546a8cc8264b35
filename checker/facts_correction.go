package checker

import (
	"context"
	"slices"
	"strings"

	"welfare/records"
)

// The correction checks judge the committee's corrective actions against
// the previous review's findings and this period's. They need this
// period's findings, so they run in a second pass: the first pass
// evaluates every other package, then correctionFacts builds one document
// per problem (check and subject) from those findings, the previous
// review and corrective_actions.csv, and the packages that receive the
// "correction" subject kind are evaluated on them. Go measures (days past
// the due date, days after closing); the rules compare with the limits.

// correctionKind is the subject kind of the second pass.
const correctionKind = "correction"

// needsPrevious is the custom.needs entry of a check that needs the
// previous review's findings (--previous).
const needsPrevious = "--previous"

// followUpSkip says why a check cannot be evaluated in this run for lack of
// the previous review; "" when it can.
func followUpSkip(cfg config, c CheckInfo) string {
	if cfg.Previous == nil && slices.Contains(c.Needs, needsPrevious) {
		return "no previous findings file (--previous)"
	}
	return ""
}

// correctionFacts builds the documents of the correction kind. found are
// this period's findings of the first pass.
func correctionFacts(set *records.Set, prev *Previous, p Period, found []Finding) []map[string]any {
	type problem struct {
		check, subject string
		prev, now      []*Finding
		actions        []*records.CorrectiveAction
	}
	byKey := map[string]*problem{}
	get := func(check, subject string) *problem {
		k := ProblemOf(check, subject)
		pr := byKey[k]
		if pr == nil {
			pr = &problem{check: check, subject: subject}
			byKey[k] = pr
		}
		return pr
	}
	// Correction findings answer no plan of their own: they are about plans.
	isCorrection := func(check string) bool { return strings.HasPrefix(check, correctionKind+".") }
	if prev != nil {
		for i := range prev.Findings {
			f := &prev.Findings[i]
			if !isCorrection(f.Check) {
				pr := get(f.Check, f.Subject)
				pr.prev = append(pr.prev, f)
			}
		}
	}
	for i := range set.CorrectiveActions {
		a := &set.CorrectiveActions[i]
		pr := get(a.Check, a.Subject)
		pr.actions = append(pr.actions, a)
	}
	for i := range found {
		f := &found[i]
		if pr := byKey[f.Problem()]; pr != nil && !isCorrection(f.Check) {
			pr.now = append(pr.now, f)
		}
	}

	keys := make([]string, 0, len(byKey))
	for k := range byKey {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	out := make([]map[string]any, 0, len(keys))
	for _, k := range keys {
		pr := byKey[k]
		prevDocs := make([]any, 0, len(pr.prev))
		for _, f := range pr.prev {
			n := 0
			for _, a := range pr.actions {
				if Answers(a, f.Check, f.Subject, f.On) {
					n++
				}
			}
			prevDocs = append(prevDocs, map[string]any{
				"on": f.On.String(), "severity": string(f.Severity), "message": f.Message, "answering_actions": n,
			})
		}
		actDocs := make([]any, 0, len(pr.actions))
		for _, a := range pr.actions {
			actDocs = append(actDocs, actionDoc(a, pr.prev, pr.now, p))
		}
		out = append(out, map[string]any{
			"kind": correctionKind, "id": k, "check": pr.check, "subject": pr.subject,
			"period":   map[string]any{"from": p.From.String(), "until": p.To.String()},
			"previous": prevDocs, "actions": actDocs,
		})
	}
	return out
}

// actionDoc is one corrective action with its measurements at the period's
// end and this period's findings of its problem after it was closed.
func actionDoc(a *records.CorrectiveAction, prev, now []*Finding, p Period) map[string]any {
	var sev Severity
	for _, fs := range [][]*Finding{prev, now} {
		for _, f := range fs {
			if Answers(a, f.Check, f.Subject, f.On) && f.Severity.Rank() > sev.Rank() {
				sev = f.Severity
			}
		}
	}
	closedAtEnd := !a.ClosedOn.IsZero() && a.ClosedOn <= p.To
	doc := map[string]any{
		"ref": string(a.Ref), "plan": a.Plan, "owner": a.Owner, "verified_by": a.VerifiedBy,
		"found_on": dayOrNull(a.FoundOn), "due_on": a.DueOn.String(), "closed_on": dayOrNull(a.ClosedOn),
		"answers_severity": nil,
		"open_at_end":      !closedAtEnd,
		// Days from the due date to the period's last day (negative: not yet due).
		"days_past_due_at_end": int(p.To - a.DueOn),
		"closed_in_period":     closedAtEnd && a.ClosedOn >= p.From,
		// Days from the due date to closing (null while open).
		"days_closed_after_due": nil,
		"after_closed":          []any{},
	}
	if sev != "" {
		doc["answers_severity"] = string(sev)
	}
	if !a.ClosedOn.IsZero() {
		doc["days_closed_after_due"] = int(a.ClosedOn - a.DueOn)
		var after []any
		for _, f := range now {
			last := f.Until
			if last.IsZero() {
				last = f.On
			}
			if last <= a.ClosedOn {
				continue
			}
			first := max(f.On, a.ClosedOn+1)
			after = append(after, map[string]any{
				"on": first.String(), "finding_on": f.On.String(), "severity": string(f.Severity),
				"days_after_closed": int(first - a.ClosedOn), "evidence": refStrings(f.Evidence),
			})
		}
		if after != nil {
			doc["after_closed"] = after
		}
	}
	return doc
}

func refStrings(refs []records.Ref) []any {
	out := make([]any, len(refs))
	for i, r := range refs {
		out[i] = string(r)
	}
	return out
}

// correctionPass is the second pass: it evaluates the correction package
// on this period's first-pass findings (of every domain evaluated, whatever
// --only keeps in the report), adds its findings to the result
// and fills the result's follow-up (classes, resolved problems, actions).
func correctionPass(ctx context.Context, cfg config, set *records.Set, res *Result, firstPass []Finding, skipped, only map[string]bool) error {
	var judged []Finding // every correction finding, for the actions' status
	if slices.Contains(cfg.Engine.Kinds(), correctionKind) {
		docs := correctionFacts(set, cfg.Previous, res.Period, firstPass)
		found, err := cfg.Engine.Evaluate(ctx, correctionKind, docs)
		if err != nil {
			return err
		}
		for _, fd := range found {
			if skipped[fd.Check] {
				continue
			}
			judged = append(judged, fd)
			if len(only) > 0 && !only[fd.Domain] {
				continue
			}
			res.Findings = append(res.Findings, fd)
		}
		SortFindings(res.Findings)
	}
	fu := &FollowUp{Previous: cfg.Previous}
	fu.classify(res, evaluatedChecks(cfg, res, only))
	fu.actionStates(set, res.Period, judged, func(a *records.CorrectiveAction) Severity {
		var sev Severity
		if cfg.Previous != nil {
			for _, f := range cfg.Previous.Findings {
				if Answers(a, f.Check, f.Subject, f.On) && f.Severity.Rank() > sev.Rank() {
					sev = f.Severity
				}
			}
		}
		for _, f := range firstPass {
			if Answers(a, f.Check, f.Subject, f.On) && f.Severity.Rank() > sev.Rank() {
				sev = f.Severity
			}
		}
		return sev
	})
	res.FollowUp = fu
	return nil
}
