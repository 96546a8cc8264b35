package checker

import (
	"slices"
	"strconv"
	"strings"

	"welfare/records"
)

// A finding's problem is its check and subject; its key adds its first day
// (`care.water.unavailable S2-11 2026-01-08`). Problems follow a finding
// from one review to the next; corrective plans answer keys or problems.

// ProblemOf is the problem of a check and subject.
func ProblemOf(check, subject string) string { return check + " " + subject }

// KeyOf is the key of a check, subject and first day.
func KeyOf(check, subject string, on records.Day) string {
	return ProblemOf(check, subject) + " " + on.String()
}

// Problem is the finding's check and subject.
func (f Finding) Problem() string { return ProblemOf(f.Check, f.Subject) }

// Classes of a finding against the previous review.
const (
	ClassNew       = "new"
	ClassRecurring = "recurring"
)

// Statuses of a corrective action at the end of the period.
const (
	StatusOnSchedule = "on schedule"
	StatusOverdue    = "overdue"
	StatusClosed     = "closed"
	StatusVerified   = "verified"
)

// Previous is the previous review, read from a findings file this tool
// wrote (`welfare check … --previous FILE`).
type Previous struct {
	File     string
	Facility string
	Period   Period
	Findings []Finding
}

// FollowUp is what a review says about the previous one and the
// committee's corrective actions.
type FollowUp struct {
	// Previous is the previous review; nil when none was given.
	Previous *Previous `json:"-"`
	// Class maps each finding's key to new or recurring (empty without a previous review).
	Class map[string]string `json:"-"`
	// Resolved are the previous review's problems that are gone from checks
	// evaluated this time; NotRechecked those of checks not evaluated this
	// time (not in force, lacking records, turned off or left out by
	// --only), which are never called resolved.
	Resolved     []PastProblem `json:"-"`
	NotRechecked []PastProblem `json:"-"`
	// Actions are the corrective actions, overdue first, then by due date.
	Actions []ActionState `json:"-"`
	// byProblem indexes Actions by check and subject (ProblemOf), so a
	// report asking for each of many findings' action does not compare it
	// with every action; nil when built by hand (ActionFor then scans).
	byProblem map[string][]int
}

// PastProblem is one problem of the previous review: its check, subject,
// first finding day, highest severity and number of findings.
type PastProblem struct {
	Check    string
	Domain   string
	Subject  string
	On       records.Day
	Severity Severity
	Count    int
	Why      string // for a problem not re-checked: why the check was not evaluated
}

// Problem is the past problem's check and subject.
func (p PastProblem) Problem() string { return ProblemOf(p.Check, p.Subject) }

// ActionState is a corrective action and its status at the end of the period.
type ActionState struct {
	Action records.CorrectiveAction
	Status string
	// Severity is the highest severity of the findings it answers (previous
	// review or this period); empty when it answers none of them.
	Severity Severity
}

// Problem is the problem the action answers.
func (a ActionState) Problem() string { return ProblemOf(a.Action.Check, a.Action.Subject) }

// Answers reports whether the action answers the finding of check,
// subject and first day on: same check and subject, and found_on equal
// to on or empty.
func Answers(a *records.CorrectiveAction, check, subject string, on records.Day) bool {
	return a.Check == check && a.Subject == subject && (a.FoundOn.IsZero() || a.FoundOn == on)
}

// ClassOf is the finding's class against the previous review: new or
// recurring; "" when the run had no previous review.
func (r *Result) ClassOf(f *Finding) string {
	if r.FollowUp == nil || r.FollowUp.Previous == nil {
		return ""
	}
	return r.FollowUp.Class[f.Key()]
}

