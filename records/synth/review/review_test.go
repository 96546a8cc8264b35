package review_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records/synth"
	"welfare/records/synth/review"
	"welfare/reports"
)

// The written file is one `welfare check --previous` reads back with the
// same findings; a check the shipped rules lack, or a severity that is not
// one, is refused.
func TestWrite(t *testing.T) {
	good := synth.ReviewFinding{Check: "care.water.unavailable", Subject: "S001-01", On: "2025-12-03",
		Severity: "significant", Message: "water found frozen"}
	run := synth.ReviewFinding{Check: "care.observation.missed", Subject: "S001-02", On: "2025-12-05", Until: "2025-12-06",
		Severity: "significant", Message: "not observed for 2 days in a row"}
	for _, tc := range []struct {
		name    string
		finding synth.ReviewFinding
		err     string
	}{
		{"a day", good, ""},
		{"a run", run, ""},
		{"unknown check", synth.ReviewFinding{Check: "care.water.warm", Subject: "S1", On: "2025-12-03", Severity: "minor"}, "not a check of the shipped rules"},
		{"bad severity", synth.ReviewFinding{Check: "care.water.unavailable", Subject: "S1", On: "2025-12-03", Severity: "grave"}, `severity "grave"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := synth.Review{Facility: "Invented farm", From: "2025-12-01", To: "2025-12-31", Findings: []synth.ReviewFinding{tc.finding}}
			var b bytes.Buffer
			err := review.Write(&b, r)
			if tc.err != "" {
				if err == nil || !strings.Contains(err.Error(), tc.err) {
					t.Fatalf("error %v, want one containing %q", err, tc.err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			prev, err := reports.ReadFindings(&b, "findings.json")
			if err != nil {
				t.Fatal(err)
			}
			if prev.Facility != r.Facility || prev.Period.From.String() != r.From || prev.Period.To.String() != r.To || len(prev.Findings) != 1 {
				t.Fatalf("read back %+v", prev)
			}
			f := prev.Findings[0]
			got := synth.ReviewFinding{Check: f.Check, Subject: f.Subject, On: f.On.String(), Severity: string(f.Severity), Message: f.Message}
			if !f.Until.IsZero() {
				got.Until = f.Until.String()
			}
			if diff := cmp.Diff(tc.finding, got); diff != "" {
				t.Errorf("finding read back (-written +read):\n%s", diff)
			}
			if f.Domain != "care" || f.Title == "" || f.Source == "" {
				t.Errorf("domain %q, title %q, source %q: want the shipped check's", f.Domain, f.Title, f.Source)
			}
		})
	}
}
