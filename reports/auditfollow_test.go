package reports

import (
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records"
)

// A period over more than one month gets a chart of findings per month by
// domain and severity; each finding counts in the month of its first day.
func TestTrendsPerMonth(t *testing.T) {
	day := func(s string) records.Day {
		d, err := records.ParseDay(s)
		if err != nil {
			t.Fatal(err)
		}
		return d
	}
	f := func(check, on string, sev checker.Severity) checker.Finding {
		return checker.Finding{Check: check, Domain: check[:4], Subject: "S1-01", On: day(on), Severity: sev, Evidence: []records.Ref{}}
	}
	r := &checker.Result{Facility: "Birchfall Fur Research Station",
		Period: checker.Period{From: day("2026-01-20"), To: day("2026-03-02")},
		Findings: []checker.Finding{
			f("care.water.unavailable", "2026-01-25", checker.Significant),
			f("care.water.unavailable", "2026-02-03", checker.Significant),
			f("care.feeding.missed", "2026-02-28", checker.Minor),
			f("cold.bedding.stale", "2026-03-01", checker.Minor),
		}}
	a, err := BuildAudit(r, PDFOptions{GeneratedAt: time.Date(2026, 3, 3, 8, 0, 0, 0, time.UTC)})
	if err != nil {
		t.Fatal(err)
	}
	var bars []Bar
	for _, s := range a.Sections {
		if s.Title != "Trends" {
			continue
		}
		for _, b := range s.Blocks {
			if b.Kind == KindBarChart {
				bars = b.Bars
			}
		}
	}
	want := []Bar{
		{Label: "2026-01 care", Segments: []Segment{{Severity: "significant", Count: 1}}, Total: 1},
		{Label: "2026-02 care", Segments: []Segment{{Severity: "significant", Count: 1}, {Severity: "minor", Count: 1}}, Total: 2},
		{Label: "2026-03 cold", Segments: []Segment{{Severity: "minor", Count: 1}}, Total: 1},
	}
	if diff := cmp.Diff(want, bars); diff != "" {
		t.Errorf("month chart (-want +got):\n%s", diff)
	}
	if got := monthsOf(checker.Period{From: day("2026-01-31"), To: day("2026-02-01")}); !cmp.Equal(got, []string{"2026-01", "2026-02"}) {
		t.Errorf("months of Jan 31 – Feb 1 = %v", got)
	}
	// One month and no previous review: no trends section.
	r.Period = checker.Period{From: day("2026-02-01"), To: day("2026-02-28")}
	if _, ok := (&auditBuilder{r: r, tall: countFindings(r.Findings)}).trends(); ok {
		t.Error("trends for a one-month period without a previous review")
	}
}
