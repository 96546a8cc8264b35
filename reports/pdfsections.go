package reports

import (
	"fmt"
	"strings"

	"welfare/checker"
)

func (d *doc) cover() {
	p, r := d.pdf, d.r
	p.AddPage()
	p.Bookmark("Cover", 0, -1)
	p.SetY(32)
	d.font(sans, "B", 24)
	p.CellFormat(contentW, 11, "Welfare records audit", "", 1, "L", false, 0, "")
	d.font(sans, "", 15)
	p.MultiCell(contentW, 7.5, clean(orNone(r.Facility)), "", "L", false)
	p.Ln(6)

	const size = 10.5
	d.keyValue("Period", dayOrNone(r.Period.From)+" to "+dayOrNone(r.Period.To)+" (inclusive)", sans, size)
	d.keyValue("Inspector", orNone(d.opt.Inspector), sans, size)
	d.keyValue("Generated", d.opt.GeneratedAt.Format("2006-01-02 15:04:05 -07:00"), sans, size)
	d.keyValue("Checks in force", fmt.Sprintf("%d, of which %d not evaluated", len(r.Checks), len(r.NotEvaluated)), sans, size)
	t := d.tall
	d.keyValue("Findings", fmt.Sprintf("%d: %d significant, %d minor, %d note",
		t.total(), t.severityTotal(checker.Significant), t.severityTotal(checker.Minor), t.severityTotal(checker.Note)), sans, size)
	d.keyValue("Fingerprint", orNone(r.Fingerprint), mono, 9.5)
	d.font(sans, "I", 8.5)
	p.SetX(margin + 42)
	p.MultiCell(contentW-42, lineHeight(8.5), "SHA-256 over the records, rules and limits used. Every page carries its first 12 digits.", "", "L", false)

	d.subheading("Rows read per file", 20)
	tb := &table{size: 9, caption: "Rows read per file", cols: []column{
		{head: "File", w: 62, align: "L", mono: true},
		{head: "Read", w: 22, align: "R"},
		{head: "Accepted", w: 22, align: "R"},
		{head: "Rejected", w: 22, align: "R"},
		{head: "Note", w: 52, align: "L"},
	}}
	if len(r.Accounting) == 0 {
		d.para("No record files were reported.", "I", 9.5)
	} else {
		cells := func(c string, read, acc, rej int, note string) []string {
			return []string{c, itoa(read), itoa(acc), itoa(rej), note}
		}
		first := r.Accounting[0]
		d.start(tb, cells(first.File, first.Read, first.Accepted, first.Rejected, first.Failed))
		for _, c := range r.Accounting {
			note := ""
			if c.Failed != "" {
				note = "not used: " + c.Failed
			}
			d.row(tb, cells(c.File, c.Read, c.Accepted, c.Rejected, note), rowStyle{})
		}
		tt := totals(r.Accounting)
		d.row(tb, cells("total", tt.Read, tt.Accepted, tt.Rejected, "rejected rows are findings (records.row.rejected)"), rowStyle{bold: true})
	}

	p.Ln(6)
	d.notice(Disclaimer + " Read the cautions before working with the animals.")
}

// notice is a boxed paragraph that never splits across pages.
func (d *doc) notice(text string) {
	p := d.pdf
	const size = 10
	d.font(sans, "", size)
	lines := wrap(p, clean(text), contentW-8)
	h := float64(len(lines))*lineHeight(size) + 6
	d.ensure(h)
	y := p.GetY()
	p.SetLineWidth(0.5)
	p.SetFillColor(242, 242, 242)
	p.Rect(margin, y, contentW, h, "FD")
	p.SetLineWidth(0.2)
	for i, l := range lines {
		p.SetXY(margin+4, y+3+float64(i)*lineHeight(size))
		p.CellFormat(contentW-8, lineHeight(size), l, "", 0, "L", false, 0, "")
	}
	p.SetXY(margin, y+h+2)
}

