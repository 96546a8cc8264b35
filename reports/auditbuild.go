package reports

import (
	"bytes"
	"errors"
	"fmt"
	"regexp"
	"slices"
	"strings"
	"time"

	"welfare/checker"
)

// PDFOptions shapes the PDF audit report.
type PDFOptions struct {
	// Inspector is printed on the cover; empty prints "(not stated)".
	Inspector string
	// GeneratedAt is printed on the cover and stored as the PDF's creation
	// and modification dates. It is required: with it fixed, the same
	// Result gives a byte-identical PDF.
	GeneratedAt time.Time
	// MaxPerCheck is how many findings of one check are listed in the
	// findings section before "N more in the attached findings.csv /
	// findings.json": 0 means DefaultPDFMaxPerCheck, a negative number
	// lists every finding.
	MaxPerCheck int
	// SiteOf maps the subject of a cold finding (an enclosure or a staff
	// id) to its weather site, so the cold-season chart of that site marks
	// the finding's days. A finding whose subject is a site itself needs no
	// entry; with a single weather site every cold finding is that site's.
	SiteOf map[string]string
	// FindingsJSON and FindingsCSV, when set, are what WriteJSON and
	// WriteCSV wrote for the same result: attached as they are rather than
	// written again (a run writing --json and --csv beside the PDF has
	// them; with hundreds of thousands of findings writing them is most
	// of the PDF's time). The caller vouches they are of this result.
	FindingsJSON, FindingsCSV []byte
}

// DefaultPDFMaxPerCheck keeps a report with thousands of findings printable;
// every finding is still in the attached files.
const DefaultPDFMaxPerCheck = 25

// BuildAudit lays out the PDF audit report of r: cover, summary, health and
// mortality (when r.Health is set), cold season (when r.Weather has data),
// warm season, inside buildings and cleaning (when r.Warm is set), findings with an empty plan-for-correction
// cell for each, limits in force, cautions and sign-off, with findings.json
// and findings.csv attached. It is pure: the same r and opt give the same
// Audit.
func BuildAudit(r *checker.Result, opt PDFOptions) (*Audit, error) {
	if r == nil {
		return nil, errors.New("reports: no result to write")
	}
	if opt.GeneratedAt.IsZero() {
		return nil, errors.New("reports: PDFOptions.GeneratedAt is required: it is printed on the report and fixes its bytes")
	}
	if opt.MaxPerCheck == 0 {
		opt.MaxPerCheck = DefaultPDFMaxPerCheck
	}
	js, cs := opt.FindingsJSON, opt.FindingsCSV
	if js == nil {
		var err error
		if js, err = JSONBytes(r); err != nil {
			return nil, fmt.Errorf("reports: attached findings.json: %w", err)
		}
	}
	if cs == nil {
		var err error
		if cs, err = CSVBytes(r); err != nil {
			return nil, fmt.Errorf("reports: attached findings.csv: %w", err)
		}
	}
	b := &auditBuilder{r: r, opt: opt, tall: countFindings(r.Findings), groups: groupFindings(r)}
	a := &Audit{
		Title:       "Welfare records audit: " + orNone(r.Facility),
		Subject:     "Period " + dayOrNone(r.Period.From) + " to " + dayOrNone(r.Period.To),
		Author:      opt.Inspector,
		GeneratedAt: opt.GeneratedAt,
		Header: [2]string{"Welfare records audit · " + orNone(r.Facility),
			"Period " + dayOrNone(r.Period.From) + " – " + dayOrNone(r.Period.To)},
		Footer: "Fingerprint " + shortPrint(r.Fingerprint) + " · records check, not a veterinary judgement",
	}
	a.Sections = append(a.Sections, b.cover(), b.summary())
	if r.Health != nil {
		a.Sections = append(a.Sections, b.healthSection())
	}
	a.Sections = append(a.Sections, b.followUpSections()...)
	if hasWeather(r) {
		a.Sections = append(a.Sections, b.coldSeason())
	}
	if r.Warm != nil {
		a.Sections = append(a.Sections, b.warmSeason())
	}
	a.Sections = append(a.Sections, b.findings(), b.limits(), b.cautions(), b.signOff())
	a.Attachments = []Attachment{
		{Name: "findings.json", Description: "Every finding, with the accounting and the checks in force (JSON)", Content: js, Bytes: len(js)},
		{Name: "findings.csv", Description: "Every finding, one per row (CSV)", Content: cs, Bytes: len(cs)},
	}
	if len(r.LimitsText) > 0 {
		a.Attachments = append(a.Attachments, Attachment{Name: "limits.yaml",
			Description: "The limits in force, whole (a file of changes laid over the defaults is shown merged)",
			Content:     r.LimitsText, Bytes: len(r.LimitsText)})
	}
	return a, nil
}