// ActionFor is the corrective action that answers the finding: one whose
// found_on is the finding's day before one that answers the whole problem,
// then the latest due. nil when none does.
func (r *Result) ActionFor(f *Finding) *ActionState {
	if r.FollowUp == nil {
		return nil
	}
	var best *ActionState
	consider := func(a *ActionState) {
		if !Answers(&a.Action, f.Check, f.Subject, f.On) {
			return
		}
		if best == nil || (!a.Action.FoundOn.IsZero() && best.Action.FoundOn.IsZero()) ||
			(a.Action.FoundOn.IsZero() == best.Action.FoundOn.IsZero() && a.Action.DueOn > best.Action.DueOn) {
			best = a
		}
	}
	if fu := r.FollowUp; fu.byProblem != nil {
		for _, i := range fu.byProblem[ProblemOf(f.Check, f.Subject)] {
			consider(&fu.Actions[i])
		}
		return best
	}
	for i := range r.FollowUp.Actions {
		consider(&r.FollowUp.Actions[i])
	}
	return best
}

// ActionLine is the plan, owner, due date and status of an action in one
// line, for a report's "plan and schedule" column.
func (a *ActionState) ActionLine() string {
	var b strings.Builder
	b.WriteString(a.Action.Plan)
	if a.Action.Owner != "" {
		b.WriteString(" — " + a.Action.Owner)
	}
	b.WriteString("; due " + a.Action.DueOn.String() + "; " + a.Status)
	if !a.Action.ClosedOn.IsZero() {
		b.WriteString(" " + a.Action.ClosedOn.String())
	}
	if a.Action.VerifiedBy != "" {
		b.WriteString(" by " + a.Action.VerifiedBy)
	}
	return b.String()
}

// evaluatedChecks maps every check in force to "" when it was evaluated
// in this run, or to why it was not.
func evaluatedChecks(cfg config, res *Result, only map[string]bool) map[string]string {
	why := map[string]string{}
	for _, s := range res.NotEvaluated {
		why[s.Check] = "not evaluated: " + s.Reason
	}
	out := map[string]string{}
	for _, c := range res.Checks {
		switch {
		case len(only) > 0 && !only[c.Domain]:
			out[c.ID] = "not re-checked: left out by --only"
		case why[c.ID] != "":
			out[c.ID] = why[c.ID]
		case cfg.Limits != nil && cfg.Limits.Severity[c.ID] == "off":
			out[c.ID] = "turned off in the limits"
		default:
			out[c.ID] = ""
		}
	}
	return out
}

// classify fills the follow-up's classes and its resolved and
// not-re-checked problems from the previous review.
func (fu *FollowUp) classify(res *Result, evaluated map[string]string) {
	fu.Class = map[string]string{}
	if fu.Previous == nil {
		return
	}
	before := map[string]bool{}
	for _, f := range fu.Previous.Findings {
		before[f.Problem()] = true
	}
	now := map[string]bool{}
	for _, f := range res.Findings {
		now[f.Problem()] = true
		if before[f.Problem()] {
			fu.Class[f.Key()] = ClassRecurring
		} else {
			fu.Class[f.Key()] = ClassNew
		}
	}
	past := map[string]*PastProblem{}
	var order []string
	for _, f := range fu.Previous.Findings {
		p := past[f.Problem()]
		if p == nil {
			p = &PastProblem{Check: f.Check, Domain: f.Domain, Subject: f.Subject, On: f.On, Severity: f.Severity}
			past[f.Problem()] = p
			order = append(order, f.Problem())
		}
		p.Count++
		if f.On < p.On {
			p.On = f.On
		}
		if f.Severity.Rank() > p.Severity.Rank() {
			p.Severity = f.Severity
		}
	}
	slices.Sort(order)
	for _, k := range order {
		p := past[k]
		if now[k] {
			continue
		}
		why, inForce := evaluated[p.Check]
		switch {
		case !inForce:
			p.Why = "not re-checked: the check is not in force"
			fu.NotRechecked = append(fu.NotRechecked, *p)
		case why != "":
			if !strings.HasPrefix(why, "not re-checked") {
				why = "not re-checked: " + why
			}
			p.Why = why
			fu.NotRechecked = append(fu.NotRechecked, *p)
		default:
			fu.Resolved = append(fu.Resolved, *p)
		}
	}
}

