package checker

import (
	"welfare/records"
)

// Severity is the weight of a finding, in the terms animal-care programme
// reviews use (US PHS Policy IV.B distinguishes significant from minor).
type Severity string

const (
	Significant Severity = "significant"
	Minor       Severity = "minor"
	Note        Severity = "note"
)

// Rank orders severities: significant 3, minor 2, note 1, anything else 0.
func (s Severity) Rank() int {
	switch s {
	case Significant:
		return 3
	case Minor:
		return 2
	case Note:
		return 1
	}
	return 0
}

// Finding is one problem found in the records.
type Finding struct {
	Check    string // domain.topic.problem
	Domain   string // the check id's first part
	Subject  string // enclosure, animal, staff, item, protocol or site id, or FILE:LINE
	On       records.Day
	Until    records.Day // last day of a run; zero for a single day
	Severity Severity
	// SeverityWhy says why Severity differs from the check's default ("significant: 2 days
	// in a row", "limits override ..."); "" when it does not.
	SeverityWhy string
	Message     string
	Evidence    []records.Ref
	Title       string
	Source      string
	// Reportable: noncompliance the institution reports (PHS Policy
	// IV.F.3); outputs mark it "report to the institutional official".
	Reportable bool
	// Local: the check is a committee's own (CheckInfo.Local).
	Local bool
}

// Key is the finding's stable identity: check id, subject and first day,
// `care.water.unavailable S2-11 2026-01-08` (see followup.go).
func (f Finding) Key() string { return KeyOf(f.Check, f.Subject, f.On) }

// CheckInfo is a rule's metadata, read from its # METADATA annotation.
type CheckInfo struct {
	ID          string   `json:"id"`
	Domain      string   `json:"domain"`
	Title       string   `json:"title"`
	Description string   `json:"description"`
	Severity    Severity `json:"severity"` // the rule's default
	Source      string   `json:"source"`
	Package     string   `json:"package"` // e.g. welfare.care
	File        string   `json:"file"`    // where the rule is defined
	Row         int      `json:"row"`     // the row of the rule's METADATA in File
	// Limits are the limits the check reads, as dotted paths of the
	// limits file ("health.weight_loss_pct"; [_] for a part chosen at run
	// time), found in the compiled rules.
	Limits []string `json:"limits,omitempty"`
	// Needs lists the record files the check reads; when one is absent the
	// check is "not evaluated".
	Needs []string `json:"needs,omitempty"`
	// Runs is true when consecutive days of the same check and subject
	// collapse into one finding (On = first day, Until = last day).
	Runs bool `json:"runs,omitempty"`
	// Subjects are the subject kinds whose facts the check's package
	// receives (enclosure, animal, ...), from its package METADATA.
	Subjects []string `json:"subjects,omitempty"`
	// Reportable is custom.reportable: findings of the check are
	// noncompliance reported to the institutional official (PHS Policy IV.F.3).
	Reportable bool `json:"reportable,omitempty"`
	// Escalation is custom.escalation: when a finding's severity departs
	// from the default ("significant from 2 days in a row").
	Escalation string `json:"escalation,omitempty"`
	// Period is custom.period: the stretch of time the check is judged
	// over. "review" (PeriodReview) is a review period, as for the
	// follow-up of corrective plans: a keeper's view of one day leaves such
	// a check out. Empty (or "day" in the METADATA) is the default: the
	// check judges days.
	Period string `json:"period,omitempty"`
	// Local: the check is the committee's own — from a Source marked Local
	// (a --rules folder), or a rule file that is not one of the shipped
	// rules as shipped (an edited copy); outputs mark it "local rule".
	Local bool `json:"local,omitempty"`
}

// PeriodReview is the custom.period of a check judged over a review period,
// not a keeper's day.
const PeriodReview = "review"

// ReviewPeriod reports whether the check is judged over a review period
// (custom.period: review) rather than day by day.
func (c CheckInfo) ReviewPeriod() bool { return c.Period == PeriodReview }

// Skipped is a check that was not evaluated, and why.
type Skipped struct {
	Check  string `json:"check"`
	Reason string `json:"reason"`
}
