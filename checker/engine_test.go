package checker_test

import (
	"context"
	"errors"
	"fmt"
	"os"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"welfare/checker"
	"welfare/records"
	"welfare/rules"
)

// engBasic is the engine test rule set in testdata/policies/basic.
func engBasic() []checker.Source {
	return []checker.Source{{Name: "rules", FS: os.DirFS("testdata/policies/basic"), Trusted: true}}
}

// engLimits are the limits the basic policies read. −28 °C wind chill is
// where exposed skin can freeze in 10–30 minutes (Environment and Climate
// Change Canada wind chill hazard bands).
func engLimits(severity map[string]any) map[string]any {
	l := map[string]any{"cold": map[string]any{"frostbite_wind_chill_c": -28}}
	if severity != nil {
		l["severity"] = severity
	}
	return l
}

func engNew(t testing.TB, sources []checker.Source, limits map[string]any, opt checker.EngineOptions) *checker.Engine {
	t.Helper()
	e, err := checker.NewEngine(context.Background(), sources, limits, opt)
	if err != nil {
		t.Fatalf("NewEngine: %v", err)
	}
	return e
}

// engUser is a user rule folder "user" holding the given files.
func engUser(files map[string]string) []checker.Source {
	m := fstest.MapFS{}
	for name, text := range files {
		m[name] = &fstest.MapFile{Data: []byte(text)}
	}
	return []checker.Source{{Name: "user", FS: m}}
}

// engHeader is a valid package header (lines 1–7) and a check METADATA
// block (lines 9–15); the rule under test starts on line 16.
const engHeader = `# METADATA
# title: Sandbox test
# description: A user rule under test.
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.sandbox

# METADATA
# title: Probe
# description: Tries a built-in.
# custom:
#   id: sandbox.probe.fired
#   severity: minor
#   source: facility choice
`

func engDay(s string) records.Day {
	d, err := records.ParseDay(s)
	if err != nil {
		panic(err)
	}
	return d
}

// engDays is one enclosure's care days, each unobserved, unfed for n days
// and with its own evidence row.
func engDays(id string, days ...string) map[string]any {
	var list []any
	for i, d := range days {
		list = append(list, map[string]any{
			"day": d, "occupied": true, "observed": false, "fed": true, "unfed_run": 0,
			"refs": []any{fmt.Sprintf("daily_care.csv:%d", 10+i)},
		})
	}
	return map[string]any{"id": id, "days": list}
}

func TestNewEngineRefusesSandboxEscapes(t *testing.T) {
	// Each call is a real built-in of OPA; the sandbox must refuse it at
	// compile time, at the call's position (line 17, after `if {` on 16,
	// column 7 after "\tx := ").
	tests := []struct {
		name, call string
	}{
		{"network", `http.send({"method": "get", "url": "https://example.org"})`},
		{"environment", `opa.runtime()`},
		{"clock", `time.now_ns()`},
		{"random", `rand.intn("seed", 10)`},
		{"dns", `net.lookup_ip_addr("example.org")`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			name := strings.SplitN(tt.call, "(", 2)[0]
			src := engHeader + "findings contains f if {\n\tx := " + tt.call + "\n" +
				"\tf := {\"check\": \"sandbox.probe.fired\", \"subject\": sprintf(\"%v\", [x]), \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
			_, err := checker.NewEngine(context.Background(), engUser(map[string]string{"probe.rego": src}), nil, checker.EngineOptions{})
			if err == nil {
				t.Fatalf("NewEngine accepted a rule calling %s", name)
			}
			var rerr *checker.RulesError
			if !errors.As(err, &rerr) {
				t.Fatalf("error is %T, want *checker.RulesError: %v", err, err)
			}
			want := "user/probe.rego:17:7: " + name + " is not allowed in welfare rules"
			if !strings.HasPrefix(err.Error(), want) {
				t.Errorf("error = %q, want it to start with %q", err, want)
			}
		})
	}
}

