package checker

import (
	"context"
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