type auditBuilder struct {
	r      *checker.Result
	opt    PDFOptions
	tall   tally
	groups []domainGroup // the findings by domain and check, as the findings section lists them
	out    []Block
}

// onPages is how many findings the findings section lists: at most
// MaxPerCheck of each check.
func (b *auditBuilder) onPages() int {
	n := 0
	for _, g := range b.groups {
		for _, c := range g.checks {
			n += b.shown(len(c.findings))
		}
	}
	return n
}

// shown is how many of n rows a capped listing prints (MaxPerCheck; a
// negative cap prints them all).
func (b *auditBuilder) shown(n int) int {
	if b.opt.MaxPerCheck > 0 && n > b.opt.MaxPerCheck {
		return b.opt.MaxPerCheck
	}
	return n
}

// listing is a table of a figure that grows with the records or the
// findings (deaths, open cases, plans, recurring problems, cleaning gaps):
// over the cap (MaxPerCheck rows) its bold rows, those with a finding or
// overdue, come first, the first MaxPerCheck are printed, and a line says
// how many more there are and where they are (more names them: "deaths
// in the attached findings.json (health.deaths)"). The pages of a report
// stay bounded however many there are; the attached files hold them all.
func (b *auditBuilder) listing(t *Table, more string) []Block {
	n := b.shown(len(t.Rows))
	if n == len(t.Rows) {
		return []Block{{Kind: KindTable, Table: t}}
	}
	rows := slices.Clone(t.Rows)
	slices.SortStableFunc(rows, func(x, y Row) int {
		switch {
		case x.Bold == y.Bold:
			return 0
		case x.Bold:
			return -1
		}
		return 1
	})
	t.Rows = rows[:n]
	first := ""
	if rows[0].Bold {
		first = " (those in bold first)"
	}
	return []Block{{Kind: KindTable, Table: t}, space(1),
		para(fmt.Sprintf("%d of %d listed%s; %d more %s.", n, len(rows), first, len(rows)-n, more), "italic", 8.5)}
}

func (b *auditBuilder) add(bl ...Block) { b.out = append(b.out, bl...) }

// section returns the blocks added since the last call as a section.
func (b *auditBuilder) section(title string, newPage bool, heading string) AuditSection {
	s := AuditSection{Title: title, NewPage: newPage, Heading: heading, Blocks: b.out}
	b.out = nil
	return s
}

// hasWeather: the cold-season chart is drawn when a weather site had a day
// in the hazard bands (a minimum wind chill at or below the mildest band's
// warm edge, 0 °C); a summer period has no cold-season page.
func hasWeather(r *checker.Result) bool {
	edge := hazardBands()[0].Hi
	for _, s := range r.Weather {
		for _, d := range s.Days {
			if d.WindReadings > 0 && d.MinWindChillC <= edge {
				return true
			}
		}
	}
	return false
}

func para(text, style string, size float64) Block {
	return Block{Kind: KindParagraph, Text: text, Style: style, Size: size}
}

func space(mm float64) Block { return Block{Kind: KindSpace, Size: mm} }

func subheading(text string, keep float64) Block {
	return Block{Kind: KindSubheading, Text: text, Keep: keep}
}

func keyValue(label, value string, mono bool, size float64) Block {
	return Block{Kind: KindKeyValue, Label: label, Text: value, Mono: mono, Size: size}
}

