package reports

import (
	"fmt"
	"slices"
	"sort"
	"strings"

	"welfare/checker"
	"welfare/records"
)

// Disclaimer is the statement every human-readable output carries.
const Disclaimer = "This report is a check of the records against the rules and limits in force; " +
	"it is not a veterinary judgement. The attending veterinarian, the animal-care committee " +
	"and local law decide on the animals' welfare and on any corrective action."

// domainOrder is the order of the check catalogue: record keeping first,
// because rejected rows limit what every other check could see.
var domainOrder = checker.Domains()

// severities lists the severities most severe first.
var severities = []checker.Severity{checker.Significant, checker.Minor, checker.Note}

// domainOf is the finding's domain, falling back to the check id's first
// part when the checker left it empty.
func domainOf(f *checker.Finding) string {
	if f.Domain != "" {
		return f.Domain
	}
	if i := strings.IndexByte(f.Check, '.'); i > 0 {
		return f.Check[:i]
	}
	return f.Check
}

// domainRank orders known domains as the catalogue does and unknown ones
// after them, alphabetically (by the caller's tie-break).
func domainRank(d string) int {
	for i, x := range domainOrder {
		if x == d {
			return i
		}
	}
	return len(domainOrder)
}

// tally counts findings by domain and severity.
type tally struct {
	domains []string // known domains always, then any other domain with findings
	counts  map[string]map[checker.Severity]int
	other   int // findings with a severity outside the three known ones
}

func countFindings(fs []checker.Finding) tally {
	t := tally{counts: map[string]map[checker.Severity]int{}}
	for i := range fs {
		d := domainOf(&fs[i])
		m := t.counts[d]
		if m == nil {
			m = map[checker.Severity]int{}
			t.counts[d] = m
		}
		m[fs[i].Severity]++
		if fs[i].Severity.Rank() == 0 {
			t.other++
		}
	}
	t.domains = append(t.domains, domainOrder...)
	var extra []string
	for d := range t.counts {
		if domainRank(d) == len(domainOrder) {
			extra = append(extra, d)
		}
	}
	sort.Strings(extra)
	t.domains = append(t.domains, extra...)
	return t
}

func (t tally) get(domain string, s checker.Severity) int { return t.counts[domain][s] }

func (t tally) domainTotal(domain string) int {
	n := 0
	for _, c := range t.counts[domain] {
		n += c
	}
	return n
}

func (t tally) severityTotal(s checker.Severity) int {
	n := 0
	for _, d := range t.domains {
		n += t.counts[d][s]
	}
	return n
}

func (t tally) total() int {
	n := 0
	for _, d := range t.domains {
		n += t.domainTotal(d)
	}
	return n
}

// bySeverity returns the findings in the checker's report order (most
// severe first), whatever order the result holds them in.
func bySeverity(fs []checker.Finding) []*checker.Finding {
	sorted := slices.Clone(fs)
	checker.SortFindings(sorted)
	out := make([]*checker.Finding, len(sorted))
	for i := range sorted {
		out[i] = &sorted[i]
	}
	return out
}

// checkGroup is one check's findings within a domain, most severe first.
type checkGroup struct {
	check    string
	title    string
	source   string
	worst    checker.Severity
	findings []*checker.Finding
}

// domainGroup is one domain's findings, checks with significant findings first.
type domainGroup struct {
	domain string
	checks []checkGroup
	count  int
}

