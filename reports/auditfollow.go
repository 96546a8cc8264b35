package reports

import (
	"bufio"
	"fmt"
	"sort"
	"strings"

	"welfare/checker"
	"welfare/records"
)

// The follow-up parts of the audit: "Since the last review" (new,
// recurring and resolved problems, the corrective actions) and the trends
// (findings per month; the previous period's totals beside this one's).

// planCell is the "Plan and schedule for correction" cell of a finding:
// the plan that answers it, its owner, due date and status; empty (to be
// written by hand) when no plan answers it.
func planCell(r *checker.Result, f *checker.Finding) string {
	a := r.ActionFor(f)
	if a == nil {
		return ""
	}
	return a.ActionLine()
}

// keyLine is the line under a finding's message: its key and, against a
// previous review, its class.
func keyLine(r *checker.Result, f *checker.Finding) string {
	s := "key " + f.Key()
	if c := r.ClassOf(f); c != "" {
		s += " · " + c
	}
	return s
}

// followUpSections are the sections after the summary: "Since the last
// review" when there is a previous review or corrective actions, and
// "Trends" when the period spans more than one month or has a previous
// review to compare with.
func (b *auditBuilder) followUpSections() []AuditSection {
	var out []AuditSection
	fu := b.r.FollowUp
	if fu != nil && (fu.Previous != nil || len(fu.Actions) > 0) {
		out = append(out, b.sinceLast())
	}
	if s, ok := b.trends(); ok {
		out = append(out, s)
	}
	return out
}

func (b *auditBuilder) sinceLast() AuditSection {
	r, fu := b.r, b.r.FollowUp
	if p := fu.Previous; p != nil {
		b.add(para(fmt.Sprintf("Compared with the previous review %s (%s to %s, %s). A problem is a check and a subject; "+
			"it is recurring when the previous review had it, resolved when the previous review had it and its check, evaluated "+
			"this time, no longer finds it. A problem whose check was not evaluated this time is not re-checked, never resolved.",
			p.File, p.Period.From, p.Period.To, plural(len(p.Findings), "finding")), "", 9.5))
		b.add(space(2), subheading("Problems by domain", 30), Block{Kind: KindTable, Table: b.classTable()})

		var rec []Row
		seen := map[string]bool{}
		for i := range r.Findings {
			f := &r.Findings[i]
			if f.Severity != checker.Significant || r.ClassOf(f) != checker.ClassRecurring || seen[f.Problem()] {
				continue
			}
			seen[f.Problem()] = true
			rec = append(rec, Row{Cells: []string{f.Check, f.Subject, dates(f), planCell(r, f)}})
		}
		b.add(subheading(fmt.Sprintf("Recurring significant problems (%d)", len(rec)), 14))
		if len(rec) == 0 {
			b.add(para("None.", "", 10))
		} else {
			b.add(b.listing(&Table{Size: 8.5, Caption: "Recurring significant problems", Columns: []Column{
				{Head: "Check", Width: 55, Align: "L", Mono: true},
				{Head: "Subject", Width: 25, Align: "L", Mono: true},
				{Head: "This period", Width: 30, Align: "L"},
				{Head: "Plan and schedule", Width: 70, Align: "L"},
			}, Rows: rec}, "in the attached findings.csv and findings.json (class recurring, severity significant)")...)
		}
		b.add(subheading(fmt.Sprintf("Resolved since the previous review (%d)", len(fu.Resolved)), 14))
		if len(fu.Resolved) == 0 {
			b.add(para("None.", "", 10))
		} else {
			b.add(b.listing(pastTable("Resolved since the previous review", fu.Resolved, false),
				"in the attached findings.json (follow_up.resolved)")...)
		}
		if len(fu.NotRechecked) > 0 {
			b.add(subheading(fmt.Sprintf("Not re-checked this time (%d)", len(fu.NotRechecked)), 14),
				para("Their checks were not evaluated in this period, so whether they were corrected is not known.", "italic", 9))
			b.add(b.listing(pastTable("Not re-checked this time", fu.NotRechecked, true),
				"in the attached findings.json (follow_up.not_rechecked)")...)
		}
	} else {
		b.add(para("No previous review was given (--previous), so findings are not classed new or recurring; "+
			"the corrective actions are judged against this period's findings.", "italic", 9.5))
	}

	b.add(subheading(fmt.Sprintf("Corrective actions (%d), overdue first", len(fu.Actions)), 14))
	if len(fu.Actions) == 0 {
		b.add(para("No corrective_actions.csv in the records folder: no plan and schedule for correction is on record.", "", 10))
	} else {
		at := &Table{Size: 8, Caption: "Corrective actions", Columns: []Column{
			{Head: "Status", Width: 20, Align: "L"},
			{Head: "Problem", Width: 64, Align: "L", Mono: true},
			{Head: "Plan", Width: 43, Align: "L"},
			{Head: "Owner", Width: 15, Align: "L", Mono: true},
			{Head: "Due", Width: 19, Align: "L"},
			{Head: "Closed", Width: 19, Align: "L"},
		}}
		for _, a := range fu.Actions {
			closed := "—"
			if !a.Action.ClosedOn.IsZero() {
				closed = a.Action.ClosedOn.String()
				if a.Action.VerifiedBy != "" {
					closed += "\nverified " + a.Action.VerifiedBy
				}
			}
			at.Rows = append(at.Rows, Row{Bold: a.Status == checker.StatusOverdue, Cells: []string{a.Status, a.Problem(),
				a.Action.Plan, orDash(a.Action.Owner), a.Action.DueOn.String(), closed}})
		}
		b.add(b.listing(at, "in the attached findings.json (follow_up.corrective_actions) and the records' corrective_actions.csv")...)
		b.add(para("9 CFR §2.31(c)(3): a significant deficiency not corrected by the date in its plan is reported to APHIS and "+
			"any funding agency within 15 business days; the institution decides, with its attending veterinarian and committee.", "italic", 8.5))
	}
	return b.section("Since the last review", true, "Since the last review")
}