func (b *auditBuilder) cover() AuditSection {
	r, t := b.r, b.tall
	b.add(Block{Kind: KindTitle, Text: "Welfare records audit", Subtitle: orNone(r.Facility)})
	const size = 10.5
	b.add(
		keyValue("Inspector", orNone(b.opt.Inspector), false, size),
		keyValue("Generated", generatedIn(b.opt.GeneratedAt, r.Location), false, size),
		keyValue("Findings", fmt.Sprintf("%d: %d significant, %d minor, %d note",
			t.total(), t.severityTotal(checker.Significant), t.severityTotal(checker.Minor), t.severityTotal(checker.Note)), false, size),
		keyValue("Reportable", reportableCover(r.Findings), false, size),
	)
	// A capped listing says so before the report is signed.
	if n, all := b.onPages(), len(r.Findings); n < all {
		b.add(keyValue("On these pages", fmt.Sprintf("%d of the %d findings (at most %d per check); all %d are in the attached findings.csv and findings.json",
			n, all, b.opt.MaxPerCheck, all), false, size))
	}
	b.add(keyValue("Checks in force", checksInForce(r), false, size))
	// The scope: what this report was limited to, switched off, changed or
	// added, before anyone reads its counts as a pass.
	for _, it := range scopeItems(r) {
		b.add(keyValue(it.Label, it.Value, false, size))
		for _, m := range it.More {
			b.add(Block{Kind: KindParagraph, Size: 8.5, Indent: 42, Text: m})
		}
	}
	b.add(
		keyValue("Fingerprint", orNone(r.Fingerprint), true, 9.5),
		Block{Kind: KindParagraph, Style: "italic", Size: 8.5, Indent: 42,
			Text: "SHA-256 over the records, rules and limits used and the checks selected. Every page carries its first 12 digits."},
	)
	if v := toVerify(r.Limits); v != "" {
		b.add(space(2), Block{Kind: KindNotice, Text: v})
	}
	b.add(
		subheading("Rows read per file", 20),
	)
	if len(r.Accounting) == 0 {
		b.add(para("No record files were reported.", "italic", 9.5))
	} else {
		tb := &Table{Size: 9, Caption: "Rows read per file", Columns: []Column{
			{Head: "File", Width: 62, Align: "L", Mono: true},
			{Head: "Read", Width: 22, Align: "R"},
			{Head: "Accepted", Width: 22, Align: "R"},
			{Head: "Rejected", Width: 22, Align: "R"},
			{Head: "Note", Width: 52, Align: "L"},
		}}
		for _, c := range r.Accounting {
			note := ""
			if c.Failed != "" {
				note = "not used: " + c.Failed
			}
			tb.Rows = append(tb.Rows, Row{Cells: []string{c.File, itoa(c.Read), itoa(c.Accepted), itoa(c.Rejected), note}})
		}
		tt := totals(r.Accounting)
		tb.Rows = append(tb.Rows, Row{Bold: true, Cells: []string{"total", itoa(tt.Read), itoa(tt.Accepted), itoa(tt.Rejected),
			"rejected rows are findings (records.row.rejected)"}})
		b.add(Block{Kind: KindTable, Table: tb})
	}
	b.add(space(6), Block{Kind: KindNotice, Text: Disclaimer + " Read the cautions before working with the animals."})
	return b.section("Cover", true, "")
}

