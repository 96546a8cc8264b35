package checker

import (
	"context"
	"fmt"
	"slices"
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
	// Previous is the previous review (--previous), for the follow-up and
	// the correction checks; nil when none was given.
	Previous *Previous
	// Rejected are the loader's rejected rows (records.Set.Problems) when
	// Records is a part of what was loaded (records.Set.Until); nil:
	// Records.Problems.
	Rejected []records.Problem
	// Lines has, per record file the loader read, its number of lines:
	// every evidence ref must name one of them. Nil when the rows did not
	// come from files (hand-made sets in tests): refs are then not checked.
	Lines map[string]int
	// DropRecords lets the check release the event rows only the facts
	// read (dropEvents) once the facts are built: for a caller that keeps
	// nothing of Records but the result.
	DropRecords bool
	// Released: see CheckOptions.Released.
	Released func()
}

// evalChunk is how many subjects of a kind are evaluated at once: each
// chunk's documents are let go before the next is evaluated.
const evalChunk = 256

// check computes the facts of every subject, evaluates the rules on them
// and returns the findings with everything a report needs but the
// fingerprint (Policy.Check adds it).
func check(ctx context.Context, cfg config) (*Result, error) {
	set := cfg.Records
	if cfg.Engine != nil {
		set = knownChecks(set, cfg.Engine.Checks())
	}
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
	var release func()
	if cfg.DropRecords {
		release = func() {
			cfg.Records.DropCare()
			set.DropCare()
			if cfg.Released != nil {
				cfg.Released()
			}
		}
	}
	buildFacts(f, release)
	f.addExtra()
	// The builders' shared indexes are not read again.
	f.care, f.handling, f.rounds = nil, nil, nil

	res := &Result{
		Facility:   set.Facility.Name,
		Period:     p,
		Accounting: set.Accounting,
		Warnings:   set.Warnings,
		Care:       f.coverage,
		SiteOf:     siteOf(set),
		Weather:    f.weather,
		ColdLines: ColdLines{Bedding: cfg.Limits.Cold.BeddingWindChill, Shelter: cfg.Limits.Cold.ShelterWindChill,
			Frostbite: cfg.Limits.Cold.FrostbiteWindChill},
	}
	res.Limits, res.LimitsText, res.Location = cfg.Limits.Lines(), cfg.Limits.Source(), set.Location
	res.Scope, res.Checks = scopeOf(cfg.Engine, cfg.Limits, cfg.Only)

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

	if cfg.DropRecords {
		dropEvents(cfg.Records)
		dropEvents(set)
	}
	// What the report needs of the documents once the findings are known
	// is taken now: each kind's documents go as soon as they are evaluated.
	inForce := map[string]bool{}
	for _, c := range res.Checks {
		inForce[c.ID] = !skipped[c.ID] && (len(only) == 0 || only[c.Domain]) && !cfg.Engine.off(c.ID)
	}
	res.Partial = f.partials(func(id string) bool { return inForce[id] })
	gaps := cleaningGaps(f.docs["enclosure"])

	progress("rules", 0)
	// The whole evaluation runs under its own budget; the packages' time
	// and the files read go to Evaluate with the context.
	rctx, cancel := cfg.Engine.startRun(ctx, cfg.Lines)
	defer cancel()
	evaluated := 0
	var firstPass []Finding
	malformed := false
	for _, kind := range cfg.Engine.Kinds() {
		inputs := f.inputs(kind)
		if len(inputs) == 0 {
			continue
		}
		f.keepFigureSections(kind)
		// Chunks in subject order: the error of the first failing subject
		// is still the one returned, and the findings are those of one
		// Evaluate over all the subjects (runs collapsed, sorted).
		var found []Finding
		for len(inputs) > 0 {
			n := min(len(inputs), evalChunk)
			part, err := cfg.Engine.Evaluate(rctx, kind, inputs[:n])
			if err != nil {
				return nil, err
			}
			clear(inputs[:n])
			inputs = inputs[n:]
			found = append(found, part...)
			evaluated += n
			progress("rules", evaluated)
		}
		found = collapseRuns(found, cfg.Engine.checks)
		slices.SortStableFunc(found, compareFindings)
		for _, fd := range found {
			switch {
			case fd.Check == MalformedCheck:
				// A rule's mistake is the run's problem, whatever --only says.
				fd.On = p.From
				malformed = true
			case fd.Check == RejectedCheck:
				// Rejected rows are always listed (addRejected).
			case skipped[fd.Check]:
				continue
			default:
				firstPass = append(firstPass, fd) // the correction checks see every domain's
				if len(only) > 0 && !only[fd.Domain] {
					continue
				}
			}
			res.Findings = append(res.Findings, fd)
		}
	}
	if malformed {
		res.Checks = addCheck(res.Checks, malformedInfo)
	}
	res.Rejected = set.Problems
	if cfg.Rejected != nil {
		res.Rejected = cfg.Rejected
	}
	addRejected(res, cfg.Engine.checks, p)
	SortFindings(res.Findings)
	f.addFigures(res, cfg.Only, gaps)
	if err := correctionPass(ctx, cfg, set, res, firstPass, skipped, only); err != nil {
		return nil, err
	}
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
	rounds := set.CareRounds()
	for i := range rounds.Len() {
		see(rounds.Day(i))
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

// RejectedCheck is the check id of a row the loader rejected. Its findings
// are never filtered away: not by --only, not by a severity override
// "off", not by leaving the shipped rules out (addRejected).
const RejectedCheck = "records.row.rejected"

// rejectedInfo is RejectedCheck's catalogue entry when the rules in force
// do not define it (the shipped rules/records.rego does).
var rejectedInfo = CheckInfo{
	ID: RejectedCheck, Domain: "records", Title: "Row rejected",
	Description: "A row failed parsing, validation or a reference check; it was not used by any other check.",
	Severity:    Minor, Source: "common practice", Package: "(loader)",
}

// addRejected lists every row the loader rejected among the findings: the
// rule's own finding when it made one, otherwise one made here from the
// loader's problem, with the rule's severity when the rule is in force
// (a severity override "off" does not hide a rejected row).
func addRejected(res *Result, checks map[string]CheckInfo, p Period) {
	if len(res.Rejected) == 0 {
		return
	}
	listed := map[string]bool{}
	for _, f := range res.Findings {
		if f.Check == RejectedCheck {
			listed[f.Subject] = true
		}
	}
	info, inForce := checks[RejectedCheck]
	if !inForce {
		info = rejectedInfo
	}
	added := false
	for _, pr := range res.Rejected {
		ref := pr.Row()
		if listed[string(ref)] {
			continue
		}
		on := pr.Day
		if on.IsZero() {
			on = p.From
		}
		res.Findings = append(res.Findings, Finding{Check: RejectedCheck, Domain: info.Domain, Subject: string(ref), On: on,
			Severity: info.Severity, Message: pr.Error(), Evidence: []records.Ref{ref}, Title: info.Title, Source: info.Source,
			Reportable: info.Reportable})
		added = true
	}
	if added && !inForce {
		res.Checks = addCheck(res.Checks, rejectedInfo)
	}
}

// addCheck adds c to checks (sorted by id) unless it is there.
func addCheck(checks []CheckInfo, c CheckInfo) []CheckInfo {
	i, found := slices.BinarySearchFunc(checks, c.ID, func(a CheckInfo, id string) int { return strings.Compare(a.ID, id) })
	if found {
		return checks
	}
	return slices.Insert(checks, i, c)
}

// dropEvents lets go of the rows that only the fact builders read: once the
// facts are built, the rules, the report figures (deaths, treatments,
// litters, environment readings), the follow-up (corrective actions) and
// the reports read none of these.
func dropEvents(set *records.Set) {
	set.DropCare()
	set.Handling, set.PPEChecks, set.Weather, set.Work = nil, nil, nil, nil
	set.Culls, set.Housing, set.Observations, set.Extra = nil, nil, nil, nil
}

// figureSections are the sections of a kind's documents that the report
// figures read after the findings are known (addFigures); the cleaning
// gaps are taken as CleaningGap before evaluation (cleaningGaps).
var figureSections = map[string][]string{
	"facility": {"mortality"},
	"animal":   {"weights"},
	"site":     {"heat"},
}

// keepFigureSections replaces the documents of kind by what figureSections
// keeps of them (nothing for most kinds), so the rest can go once the kind
// is evaluated.
func (f *facts) keepFigureSections(kind string) {
	keep := figureSections[kind]
	if len(keep) == 0 {
		delete(f.docs, kind)
		return
	}
	slim := make(map[string]map[string]any, len(f.docs[kind]))
	for id, d := range f.docs[kind] {
		s := map[string]any{}
		for _, k := range keep {
			if v, ok := d[k]; ok {
				s[k] = v
			}
		}
		slim[id] = s
	}
	f.docs[kind] = slim
}