// classTable counts new, recurring, resolved and not re-checked problems by domain.
func (b *auditBuilder) classTable() *Table {
	r, fu := b.r, b.r.FollowUp
	type counts struct{ fresh, recurring, resolved, notRechecked int }
	by := map[string]*counts{}
	get := func(d string) *counts {
		if by[d] == nil {
			by[d] = &counts{}
		}
		return by[d]
	}
	seen := map[string]bool{}
	for i := range r.Findings {
		f := &r.Findings[i]
		if seen[f.Problem()] {
			continue
		}
		seen[f.Problem()] = true
		if r.ClassOf(f) == checker.ClassRecurring {
			get(domainOf(f)).recurring++
		} else {
			get(domainOf(f)).fresh++
		}
	}
	for _, p := range fu.Resolved {
		get(pastDomain(p)).resolved++
	}
	for _, p := range fu.NotRechecked {
		get(pastDomain(p)).notRechecked++
	}
	t := &Table{Size: 9, Caption: "Problems by domain", Columns: []Column{
		{Head: "Domain", Width: 50, Align: "L"},
		{Head: "New", Width: 30, Align: "R"},
		{Head: "Recurring", Width: 30, Align: "R"},
		{Head: "Resolved", Width: 30, Align: "R"},
		{Head: "Not re-checked", Width: 40, Align: "R"},
	}}
	var total counts
	for _, d := range orderedDomains(by) {
		c := by[d]
		total.fresh, total.recurring, total.resolved, total.notRechecked = total.fresh+c.fresh, total.recurring+c.recurring,
			total.resolved+c.resolved, total.notRechecked+c.notRechecked
		t.Rows = append(t.Rows, Row{Cells: []string{d, itoa(c.fresh), itoa(c.recurring), itoa(c.resolved), itoa(c.notRechecked)}})
	}
	t.Rows = append(t.Rows, Row{Bold: true, Cells: []string{"total", itoa(total.fresh), itoa(total.recurring), itoa(total.resolved), itoa(total.notRechecked)}})
	return t
}

