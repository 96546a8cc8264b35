package reports_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"regexp"
	"strings"
	"testing"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/records/synth"
	"welfare/reports"
	"welfare/reports/pdf"
)

// failingResult checks the failing farm (welfare generate --failing) of n
// animals over days days with the shipped rules: every enclosure fails
// every check it can on every day.
func failingResult(tb testing.TB, n, days int) *checker.Result {
	tb.Helper()
	return generatedResult(tb, synth.Options{Animals: n, Days: days, Seed: 7, Failing: true})
}

// withEverything adds to a failing farm's result the listings the failing
// farm does not make, each growing with its findings: a death, an open case
// and an early-weaned litter per 20 findings' worth of animals, a mortality
// line per building and day, and a previous review that had every problem
// (so all recur), some gone (resolved) or not re-checked, and a corrective
// action per problem, overdue. So every section that lists rows grows with
// the size, as on a real farm where everything goes wrong.
func withEverything(r *checker.Result) {
	var subjects []string
	seen := map[string]bool{}
	for i := range r.Findings {
		if s := r.Findings[i].Subject; !seen[s] {
			seen[s] = true
			subjects = append(subjects, s)
		}
	}
	h := &checker.Health{Files: []string{"deaths.csv", "observations.csv", "treatments.csv", "litters.csv"},
		MortalityLimit: checker.MortalityLimit{MinDeaths: 2, MonthlyPct: 2}, WeightLossPct: 10, WeightLossDays: 30}
	for i, s := range subjects {
		day := r.Period.From + records.Day(i%max(1, int(r.Period.To-r.Period.From)))
		h.Deaths = append(h.Deaths, checker.DeathLine{Animal: s, Species: "vulpes_vulpes", Building: "S001", On: day, Cause: "unknown",
			Ref: records.Ref(fmt.Sprintf("deaths.csv:%d", i+2))})
		h.Mortality = append(h.Mortality, checker.MortalityMonth{Building: fmt.Sprintf("S%03d", i), Month: r.Period.From,
			Deaths: 3, AnimalDays: 1500, DaysInMonth: 31, High: i%2 == 0})
		h.OpenCases = append(h.OpenCases, checker.OpenCase{Case: fmt.Sprintf("C%05d", i), Animal: s, Diagnosis: "wound", Opened: r.Period.From, Unreviewed: true})
		h.EarlyWeaning = append(h.EarlyWeaning, checker.WeanedLitter{Litter: fmt.Sprintf("L%05d", i), Dam: s, Species: "vulpes_vulpes",
			Whelped: r.Period.From - 40, WeanedOn: r.Period.From, AgeDays: 40, MinDays: 56, Born: 5})
	}
	r.Health = h
	prev := &checker.Previous{File: "previous/findings.json", Facility: r.Facility,
		Period: checker.Period{From: r.Period.From - 30, To: r.Period.From - 1}, Findings: r.Findings}
	fu := &checker.FollowUp{Previous: prev, Class: map[string]string{}}
	for i := range r.Findings {
		f := &r.Findings[i]
		fu.Class[f.Key()] = checker.ClassRecurring
	}
	for i, s := range subjects {
		p := checker.PastProblem{Check: "care.water.unavailable", Domain: "care", Subject: s + "-old", On: prev.Period.From, Severity: checker.Significant, Count: 3}
		fu.Resolved = append(fu.Resolved, p)
		p.Check, p.Why = "ppe.damaged.used", "not re-checked: no ppe_checks.csv"
		fu.NotRechecked = append(fu.NotRechecked, p)
		fu.Actions = append(fu.Actions, checker.ActionState{Status: checker.StatusOverdue, Severity: checker.Significant,
			Action: records.CorrectiveAction{Check: "care.water.unavailable", Subject: s + "-old", Plan: "Heated drinkers", Owner: "K01",
				DueOn: r.Period.From + records.Day(i%5)}})
	}
	r.FollowUp = fu
}

// boundedTables are the PDF's tables whose rows do not grow with the
// records or the findings: files, domains, checks and limits.
var boundedTables = regexp.MustCompile(`^(Rows read per file|Findings by domain and severity|Checks not evaluated|Checks evaluated only in part|` +
	`Read but not used|Limits: .*|Checks in force|Problems by domain|This period beside the previous one)$`)

var pageObject = regexp.MustCompile(`/Type /Page\n`)

