package reports_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/reports"
)

// What WriteJSON writes, ReadFindings reads back: the previous review of
// the next check.
func TestReadFindingsRoundTrip(t *testing.T) {
	r := sampleResult(5)
	var b bytes.Buffer
	if err := reports.WriteJSON(&b, r); err != nil {
		t.Fatal(err)
	}
	prev, err := reports.ReadFindings(&b, "findings.json")
	if err != nil {
		t.Fatal(err)
	}
	type row struct{ Key, Domain string }
	var want, got []row
	for _, f := range r.Findings {
		want = append(want, row{f.Key(), f.Domain})
	}
	for _, f := range prev.Findings {
		got = append(got, row{f.Key(), f.Domain})
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings read back (-want +got):\n%s", diff)
	}
	if prev.Facility != r.Facility || prev.Period != r.Period {
		t.Errorf("facility %q period %v, want %q %v", prev.Facility, prev.Period, r.Facility, r.Period)
	}
}

func TestReadFindingsRefuses(t *testing.T) {
	good := `{"facility": "F", "period": {"from": "2025-12-01", "to": "2025-12-31"}, "fingerprint": "", "checks": [], "findings": [%s]}`
	tests := []struct{ name, doc, want string }{
		{"truncated", `{"facility": "F",` + "\n" + `  "period": `, "f.json:2:13: is not a findings file written by 'welfare check --json'"},
		{"a list", `[1, 2]`, "f.json:1:1: is not a findings file"},
		{"no findings", `{"facility": "F", "period": {}, "fingerprint": "", "checks": []}`, `(no "findings")`},
		{"wrong type", strings.Replace(good, "%s", `{"check": 7}`, 1), "is a JSON number, not a string"},
		{"bad check", strings.Replace(good, "%s", `{"check": "Water", "subject": "S1", "on": "2025-12-02", "severity": "minor"}`, 1),
			`f.json: findings[0]: check "Water" is not a check id`},
		{"bad severity", strings.Replace(good, "%s", `{"check": "care.water.unavailable", "subject": "S1", "on": "2025-12-02", "severity": "high"}`, 1),
			`findings[0]: severity "high" is not significant, minor or note`},
		{"period backwards", strings.Replace(strings.Replace(good, "%s", "", 1), `"to": "2025-12-31"`, `"to": "2025-11-30"`, 1),
			"period.to 2025-11-30 is before period.from 2025-12-01"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := reports.ReadFindings(strings.NewReader(tt.doc), "f.json")
			if err == nil || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("error %v, want one containing %q", err, tt.want)
			}
		})
	}
}