func pastDomain(p checker.PastProblem) string {
	if p.Domain != "" {
		return p.Domain
	}
	d, _, _ := strings.Cut(p.Check, ".")
	return d
}

// orderedDomains lists the map's domains in the report's domain order.
func orderedDomains[T any](by map[string]T) []string {
	var ds []string
	for d := range by {
		ds = append(ds, d)
	}
	sort.Slice(ds, func(i, j int) bool {
		if a, b := domainRank(ds[i]), domainRank(ds[j]); a != b {
			return a < b
		}
		return ds[i] < ds[j]
	})
	return ds
}

func pastTable(caption string, ps []checker.PastProblem, why bool) *Table {
	t := &Table{Size: 8.5, Caption: caption, Columns: []Column{
		{Head: "Check", Width: 55, Align: "L", Mono: true},
		{Head: "Subject", Width: 25, Align: "L", Mono: true},
		{Head: "Previously from", Width: 28, Align: "L"},
		{Head: "Severity", Width: 22, Align: "L"},
	}}
	if why {
		t.Columns = append(t.Columns, Column{Head: "Why", Width: 50, Align: "L"})
	} else {
		t.Columns = append(t.Columns, Column{Head: "Findings", Width: 50, Align: "R"})
	}
	for _, p := range ps {
		last := itoa(p.Count)
		if why {
			last = strings.TrimPrefix(p.Why, "not re-checked: ")
		}
		t.Rows = append(t.Rows, Row{Cells: []string{p.Check, p.Subject, p.On.String(), string(p.Severity), last}})
	}
	return t
}

// trends: findings per month by domain and severity when the period spans
// more than one month, and the previous period's totals beside this one's.
func (b *auditBuilder) trends() (AuditSection, bool) {
	r := b.r
	var prev *checker.Previous
	if r.FollowUp != nil {
		prev = r.FollowUp.Previous
	}
	months := monthsOf(r.Period)
	if len(months) < 2 && prev == nil {
		return AuditSection{}, false
	}
	if prev != nil {
		pt := countFindings(prev.Findings)
		t := &Table{Size: 9, Caption: "This period beside the previous one", Columns: []Column{
			{Head: "Domain", Width: 40, Align: "L"},
			{Head: "Previous: significant", Width: 35, Align: "R"},
			{Head: "minor", Width: 17, Align: "R"},
			{Head: "total", Width: 17, Align: "R"},
			{Head: "This period: significant", Width: 37, Align: "R"},
			{Head: "minor", Width: 17, Align: "R"},
			{Head: "total", Width: 17, Align: "R"},
		}}
		all := map[string]bool{}
		for _, d := range pt.domains {
			all[d] = true
		}
		for _, d := range b.tall.domains {
			all[d] = true
		}
		for _, d := range orderedDomains(all) {
			if pt.domainTotal(d) == 0 && b.tall.domainTotal(d) == 0 {
				continue
			}
			t.Rows = append(t.Rows, Row{Cells: []string{d,
				itoa(pt.get(d, checker.Significant)), itoa(pt.get(d, checker.Minor)), itoa(pt.domainTotal(d)),
				itoa(b.tall.get(d, checker.Significant)), itoa(b.tall.get(d, checker.Minor)), itoa(b.tall.domainTotal(d))}})
		}
		t.Rows = append(t.Rows, Row{Bold: true, Cells: []string{"total",
			itoa(pt.severityTotal(checker.Significant)), itoa(pt.severityTotal(checker.Minor)), itoa(pt.total()),
			itoa(b.tall.severityTotal(checker.Significant)), itoa(b.tall.severityTotal(checker.Minor)), itoa(b.tall.total())}})
		b.add(subheading(fmt.Sprintf("This period beside the previous one (%s to %s)", prev.Period.From, prev.Period.To), 30),
			para("Counts of findings, not of problems: a run of days is one finding. Notes are in the totals.", "italic", 9),
			Block{Kind: KindTable, Table: t})
	}
	if len(months) >= 2 {
		b.add(subheading("Findings per month by domain and severity", 40),
			para("Each finding counts in the month of its first day.", "italic", 9), b.monthChart(months))
	}
	return b.section("Trends", true, "Trends"), true
}

