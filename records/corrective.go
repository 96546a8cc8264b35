package records

import (
	"fmt"
	"regexp"
)

// correctiveFile holds the committee's plans for findings: one row per
// corrective action, naming the finding it answers by check, subject and
// (optionally) the finding's first day.
const correctiveFile = "corrective_actions.csv"

// CorrectiveAction is a row of corrective_actions.csv. Whether Check is a
// check in force is for the checker to say: the loader does not know the
// rules, so it only refuses what cannot be a check id at all.
type CorrectiveAction struct {
	Ref        Ref
	Check      string `csv:"check,required" validate:"required"`
	Subject    string `csv:"subject,required" validate:"required"`
	FoundOn    Day    `csv:"found_on"`
	Plan       string `csv:"plan,required" validate:"required"`
	Owner      string `csv:"owner" validate:"omitempty,id"`
	DueOn      Day    `csv:"due_on,required" validate:"required"`
	ClosedOn   Day    `csv:"closed_on"`
	VerifiedBy string `csv:"verified_by" validate:"omitempty,id"`
}

func (a *CorrectiveAction) rowRef() Ref { return a.Ref }

// checkIDPattern is the shape of a check id (domain.topic.problem, two to
// four parts of lower-case letters, digits and underscores), as the rule
// engine requires it of every check's custom.id.
var checkIDPattern = regexp.MustCompile(`^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*){1,3}$`)

// IsCheckID reports whether s has the shape of a check id.
func IsCheckID(s string) bool { return checkIDPattern.MatchString(s) }

var correctiveSpec = &fileSpec[CorrectiveAction]{
	name: correctiveFile,
	row: func(a *CorrectiveAction, c *rowCheck) *cellError {
		switch {
		case !IsCheckID(a.Check):
			return c.fail("Check", fmt.Sprintf("%q is not a check id (domain.topic.problem, e.g. care.water.unavailable)", a.Check))
		case !a.ClosedOn.IsZero() && !a.FoundOn.IsZero() && a.ClosedOn < a.FoundOn:
			return c.fail("ClosedOn", fmt.Sprintf("%s is before found_on %s", a.ClosedOn, a.FoundOn))
		case a.VerifiedBy != "" && a.ClosedOn.IsZero():
			return c.fail("ClosedOn", "is required when verified_by is given (a correction is verified once it is closed)")
		}
		return nil
	},
	day: func(a *CorrectiveAction) Day {
		if !a.FoundOn.IsZero() {
			return a.FoundOn
		}
		return a.DueOn
	},
}

// correctiveRefs is the cross-record rule of corrective_actions.csv: the
// owner and the person who verified are staff.
func (ld *loadedSet) correctiveRefs(staff *index) {
	ld.corrective.keep(func(a *CorrectiveAction) *cellError {
		return ld.corrective.refs(ref{"Owner", a.Owner, staff}, ref{"VerifiedBy", a.VerifiedBy, staff})
	})
}
