package checker_test

import (
	"context"
	"errors"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/rules"
)

// committeeRule is a complete committee rule package named pkg (package
// METADATA on lines 1–5, the package on line 6) with one check.
func committeeRule(pkg, id string) string {
	return `# METADATA
# title: Committee rules
# description: A committee's own check.
# custom:
#   subjects: [enclosure]
package ` + pkg + `

# METADATA
# title: Committee check
# description: Fires on every enclosure.
# custom:
#   id: ` + id + `
#   severity: minor
#   source: facility choice
findings contains f if {
	f := {"check": "` + id + `", "subject": input.id, "on": "2026-01-01", "message": "m", "evidence": []}
}
`
}

// TestRulesFolderIsContained: a --rules folder may only define packages of
// its own under welfare.: it may not add to a shipped package (which could
// switch a shipped check off or add a finding in its name), shadow
// data.limits, or define anything at another root. Each refusal is
// positioned at the package line.
func TestRulesFolderIsContained(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, file, src string
		want            string // "" for accepted
	}{
		{"a shipped package gains a rule", "cold_extra.rego", committeeRule("welfare.cold", "cold.committee.extra"),
			"committee/cold_extra.rego:6:1: package welfare.cold is refused: welfare.cold is a shipped package"},
		{"a newer shipped package", "heat_extra.rego", committeeRule("welfare.heat", "heat.committee.extra"),
			"committee/heat_extra.rego:6:1: package welfare.heat is refused: welfare.heat is a shipped package"},
		{"under a shipped package", "sub.rego", committeeRule("welfare.care.sub", "care.committee.extra"),
			"committee/sub.rego:6:1: package welfare.care.sub is refused: welfare.care is a shipped package"},
		{"a shipped test package", "care_test.rego", "package welfare.care_test\n\ntest_x if true\n",
			"committee/care_test.rego:1:1: package welfare.care_test is refused: welfare.care_test is a shipped package"},
		{"limits set", "limits.rego", "# the frostbite line moved by a rule\npackage limits\n\ncold := {\"frostbite_wind_chill_c\": -60}\n",
			"committee/limits.rego:2:1: package limits is refused: data.limits are the limits in force"},
		{"under limits", "lim.rego", "package limits.cold\n\nfrostbite_wind_chill_c := -60\n",
			"committee/lim.rego:1:1: package limits.cold is refused: data.limits are the limits in force"},
		{"another root", "foo.rego", "package foo\n\nx := 1\n",
			"committee/foo.rego:1:1: package foo is refused: a committee's rules go in a package of their own under welfare."},
		{"welfare itself", "w.rego", "package welfare\n\nx := 1\n",
			"committee/w.rego:1:1: package welfare is refused: a committee's rules go in a package of their own under welfare."},
		{"own package", "ours.rego", committeeRule("welfare.ourcommittee", "ourcommittee.cage.checked"), ""},
		{"own test package", "ours_test.rego", "package welfare.ourcommittee_test\n\ntest_x if true\n", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			sources := []checker.Source{
				{Name: "rules", FS: rules.FS()},
				{Name: "committee", FS: fstest.MapFS{tt.file: {Data: []byte(tt.src)}}},
			}
			// The rule tests read the _test.rego files too: the same refusal.
			var out strings.Builder
			_, _, testErr := checker.RunTests(context.Background(), sources, nil, &out, false)
			p, err := checker.Compile(context.Background(), lim, sources, checker.Options{})
			if strings.HasSuffix(tt.file, "_test.rego") {
				err = testErr
			}
			if tt.want == "" {
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				if p != nil && !strings.HasSuffix(tt.file, "_test.rego") {
					var ids []string
					for _, c := range p.Checks() {
						if c.Package == "welfare.ourcommittee" {
							ids = append(ids, c.ID)
						}
					}
					if diff := cmp.Diff([]string{"ourcommittee.cage.checked"}, ids); diff != "" {
						t.Errorf("committee checks (-want +got):\n%s", diff)
					}
				}
				return
			}
			var rerr *checker.RulesError
			if !errors.As(err, &rerr) {
				t.Fatalf("error = %v (%T), want a *checker.RulesError", err, err)
			}
			if !strings.HasPrefix(err.Error(), tt.want) {
				t.Errorf("error = %q, want it to start with %q", err, tt.want)
			}
			if testErr == nil || !strings.HasPrefix(testErr.Error(), tt.want) {
				t.Errorf("rule tests: error = %v, want it to start with %q", testErr, tt.want)
			}
		})
	}
}

// TestShippedRulesAreNotContained: the shipped files, given as they are
// embedded (also under another source name, as --rules-only with a copy of
// them does), compile.
func TestShippedRulesAreNotContained(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"rules", "copy"} {
		if _, err := checker.Compile(context.Background(), lim, []checker.Source{{Name: name, FS: rules.FS()}}, checker.Options{}); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
}

// TestWallClockBuiltinsRefused lists every built-in whose answer depends on
// when the check runs: each is refused at its call's position. (OPA's
// built-in documentation: crypto.x509.parse_and_verify_certificates
// verifies the chain "at the current time"; io.jwt.decode_verify checks
// exp and nbf against the time of evaluation.)
func TestWallClockBuiltinsRefused(t *testing.T) {
	tests := []struct {
		name, call string
	}{
		{"clock", `time.now_ns()`},
		{"certificate verification", `crypto.x509.parse_and_verify_certificates("MIIB")`},
		{"certificate verification with options", `crypto.x509.parse_and_verify_certificates_with_options("MIIB", {"KeyUsages": ["KeyUsageDigitalSignature"]})`},
		{"token verification", `io.jwt.decode_verify("a.b.c", {"secret": "s"})`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			name := strings.SplitN(tt.call, "(", 2)[0]
			src := engHeader + "findings contains f if {\n\tx := " + tt.call + "\n" +
				"\tf := {\"check\": \"sandbox.probe.fired\", \"subject\": sprintf(\"%v\", [x]), \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
			_, err := checker.NewEngine(context.Background(), engUser(map[string]string{"probe.rego": src}), nil, checker.EngineOptions{})
			want := "user/probe.rego:17:7: " + name + " is not allowed in welfare rules"
			if err == nil || !strings.HasPrefix(err.Error(), want) {
				t.Errorf("error = %v, want it to start with %q", err, want)
			}
		})
	}
}