func (b *auditBuilder) summary() AuditSection {
	r, t := b.r, b.tall
	b.add(subheading("Findings by domain and severity", 30))
	tb := &Table{Size: 9.5, Caption: "Findings by domain and severity", Columns: []Column{
		{Head: "Domain", Width: 60, Align: "L"},
		{Head: "Significant", Width: 30, Align: "R"},
		{Head: "Minor", Width: 30, Align: "R"},
		{Head: "Note", Width: 30, Align: "R"},
		{Head: "Total", Width: 30, Align: "R"},
	}}
	for _, dom := range t.domains {
		tb.Rows = append(tb.Rows, Row{Cells: []string{dom, itoa(t.get(dom, checker.Significant)), itoa(t.get(dom, checker.Minor)),
			itoa(t.get(dom, checker.Note)), itoa(t.domainTotal(dom))}})
	}
	tb.Rows = append(tb.Rows, Row{Bold: true, Cells: []string{"total", itoa(t.severityTotal(checker.Significant)),
		itoa(t.severityTotal(checker.Minor)), itoa(t.severityTotal(checker.Note)), itoa(t.total())}})
	b.add(Block{Kind: KindTable, Table: tb})
	if len(r.Findings) == 0 && (len(r.NotEvaluated) > 0 || len(r.Partial) > 0) {
		// Never a bare all-clear: zero findings over checks that were not
		// all evaluated is not a clean result.
		b.add(para(noFindings(r), "bold", 9.5))
	}
	if t.other > 0 {
		b.add(para(fmt.Sprintf("%d findings carry a severity other than significant, minor or note; they are counted in the totals only.", t.other), "italic", 8.5))
	}
	if n := countReportable(r.Findings); n > 0 {
		b.add(para(fmt.Sprintf("%s to %s (PHS Policy IV.F.3): marked » in the findings.",
			plural(n, "finding"), ReportableMark), "bold", 9.5))
	}
	b.add(space(3), b.barChart())

	b.add(subheading("Care records", 14), para(careShare(r.Care), "", 10))
	if c := r.Care; c.OccupiedDays > 0 {
		b.add(Block{Kind: KindCareBar, Care: &CareBar{Complete: c.CompleteDays, Occupied: c.OccupiedDays,
			Caption: fmt.Sprintf("%s complete, %d days incomplete", percent(c.CompleteDays, c.OccupiedDays), c.OccupiedDays-c.CompleteDays)}})
	}

	b.add(subheading(fmt.Sprintf("Checks not evaluated (%d)", len(r.NotEvaluated)), 14))
	if len(r.NotEvaluated) == 0 {
		b.add(para("Every check in force was evaluated.", "", 10))
	} else {
		b.add(para("These checks found no records to read, so their silence below is not a clean result.", "italic", 9), space(1))
		nt := &Table{Size: 9, Caption: "Checks not evaluated", Columns: []Column{
			{Head: "Check", Width: 70, Align: "L", Mono: true},
			{Head: "Why", Width: 110, Align: "L"},
		}}
		for _, s := range r.NotEvaluated {
			nt.Rows = append(nt.Rows, Row{Cells: []string{s.Check, s.Reason}})
		}
		b.add(Block{Kind: KindTable, Table: nt})
	}
	if len(r.Partial) > 0 {
		b.add(subheading(fmt.Sprintf("Checks evaluated only in part (%d)", len(r.Partial)), 14),
			para("These checks could not judge some of their items because a value they need was not recorded "+
				"(each a records.value.missing finding); those items are not a clean result.", "italic", 9), space(1))
		pt := &Table{Size: 9, Caption: "Checks evaluated only in part", Columns: []Column{
			{Head: "Check", Width: 55, Align: "L", Mono: true},
			{Head: "Not judged", Width: 45, Align: "L"},
			{Head: "Why", Width: 80, Align: "L"},
		}}
		for _, p := range r.Partial {
			why := make([]string, len(p.Why))
			for i, w := range p.Why {
				why[i] = fmt.Sprintf("%d: %s", w.Count, w.Reason)
			}
			pt.Rows = append(pt.Rows, Row{Cells: []string{p.Check, fmt.Sprintf("%d of %d %s", p.NotJudged, p.Total, p.Unit), strings.Join(why, "\n")}})
		}
		b.add(Block{Kind: KindTable, Table: pt})
	}
	if len(r.Warnings) > 0 {
		b.add(subheading(fmt.Sprintf("Read but not used (%d)", len(r.Warnings)), 14))
		wt := &Table{Size: 9, Caption: "Read but not used", Columns: []Column{
			{Head: "File", Width: 50, Align: "L", Mono: true},
			{Head: "Column", Width: 35, Align: "L", Mono: true},
			{Head: "Why", Width: 95, Align: "L"},
		}}
		for _, w := range r.Warnings {
			wt.Rows = append(wt.Rows, Row{Cells: []string{w.File, w.Column, w.Message}})
		}
		b.add(Block{Kind: KindTable, Table: wt})
	}
	return b.section("Summary", true, "Summary")
}

// barChart is the findings per domain, stacked by severity.
func (b *auditBuilder) barChart() Block {
	t := b.tall
	bars := make([]Bar, 0, len(t.domains))
	for _, dom := range t.domains {
		bar := Bar{Label: dom, Segments: []Segment{}, Total: t.domainTotal(dom)}
		for _, s := range severities {
			if c := t.get(dom, s); c > 0 {
				bar.Segments = append(bar.Segments, Segment{Severity: string(s), Count: c})
			}
		}
		bars = append(bars, bar)
	}
	return Block{Kind: KindBarChart, Bars: bars}
}

func (b *auditBuilder) findings() AuditSection {
	r := b.r
	b.add(para("Grouped by domain; within a domain, checks with significant findings come first. "+
		"US PHS Policy IV.B asks for a reasonable and specific plan and schedule for correcting each deficiency: "+
		"it is in the last column when corrective_actions.csv has one, else write it there. Under each message is the finding's key "+
		"(check, subject, first day; the problem is the key without the day) and, against a previous review, whether it is new or recurring. Every finding, including any not listed here, is in findings.csv and findings.json attached to this PDF.", "", 9.5))
	if len(r.Findings) == 0 {
		if len(r.NotEvaluated) == 0 && len(r.Partial) == 0 {
			b.add(space(3), para("No findings in the period.", "bold", 11))
		} else {
			b.add(space(3), para(noFindings(r)+" See the summary.", "bold", 11))
		}
		return b.section("Findings", true, "Findings")
	}
	if n, all := b.onPages(), len(r.Findings); n < all {
		b.add(space(2), Block{Kind: KindNotice, Text: fmt.Sprintf("%d of the %d findings are listed below, the first %d of each check "+
			"(significant first); the other %d are not on these pages but in the attached findings.csv and findings.json, "+
			"each check's count of them under its table.", n, all, b.opt.MaxPerCheck, all-n)})
	}
	for gi, g := range b.groups {
		if gi > 0 {
			b.add(space(3))
		}
		b.add(Block{Kind: KindDomainHeading, Text: fmt.Sprintf("%s (%d)", g.domain, g.count), Bookmark: "Findings: " + g.domain})
		for _, c := range g.checks {
			b.add(b.checkFindings(c))
		}
	}
	return b.section("Findings", true, "Findings")
}

