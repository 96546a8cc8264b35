package rules_test

import (
	"context"
	"io/fs"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/open-policy-agent/opa/v1/format"

	"welfare/checker"
	"welfare/rules"
)

// TestRegoFormatted: every shipped .rego file is laid out as OPA's
// formatter lays it out (what 'opa fmt' writes), so a diff of a rule shows
// only what changed in it.
func TestRegoFormatted(t *testing.T) {
	files, err := fs.Glob(rules.FS(), "*.rego")
	if err != nil || len(files) == 0 {
		t.Fatalf("no .rego files (%v)", err)
	}
	for _, name := range files {
		t.Run(name, func(t *testing.T) {
			src, err := fs.ReadFile(rules.FS(), name)
			if err != nil {
				t.Fatal(err)
			}
			got, err := format.Source(name, src)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(string(got), string(src)); diff != "" {
				t.Errorf("%s is not formatted as OPA formats it (-formatted +file):\n%s", name, diff)
			}
		})
	}
}

// TestShippedRuleTests runs the shipped _test.rego tests with the default
// limits, one Go test per Rego test, so a failure names its test.
func TestShippedRuleTests(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	p, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	results, err := p.RuleTests(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if len(results) == 0 {
		t.Fatal("no rule tests found")
	}
	for _, r := range results {
		t.Run(strings.TrimPrefix(r.Name, "welfare."), func(t *testing.T) {
			switch r.Status {
			case "FAIL":
				t.Errorf("%s:%d: %s failed %s\n%s", r.File, r.Row, r.Name, r.Error, r.Output)
			case "SKIP":
				t.Skipf("%s:%d: skipped", r.File, r.Row)
			}
		})
	}
}