func (d *doc) summary() {
	r, t := d.r, d.tall
	d.heading("Summary")
	d.subheading("Findings by domain and severity", 30)
	tb := &table{size: 9.5, caption: "Findings by domain and severity", cols: []column{
		{head: "Domain", w: 60, align: "L"},
		{head: "Significant", w: 30, align: "R"},
		{head: "Minor", w: 30, align: "R"},
		{head: "Note", w: 30, align: "R"},
		{head: "Total", w: 30, align: "R"},
	}}
	rowOf := func(dom string) []string {
		return []string{dom, itoa(t.get(dom, checker.Significant)), itoa(t.get(dom, checker.Minor)),
			itoa(t.get(dom, checker.Note)), itoa(t.domainTotal(dom))}
	}
	d.start(tb, rowOf(t.domains[0]))
	for _, dom := range t.domains {
		d.row(tb, rowOf(dom), rowStyle{})
	}
	d.row(tb, []string{"total", itoa(t.severityTotal(checker.Significant)), itoa(t.severityTotal(checker.Minor)),
		itoa(t.severityTotal(checker.Note)), itoa(t.total())}, rowStyle{bold: true})
	if t.other > 0 {
		d.para(fmt.Sprintf("%d findings carry a severity other than significant, minor or note; they are counted in the totals only.", t.other), "I", 8.5)
	}
	d.pdf.Ln(3)
	d.barChart()

	d.subheading("Care records", 14)
	d.para(careShare(r.Care), "", 10)
	d.careBar()

	d.subheading(fmt.Sprintf("Checks not evaluated (%d)", len(r.NotEvaluated)), 14)
	if len(r.NotEvaluated) == 0 {
		d.para("Every check in force was evaluated.", "", 10)
	} else {
		d.para("These checks found no records to read, so their silence below is not a clean result.", "I", 9)
		d.pdf.Ln(1)
		nt := &table{size: 9, caption: "Checks not evaluated", cols: []column{
			{head: "Check", w: 70, align: "L", mono: true},
			{head: "Why", w: 110, align: "L"},
		}}
		d.start(nt, []string{r.NotEvaluated[0].Check, r.NotEvaluated[0].Reason})
		for _, s := range r.NotEvaluated {
			d.row(nt, []string{s.Check, s.Reason}, rowStyle{})
		}
	}
	if len(r.Warnings) > 0 {
		d.subheading(fmt.Sprintf("Read but not used (%d)", len(r.Warnings)), 14)
		wt := &table{size: 9, caption: "Read but not used", cols: []column{
			{head: "File", w: 50, align: "L", mono: true},
			{head: "Column", w: 35, align: "L", mono: true},
			{head: "Why", w: 95, align: "L"},
		}}
		w0 := r.Warnings[0]
		d.start(wt, []string{w0.File, w0.Column, w0.Message})
		for _, w := range r.Warnings {
			d.row(wt, []string{w.File, w.Column, w.Message}, rowStyle{})
		}
	}
}

// careBar draws the care coverage as a bar, complete days dark.
func (d *doc) careBar() {
	c := d.r.Care
	if c.OccupiedDays == 0 {
		return
	}
	p := d.pdf
	d.ensure(10)
	y := p.GetY() + 2
	const w, h = 120.0, 5.0
	p.SetLineWidth(0.2)
	p.SetFillColor(255, 255, 255)
	p.Rect(margin, y, w, h, "D")
	frac := float64(c.CompleteDays) / float64(c.OccupiedDays)
	frac = min(max(frac, 0), 1)
	p.SetFillColor(70, 70, 70)
	if frac > 0 {
		p.Rect(margin, y, w*frac, h, "F")
	}
	d.font(sans, "", 8.5)
	p.SetXY(margin+w+3, y)
	p.CellFormat(50, h, fmt.Sprintf("%s complete, %d days incomplete", percent(c.CompleteDays, c.OccupiedDays), c.OccupiedDays-c.CompleteDays), "", 0, "L", false, 0, "")
	p.SetXY(margin, y+h+3)
}