func (b *auditBuilder) checkFindings(c checkGroup) Block {
	tb := &Table{Size: 8, Caption: c.check, MinRowH: 11, Columns: []Column{
		{Head: "Severity", Width: 16, Align: "L"},
		{Head: "Subject", Width: 24, Align: "L", Mono: true},
		{Head: "Date or days", Width: 22, Align: "L"},
		{Head: "Message", Width: 49, Align: "L"},
		{Head: "Evidence", Width: 36, Align: "L", Mono: true},
		{Head: "Plan and schedule for correction", Width: 33, Align: "L"},
	}}
	counts := map[checker.Severity]int{}
	for _, f := range c.findings {
		counts[f.Severity]++
	}
	var parts []string
	for _, s := range severities {
		if counts[s] > 0 {
			parts = append(parts, fmt.Sprintf("%d %s", counts[s], s))
		}
	}
	head := c.check
	if c.title != "" {
		head += " — " + c.title
	}
	meta := fmt.Sprintf("%s (%s). Source: %s", plural(len(c.findings), "finding"), strings.Join(parts, ", "), orNone(c.source))
	if c.findings[0].Reportable {
		meta += ". Reportable: " + ReportableMark + " (PHS Policy IV.F.3)."
	}
	shown := b.shown(len(c.findings))
	for _, f := range c.findings[:shown] {
		cells := findingCells(f)
		cells[3] += "\n" + keyLine(b.r, f)
		cells[5] = planCell(b.r, f)
		tb.Rows = append(tb.Rows, Row{Cells: cells})
	}
	bl := Block{Kind: KindCheckFindings, Text: head, Subtitle: meta, Table: tb}
	if more := len(c.findings) - shown; more > 0 {
		bl.More = fmt.Sprintf("%d more %s findings in the attached findings.csv / findings.json.", more, c.check)
	}
	return bl
}

// maxEvidenceShown keeps one finding's row short; the attached files carry
// every ref.
const maxEvidenceShown = 8

func findingCells(f *checker.Finding) []string {
	ev := f.Evidence
	text := refsString(ev, "\n")
	if len(ev) > maxEvidenceShown {
		text = refsString(ev[:maxEvidenceShown], "\n") + fmt.Sprintf("\n+%d more (attached files)", len(ev)-maxEvidenceShown)
	}
	if len(ev) == 0 {
		text = "—"
	}
	when := dates(f)
	if !f.Until.IsZero() && f.Until != f.On {
		// One date per line: a range never breaks inside a date.
		when = dayOrNone(f.On) + " –\n" + f.Until.String()
	}
	msg := f.Message
	if f.SeverityWhy != "" {
		msg += "\nSeverity " + f.SeverityWhy + "."
	}
	if f.Reportable {
		msg += "\n» " + capitalise(ReportableMark) + " (PHS Policy IV.F.3)."
	}
	return []string{string(f.Severity), f.Subject, when, msg, text, ""}
}

