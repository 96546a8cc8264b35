package reports_test

import (
	"bytes"
	"fmt"
	"strings"
	"testing"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
)

// TestTextListsEveryRejectedRow: the terminal cuts a check's findings at
// MaxPerCheck, but never the rows the loader rejected.
func TestTextListsEveryRejectedRow(t *testing.T) {
	day, err := records.ParseDay("2026-01-05")
	if err != nil {
		t.Fatal(err)
	}
	r := &checker.Result{Facility: "Test station", Period: checker.Period{From: day, To: day}}
	for i := range 25 {
		ref := records.Ref(fmt.Sprintf("daily_care.csv:%d", i+2))
		r.Findings = append(r.Findings, checker.Finding{Check: checker.RejectedCheck, Domain: "records", Subject: string(ref),
			On: day, Severity: checker.Minor, Message: string(ref) + ": water: \"frozn\" is not one of …", Evidence: []records.Ref{ref},
			Title: "Row rejected", Source: "common practice"})
	}
	var b bytes.Buffer
	if err := reports.WriteText(&b, r, reports.TextOptions{MaxPerCheck: 20}); err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(b.String(), "MINOR  records.row.rejected"); n != 25 {
		t.Errorf("%d rejected rows listed, want all 25:\n%s", n, b.String())
	}
	if strings.Contains(b.String(), "more minor records.row.rejected") {
		t.Errorf("rejected rows cut:\n%s", b.String())
	}
}
