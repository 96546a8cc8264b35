package main

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"welfare/checker"
	"welfare/records/demo"
	"welfare/reports"
	"welfare/rules"
)

// TestExplainEveryDemoFinding: --explain answers for every finding of the
// demo: the subject's document, the rule's file:row, each limit the check
// reads with a value, and every evidence row read back from its file.
func TestExplainEveryDemoFinding(t *testing.T) {
	if testing.Short() {
		t.Skip("evaluates every demo finding's subject again")
	}
	ctx := context.Background()
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	policy, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	fsys, err := recordsFolder("../../testdata/demo/records")
	if err != nil {
		t.Fatal(err)
	}
	// The demo is checked with its December review, as welfare demo does.
	_, data, ok := demo.Seasons["winter"].Previous()
	if !ok {
		t.Fatal("the winter demo has no previous review")
	}
	prev, err := reports.ReadFindings(bytes.NewReader(data), "previous.json")
	if err != nil {
		t.Fatal(err)
	}
	x, err := policy.Explainer(ctx, fsys, checker.CheckOptions{Previous: prev})
	if err != nil {
		t.Fatal(err)
	}
	findings := x.Result().Findings
	if got, want := len(findings), len(planted(t)); got != want {
		t.Fatalf("%d demo findings, the answer key has %d", got, want)
	}
	for _, f := range findings {
		key := checker.ExplainKey(f)
		ex, err := x.Explain(ctx, key)
		if err != nil {
			t.Errorf("%s: %v", key, err)
			continue
		}
		if ex.Input == nil || ex.Input["kind"] != ex.Kind {
			t.Errorf("%s: no input document of kind %s", key, ex.Kind)
		}
		if ex.Check.File == "" || ex.Check.Row == 0 {
			t.Errorf("%s: no rule file:row", key)
		}
		for _, l := range ex.Limits {
			if l.Value == nil {
				t.Errorf("%s: limit %s has no value", key, l.Path)
			}
		}
		if len(ex.Evidence) != len(f.Evidence) {
			t.Errorf("%s: %d evidence rows for %d references", key, len(ex.Evidence), len(f.Evidence))
		}
		for _, e := range ex.Evidence {
			if e.Err != "" || e.Line == "" {
				t.Errorf("%s: evidence %s: %q %s", key, e.Ref, e.Line, e.Err)
			}
		}
	}
}

// TestExplainCommand: the command prints the finding, the rule, the
// limits with their values, the evidence rows as written and the facts;
// an unknown key names the check's keys. Values from testdata/demo/PLANTED.md
// (RF-416, 7.4 kg on Dec 29 and 6.5 kg on Jan 26) and rules/limits.yaml.
func TestExplainCommand(t *testing.T) {
	tests := []struct {
		key      string
		code     int
		contains []string
	}{
		{"health.weight.loss RF-416 2026-01-26", exitOK, []string{
			"Finding health.weight.loss RF-416 2026-01-26 (minor)",
			"Rule: rules/health.rego:",
			"health.weight_loss_pct = 10\n",
			"health.weight_loss_days = 30\n",
			"2025-12-29T10:48,RF-416,ST-04,7.4,",
			"2026-01-26T10:48,RF-416,ST-04,6.5,",
			"Facts the rule saw (input, animal RF-416):",
			`"kg": 6.5`,
		}},
		{"health.weight.loss  RF-416   2026-01-26", exitOK, []string{"Finding health.weight.loss RF-416 2026-01-26"}},
		{"health.weight.loss RF-416 2026-01-27", exitUsage, []string{"the findings of health.weight.loss are: health.weight.loss RF-416 2026-01-26"}},
		{"no.such.check X 2026-01-01", exitUsage, []string{`no finding has the key "no.such.check X 2026-01-01"`}},
	}
	for _, tt := range tests {
		t.Run(tt.key, func(t *testing.T) {
			code, out, errOut := runMain(t, "check", "../../testdata/demo/records", "--explain", tt.key)
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
