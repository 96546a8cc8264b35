package checker

import (
	"context"
	"fmt"
	"io"
	"io/fs"
	"slices"
	"strings"
	"sync/atomic"

	"welfare/records"
	"welfare/rules"
)

// Policy is a compiled rule set with the limits in force: what a check
// judges records by. Build it with Compile; it is safe for concurrent use.
type Policy struct {
	limits   *rules.Limits
	data     map[string]any // the limits as data.limits, converted once
	sources  []Source
	engine   *engine
	progress func(phase string, done int)
}

// Compile converts the limits once (they are data.limits to the rules),
// parses and compiles the rule files of sources in the sandbox (files
// ending in _test.rego are left out), reads their METADATA and prepares
// one query per rule package. A problem in the rules is a *RulesError with
// every problem as "file:row:col: message".
func Compile(ctx context.Context, limits *rules.Limits, sources []Source, opt Options) (*Policy, error) {
	if limits == nil {
		return nil, fmt.Errorf("no limits given")
	}
	data, err := limits.Data()
	if err != nil {
		return nil, fmt.Errorf("limits: %w", err)
	}
	e, err := newEngine(ctx, sources, data, opt)
	if err != nil {
		return nil, err
	}
	if err := checkOverrides(limits, e.Checks()); err != nil {
		return nil, err
	}
	return &Policy{limits: limits, data: data, sources: sources, engine: e, progress: opt.Progress}, nil
}

// Limits are the limits in force.
func (p *Policy) Limits() *rules.Limits { return p.limits }

// Checks lists the metadata of every check the rules define, sorted by id.
func (p *Policy) Checks() []CheckInfo { return p.engine.Checks() }

// Domains lists the domains of the checks in force, in check-id order
// without repeats: what --only may name.
func (p *Policy) Domains() []string {
	var out []string
	seen := map[string]bool{}
	for _, c := range p.engine.sorted {
		if !seen[c.Domain] {
			seen[c.Domain] = true
			out = append(out, c.Domain)
		}
	}
	return out
}

// Check loads the records folder recordsFS with the species of the limits
// in force, computes the facts of every subject, evaluates the rules on
// them and returns the findings with everything a report needs. A zero
// From or To of period is taken from the records' dates; only keeps the
// findings of these domains (all when empty). The result's fingerprint
// covers exactly the bytes read: records, rule files and limits.
func (p *Policy) Check(ctx context.Context, recordsFS fs.FS, period Period, only []string) (*Result, error) {
	res, _, err := p.CheckWith(ctx, recordsFS, CheckOptions{Period: period, Only: only, DropRecords: true})
	return res, err
}

// CheckOptions are what one check judges beyond the records folder.
type CheckOptions struct {
	// Period to check; a zero From or To is taken from the records' dates.
	Period Period
	// Only keeps the findings of these domains (all when empty).
	Only []string
	// Previous is the previous review (--previous): findings are classed
	// against it and the correction checks read it. Nil: none.
	Previous *Previous
	// Scope, when set, chooses the rows and the period once the records
	// are loaded (it replaces Period).
	Scope Scope
	// DropRecords releases the event rows (care rounds, handlings, weather,
	// outdoor work, ...) as soon as the facts are built, for a caller that
	// needs only the result: CheckWith then returns no rows.
	DropRecords bool
	// Released, when set with DropRecords, is called once the care rounds
	// are let go, while the facts are built: most of a large set's memory
	// is then garbage, for a caller pacing the collector to take it.
	Released func()
}

// Scope chooses, once the records are loaded, what a check judges: the
// rows (for the keepers' view of a day, the records as they stood at a
// moment: records.Set.Until) and the period. It may read the facility's
// time zone from the set.
type Scope func(set *records.Set) (*records.Set, Period, error)