func (b *auditBuilder) limits() AuditSection {
	r := b.r
	b.add(para("The values the rules compared the records with, each with the source tag from the limits file: "+
		"[P] published source, [C] common practice, [F] facility choice, [M] recalled from memory and still to be verified.", "", 9.5),
		space(2))
	if len(r.Limits) == 0 {
		b.add(para("No limits were reported with this result.", "italic", 10))
	} else {
		b.add(para("The whole limits file in force is attached to this PDF (limits.yaml).", "italic", 8.5))
		for _, g := range limitGroups(r.Limits) {
			b.add(subheading(g.title, 14))
			tb := &Table{Size: 8, Caption: "Limits: " + g.title, Columns: []Column{
				{Head: "Limit", Width: 62, Align: "L", Mono: true},
				{Head: "Value", Width: 38, Align: "L"},
				{Head: "Unit", Width: 14, Align: "L"},
				{Head: "Source", Width: 66, Align: "L"},
			}}
			for _, l := range g.lines {
				tb.Rows = append(tb.Rows, Row{Cells: []string{l.Key, l.Value, unitOf(l.Key), l.Source}})
			}
			b.add(Block{Kind: KindTable, Table: tb})
		}
	}

	b.add(subheading(fmt.Sprintf("Checks in force (%d)", len(r.Checks)), 20))
	if len(r.Checks) == 0 {
		b.add(para("No checks were reported with this result.", "italic", 10))
		return b.section("Limits in force", true, "Limits in force")
	}
	skipped := map[string]bool{}
	for _, s := range r.NotEvaluated {
		skipped[s.Check] = true
	}
	overrides := map[string]string{}
	for _, l := range r.Limits {
		if id, ok := strings.CutPrefix(l.Key, "severity."); ok {
			overrides[id] = l.Value
		}
	}
	ct := &Table{Size: 8, Caption: "Checks in force", Columns: []Column{
		{Head: "Check", Width: 48, Align: "L", Mono: true},
		{Head: "Title", Width: 44, Align: "L"},
		{Head: "Severity", Width: 38, Align: "L"},
		{Head: "Source", Width: 50, Align: "L"},
	}}
	for _, c := range r.Checks {
		id := c.ID
		if skipped[c.ID] {
			id += "\n(not evaluated)"
		}
		title := c.Title
		if c.Local {
			title += LocalMark
		}
		sev := string(c.Severity)
		if c.Escalation != "" {
			sev += "; " + c.Escalation
		}
		if o, ok := overrides[c.ID]; ok && o != string(c.Severity) {
			sev = o + " (limits override; default " + sev + ")"
		}
		ct.Rows = append(ct.Rows, Row{Cells: []string{id, title, sev, c.Source}})
	}
	if len(r.Scope.Off) > 0 {
		b.add(para("Switched off by the limits (severity: off), not in force: "+strings.Join(r.Scope.Off, ", ")+".", "italic", 8.5))
	}
	b.add(Block{Kind: KindTable, Table: ct})
	return b.section("Limits in force", true, "Limits in force")
}

// limitGroup is the limits of one domain (or one species profile), with
// keys shown relative to it.
type limitGroup struct {
	title string
	lines []checker.LimitLine
}

// limitGroups groups the limits in force by their first key (species by
// profile), in the order of the limits file.
func limitGroups(lines []checker.LimitLine) []limitGroup {
	var out []limitGroup
	for _, l := range lines {
		parts := strings.SplitN(l.Key, ".", 3)
		title, rest := parts[0], strings.Join(parts[1:], ".")
		if parts[0] == "species" && len(parts) == 3 {
			title, rest = "species "+parts[1], parts[2]
		}
		if rest == "" {
			rest = parts[0]
		}
		if len(out) == 0 || out[len(out)-1].title != title {
			out = append(out, limitGroup{title: title})
		}
		l.Key = rest
		out[len(out)-1].lines = append(out[len(out)-1].lines, l)
	}
	return out
}

// units by the ending of a limit's key (the limits file names units in
// its keys).
var units = []struct{ suffix, unit string }{
	{"_m2", "m²"}, {"_cm", "cm"}, {"_mm", "mm"}, {"_kg", "kg"}, {"wind_chill", "wind chill °C"}, {"_c", "°C"},
	{"_kmh", "km/h"}, {"_days", "days"}, {"_hours", "h"}, {"_min", "min"}, {"_months", "months"},
	{"_pct", "%"}, {"_iu_ml", "IU/mL"}, {"_ppm_max", "ppm"},
}

// unitOf is a limit's unit, read from the last part of its key that names
// one (a map entry such as max_duration_min.weighing takes its map's);
// "" when none does.
func unitOf(key string) string {
	parts := strings.Split(key, ".")
	for i := len(parts) - 1; i >= 0; i-- {
		p, _, _ := strings.Cut(parts[i], "[")
		for _, u := range units {
			if strings.HasSuffix(p, u.suffix) {
				return u.unit
			}
		}
	}
	return ""
}

// biteReportItem marks where the bite-report caution, which quotes the limit
// in force, goes.
const biteReportItem = "\x00bite-report"

// heatBandsItem marks where the heat caution quoting the NWS bands goes.
const heatBandsItem = "\x00heat-bands"

