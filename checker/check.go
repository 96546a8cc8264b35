package checker

import (
	"context"
	"fmt"
	"strings"

	"welfare/records"
	"welfare/rules"
)

// Config is one check run: the loaded records, the limits and rules in
// force, and the period to check.
type Config struct {
	Records *records.Set
	Limits  *rules.Limits
	// LimitsSource is the text of the limits file in force, for the report's
	// "limits in force" with each value's source comment.
	LimitsSource []byte
	// Engine holds the compiled rules (see NewEngine).
	Engine *Engine
	// Period to check; a zero From or To is taken from the records' dates.
	Period Period
	// Only keeps the findings of these domains (all when empty).
	Only []string
	// Fingerprint identifies the inputs (see Fingerprint); copied to the result.
	Fingerprint string
	// Previous is the previous review (--previous), for the follow-up and
	// the correction checks; nil when none was given.
	Previous *Previous
}

// Check computes the facts of every subject, evaluates the rules on them
// and returns the findings with everything a report needs.
func Check(ctx context.Context, cfg Config) (*Result, error) {
	set := knownChecks(cfg.Records, cfg.Engine.Checks())
	p := cfg.Period
	if p.From.IsZero() || p.To.IsZero() {
		from, to := recordSpan(set)
		if p.From.IsZero() {
			p.From = from
		}
		if p.To.IsZero() {
			p.To = to
		}
	}
	if p.From.IsZero() || p.To.IsZero() {
		return nil, fmt.Errorf("no dated records to check: give --from and --to")
	}
	if p.To < p.From {
		return nil, fmt.Errorf("the period ends (%s) before it starts (%s)", p.To, p.From)
	}
	f := newFacts(set, cfg.Limits, p)
	for _, add := range domainFacts {
		add(f)
	}

	res := &Result{
		Facility:    set.Facility.Name,
		Period:      p,
		Fingerprint: cfg.Fingerprint,
		Accounting:  set.Accounting,
		Warnings:    set.Warnings,
		Checks:      cfg.Engine.Checks(),
		Care:        f.coverage,
		Weather:     f.weather,
		ColdLines: ColdLines{Bedding: cfg.Limits.Cold.BeddingWindChill, Shelter: cfg.Limits.Cold.ShelterWindChill,
			Frostbite: cfg.Limits.Cold.FrostbiteWindChill},
	}
	if len(cfg.LimitsSource) > 0 {
		res.Limits = limitLines(cfg.LimitsSource)
	}

	only := map[string]bool{}
	for _, d := range cfg.Only {
		only[d] = true
	}
	skipped := map[string]bool{}
	for _, c := range res.Checks {
		if len(only) > 0 && !only[c.Domain] {
			continue
		}
		if why := followUpSkip(cfg, c); why != "" {
			skipped[c.ID] = true
			res.NotEvaluated = append(res.NotEvaluated, Skipped{Check: c.ID, Reason: why})
			continue
		}
		var missing []string
		for _, file := range c.Needs {
			if file == needsPrevious {
				continue
			}
			if what, ok := needMet(set, file); !ok {
				missing = append(missing, what)
			}
		}
		if len(missing) > 0 {
			skipped[c.ID] = true
			res.NotEvaluated = append(res.NotEvaluated, Skipped{Check: c.ID,
				Reason: "no " + strings.Join(missing, " or ") + " in the records folder"})
		}
	}

	var firstPass []Finding
	for _, kind := range cfg.Engine.Kinds() {
		inputs := f.inputs(kind)
		if len(inputs) == 0 {
			continue
		}
		found, err := cfg.Engine.Evaluate(ctx, kind, inputs)
		if err != nil {
			return nil, err
		}
		for _, fd := range found {
			if skipped[fd.Check] {
				continue
			}
			firstPass = append(firstPass, fd) // the correction checks see every domain's
			if len(only) > 0 && !only[fd.Domain] {
				continue
			}
			res.Findings = append(res.Findings, fd)
		}
	}
	SortFindings(res.Findings)
	if err := correctionPass(ctx, cfg, set, res, firstPass, skipped, only); err != nil {
		return nil, err
	}
	if res.Findings == nil {
		res.Findings = []Finding{}
	}
	return res, nil
}

// domainFacts are the fact builders, one per domain, run in order. Each adds
// its sections to the subjects' documents. Domains in other files add
// theirs in an init func.
var domainFacts = []func(*facts){
	(*facts).enclosureFacts,
	(*facts).careFacts,
	(*facts).recordsFacts,
}

// recordSpan is the first and last day of the facility's event records
// (care rounds, handling, weather, outdoor work, culls). Inspections of
// equipment are left out: the last glove check before the period is
// evidence for it, not part of it.
func recordSpan(set *records.Set) (from, to records.Day) {
	see := func(d records.Day) {
		if d.IsZero() {
			return
		}
		if from.IsZero() || d < from {
			from = d
		}
		if d > to {
			to = d
		}
	}
	for i := range set.Care {
		see(set.Care[i].Day)
	}
	for i := range set.Handling {
		see(records.DayOf(set.Handling[i].At))
	}
	for i := range set.Weather {
		see(records.DayOf(set.Weather[i].At))
	}
	for i := range set.Work {
		see(records.DayOf(set.Work[i].StartedAt))
	}
	for i := range set.Culls {
		see(records.DayOf(set.Culls[i].At))
	}
	return from, to
}
