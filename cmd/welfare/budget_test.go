package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestRuleBudgetFlags: a committee rule that loops runs out of the budget
// of its whole package (--package-timeout), or of the whole evaluation
// (--evaluation-timeout), before its per-subject budget, and the error
// names the package; a budget of 0 is a usage error.
func TestRuleBudgetFlags(t *testing.T) {
	dir := t.TempDir()
	src := `# METADATA
# title: Slow
# description: A committee package that loops.
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.slow

# METADATA
# title: Never
# description: Loops, then never fires.
# custom:
#   id: slow.loop.never
#   severity: minor
#   source: facility choice
findings contains f if {
	some i in numbers.range(1, 3000)
	some j in numbers.range(1, 3000)
	some k in numbers.range(1, 3000)
	i + j + k < 0
	f := {"check": "slow.loop.never", "subject": input.id, "on": "2026-01-01", "message": "m", "evidence": []}
}
`
	if err := os.WriteFile(filepath.Join(dir, "slow.rego"), []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runMain(t, "check", demoRecords, "--rules", dir, "--rule-timeout", "1m", "--package-timeout", "300ms")
	want := "welfare.slow: the 300ms time budget ran out for the whole package, across its subjects"
	if code != exitUsage || !strings.Contains(stderr, want) {
		t.Errorf("exit %d, want %d and %q in:\n%s", code, exitUsage, want, stderr)
	}
	// The whole evaluation's budget is long enough for the shipped rules on
	// the demo even on a loaded machine (a budget that ran out in one of
	// them would name it), never for the loop (27 billion steps).
	code, _, stderr = runMain(t, "check", demoRecords, "--rules", dir, "--rule-timeout", "1m", "--evaluation-timeout", "3s")
	if code != exitUsage || !strings.Contains(stderr, "the 3s time budget ran out for the whole evaluation") || !strings.Contains(stderr, "welfare.slow: subject ") {
		t.Errorf("exit %d, want %d and the whole evaluation's budget named with the package in:\n%s", code, exitUsage, stderr)
	}
	for _, flag := range []string{"--rule-timeout", "--package-timeout", "--evaluation-timeout"} {
		code, _, stderr := runMain(t, "check", demoRecords, flag, "0s")
		if code != exitUsage || !strings.Contains(stderr, flag+" 0s: a time budget must be more than 0") {
			t.Errorf("%s 0s: exit %d\n%s", flag, code, stderr)
		}
	}
}