// actionStates gives each corrective action its status at the period's
// end. Overdue is what the rules judged (a correction.overdue finding on
// the action's problem and due date), not a second opinion computed here.
func (fu *FollowUp) actionStates(set *records.Set, p Period, judged []Finding, severity func(*records.CorrectiveAction) Severity) {
	overdue := map[string]bool{}
	for _, f := range judged {
		if f.Check == "correction.overdue" {
			overdue[f.Subject+" "+f.On.String()] = true
		}
	}
	end := p.To
	for i := range set.CorrectiveActions {
		a := set.CorrectiveActions[i]
		st := ActionState{Action: a, Severity: severity(&a)}
		closed := !a.ClosedOn.IsZero() && a.ClosedOn <= end
		switch {
		case closed && a.VerifiedBy != "":
			st.Status = StatusVerified
		case closed:
			st.Status = StatusClosed
		case overdue[ProblemOf(a.Check, a.Subject)+" "+a.DueOn.String()]:
			st.Status = StatusOverdue
		default:
			st.Status = StatusOnSchedule
		}
		fu.Actions = append(fu.Actions, st)
	}
	rank := map[string]int{StatusOverdue: 0, StatusOnSchedule: 1, StatusClosed: 2, StatusVerified: 3}
	slices.SortStableFunc(fu.Actions, func(a, b ActionState) int {
		if d := rank[a.Status] - rank[b.Status]; d != 0 {
			return d
		}
		if a.Action.DueOn != b.Action.DueOn {
			return int(a.Action.DueOn) - int(b.Action.DueOn)
		}
		return strings.Compare(a.Problem(), b.Problem())
	})
	fu.byProblem = make(map[string][]int, len(fu.Actions))
	for i := range fu.Actions {
		k := ProblemOf(fu.Actions[i].Action.Check, fu.Actions[i].Action.Subject)
		fu.byProblem[k] = append(fu.byProblem[k], i)
	}
}

// knownChecks rejects the corrective actions whose check is not a check in
// force: the loader cannot know the rules, so the row is rejected here,
// positioned, and counted as rejected (records.row.rejected reports it).
// The set is copied when a row is rejected; the caller's is left as it was.
func knownChecks(set *records.Set, checks []CheckInfo) *records.Set {
	known := map[string]bool{}
	for _, c := range checks {
		known[c.ID] = true
	}
	var bad []int
	for i := range set.CorrectiveActions {
		if !known[set.CorrectiveActions[i].Check] {
			bad = append(bad, i)
		}
	}
	if len(bad) == 0 {
		return set
	}
	cp := *set
	cp.CorrectiveActions = nil
	cp.Problems = slices.Clone(set.Problems)
	cp.Accounting = slices.Clone(set.Accounting)
	for i := range set.CorrectiveActions {
		a := set.CorrectiveActions[i]
		if !slices.Contains(bad, i) {
			cp.CorrectiveActions = append(cp.CorrectiveActions, a)
			continue
		}
		file, where, _ := strings.Cut(string(a.Ref), ":")
		p := records.Problem{File: file, Column: "check", Value: a.Check, Day: a.FoundOn,
			Reason: strconv.Quote(a.Check) + " is not a check in force (see 'welfare rules list'); write the check id of the finding the action answers"}
		if p.Day.IsZero() {
			p.Day = a.DueOn
		}
		if n, err := strconv.Atoi(where); err == nil {
			p.Line = n
		} else {
			p.At = where
		}
		cp.Problems = append(cp.Problems, p)
		for j := range cp.Accounting {
			if cp.Accounting[j].File == "corrective_actions.csv" {
				cp.Accounting[j].Accepted--
				cp.Accounting[j].Rejected++
				break
			}
		}
	}
	return &cp
}
