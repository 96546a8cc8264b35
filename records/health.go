package records

import (
	"fmt"
)

// The health and breeding record files (deaths, observations, veterinary
// cases, litters): their per-file rules here, their cross-record rules in
// crossCheckHealth.
var (
	deathSpec = &fileSpec[Death]{
		name: deathsFile,
		row: func(d *Death, c *rowCheck) *cellError {
			if !d.VetNotifiedAt.IsZero() && d.VetNotifiedAt.Before(d.FoundDeadAt) {
				return c.fail("VetNotifiedAt", fmt.Sprintf("%s is before found_dead_at %s",
					d.VetNotifiedAt.Format("2006-01-02T15:04"), d.FoundDeadAt.Format("2006-01-02T15:04")))
			}
			return nil
		},
		day: func(d *Death) Day { return dayOfTime(d.FoundDeadAt) },
		// An animal dies once: a second row for it is a duplicate.
		id:     func(d *Death) string { return d.AnimalID },
		idName: "AnimalID",
	}
	observationSpec = &fileSpec[Observation]{
		name: observationsFile,
		day:  func(o *Observation) Day { return dayOfTime(o.At) },
	}
	treatmentSpec = &fileSpec[Treatment]{
		name: treatmentsFile,
		row: func(t *Treatment, c *rowCheck) *cellError {
			switch {
			case !t.ClosedOn.IsZero() && t.ClosedOn < t.OpenedOn:
				return c.fail("ClosedOn", fmt.Sprintf("%s is before opened_on %s", t.ClosedOn, t.OpenedOn))
			case !t.ReviewedOn.IsZero() && t.ReviewedOn < t.OpenedOn:
				return c.fail("ReviewedOn", fmt.Sprintf("%s is before opened_on %s", t.ReviewedOn, t.OpenedOn))
			case !t.ClosedOn.IsZero() && t.Outcome == "":
				return c.fail("Outcome", "is required when closed_on is given")
			case t.ClosedOn.IsZero() && t.Outcome != "":
				return c.fail("ClosedOn", "is required when outcome is given")
			}
			return nil
		},
		day:    func(t *Treatment) Day { return t.OpenedOn },
		id:     func(t *Treatment) string { return t.CaseID },
		idName: "CaseID",
	}
	litterSpec = &fileSpec[Litter]{
		name: littersFile,
		row: func(l *Litter, c *rowCheck) *cellError {
			alive, aliveCol := l.Born, "born"
			if l.BornAlive != nil {
				alive, aliveCol = *l.BornAlive, c.p.header("BornAlive")
			}
			switch {
			case l.BornAlive != nil && *l.BornAlive > l.Born:
				return c.fail("BornAlive", fmt.Sprintf("%d is more than born (%d)", *l.BornAlive, l.Born))
			case !l.WeanedOn.IsZero() && l.WeanedOn < l.WhelpedOn:
				return c.fail("WeanedOn", fmt.Sprintf("%s is before whelped_on %s", l.WeanedOn, l.WhelpedOn))
			case !l.WeanedOn.IsZero() && l.Weaned == nil:
				return c.fail("Weaned", "is required when weaned_on is given")
			case l.WeanedOn.IsZero() && l.Weaned != nil:
				return c.fail("WeanedOn", "is required when weaned is given")
			case l.Weaned != nil && *l.Weaned > alive:
				return c.fail("Weaned", fmt.Sprintf("%d is more than %s (%d)", *l.Weaned, aliveCol, alive))
			}
			return nil
		},
		day:    func(l *Litter) Day { return l.WhelpedOn },
		id:     func(l *Litter) string { return l.ID },
		idName: "ID",
	}
)

// crossCheckHealth applies the cross-record rules of the health and
// breeding files: every animal and staff id exists, and a litter's dam is a
// female present at the facility on whelped_on. Whether a death matches the
// animal's departure is a record-keeping finding (records.death.mismatch),
// not a loading problem.
func (ld *loadedSet) crossCheckHealth(animals, staff *index) {
	ld.deaths.keep(func(d *Death) *cellError {
		return ld.deaths.refs(ref{"AnimalID", d.AnimalID, animals}, ref{"FoundBy", d.FoundBy, staff})
	})
	ld.observations.keep(func(o *Observation) *cellError {
		return ld.observations.refs(ref{"AnimalID", o.AnimalID, animals}, ref{"StaffID", o.StaffID, staff})
	})
	ld.treatments.keep(func(t *Treatment) *cellError {
		return ld.treatments.refs(ref{"AnimalID", t.AnimalID, animals}, ref{"PrescribedBy", t.PrescribedBy, staff})
	})
	byID := make(map[string]*Animal, len(ld.animals.rows))
	for i := range ld.animals.rows {
		byID[ld.animals.rows[i].ID] = &ld.animals.rows[i]
	}
	ld.litters.keep(func(l *Litter) *cellError {
		if ce := ld.litters.refs(ref{"DamID", l.DamID, animals}); ce != nil {
			return ce
		}
		a := byID[l.DamID]
		switch {
		case a.Sex != "f":
			sex := a.Sex
			if sex == "" {
				sex = "not recorded"
			}
			return ld.litters.cellErr("DamID", l.DamID, fmt.Sprintf("%q is not a female (sex %s at %s)", l.DamID, sex, a.Ref))
		case l.WhelpedOn < a.ArrivedOn || (!a.LeftOn.IsZero() && l.WhelpedOn > a.LeftOn):
			left := "still here"
			if !a.LeftOn.IsZero() {
				left = "left " + a.LeftOn.String()
			}
			return ld.litters.cellErr("DamID", l.DamID, fmt.Sprintf("%q was not at the facility on whelped_on %s (arrived %s, %s; %s)",
				l.DamID, l.WhelpedOn, a.ArrivedOn, left, a.Ref))
		}
		return nil
	})
}