// cautionGroups are printed on every report, whatever was found: the people
// reading it work with animals that bite and carry zoonoses, in the cold.
var cautionGroups = []struct {
	title string
	items []string
}{
	{"Handling", []string{
		"Conscious foxes and mink bite. Handle a conscious animal only with bite-resistant gloves or gauntlets that were inspected and found sound; use the restraint, sedation and number of people the protocol sets.",
		biteReportItem, // filled from the limits in force (BiteReportCaution)
		"Wash every bite or scratch at once, thoroughly, with soap and running water for about 15 minutes (WHO rabies position paper, 2018), then seek medical assessment.",
	}},
	{"Zoonoses", []string{
		RabiesExposureCaution,
		"Fox tapeworm (Echinococcus multilocularis): eggs passed in fox faeces contaminate fur and bedding, and survive freezing (−20 °C; killed at −80 °C) (Public Health Agency of Canada, pathogen safety data sheet). Wear gloves and dedicated clothing that stays in the unit, wash hands after work and before eating, and do not eat, drink or smoke in animal areas.",
		"Sarcoptic mange: mites from affected foxes cause itching skin lesions in people (Pisano et al., Emerg Infect Dis 2019;25(6):1235). Wear gloves and long sleeves with animals that have skin lesions, and report any rash.",
		"Leptospirosis: spread in the urine of infected animals and rodents. Cover cuts, wear gloves and eye protection when hosing or cleaning, and avoid splashes (common practice).",
	}},
	{"Cold injury for staff", []string{
		"Plan outdoor work by the work/warm-up schedule (ACGIH TLV, cold stress) and take the warm-up breaks in a heated place. At a wind chill of −28 or colder people's exposed skin can freeze in 10–30 minutes (Environment and Climate Change Canada).",
		"Cover exposed skin, change wet clothing at once, work in pairs in severe cold, and watch each other for frostbite (white or waxy, numb skin) and hypothermia (shivering, clumsiness, confusion).",
	}},
	{"Heat illness for staff", []string{
		heatBandsItem, // filled from checker/heat's bands (HeatBandsCaution)
		"Drink water often, before thirst; rest in shade or a cool room and do heavy work in the cool hours; work in pairs on hot days, and let newcomers build up to the heat over several days (common practice).",
		"Watch each other for heat exhaustion (heavy sweating, cramps, weakness, headache, nausea, dizziness): stop, move to shade, cool down and drink. Confusion, collapse or hot skin with little sweating may be heat stroke: call emergency services and cool the person at once (common practice).",
	}},
}

func (b *auditBuilder) cautions() AuditSection {
	for _, g := range cautionGroups {
		b.add(subheading(g.title, 12))
		for _, it := range g.items {
			switch it {
			case biteReportItem:
				it = BiteReportCaution(b.r)
			case heatBandsItem:
				it = HeatBandsCaution()
			}
			b.add(Block{Kind: KindBullet, Text: it})
		}
	}
	b.add(space(3), Block{Kind: KindNotice, Text: Disclaimer})
	return b.section("Cautions", true, "Cautions")
}

func (b *auditBuilder) signOff() AuditSection {
	r := b.r
	b.add(Block{Kind: KindSignOff, Text: "Sign-off", Bookmark: "Sign-off",
		Subtitle: "Reviewed the findings and the plans for their correction, for the period " +
			dayOrNone(r.Period.From) + " to " + dayOrNone(r.Period.To) + " (fingerprint " + shortPrint(r.Fingerprint) + ").",
		Roles:  []string{"Attending veterinarian", "Chair, animal-care committee"},
		Fields: []string{"Name", "Signature", "Date"}})
	return b.section("Sign-off", false, "")
}

// checksInForce counts the checks in force, those --only selected, those
// not evaluated and those evaluated only in part.
func checksInForce(r *checker.Result) string {
	part := ""
	if n := len(r.Partial); n > 0 {
		part = fmt.Sprintf(" and %d evaluated only in part", n)
	}
	if len(r.Scope.Only) == 0 {
		return fmt.Sprintf("%d, of which %d not evaluated%s", len(r.Checks), len(r.NotEvaluated), part)
	}
	n := 0
	for _, c := range r.Checks {
		if slices.Contains(r.Scope.Only, c.Domain) {
			n++
		}
	}
	return fmt.Sprintf("%d; %d of them selected by --only, of which %d not evaluated%s", len(r.Checks), n, len(r.NotEvaluated), part)
}

