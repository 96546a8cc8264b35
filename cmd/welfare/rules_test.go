package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// TestRulesInput: 'welfare rules input KIND' prints the fields a rule may
// read, from the same schema the compiler checks rules against.
func TestRulesInput(t *testing.T) {
	tests := []struct {
		args     []string
		code     int
		contains []string
	}{
		{[]string{"rules", "input", "enclosure"}, exitOK, []string{
			"input.care.unobserved[].days", "integer",
			"input.cold.days_at_or_past_bedding_limits[].days_since_bedding", "integer or null",
			"input.ref", "string or null",
		}},
		{[]string{"rules", "input", "staff"}, exitOK, []string{"input.name", "input.staff.handled[].rabies.primary_on", "day (YYYY-MM-DD) or null"}},
		{[]string{"rules", "input", "cage"}, exitUsage, []string{`no subject kind "cage"`}},
		{[]string{"rules", "input"}, exitUsage, []string{"rules input needs one subject KIND"}},
	}
	for _, tt := range tests {
		t.Run(strings.Join(tt.args, " "), func(t *testing.T) {
			code, out, errOut := runMain(t, tt.args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d\n%s%s", code, tt.code, out, errOut)
			}
			for _, s := range tt.contains {
				if !strings.Contains(out+errOut, s) {
					t.Errorf("output lacks %q:\n%s%s", s, out, errOut)
				}
			}
		})
	}
}