// monthsOf lists the calendar months ("2026-01") the period touches.
func monthsOf(p checker.Period) []string {
	if p.From.IsZero() || p.To.IsZero() {
		return nil
	}
	var out []string
	for d := p.From; d <= p.To; {
		m := d.String()[:7]
		out = append(out, m)
		t := d.Time()
		d = records.DayOf(t.AddDate(0, 1, 1-t.Day()))
	}
	return out
}

// monthChart is one stacked bar per month and domain with findings.
func (b *auditBuilder) monthChart(months []string) Block {
	by := map[string][]checker.Finding{}
	for _, f := range b.r.Findings {
		m := f.On.String()[:7]
		by[m] = append(by[m], f)
	}
	var bars []Bar
	for _, m := range months {
		t := countFindings(by[m])
		for _, d := range t.domains {
			if t.domainTotal(d) == 0 {
				continue
			}
			bar := Bar{Label: m + " " + d, Segments: []Segment{}, Total: t.domainTotal(d)}
			for _, s := range severities {
				if c := t.get(d, s); c > 0 {
					bar.Segments = append(bar.Segments, Segment{Severity: string(s), Count: c})
				}
			}
			bars = append(bars, bar)
		}
	}
	return Block{Kind: KindBarChart, Bars: bars}
}

// writeFollowUp is the terminal's short "since the last review": the
// problems' classes, what was resolved or not re-checked, and the plans
// that are overdue.
func writeFollowUp(b *bufio.Writer, r *checker.Result) {
	fu := r.FollowUp
	if fu == nil || (fu.Previous == nil && len(fu.Actions) == 0) {
		return
	}
	p := func(format string, a ...any) { fmt.Fprintf(b, format, a...) }
	if prev := fu.Previous; prev != nil {
		fresh, recurring := 0, 0
		seen := map[string]bool{}
		for i := range r.Findings {
			f := &r.Findings[i]
			if seen[f.Problem()] {
				continue
			}
			seen[f.Problem()] = true
			if r.ClassOf(f) == checker.ClassRecurring {
				recurring++
			} else {
				fresh++
			}
		}
		p("Since the previous review (%s, %s to %s)\n", prev.File, prev.Period.From, prev.Period.To)
		p("  problems: %d new, %d recurring, %d resolved, %d not re-checked\n", fresh, recurring, len(fu.Resolved), len(fu.NotRechecked))
		for _, x := range fu.Resolved {
			p("  resolved: %s\n", x.Problem())
		}
		for _, x := range fu.NotRechecked {
			p("  not re-checked: %s (%s)\n", x.Problem(), strings.TrimPrefix(x.Why, "not re-checked: "))
		}
	} else {
		p("Corrective actions\n")
	}
	status := map[string]int{}
	for _, a := range fu.Actions {
		status[a.Status]++
	}
	p("  corrective actions: %d overdue, %d on schedule, %d closed, %d verified\n", status[checker.StatusOverdue],
		status[checker.StatusOnSchedule], status[checker.StatusClosed], status[checker.StatusVerified])
	for _, a := range fu.Actions {
		if a.Status == checker.StatusOverdue {
			owner := ""
			if a.Action.Owner != "" {
				owner = a.Action.Owner + ", "
			}
			p("  overdue: %s — %s (%sdue %s)\n", a.Problem(), oneLine(a.Action.Plan), owner, a.Action.DueOn)
		}
	}
	p("\n")
}