func TestNewEngineRulesErrors(t *testing.T) {
	tests := []struct {
		name  string
		files map[string]string
		want  []string // each problem line, exactly
	}{
		{
			name: "syntax error",
			files: map[string]string{"bad.rego": engHeader +
				"findings contains f if {\n\tf := {\"check\": \n}\n"},
			want: []string{"user/bad.rego:18:1: unexpected } token"},
		},
		{
			name: "package without subjects",
			files: map[string]string{"nosubj.rego": "package welfare.x\n\n" +
				"findings contains \"x\" if false\n"},
			want: []string{"user/nosubj.rego:1:1: package welfare.x defines findings but has no package METADATA with custom.subjects (one or more of facility, enclosure, animal, staff, item, protocol, site, building, correction)"},
		},
		{
			name: "unknown subject kind",
			files: map[string]string{"cage.rego": strings.Replace(engHeader, "[enclosure]", "[cage]", 1) +
				"findings contains \"x\" if false\n"},
			want: []string{"user/cage.rego:1:1: package welfare.sandbox: unknown subject kind \"cage\" in custom.subjects (known: facility, enclosure, animal, staff, item, protocol, site, building, correction)"},
		},
		{
			name: "bad severity and missing source",
			files: map[string]string{"meta.rego": strings.Replace(strings.Replace(engHeader,
				"severity: minor", "severity: critical", 1), "#   source: facility choice\n", "", 1) +
				"findings contains \"x\" if false\n"},
			want: []string{
				"user/meta.rego:9:1: check sandbox.probe.fired: custom.severity must be significant, minor or note, not critical",
				"user/meta.rego:9:1: check sandbox.probe.fired: METADATA needs custom.source (a published source, common practice or facility choice)",
			},
		},
		{
			name: "unknown period",
			files: map[string]string{"period.rego": strings.Replace(engHeader,
				"severity: minor\n", "severity: minor\n#   period: week\n", 1) +
				"findings contains \"x\" if false\n"},
			want: []string{"user/period.rego:9:1: check sandbox.probe.fired: custom.period must be day or review, not week"},
		},
		{
			name: "check id in two packages",
			files: map[string]string{
				"a.rego": engHeader + "findings contains \"x\" if false\n",
				"b.rego": strings.Replace(engHeader, "welfare.sandbox", "welfare.other", 1) + "findings contains \"x\" if false\n",
			},
			want: []string{"user/b.rego:9:1: check sandbox.probe.fired is already defined in package welfare.sandbox (user/a.rego)"},
		},
		{
			name: "finding with another package's check",
			files: map[string]string{
				"a.rego": engHeader + "findings contains \"x\" if false\n",
				"b.rego": strings.Replace(strings.Replace(engHeader, "welfare.sandbox", "welfare.other", 1), "sandbox.probe.fired", "other.probe.fired", 1) +
					"findings contains f if {\n\tf := {\"check\": \"sandbox.probe.fired\", \"subject\": input.id}\n}\n",
			},
			want: []string{"user/b.rego:17:17: check sandbox.probe.fired belongs to package welfare.sandbox (user/a.rego), not welfare.other"},
		},
		{
			name: "finding with a check nobody defines",
			files: map[string]string{"none.rego": engHeader +
				"findings contains f if {\n\tf := {\"check\": \"sandbox.probe.typo\", \"subject\": input.id}\n}\n"},
			want: []string{"user/none.rego:17:17: check sandbox.probe.typo has no METADATA in package welfare.sandbox (title, description, custom.id, custom.severity, custom.source)"},
		},
		{
			name: "unused variable under strict mode",
			files: map[string]string{"strict.rego": engHeader +
				"findings contains \"x\" if {\n\tunused := 1\n\tfalse\n}\n"},
			want: []string{"user/strict.rego:17:2: assigned var unused unused"},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := checker.NewEngine(context.Background(), engUser(tt.files), nil, checker.EngineOptions{})
			var rerr *checker.RulesError
			if !errors.As(err, &rerr) {
				t.Fatalf("error = %v (%T), want *checker.RulesError", err, err)
			}
			if diff := cmp.Diff(tt.want, rerr.Problems); diff != "" {
				t.Errorf("problems (-want +got):\n%s", diff)
			}
		})
	}
}

