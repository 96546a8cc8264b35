package checker

import (
	"context"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/rules"
)

// checks.md "Corrections to the first set": the six protocol checks that are
// reportable noncompliance (PHS Policy IV.F.3; NIH notice NOT-OD-05-034, from
// memory) carry custom.reportable: true, and no other shipped check does.
func TestShippedReportableChecks(t *testing.T) {
	data, err := defaultLimits(t).Data()
	if err != nil {
		t.Fatal(err)
	}
	e, err := NewEngine(context.Background(), []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, c := range e.Checks() {
		if c.Reportable {
			got = append(got, c.ID)
		}
	}
	want := []string{
		"protocol.animals.exceeded", "protocol.inactive", "protocol.method.unapproved",
		"protocol.personnel.unlisted", "protocol.procedure.unapproved", "protocol.species.unapproved",
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("reportable checks (-want +got):\n%s", diff)
	}
}

// The engine carries custom.reportable onto every finding of the check (PHS
// Policy IV.F.3), and onto no other finding.
func TestFindingsCarryReportable(t *testing.T) {
	fs := peopleFindings(t, peopleSet(t), peopleLimits(t), peoplePeriod)
	marked := map[string]bool{}
	for _, f := range fs {
		want := strings.HasPrefix(f.Check, "protocol.") && f.Check != "protocol.expiring" && f.Check != "protocol.review.overdue"
		if f.Reportable != want {
			t.Errorf("%s %s: reportable = %v, want %v", f.Check, f.Subject, f.Reportable, want)
		}
		if f.Reportable {
			marked[f.Check] = true
		}
	}
	// The people fixture plants protocol.inactive, procedure.unapproved and animals.exceeded.
	for _, c := range []string{"protocol.inactive", "protocol.procedure.unapproved", "protocol.animals.exceeded"} {
		if !marked[c] {
			t.Errorf("no reportable %s finding; got %v", c, marked)
		}
	}
}
