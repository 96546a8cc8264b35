package reports

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"welfare/checker"
	"welfare/records"
)

// TextOptions shapes the terminal summary.
type TextOptions struct {
	// MaxPerCheck is how many findings of one check (and severity) are
	// listed before "… and N more" (rejected rows are all listed): 0
	// means the default of 10, a negative
	// number lists every finding.
	MaxPerCheck int
}

// DefaultTextMaxPerCheck keeps a morning check readable on one screen per check.
const DefaultTextMaxPerCheck = 10

// WriteText writes the terminal summary of r: plain text without colour
// codes, so it reads the same in a terminal, a log file or an e-mail.
func WriteText(w io.Writer, r *checker.Result, opt TextOptions) error {
	max := opt.MaxPerCheck
	if max == 0 {
		max = DefaultTextMaxPerCheck
	}
	b := bufio.NewWriter(w)
	p := func(format string, a ...any) { fmt.Fprintf(b, format, a...) }

	p("Welfare records check: %s\n", orNone(r.Facility))
	writeScope(b, r)
	p("Fingerprint: %s\n\n", orNone(r.Fingerprint))

	writeAccounting(b, r)
	writeTally(b, r)

	if len(r.NotEvaluated) > 0 {
		p("Checks not evaluated (%d)\n", len(r.NotEvaluated))
		for _, s := range r.NotEvaluated {
			p("  %s: %s\n", s.Check, s.Reason)
		}
		p("\n")
	}
	if len(r.Partial) > 0 {
		p("Checks evaluated only in part (%d)\n", len(r.Partial))
		for _, s := range r.Partial {
			p("  %s\n", s)
		}
		p("\n")
	}
	if len(r.Warnings) > 0 {
		p("Warnings (%d): read but not used\n", len(r.Warnings))
		for _, wn := range r.Warnings {
			where := wn.File
			if wn.Column != "" {
				where += " column " + wn.Column
			}
			p("  %s: %s\n", where, wn.Message)
		}
		p("\n")
	}
	p("%s\n\n", careShare(r.Care))
	writeFollowUp(b, r)

	if len(r.Findings) == 0 {
		p("%s\n\n", noFindings(r))
	} else {
		p("Findings, most severe first (%d)\n", len(r.Findings))
		fs := bySeverity(r.Findings)
		for i := 0; i < len(fs); {
			// A block is one check at one severity; bySeverity keeps it contiguous.
			j := i
			for j < len(fs) && fs[j].Check == fs[i].Check && fs[j].Severity == fs[i].Severity {
				j++
			}
			shown := j - i
			// Rejected rows are never cut: each is a row no check saw.
			if max > 0 && shown > max && fs[i].Check != checker.RejectedCheck {
				shown = max
			}
			for _, f := range fs[i : i+shown] {
				check := f.Check
				if f.Local {
					check += LocalMark
				}
				p("\n%s  %s  %s  %s\n", strings.ToUpper(string(f.Severity)), check, orNone(f.Subject), dates(f))
				p("  %s\n", oneLine(f.Message))
				if f.SeverityWhy != "" {
					p("  why this severity: %s\n", f.SeverityWhy)
				}
				if f.Reportable {
					p("  reportable: %s (PHS Policy IV.F.3)\n", ReportableMark)
				}
				if c := r.ClassOf(f); c == checker.ClassRecurring {
					p("  recurring: found in the previous review too\n")
				}
				if a := r.ActionFor(f); a != nil {
					p("  plan: %s\n", oneLine(a.ActionLine()))
				}
				if len(f.Evidence) > 0 {
					p("  evidence: %s\n", shortRefs(f.Evidence, textMaxEvidence))
				}
			}
			if more := j - i - shown; more > 0 {
				p("\n  … and %d more %s %s findings\n", more, fs[i].Severity, fs[i].Check)
			}
			i = j
		}
		p("\n")
	}
	p("%s\n", Disclaimer)
	return b.Flush()
}

func writeAccounting(b *bufio.Writer, r *checker.Result) {
	fmt.Fprintf(b, "Rows per file\n")
	width := len("total")
	for _, c := range r.Accounting {
		width = max(width, len(c.File))
	}
	row := func(name, read, acc, rej, note string) {
		fmt.Fprintf(b, "  %-*s  %9s  %9s  %9s%s\n", width, name, read, acc, rej, note)
	}
	row("file", "read", "accepted", "rejected", "")
	for _, c := range r.Accounting {
		note := ""
		if c.Failed != "" {
			note = "  (not used: " + oneLine(c.Failed) + ")"
		}
		row(c.File, itoa(c.Read), itoa(c.Accepted), itoa(c.Rejected), note)
	}
	t := totals(r.Accounting)
	row(t.File, itoa(t.Read), itoa(t.Accepted), itoa(t.Rejected), "")
	fmt.Fprintln(b)
}

func writeTally(b *bufio.Writer, r *checker.Result) {
	t := countFindings(r.Findings)
	fmt.Fprintf(b, "Findings by domain\n")
	row := func(name string, cells ...string) {
		fmt.Fprintf(b, "  %-11s", name)
		for _, c := range cells {
			fmt.Fprintf(b, "  %11s", c)
		}
		fmt.Fprintln(b)
	}
	row("domain", "significant", "minor", "note", "total")
	for _, d := range t.domains {
		row(d, itoa(t.get(d, checker.Significant)), itoa(t.get(d, checker.Minor)),
			itoa(t.get(d, checker.Note)), itoa(t.domainTotal(d)))
	}
	row("total", itoa(t.severityTotal(checker.Significant)), itoa(t.severityTotal(checker.Minor)),
		itoa(t.severityTotal(checker.Note)), itoa(t.total()))
	if t.other > 0 {
		fmt.Fprintf(b, "  (%d findings carry an unknown severity; they are counted in the totals only)\n", t.other)
	}
	fmt.Fprintln(b)
}

func itoa(n int) string { return strconv.Itoa(n) }

// percent is part/whole with one decimal, rounded down so that an incomplete
// record never shows as 100 %.
func percent(part, whole int) string {
	if whole == 0 {
		return "–"
	}
	v := math.Floor(float64(part)*1000/float64(whole)) / 10
	return strconv.FormatFloat(v, 'f', 1, 64) + " %"
}

func orNone(s string) string {
	if s == "" {
		return "(not stated)"
	}
	return s
}

// oneLine folds line breaks so one finding stays one block in the terminal.
func oneLine(s string) string {
	return strings.Join(strings.Fields(strings.ReplaceAll(s, "\r", " ")), " ")
}

// textMaxEvidence caps the refs printed per finding on a terminal; the JSON
// and CSV files carry them all.
const textMaxEvidence = 8

// shortRefs joins the first max refs and says how many more there are.
func shortRefs(refs []records.Ref, max int) string {
	if len(refs) <= max {
		return refsString(refs, "; ")
	}
	return fmt.Sprintf("%s; … and %d more", refsString(refs[:max], "; "), len(refs)-max)
}
