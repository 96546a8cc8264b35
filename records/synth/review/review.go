// Package review writes a generated folder's previous review
// (synth.Review) as the findings file `welfare check --json` writes, so
// that `welfare check DIR --previous DIR/previous/findings.json` reads it.
// It lives apart from package synth because it needs the checker and the
// reports, whose own tests generate folders with synth.
package review

import (
	"context"
	"fmt"
	"io"
	"sync"

	"welfare/checker"
	"welfare/records"
	"welfare/records/synth"
	"welfare/reports"
	"welfare/rules"
)

// shippedChecks are the checks of the shipped rules and limits, compiled
// once per process.
var shippedChecks = sync.OnceValues(func() ([]checker.CheckInfo, error) {
	lim, err := rules.Default()
	if err != nil {
		return nil, err
	}
	p, err := checker.Compile(context.Background(), lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		return nil, err
	}
	return p.Checks(), nil
})

// Write renders r as a findings file: each finding with its check's
// domain, title, source and reportable mark from the shipped rules. The
// review is made by hand, not checked from records, so its fingerprint is
// empty and it accounts no rows. A check the shipped rules do not have is
// an error.
func Write(w io.Writer, r synth.Review) error {
	checks, err := shippedChecks()
	if err != nil {
		return err
	}
	info := map[string]checker.CheckInfo{}
	for _, c := range checks {
		info[c.ID] = c
	}
	day := func(s string) (records.Day, error) {
		if s == "" {
			return 0, nil
		}
		return records.ParseDay(s)
	}
	res := &checker.Result{Facility: r.Facility, Checks: checks}
	if res.Period.From, err = day(r.From); err != nil {
		return err
	}
	if res.Period.To, err = day(r.To); err != nil {
		return err
	}
	for _, f := range r.Findings {
		c, ok := info[f.Check]
		if !ok {
			return fmt.Errorf("previous finding of %s: not a check of the shipped rules", f.Check)
		}
		if checker.Severity(f.Severity).Rank() == 0 {
			return fmt.Errorf("previous finding of %s: severity %q is not significant, minor or note", f.Check, f.Severity)
		}
		on, err := day(f.On)
		if err != nil {
			return err
		}
		until, err := day(f.Until)
		if err != nil {
			return err
		}
		res.Findings = append(res.Findings, checker.Finding{Check: f.Check, Domain: c.Domain, Subject: f.Subject,
			On: on, Until: until, Severity: checker.Severity(f.Severity), Message: f.Message,
			Evidence: []records.Ref{}, Title: c.Title, Source: c.Source, Reportable: c.Reportable})
	}
	checker.SortFindings(res.Findings)
	return reports.WriteJSON(w, res)
}