func TestEngineChecksAndKinds(t *testing.T) {
	e := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{})
	want := []checker.CheckInfo{
		{
			ID: "care.feeding.missed", Domain: "care", Title: "Feeding missed",
			Description: "An occupied enclosure was not fed; significant from the second unfed day.",
			Severity:    checker.Minor, Source: "common practice", Package: "welfare.care",
			File: "rules/care.rego", Row: 41, Needs: []string{"daily_care.csv", "animals.csv"},
			Subjects: []string{"enclosure"}, Local: true, // test rules, not the shipped files
		},
		{
			ID: "care.observation.missed", Domain: "care", Title: "Observation missed",
			Description: "An occupied enclosure had no observation round that day.",
			Severity:    checker.Minor,
			Source:      "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112",
			Package:     "welfare.care", File: "rules/care.rego", Row: 19, Needs: []string{"daily_care.csv"},
			Runs: true, Subjects: []string{"enclosure"}, Local: true, // test rules, not the shipped files
		},
		{
			ID: "care.water.unavailable", Domain: "care", Title: "Water unavailable",
			Description: "A round found water empty or frozen and it was not restored.",
			Severity:    checker.Significant, Source: "OLAW, inoperative watering is a significant deficiency",
			Package: "welfare.care", File: "rules/care.rego", Row: 79, Subjects: []string{"enclosure"}, Local: true, // test rules, not the shipped files
		},
		{
			ID: "cold.frostbite.risk", Domain: "cold", Title: "Frostbite risk",
			Description: "Minimum wind chill at or below the frostbite limit.",
			Severity:    checker.Note, Source: "Environment and Climate Change Canada wind chill hazard bands",
			Package: "welfare.cold", File: "rules/cold.rego", Row: 15, Runs: true,
			// cold.rego compares with this limit (line 25).
			Limits:   []string{"cold.frostbite_wind_chill_c"},
			Subjects: []string{"site", "enclosure"}, Local: true,
		},
	}
	if diff := cmp.Diff(want, e.Checks()); diff != "" {
		t.Errorf("Checks (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]string{"enclosure", "site"}, e.Kinds()); diff != "" {
		t.Errorf("Kinds (-want +got):\n%s", diff)
	}
	// A kind no package receives evaluates to nothing; an unknown kind is an error.
	if fs, err := e.Evaluate(context.Background(), "staff", []map[string]any{{"id": "S-1"}}); err != nil || len(fs) != 0 {
		t.Errorf("Evaluate(staff) = %v, %v; want no findings and no error", fs, err)
	}
	if _, err := e.Evaluate(context.Background(), "cage", nil); err == nil {
		t.Error("Evaluate(cage) gave no error")
	}
}

// BenchmarkEvaluate10kSubjects evaluates the basic care and cold policies
// (four care rule bodies) over 10,000 enclosures of 20 care days each, the
// shape of a three-week inspection of a large farm.
func BenchmarkEvaluate10kSubjects(b *testing.B) {
	e := engNew(b, engBasic(), engLimits(nil), checker.EngineOptions{})
	inputs := make([]map[string]any, 10000)
	for i := range inputs {
		var days []any
		for d := range 20 {
			days = append(days, map[string]any{
				"day":       fmt.Sprintf("2026-01-%02d", d+1),
				"occupied":  true,
				"observed":  (i+d)%7 != 0, // one unobserved day a week
				"fed":       (i+d)%11 != 0,
				"unfed_run": 1,
				"water":     []string{"ok", "ok", "ok", "frozen"}[(i+d)%4],
				"refs":      []any{fmt.Sprintf("daily_care.csv:%d", 2+i*20+d)},
			})
		}
		inputs[i] = map[string]any{"id": fmt.Sprintf("E-%05d", i), "days": days}
	}
	b.ResetTimer()
	var n int
	for b.Loop() {
		fs, err := e.Evaluate(context.Background(), "enclosure", inputs)
		if err != nil {
			b.Fatal(err)
		}
		n = len(fs)
	}
	b.ReportMetric(float64(len(inputs)*b.N)/b.Elapsed().Seconds(), "subjects/s")
	b.ReportMetric(float64(n), "findings")
}