// groupFindings groups findings by domain (catalogue order) and check
// (most severe check first, then id). The title and source come from the
// findings, else from the check catalogue in r.Checks.
func groupFindings(r *checker.Result) []domainGroup {
	info := map[string]checker.CheckInfo{}
	for _, c := range r.Checks {
		info[c.ID] = c
	}
	byCheck := map[string]*checkGroup{}
	domainOfCheck := map[string]string{}
	for _, f := range bySeverity(r.Findings) {
		g := byCheck[f.Check]
		if g == nil {
			g = &checkGroup{check: f.Check, title: f.Title, source: f.Source, worst: f.Severity}
			if g.title == "" {
				g.title = info[f.Check].Title
			}
			if f.Local || info[f.Check].Local {
				g.title += LocalMark
			}
			if g.source == "" {
				g.source = info[f.Check].Source
			}
			byCheck[f.Check] = g
			domainOfCheck[f.Check] = domainOf(f)
		}
		g.findings = append(g.findings, f)
	}
	groups := map[string]*domainGroup{}
	for id, g := range byCheck {
		d := domainOfCheck[id]
		dg := groups[d]
		if dg == nil {
			dg = &domainGroup{domain: d}
			groups[d] = dg
		}
		dg.checks = append(dg.checks, *g)
		dg.count += len(g.findings)
	}
	out := make([]domainGroup, 0, len(groups))
	for _, dg := range groups {
		sort.Slice(dg.checks, func(i, j int) bool {
			a, b := dg.checks[i], dg.checks[j]
			if ra, rb := a.worst.Rank(), b.worst.Rank(); ra != rb {
				return ra > rb
			}
			return a.check < b.check
		})
		out = append(out, *dg)
	}
	sort.Slice(out, func(i, j int) bool {
		ri, rj := domainRank(out[i].domain), domainRank(out[j].domain)
		if ri != rj {
			return ri < rj
		}
		return out[i].domain < out[j].domain
	})
	return out
}

// dates is a finding's day or run of days, "2026-01-14" or
// "2026-01-14 – 2026-01-16".
func dates(f *checker.Finding) string {
	if f.Until.IsZero() || f.Until == f.On {
		return dayOrNone(f.On)
	}
	return dayOrNone(f.On) + " – " + f.Until.String()
}

func dayOrNone(d records.Day) string {
	if d.IsZero() {
		return "no date"
	}
	return d.String()
}

func refsString(refs []records.Ref, sep string) string {
	var b strings.Builder
	for i, r := range refs {
		if i > 0 {
			b.WriteString(sep)
		}
		b.WriteString(string(r))
	}
	return b.String()
}

// totals sums the row accounting over all files.
func totals(fc []records.FileCount) records.FileCount {
	t := records.FileCount{File: "total"}
	for _, c := range fc {
		t.Read += c.Read
		t.Accepted += c.Accepted
		t.Rejected += c.Rejected
	}
	return t
}

// shortPrint is the first 12 hex digits of the fingerprint, enough to match
// a printed page to its report.
func shortPrint(fp string) string {
	if len(fp) > 12 {
		return fp[:12]
	}
	if fp == "" {
		return "none"
	}
	return fp
}

// careShare describes r.Care in words.
func careShare(c checker.CareCoverage) string {
	if c.OccupiedDays == 0 {
		return "No occupied enclosure-days in the period, so no care coverage to report."
	}
	return "Care records complete (an observed round and a feeding) on " +
		itoa(c.CompleteDays) + " of " + itoa(c.OccupiedDays) + " occupied enclosure-days (" +
		percent(c.CompleteDays, c.OccupiedDays) + ")."
}

// noFindings is what a report says when there are no findings: a bare
// "No findings." only when every check that applies was evaluated in full;
// otherwise how many checks were not evaluated or evaluated only in part,
// and which (checks.md "Never pass what was not judged").
func noFindings(r *checker.Result) string {
	if len(r.NotEvaluated) == 0 && len(r.Partial) == 0 {
		return "No findings."
	}
	var parts []string
	if n := len(r.NotEvaluated); n > 0 {
		ids := make([]string, n)
		for i, s := range r.NotEvaluated {
			ids[i] = s.Check
		}
		parts = append(parts, fmt.Sprintf("%s not evaluated (%s)", plural(n, "check"), strings.Join(ids, ", ")))
	}
	if n := len(r.Partial); n > 0 {
		ids := make([]string, n)
		for i, s := range r.Partial {
			ids[i] = s.Check
		}
		parts = append(parts, fmt.Sprintf("%s evaluated only in part (%s)", plural(n, "check"), strings.Join(ids, ", ")))
	}
	return "No findings among the checks evaluated, but not a clean result: " + strings.Join(parts, "; ") + "."
}
