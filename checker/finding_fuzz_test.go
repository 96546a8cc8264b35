package checker

import (
	"context"
	"encoding/json"
	"strings"
	"testing"
	"testing/fstest"
)

// FuzzDecodeFinding feeds any JSON value to the finding decoder as a rule's
// output. Properties: no panic; a finding kept has a known check of its
// package, a day, a known severity and evidence naming lines of the files
// read; anything else becomes a malformed finding naming the rule's row.
func FuzzDecodeFinding(f *testing.F) {
	for _, seed := range []string{
		`{"check": "fuzz.probe.fired", "subject": "E-01", "on": "2026-01-05", "message": "m", "evidence": ["daily_care.csv:4"]}`,
		`{"check": "fuzz.probe.fired", "subject": "E-01", "on": "2026-01-05", "until": "2026-01-07", "message": "m", "evidence": [], "severity": "note"}`,
		`{"check": "fuzz.probe.fired", "subject": "E-01", "on": "2026-02-30", "message": "m", "evidence": []}`,
		`{"check": "fuzz.probe.fired", "subject": 7, "on": "2026-01-05", "message": "m", "evidence": [12]}`,
		`{"check": "other.probe.fired", "subject": "E-01", "on": "2026-01-05", "message": "m", "evidence": ["../x:1"]}`,
		`{"check": "fuzz.probe.fired", "subject": "E-01", "on": "2026-01-05", "message": "m", "evidence": ["daily_care.csv:99"], "severity": "high"}`,
		`[1, 2]`, `"text"`, `null`, `{}`,
	} {
		f.Add(seed)
	}
	src := `# METADATA
# title: Fuzz
# description: The decoder's fuzz package.
# schemas:
#   - input: {type: object}
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.fuzz

# METADATA
# title: Probe
# description: Returns the input's finding.
# custom:
#   id: fuzz.probe.fired
#   severity: minor
#   source: facility choice
findings contains input.finding
`
	e, err := newEngine(context.Background(), []Source{{Name: "user", FS: fstest.MapFS{"fuzz.rego": {Data: []byte(src)}}}}, nil, Options{})
	if err != nil {
		f.Fatal(err)
	}
	lines := map[string]int{"daily_care.csv": 10}
	f.Fuzz(func(t *testing.T, text string) {
		// Numbers as the rules' results give them: json.Number.
		dec := json.NewDecoder(strings.NewReader(text))
		dec.UseNumber()
		var raw any
		if dec.Decode(&raw) != nil {
			return
		}
		fd, keep, err := e.toFinding("welfare.fuzz", raw, lines)
		if err != nil {
			m := e.malformed("welfare.fuzz", "E-01", raw, err)
			if m.Check != MalformedCheck || m.Severity != Significant || !strings.HasPrefix(m.Message, "user/fuzz.rego:18: welfare.fuzz gave a finding that was not reported: ") {
				t.Fatalf("malformed finding %+v", m)
			}
			return
		}
		if !keep {
			return
		}
		if fd.Check != "fuzz.probe.fired" || fd.On.IsZero() || fd.Severity.Rank() == 0 || fd.Subject == "" {
			t.Fatalf("kept a bad finding %+v from %s", fd, text)
		}
		for _, r := range fd.Evidence {
			if why := refNamesNoRow(string(r), lines); why != "" {
				t.Fatalf("kept evidence %q: %s", r, why)
			}
		}
	})
}