// writeFiles writes files (path -> text) under dir.
func writeFiles(t *testing.T, dir string, files map[string]string) {
	t.Helper()
	for name, text := range files {
		p := filepath.Join(dir, name)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

const tailRule = `# METADATA
# title: Tails
# description: Tail length.
# scope: package
# custom:
#   subjects: [animal]
package welfare.tails

# METADATA
# title: Fox species
# description: Fires for a red fox.
# custom:
#   id: local.tails.fox
#   severity: note
#   source: facility choice
findings contains f if {
	input.species == "vulpes_vulpes"
	f := {"check": "local.tails.fox", "subject": input.id, "on": "2026-01-01", "message": "fox", "evidence": [input.ref]}
}
`

// TestRulesTest: a member's folder reports its own tests only, in our
// wording; -v before or after DIR shows every test; a failing test shows
// its file:row, the expression that did not hold and what the rule
// produced, and exits 1.
func TestRulesTest(t *testing.T) {
	t.Chdir(t.TempDir())
	writeFiles(t, ".", map[string]string{
		"good/tails.rego": tailRule,
		"good/tails_test.rego": `package welfare.tails_test

test_fox if count(data.welfare.tails.findings) == 1 with input as {"id": "A", "ref": "animals.csv:2", "species": "vulpes_vulpes"}

test_mink if count(data.welfare.tails.findings) == 0 with input as {"id": "A", "ref": "animals.csv:2", "species": "neovison_vison"}
`,
		"bad/tails.rego": tailRule,
		"bad/tails_test.rego": `package welfare.tails_test

test_mink_wrongly_expected if {
	fs := data.welfare.tails.findings with input as {"id": "M-1", "ref": "animals.csv:3", "species": "neovison_vison"}
	count(fs) == 1
}
`,
	})
	tests := []struct {
		args     []string
		code     int
		contains []string
		lacks    []string
	}{
		{[]string{"rules", "test", "good"}, exitOK, []string{"Rule tests in good: 2 of 2 passed\n"}, []string{"PASS", "shipped"}},
		{[]string{"rules", "test", "good", "-v"}, exitOK, []string{"PASS good/tails_test.rego:3 welfare.tails_test.test_fox", "PASS rules/care_test.rego", "Rule tests in the shipped rules:", "Rule tests in good: 2 of 2 passed"}, nil},
		{[]string{"rules", "test", "-v", "good"}, exitOK, []string{"PASS good/tails_test.rego:5 welfare.tails_test.test_mink", "Rule tests in good: 2 of 2 passed"}, nil},
		{[]string{"rules", "test", "bad"}, exitFindings, []string{
			"FAIL bad/tails_test.rego:3 welfare.tails_test.test_mink_wrongly_expected",
			"did not hold: bad/tails_test.rego:5: count(fs) == 1",
			"fs = set()",
			"Rule tests in bad: 0 of 1 passed, 1 failed",
		}, []string{"PASS"}},
		{[]string{"rules", "test"}, exitOK, []string{"Rule tests in the shipped rules: "}, []string{"PASS"}},
	}
	for _, tt := range tests {
		t.Run(strings.Join(tt.args, " "), func(t *testing.T) {
			code, out, errOut := runMain(t, tt.args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d\n%s%s", code, tt.code, out, errOut)
			}
			for _, s := range tt.contains {
				if !strings.Contains(out, s) {
					t.Errorf("output lacks %q:\n%s", s, out)
				}
			}
			for _, s := range tt.lacks {
				if strings.Contains(out, s) {
					t.Errorf("output has %q:\n%s", s, out)
				}
			}
		})
	}
}

// TestRulesNew: the scaffold passes its tests at once, runs in check on
// the demo, and refuses a shipped name or an existing file.
func TestRulesNew(t *testing.T) {
	t.Chdir(t.TempDir())
	if code, _, errOut := runMain(t, "demo", "--season", "winter", "demo"); code != exitOK {
		t.Fatalf("demo: exit %d\n%s", code, errOut)
	}
	code, out, errOut := runMain(t, "rules", "new", "fences")
	if code != exitOK {
		t.Fatalf("rules new: exit %d\n%s%s", code, out, errOut)
	}
	for _, f := range []string{"our-rules/fences.rego", "our-rules/fences_test.rego"} {
		if _, err := os.Stat(f); err != nil {
			t.Errorf("rules new did not write %s", f)
		}
	}
	if code, out, _ := runMain(t, "rules", "test", "our-rules"); code != exitOK || !strings.Contains(out, "Rule tests in our-rules: 2 of 2 passed") {
		t.Errorf("the scaffold's tests: exit %d\n%s", code, out)
	}
	if code, out, errOut := runMain(t, "check", "demo/records", "--rules", "our-rules", "--fail-on", "never"); code != exitOK {
		t.Errorf("check with the scaffold: exit %d\n%s%s", code, out, errOut)
	}
	if code, out, _ := runMain(t, "rules", "list", "--rules", "our-rules"); !strings.Contains(out, "local.fences.duration_missing") || code != exitOK {
		t.Errorf("rules list lacks the scaffold's check:\n%s", out)
	}
	for _, tt := range []struct {
		args []string
		msg  string
	}{
		{[]string{"rules", "new", "fences"}, "our-rules/fences.rego already exists"},
		{[]string{"rules", "new", "care", "x"}, "welfare.care is a shipped package"},
		{[]string{"rules", "new", "Fences"}, `"Fences" is not a lower_snake_case name`},
	} {
		code, _, errOut := runMain(t, tt.args...)
		if code != exitUsage || !strings.Contains(errOut, tt.msg) {
			t.Errorf("%v: exit %d, want 2 with %q:\n%s", tt.args, code, tt.msg, errOut)
		}
	}
}

// TestRulesListJSON: every check with its origin, and the limits each
// reads (health.rego's weight-loss rule reads its three limits).
func TestRulesListJSON(t *testing.T) {
	t.Chdir(t.TempDir())
	writeFiles(t, ".", map[string]string{"ours/tails.rego": tailRule})
	code, out, errOut := runMain(t, "rules", "list", "--json", "--rules", "ours")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, errOut)
	}
	var checks []listedCheck
	if err := json.Unmarshal([]byte(out), &checks); err != nil {
		t.Fatal(err)
	}
	byID := map[string]listedCheck{}
	for _, c := range checks {
		byID[c.ID] = c
	}
	want := []listedCheck{
		{ID: "health.weight.loss", Domain: "health", Severity: "minor", InForce: "minor", Origin: "shipped", File: "rules/health.rego",
			Limits: []string{"health.weight_loss_days", "health.weight_loss_pct", "health.weight_loss_significant_pct"}},
		{ID: "local.tails.fox", Domain: "local", Severity: "note", InForce: "note", Origin: "local", File: "ours/tails.rego", Limits: []string{}},
	}
	for _, w := range want {
		got := byID[w.ID]
		got.Title, got.Description, got.Source, got.Row, got.Package, got.Subjects, got.Needs = "", "", "", 0, "", nil, nil
		if diff := cmp.Diff(w, got); diff != "" {
			t.Errorf("%s (-want +got):\n%s", w.ID, diff)
		}
	}
	if byID["health.weight.loss"].Row == 0 {
		t.Error("no row for health.weight.loss")
	}
}

// TestRulesExport: the exported copy passes its own tests with no
// shipped rules, and export refuses to overwrite.
func TestRulesExport(t *testing.T) {
	t.Chdir(t.TempDir())
	if code, out, errOut := runMain(t, "rules", "export", "ours"); code != exitOK {
		t.Fatalf("export: exit %d\n%s%s", code, out, errOut)
	}
	code, out, errOut := runMain(t, "rules", "test", "--rules", "ours", "--rules-only")
	if code != exitOK || !strings.Contains(out, "Rule tests in ours: ") || strings.Contains(out, "shipped") {
		t.Errorf("exported rules' tests: exit %d\n%s%s", code, out, errOut)
	}
	_, shipped, _ := runMain(t, "rules", "test")
	if strings.TrimPrefix(shipped, "Rule tests in the shipped rules: ") != strings.TrimPrefix(out, "Rule tests in ours: ") {
		t.Errorf("the copy runs other tests than the shipped rules: %q vs %q", out, shipped)
	}
	if code, _, errOut := runMain(t, "rules", "export", "ours"); code != exitUsage || !strings.Contains(errOut, "already exists") {
		t.Errorf("second export: exit %d\n%s", code, errOut)
	}
}
