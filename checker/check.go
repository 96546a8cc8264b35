package checker

import (
	"context"
	"fmt"
	"strings"

	"welfare/records"
	"welfare/rules"
)

// config is one check run: the loaded records, the limits and rules in
// force, and the period to check.
type config struct {
	Records *records.Set
	Limits  *rules.Limits
	// Engine holds the compiled rules (see newEngine).
	Engine *engine
	// Period to check; a zero From or To is taken from the records' dates.
	Period Period
	// Only keeps the findings of these domains (all when empty).
	Only []string
	// Progress: see Options.Progress.
	Progress func(phase string, done int)
}

// check computes the facts of every subject, evaluates the rules on them
// and returns the findings with everything a report needs but the
// fingerprint (Policy.Check adds it).
func check(ctx context.Context, cfg config) (*Result, error) {
	set := cfg.Records
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
	if err := defaultSpan(cfg.Period, p); err != nil {
		return nil, err
	}
	if p.To < p.From {
		return nil, fmt.Errorf("the period ends (%s) before it starts (%s)", p.To, p.From)
	}
	progress := cfg.Progress
	if progress == nil {
		progress = func(string, int) {}
	}
	progress("facts", 0)
	f := newFacts(set, cfg.Limits, p)
	for _, d := range domains {
		d.facts(f)
	}
	f.addExtra()

	res := &Result{
		Facility:   set.Facility.Name,
		Period:     p,
		Accounting: set.Accounting,
		Warnings:   set.Warnings,
		Checks:     cfg.Engine.Checks(),
		Care:       f.coverage,
		SiteOf:     siteOf(set),
		Weather:    f.weather,
		ColdLines: ColdLines{Bedding: cfg.Limits.Cold.BeddingWindChill, Shelter: cfg.Limits.Cold.ShelterWindChill,
			Frostbite: cfg.Limits.Cold.FrostbiteWindChill},
	}
	res.Limits = cfg.Limits.Lines()

	only := map[string]bool{}
	for _, d := range cfg.Only {
		only[d] = true
	}
	skipped := map[string]bool{}
	for _, c := range res.Checks {
		if len(only) > 0 && !only[c.Domain] {
			continue
		}
		var missing []string
		for _, file := range c.Needs {
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

	progress("rules", 0)
	evaluated := 0
	for _, kind := range cfg.Engine.Kinds() {
		inputs := f.inputs(kind)
		if len(inputs) == 0 {
			continue
		}
		found, err := cfg.Engine.Evaluate(ctx, kind, inputs)
		if err != nil {
			return nil, err
		}
		evaluated += len(inputs)
		progress("rules", evaluated)
		for _, fd := range found {
			if skipped[fd.Check] || (len(only) > 0 && !only[fd.Domain]) {
				continue
			}
			res.Findings = append(res.Findings, fd)
		}
	}
	SortFindings(res.Findings)
	f.addFigures(res, cfg.Only)
	if res.Findings == nil {
		res.Findings = []Finding{}
	}
	return res, nil
}

// recordSpan is the first and last day of the facility's event records
// (care rounds, handling, weather, outdoor work, culls). Inspections of
// equipment are left out: the last glove check before the period is
// evidence for it, not part of it.
// MaxDefaultYears is the longest period taken from the records' dates alone:
// a longer span is most often a typing slip in one date, so the user is
// asked to choose the period.
const MaxDefaultYears = 2

// defaultSpan refuses a period worked out from the records (asked is the
// period as given) that is longer than MaxDefaultYears.
func defaultSpan(asked, p Period) error {
	if !asked.From.IsZero() && !asked.To.IsZero() {
		return nil
	}
	if p.To > p.From.AddYears(MaxDefaultYears) {
		return fmt.Errorf("the records' dates run from %s to %s, more than %d years: give --from and --to to choose the period to check",
			p.From, p.To, MaxDefaultYears)
	}
	return nil
}

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

// siteOf maps the subjects of cold findings to the weather site whose
// chart they belong on: an enclosure to its building's site, a keeper to
// the site of their first stint, a site to itself.
func siteOf(set *records.Set) map[string]string {
	m := map[string]string{}
	bsite := map[string]string{}
	for _, b := range set.Facility.Buildings {
		bsite[b.ID] = b.WeatherSite
	}
	for _, e := range set.Enclosures {
		if s := bsite[e.BuildingID]; s != "" {
			m[e.ID] = s
		}
	}
	for _, w := range set.Work {
		if _, ok := m[w.StaffID]; !ok {
			m[w.StaffID] = w.SiteID
		}
	}
	for _, s := range set.Facility.WeatherSites {
		m[s] = s
	}
	return m
}