// TestWorstCasePagesBounded: ten times the findings (the failing farm at
// 100 and 1,000 animals over 16 days, with every listing growing alike)
// adds no listed row and at most a few pages: every table that grows with
// the findings is cut at the per-check cap and says how many more there are
// and where, and the page count stays under a bound that does not depend
// on the size.
func TestWorstCasePagesBounded(t *testing.T) {
	if testing.Short() {
		t.Skip("checks the failing farm at 1,000 animals: run without -short")
	}
	const maxPages = 110 // the failing farm's checks at 25 rows each, the sections and the annexes
	var pages, findings []int
	for _, n := range []int{100, 1000} {
		r := failingResult(t, n, 16)
		withEverything(r)
		opt := reports.PDFOptions{GeneratedAt: time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)}
		a, err := reports.BuildAudit(r, opt)
		if err != nil {
			t.Fatal(err)
		}
		rows, notes := 0, 0
		for _, s := range a.Sections {
			for _, bl := range s.Blocks {
				if bl.Kind == reports.KindParagraph && strings.Contains(bl.Text, " more ") && strings.Contains(bl.Text, "attached") {
					notes++
				}
				if bl.Table == nil || boundedTables.MatchString(bl.Table.Caption) {
					continue
				}
				rows += len(bl.Table.Rows)
				if len(bl.Table.Rows) > reports.DefaultPDFMaxPerCheck {
					t.Errorf("animals=%d: %s: table %q has %d rows, over the cap of %d", n, s.Title, bl.Table.Caption, len(bl.Table.Rows), reports.DefaultPDFMaxPerCheck)
				}
			}
		}
		// Nine listings over the cap: deaths, mortality, open cases,
		// litters, recurring, resolved, not re-checked, plans, cleaning gaps.
		if notes != 9 {
			t.Errorf("animals=%d: %d listings say how many more rows are attached, want 9", n, notes)
		}
		var b bytes.Buffer
		if err := pdf.Render(&b, a); err != nil {
			t.Fatal(err)
		}
		p := len(pageObject.FindAll(b.Bytes(), -1))
		t.Logf("animals=%d: %d findings, %d pages, %d bytes, %d table rows that grow", n, len(r.Findings), p, b.Len(), rows)
		if p > maxPages {
			t.Errorf("animals=%d: %d pages, over the bound of %d", n, p, maxPages)
		}
		pages, findings = append(pages, p), append(findings, len(r.Findings))
	}
	if findings[1] < 9*findings[0] {
		t.Fatalf("findings grew from %d to %d, not about 10×", findings[0], findings[1])
	}
	if pages[1] > pages[0]+3 {
		t.Errorf("pages grew from %d to %d with 10× the findings; the listings are not capped", pages[0], pages[1])
	}
}

// BenchmarkWorstCase writes the reports of a check of the failing farm
// (welfare generate --failing --days 7): every enclosure fails every check
// it can every day, at 1,000 and 10,000 animals (30,816 and 309,066
// findings). The PDF's pages stay bounded (TestWorstCasePagesBounded); its
// attached findings.json and findings.csv grow with the findings.
//
//	go test ./reports -run '^$' -bench 'WorstCase/findings=30816/' -benchmem
func BenchmarkWorstCase(b *testing.B) {
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("findings=%d", synth.FailingFindings(n, 7)), func(b *testing.B) {
			benchWriters(b, failingResult(b, n, 7), "json", "csv", "pdf")
		})
	}
}

// WriteJSON streams the findings one by one; the bytes are those of the
// whole document encoded at once (two-space indent, HTML not escaped),
// with findings, none, and a message that needs escaping.
func TestWriteJSONStreamsSameBytes(t *testing.T) {
	for _, n := range []int{0, 1, 320} {
		r := sampleResult(n)
		if n > 0 {
			r.Findings[0].Message = "wind chill ≤ −20 <said \"twice\"> & more\n"
		}
		var got, want bytes.Buffer
		if err := reports.WriteJSON(&got, r); err != nil {
			t.Fatal(err)
		}
		enc := json.NewEncoder(&want)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if err := enc.Encode(reports.NewJSONReport(r)); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got.Bytes(), want.Bytes()) {
			t.Errorf("%d findings: streamed JSON differs from the document encoded whole (%d vs %d bytes)", n, got.Len(), want.Len())
		}
	}
}