// CheckWith is Check with every option; it also returns the rows judged
// (nil with DropRecords). The fingerprint covers every byte read.
func (p *Policy) CheckWith(ctx context.Context, recordsFS fs.FS, opt CheckOptions) (*Result, *records.Set, error) {
	domains := p.Domains()
	for _, d := range opt.Only {
		if !slices.Contains(domains, d) {
			return nil, nil, fmt.Errorf("%q is not a domain of the rules in force (%s)", d, strings.Join(domains, ", "))
		}
	}
	progress := p.progress
	if progress == nil {
		progress = func(string, int) {}
	}
	progress("load", 0)
	var rows atomic.Int64
	capture := newCaptureFS(recordsFS)
	set, err := records.LoadContext(ctx, capture, records.Options{Species: p.limits.SpeciesCodes(),
		Progress: func(n int) { progress("load", int(rows.Add(int64(n)))) }})
	if err == nil {
		err = capture.err()
	}
	if err != nil {
		return nil, nil, err
	}
	judged, period := set, opt.Period
	if opt.Scope != nil {
		if judged, period, err = opt.Scope(set); err != nil {
			return nil, nil, err
		}
	}
	lines := capture.lineCounts()
	for _, pr := range set.Problems {
		// A file the loader refused unread (too large, say) is still named
		// by its problem.
		if _, read := lines[pr.File]; !read {
			lines[pr.File] = 0
		}
	}
	res, err := check(ctx, config{Records: judged, Limits: p.limits, Engine: p.engine, Period: period, Only: opt.Only,
		Progress: progress, Previous: opt.Previous, Lines: lines, Rejected: set.Problems, DropRecords: opt.DropRecords, Released: opt.Released})
	if err != nil {
		return nil, nil, err
	}
	res.Fingerprint = fingerprint(capture.read(), p.engine.files, p.limits.Source(), opt.Only)
	if opt.DropRecords {
		return res, nil, nil
	}
	return res, judged, nil
}

// Test runs the Rego tests (files ending in _test.rego) of the policy's
// sources together with the rules they test, in the same sandbox and with
// the same data.limits. It writes one PASS, FAIL or SKIP line per test to
// w, in file order, then a summary; verbose adds each test's print output
// and duration. Failing tests are counted, not returned.
func (p *Policy) Test(ctx context.Context, w io.Writer, verbose bool) (passed, failed int, err error) {
	return runTests(ctx, p.sources, p.data, w, verbose)
}

// RuleTests runs the same tests as Test and returns one result per test.
func (p *Policy) RuleTests(ctx context.Context) ([]RuleTest, error) {
	return ruleTests(ctx, p.sources, p.data)
}

// checkOverrides refuses a severity override that names no check of the
// rules in force: a misspelt id would otherwise leave the check at its
// default without a word. The error is at the override's line.
func checkOverrides(l *rules.Limits, checks []CheckInfo) error {
	ids := make([]string, len(checks))
	for i, c := range checks {
		ids[i] = c.ID
	}
	keys := make([]string, 0, len(l.Severity))
	for k := range l.Severity {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		if slices.Contains(ids, k) {
			continue
		}
		reason := fmt.Sprintf("%q is not a check of the rules in force", k)
		if s := nearestID(k, ids); s != "" {
			reason += fmt.Sprintf(" (did you mean %s?)", s)
		} else {
			reason += " (welfare rules list shows them)"
		}
		key := "severity[" + k + "]"
		return &records.LoadError{File: l.Name(), Line: l.KeyLine(key), Column: key, Reason: reason}
	}
	return nil
}

// nearestID is the check id closest to s by edit distance, when within
// three edits; "" when none is.
func nearestID(s string, ids []string) string {
	best, bestD := "", 4
	for _, id := range ids {
		if d := editDistance(s, id); d < bestD {
			best, bestD = id, d
		}
	}
	return best
}

// editDistance is the Levenshtein distance, swaps of two neighbouring
// letters counting one.
func editDistance(a, b string) int {
	d := make([][]int, len(a)+1)
	for i := range d {
		d[i] = make([]int, len(b)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(a)][len(b)]
}