func (d *doc) findings() {
	r := d.r
	d.heading("Findings")
	d.para("Grouped by domain; within a domain, checks with significant findings come first. "+
		"US PHS Policy IV.B asks for a reasonable and specific plan and schedule for correcting each deficiency: "+
		"write it in the last column. Every finding, including any not listed here, is in findings.csv and findings.json attached to this PDF.", "", 9.5)
	if len(r.Findings) == 0 {
		d.pdf.Ln(3)
		d.para("No findings in the period.", "B", 11)
		if len(r.NotEvaluated) > 0 {
			d.para(fmt.Sprintf("%s not evaluated; see the summary.", plural(len(r.NotEvaluated), "check")), "", 10)
		}
		return
	}
	for gi, g := range groupFindings(r) {
		if gi > 0 {
			d.pdf.Ln(3)
		}
		d.ensure(50)
		d.font(sans, "B", 13)
		title := fmt.Sprintf("%s (%d)", g.domain, g.count)
		d.pdf.Bookmark("Findings: "+g.domain, 1, -1)
		d.pdf.CellFormat(contentW, 7, title, "B", 1, "L", false, 0, "")
		d.pdf.Ln(1)
		for _, c := range g.checks {
			d.checkFindings(c)
		}
	}
}

func (d *doc) checkFindings(c checkGroup) {
	p := d.pdf
	tb := &table{size: 8, caption: c.check, minRowH: 11, cols: []column{
		{head: "Severity", w: 16, align: "L"},
		{head: "Subject", w: 24, align: "L", mono: true},
		{head: "Date or days", w: 22, align: "L"},
		{head: "Message", w: 49, align: "L"},
		{head: "Evidence", w: 36, align: "L", mono: true},
		{head: "Plan and schedule for correction", w: 33, align: "L"},
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

	first := findingCells(c.findings[0])
	d.font(sans, "B", 10)
	hl := wrap(p, clean(head), contentW)
	d.font(sans, "", 8.5)
	ml := wrap(p, clean(meta), contentW)
	_, rh := d.layoutRow(tb, first, rowStyle{})
	d.ensure(float64(len(hl))*lineHeight(10) + float64(len(ml))*lineHeight(8.5) + 3 + d.headerHeight(tb) + rh)
	p.Ln(1.5)
	d.para(head, "B", 10)
	d.para(meta, "", 8.5)
	p.Ln(1)
	d.drawHeader(tb)

	shown := len(c.findings)
	if d.opt.MaxPerCheck > 0 && shown > d.opt.MaxPerCheck {
		shown = d.opt.MaxPerCheck
	}
	for _, f := range c.findings[:shown] {
		d.row(tb, findingCells(f), rowStyle{})
	}
	if more := len(c.findings) - shown; more > 0 {
		d.ensure(7)
		d.font(sans, "I", 8.5)
		p.Ln(1.5)
		p.MultiCell(contentW, lineHeight(8.5), fmt.Sprintf("%d more %s findings in the attached findings.csv / findings.json.", more, c.check), "", "L", false)
	}
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
	return []string{string(f.Severity), f.Subject, when, f.Message, text, ""}
}

func (d *doc) limits() {
	r := d.r
	d.heading("Limits in force")
	d.para("The values the rules compared the records with, each with the source tag from the limits file: "+
		"[P] published source, [C] common practice, [F] facility choice, [M] recalled from memory and still to be verified.", "", 9.5)
	d.pdf.Ln(2)
	if len(r.Limits) == 0 {
		d.para("No limits were reported with this result.", "I", 10)
	} else {
		tb := &table{size: 8.5, caption: "Limits in force", cols: []column{
			{head: "Limit", w: 68, align: "L", mono: true},
			{head: "Value", w: 42, align: "L"},
			{head: "Source", w: 70, align: "L"},
		}}
		l0 := r.Limits[0]
		d.start(tb, []string{l0.Key, l0.Value, l0.Source})
		for _, l := range r.Limits {
			d.row(tb, []string{l.Key, l.Value, l.Source}, rowStyle{})
		}
	}

	d.subheading(fmt.Sprintf("Checks in force (%d)", len(r.Checks)), 20)
	if len(r.Checks) == 0 {
		d.para("No checks were reported with this result.", "I", 10)
		return
	}
	skipped := map[string]bool{}
	for _, s := range r.NotEvaluated {
		skipped[s.Check] = true
	}
	ct := &table{size: 8, caption: "Checks in force", cols: []column{
		{head: "Check", w: 52, align: "L", mono: true},
		{head: "Title", w: 58, align: "L"},
		{head: "Default", w: 20, align: "L"},
		{head: "Source", w: 50, align: "L"},
	}}
	cells := func(c checker.CheckInfo) []string {
		id := c.ID
		if skipped[c.ID] {
			id += "\n(not evaluated)"
		}
		return []string{id, c.Title, string(c.Severity), c.Source}
	}
	d.start(ct, cells(r.Checks[0]))
	for _, c := range r.Checks {
		d.row(ct, cells(c), rowStyle{})
	}
}

// biteReportItem marks where the bite-report caution, which quotes the limit
// in force, goes.
const biteReportItem = "\x00bite-report"

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
}

func (d *doc) cautions() {
	p := d.pdf
	d.heading("Cautions")
	for _, g := range cautionGroups {
		d.subheading(g.title, 12)
		for _, it := range g.items {
			if it == biteReportItem {
				it = BiteReportCaution(d.r)
			}
			d.font(sans, "", 10)
			lines := wrap(p, clean(it), contentW-6)
			d.ensure(float64(len(lines)) * lineHeight(10))
			y := p.GetY()
			p.SetXY(margin, y)
			p.CellFormat(6, lineHeight(10), "•", "", 0, "L", false, 0, "")
			for i, l := range lines {
				p.SetXY(margin+6, y+float64(i)*lineHeight(10))
				p.CellFormat(contentW-6, lineHeight(10), l, "", 0, "L", false, 0, "")
			}
			p.SetXY(margin, y+float64(len(lines))*lineHeight(10)+1.2)
		}
	}
	p.Ln(3)
	d.notice(Disclaimer)
}

func (d *doc) signOff() {
	p := d.pdf
	const blockH = 52.0
	d.ensure(14 + 2*blockH)
	if p.GetY() > topMargin+1 {
		p.Ln(4)
	}
	p.Bookmark("Sign-off", 0, -1)
	d.font(sans, "B", 16)
	p.CellFormat(contentW, 9, "Sign-off", "", 1, "L", false, 0, "")
	d.para("Reviewed the findings and the plans for their correction, for the period "+
		dayOrNone(d.r.Period.From)+" to "+dayOrNone(d.r.Period.To)+" (fingerprint "+shortPrint(d.r.Fingerprint)+").", "", 9.5)
	p.Ln(2)
	for _, role := range []string{"Attending veterinarian", "Chair, animal-care committee"} {
		y := p.GetY()
		p.SetLineWidth(0.3)
		p.Rect(margin, y, contentW, blockH-4, "D")
		d.font(sans, "B", 11)
		p.SetXY(margin+4, y+3)
		p.CellFormat(contentW-8, 6, role, "", 0, "L", false, 0, "")
		d.font(sans, "", 9.5)
		for i, label := range []string{"Name", "Signature", "Date"} {
			ly := y + 18 + float64(i)*11
			p.SetXY(margin+4, ly-4.5)
			p.CellFormat(24, 5, label, "", 0, "L", false, 0, "")
			p.SetLineWidth(0.2)
			p.Line(margin+30, ly, margin+contentW-6, ly)
		}
		p.SetXY(margin, y+blockH)
	}
}

// plural is "1 finding" or "3 findings".
func plural(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return itoa(n) + " " + noun + "s"
}