// generatedIn is the generation time in the facility's time zone, with
// the zone's name.
func generatedIn(t time.Time, loc *time.Location) string {
	if loc != nil {
		t = t.In(loc)
	}
	s := t.Format("2006-01-02 15:04 -07:00")
	if name := t.Location().String(); name != "" && name != "Local" {
		s += " (" + name + ")"
	}
	return s
}

// toVerify is the cover's box of limits in force recalled from memory
// ([M] in their source): to be verified by the committee before the
// report is relied on. "" when there are none.
func toVerify(lines []checker.LimitLine) string {
	var sources []string
	keys := map[string][]string{}
	n := 0
	for _, l := range lines {
		if !strings.Contains(l.Source, "[M") {
			continue
		}
		n++
		k, src := verifyKey(l.Key), verifySource(l.Source)
		if _, ok := keys[src]; !ok {
			sources = append(sources, src)
		}
		if !slices.Contains(keys[src], k) {
			keys[src] = append(keys[src], k)
		}
	}
	if n == 0 {
		return ""
	}
	out := fmt.Sprintf("To be verified by the committee: %s in force recalled from memory [M], "+
		"not yet checked against their source; each source with the limits it gives (* = every species):", plural(n, "value"))
	for _, src := range sources {
		out += "\n• " + src + ": " + strings.Join(keys[src], ", ")
	}
	return out
}

// verifyKey shortens a limit's key for the box of values to verify: one
// line stands for every species, and for every method of a euthanasia list.
func verifyKey(k string) string {
	parts := strings.Split(k, ".")
	if len(parts) > 2 && parts[0] == "species" {
		parts[1] = "*"
	}
	for i, p := range parts {
		if p == "euthanasia" {
			return strings.Join(parts[:i+1], ".")
		}
	}
	return strings.Join(parts, ".")
}

var memoryMark = regexp.MustCompile(`\[M(:[^\]]*)?\]`)

// verifySource is a limit's source cut to the work it names and what is to
// be verified: "[P] Council of Europe fur-animal recommendation (1999) [M:
// section]".
func verifySource(src string) string {
	head := src
	for _, cut := range []string{" as ", ":", ";", " — ", " ["} {
		if i := strings.Index(head, cut); i > 0 {
			head = head[:i]
		}
	}
	head = shorten(strings.TrimSpace(head), 90)
	if m := memoryMark.FindString(src); m != "" && !strings.HasPrefix(head, m) {
		head += " " + m
	}
	return head
}

// shorten cuts s to at most n runes, with an ellipsis.
func shorten(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}

// reportableCover is the cover's count of reportable findings (PHS Policy
// IV.F.3), said even when there are none so a reader sees it was looked at.
func reportableCover(fs []checker.Finding) string {
	n := countReportable(fs)
	if n == 0 {
		return "none: no finding to " + ReportableMark + " (PHS Policy IV.F.3)"
	}
	return fmt.Sprintf("%s to %s (PHS Policy IV.F.3), marked » in the findings", plural(n, "finding"), ReportableMark)
}

func countReportable(fs []checker.Finding) int {
	n := 0
	for i := range fs {
		if fs[i].Reportable {
			n++
		}
	}
	return n
}

func capitalise(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// plural is "1 finding" or "3 findings".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return itoa(n) + " " + noun + "s"
}

// JSONBytes is what WriteJSON writes, in a buffer grown once to an
// estimate of its size (findingsSize).
func JSONBytes(r *checker.Result) ([]byte, error) {
	var buf bytes.Buffer
	buf.Grow(findingsSize(r, 320))
	err := WriteJSON(&buf, r)
	return buf.Bytes(), err
}

// CSVBytes is what WriteCSV writes, in a buffer grown once to an estimate
// of its size.
func CSVBytes(r *checker.Result) ([]byte, error) {
	var buf bytes.Buffer
	buf.Grow(findingsSize(r, 40))
	err := WriteCSV(&buf, r)
	return buf.Bytes(), err
}

// findingsSize estimates the bytes of r's findings written one to a row
// or object: their texts twice over (message, title and source, with the
// key and problem repeating the check and subject) and perFinding for
// the names, dates and punctuation. A buffer grown to it once is not
// copied and cleared again at each doubling, which at hundreds of
// thousands of findings cost about as much as the writing.
func findingsSize(r *checker.Result, perFinding int) int {
	n := 0
	for i := range r.Findings {
		f := &r.Findings[i]
		n += perFinding + len(f.Message) + len(f.Title) + len(f.Source) + 3*len(f.Check) + 3*len(f.Subject)
		for _, e := range f.Evidence {
			n += len(e) + 12
		}
	}
	return n + 64<<10
}