// A committee's own rule: every enclosure whose facts say it was not
// cleaned gets a finding. Severity comes from the rule's METADATA unless
// the limits override it.
func ExampleEngine_Evaluate() {
	rules := fstest.MapFS{"clean.rego": {Data: []byte(`# METADATA
# title: Hygiene
# description: Enclosure cleaning, judged on hand-made documents.
# schemas:
#   - input: {type: object}
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.hygiene

# METADATA
# title: Enclosure not cleaned
# description: The enclosure's weekly cleaning was not recorded.
# custom:
#   id: hygiene.cleaning.missed
#   severity: minor
#   source: facility choice
findings contains f if {
	not input.cleaned
	f := {"check": "hygiene.cleaning.missed", "subject": input.id, "on": input.week_start,
	      "message": "weekly cleaning not recorded", "evidence": input.refs}
}
`)}}
	e, err := checker.NewEngine(context.Background(), []checker.Source{{Name: "committee", FS: rules}}, nil, checker.EngineOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{
		{"id": "B1-03", "cleaned": false, "week_start": "2026-01-12", "refs": []any{"daily_care.csv:40"}},
		{"id": "B1-04", "cleaned": true, "week_start": "2026-01-12", "refs": []any{}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, f := range fs {
		fmt.Println(f.Check, f.Subject, f.On, f.Severity, f.Evidence)
	}
	// Output:
	// hygiene.cleaning.missed B1-03 2026-01-12 minor [daily_care.csv:40]
}

// TestRuleReadingAFieldTheInputLacksFailsToCompile: a committee's typo in an
// input field is a compile error at the rule's file, row and column, not a
// rule that silently never fires. The enclosure input has care.unobserved
// (rules/schemas/enclosure.json); "unobsrved" is not in it.
func TestRuleReadingAFieldTheInputLacksFailsToCompile(t *testing.T) {
	body := "findings contains f if {\n\tsome r in input.care.unobsrved\n" +
		"\tf := {\"check\": \"sandbox.probe.fired\", \"subject\": input.id, \"on\": r.from, \"message\": \"m\", \"evidence\": []}\n}\n"
	tests := []struct {
		name, header string
		want         string
	}{
		{"one kind", engHeader, "user/typo.rego:17:12: undefined ref: input.care.unobsrved"},
		{"several kinds", strings.Replace(engHeader, "[enclosure]", "[site, enclosure, staff]", 1),
			"user/typo.rego:17:12: undefined ref: input.care.unobsrved"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			files := map[string]string{"typo.rego": tt.header + body}
			_, err := checker.NewEngine(context.Background(), engUser(files), nil, checker.EngineOptions{})
			var rerr *checker.RulesError
			if !errors.As(err, &rerr) {
				t.Fatalf("error = %v (%T), want a *checker.RulesError", err, err)
			}
			if !strings.HasPrefix(err.Error(), tt.want) {
				t.Errorf("error = %q, want it to start with %q", err, tt.want)
			}
			// The rule's own tests stop at the same place.
			var out strings.Builder
			_, _, err = checker.RunTests(context.Background(), engUser(files), nil, &out, false)
			if err == nil || !strings.HasPrefix(err.Error(), tt.want) {
				t.Errorf("rule tests: error = %v, want it to start with %q", err, tt.want)
			}
			// Spelt right, the same rule compiles.
			fixed := map[string]string{"typo.rego": tt.header + strings.Replace(body, "unobsrved", "unobserved", 1)}
			if _, err := checker.NewEngine(context.Background(), engUser(fixed), nil, checker.EngineOptions{}); err != nil {
				t.Errorf("the corrected rule does not compile: %v", err)
			}
		})
	}
}

// TestLimitReads: the limits a check reads are found in its compiled rule,
// through the package's aliases and helper rules. Expected values are read
// off the rule text (rules/health.rego, rules/handling.rego) and the
// guide's example rule.
func TestLimitReads(t *testing.T) {
	local := map[string]string{"weight.rego": `# METADATA
# title: W
# description: w
# scope: package
# custom:
#   subjects: [animal]
package welfare.weight

lim := data.limits.local

dropped(w) if w.kg * 100 < lim.weight_drop_pct * 2

# METADATA
# title: Drop
# description: d
# custom:
#   id: local.weight.dropped
#   severity: minor
#   source: facility choice
findings contains f if {
	some w in input.weights
	dropped(w)
	f := {"check": "local.weight.dropped", "subject": input.id, "on": w.on, "message": "m", "evidence": [w.ref]}
}
`}
	sources := append([]checker.Source{{Name: "rules", FS: rules.FS()}}, engUser(local)...)
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	p, err := checker.Compile(context.Background(), lim, sources, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string][]string{}
	for _, c := range p.Checks() {
		got[c.ID] = c.Limits
	}
	tests := []struct {
		check string
		want  []string
	}{
		// health.rego: weight_loss_days and _pct in losses, _significant_pct in loss_severity.
		{"health.weight.loss", []string{"health.weight_loss_days", "health.weight_loss_pct", "health.weight_loss_significant_pct"}},
		// handling.rego: bite_risk per species, unconscious_restraint, accepted_gloves, min_glove_thickness_mm.
		{"handling.glove.inadequate", []string{"handling.accepted_gloves", "handling.min_glove_thickness_mm", "handling.unconscious_restraint[_]", "species[_].bite_risk"}},
		{"handling.bite.not_washed", []string{}},
		{"local.weight.dropped", []string{"local.weight_drop_pct"}},
	}
	for _, tt := range tests {
		if diff := cmp.Diff(tt.want, got[tt.check], cmpopts.EquateEmpty()); diff != "" {
			t.Errorf("%s reads (-want +got):\n%s", tt.check, diff)
		}
	}
}
