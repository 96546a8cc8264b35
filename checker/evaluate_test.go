package checker_test

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"
	"welfare/checker"
	"welfare/records"

	"github.com/google/go-cmp/cmp"
)

func TestEvaluateTimeBudget(t *testing.T) {
	tests := []struct {
		name, body string
	}{
		// A range of 10^11 numbers cannot be built in 200 ms on any
		// machine: the built-in itself must notice the budget.
		{"huge built-in", "\tcount([x | some x in numbers.range(1, 100000000000)]) > 0\n"},
		// 3000³ ≈ 2.7·10^10 iterations: the evaluator's own loop must
		// notice the budget.
		{"nested loops", "\tsome i in numbers.range(1, 3000)\n\tsome j in numbers.range(1, 3000)\n" +
			"\tsome k in numbers.range(1, 3000)\n\ti + j + k < 0\n"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			src := engHeader + "findings contains f if {\n" + tt.body +
				"\tf := {\"check\": \"sandbox.probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
			e := engNew(t, engUser(map[string]string{"slow.rego": src}), nil, checker.EngineOptions{Timeout: 200 * time.Millisecond, Workers: 2})
			inputs := []map[string]any{{"id": "E-07"}, {"id": "E-08"}, {"id": "E-09"}}
			_, err := e.Evaluate(context.Background(), "enclosure", inputs)
			if !errors.Is(err, checker.ErrTimeBudget) {
				t.Fatalf("error = %v, want one wrapping ErrTimeBudget", err)
			}
			// The first subject in input order is named, whichever
			// worker ran out first.
			want := "welfare.sandbox: subject E-07: the 200ms time budget ran out"
			if !strings.HasPrefix(err.Error(), want) {
				t.Errorf("error = %q, want it to start with %q", err, want)
			}
		})
	}
}

// TestEvaluateBadFindings: a finding a rule got wrong does not stop the
// check: it becomes a rules.finding.malformed finding (significant) naming
// the rule's file and row and the offending field, and the package's
// other findings still report. The findings rule under test is on line 16
// of p.rego, a good one on line 18.
func TestEvaluateBadFindings(t *testing.T) {
	const both = "user/p.rego:16: welfare.sandbox" // the rule whose literal fields agree
	tests := []struct {
		name, object, want string
	}{
		{"missing on", `{"check": "sandbox.probe.fired", "subject": "E-01", "message": "m", "evidence": []}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: field "on": missing; the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","subject":"E-01"}`},
		{"bad date", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-02-30", "message": "m", "evidence": []}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: field "on": "2026-02-30" is not a date (YYYY-MM-DD); the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-02-30","subject":"E-01"}`},
		{"wrong type", `{"check": "sandbox.probe.fired", "subject": 7, "on": "2026-01-01", "message": "m", "evidence": []}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: field "subject": must be a non-empty string, not 7; the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","subject":7}`},
		{"evidence not strings", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-01", "message": "m", "evidence": [12]}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: field "evidence": must be a list of "FILE:LINE" strings, not one holding 12; the finding: {"check":"sandbox.probe.fired","evidence":[12],"message":"m","on":"2026-01-01","subject":"E-01"}`},
		// A literal id without METADATA does not compile (TestNewEngineRulesErrors);
		// a computed one is caught when the finding is decoded, and of the
		// package's findings rules the one whose literal fields agree is named.
		{"check without metadata", `{"check": concat(".", ["sandbox", "probe", "other"]), "subject": "E-01", "on": "2026-01-01", "message": "m", "evidence": []}`,
			both + ` gave a finding that was not reported: field "check": "sandbox.probe.other" has no METADATA (title, description, custom.id, custom.severity, custom.source); the finding: {"check":"sandbox.probe.other","evidence":[],"message":"m","on":"2026-01-01","subject":"E-01"}`},
		{"misspelt field", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-01", "untill": "2026-01-02", "message": "m", "evidence": []}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: unknown field "untill" (fields: check, subject, on, until, message, evidence, severity, severity_reason); the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","subject":"E-01","untill":"2026-01-02"}`},
		{"bad own severity", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-01", "message": "m", "evidence": [], "severity": "high"}`,
			`user/p.rego:16: welfare.sandbox gave a finding that was not reported: field "severity": "high" is not significant, minor or note; the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","severity":"high","subject":"E-01"}`},
	}
	good := `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-02", "message": "good", "evidence": []}`
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			src := engHeader + "findings contains " + tt.object + "\n\nfindings contains " + good + "\n"
			e := engNew(t, engUser(map[string]string{"p.rego": src}), nil, checker.EngineOptions{})
			fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-01"}})
			if err != nil {
				t.Fatalf("Evaluate stopped on a bad finding: %v", err)
			}
			var got []string
			for _, f := range fs {
				got = append(got, fmt.Sprintf("%s %s %s %s", f.Check, f.Severity, f.Subject, f.Message))
			}
			want := []string{
				"rules.finding.malformed significant E-01 " + tt.want,
				"sandbox.probe.fired minor E-01 good",
			}
			if diff := cmp.Diff(want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
		})
	}
}

// TestMalformedNamesEveryRuleThatCouldHaveMadeIt: when two findings rules
// of a check could have made the bad finding, both are named.
func TestMalformedNamesEveryRuleThatCouldHaveMadeIt(t *testing.T) {
	obj := `{"check": "sandbox.probe.fired", "subject": input.id, "on": input.on, "message": "m", "evidence": []}`
	src := engHeader + "findings contains " + obj + " if input.a\n\nfindings contains " + obj + " if input.b\n"
	src = strings.Replace(src, "# scope: package\n", "# schemas:\n#   - input: {type: object}\n# scope: package\n", 1)
	e := engNew(t, engUser(map[string]string{"p.rego": src}), nil, checker.EngineOptions{})
	fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-01", "a": true, "on": "2026-1-5"}})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{`user/p.rego:18, user/p.rego:20 (one of these findings rules): welfare.sandbox gave a finding that was not reported: field "on": "2026-1-5" is not a date (YYYY-MM-DD); the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-1-5","subject":"E-01"}`}
	var got []string
	for _, f := range fs {
		got = append(got, f.Message)
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
}

// TestEvaluateCheckOfAnotherPackage: a computed check id that belongs to
// another package is a malformed finding of the package that made it.
func TestEvaluateCheckOfAnotherPackage(t *testing.T) {
	other := strings.Replace(strings.Replace(engHeader, "welfare.sandbox", "welfare.other", 1), "sandbox.probe.fired", "other.probe.fired", 1) +
		"findings contains {\"check\": concat(\".\", [\"sandbox\", \"probe\", \"fired\"]), \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n"
	sandbox := engHeader + "findings contains {\"check\": \"sandbox.probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"ok\", \"evidence\": []}\n"
	e := engNew(t, engUser(map[string]string{"a.rego": sandbox, "b.rego": other}), nil, checker.EngineOptions{})
	fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-02"}})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, f := range fs {
		got = append(got, f.Check+" "+f.Message)
	}
	want := []string{
		`rules.finding.malformed user/b.rego:16: welfare.other gave a finding that was not reported: field "check": "sandbox.probe.fired" belongs to package welfare.sandbox, not welfare.other; the finding: {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","subject":"E-02"}`,
		"sandbox.probe.fired ok",
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
}

func TestEvaluateSeverityPrecedence(t *testing.T) {
	// One enclosure, fed but unobserved on 2026-01-05, and unfed for the
	// second day on 2026-01-06 (the policy marks that significant itself).
	input := map[string]any{"id": "E-01", "days": []any{
		map[string]any{"day": "2026-01-05", "occupied": true, "observed": false, "fed": true, "unfed_run": 0, "refs": []any{"daily_care.csv:5"}},
		map[string]any{"day": "2026-01-06", "occupied": true, "observed": true, "fed": false, "unfed_run": 2, "refs": []any{"daily_care.csv:6"}},
	}}
	type got struct {
		Check    string
		Severity checker.Severity
	}
	tests := []struct {
		name     string
		severity map[string]any
		want     []got
	}{
		{"metadata default and the finding's own", nil, []got{
			{"care.feeding.missed", checker.Significant}, // the finding's own severity beats the default minor
			{"care.observation.missed", checker.Minor},   // metadata default
		}},
		{"limits override beats the finding's own", map[string]any{"care.feeding.missed": "note"}, []got{
			{"care.feeding.missed", checker.Note},
			{"care.observation.missed", checker.Minor},
		}},
		{"limits override beats the default", map[string]any{"care.observation.missed": "significant"}, []got{
			{"care.feeding.missed", checker.Significant},
			{"care.observation.missed", checker.Significant},
		}},
		{"off drops the check", map[string]any{"care.observation.missed": "off"}, []got{
			{"care.feeding.missed", checker.Significant},
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e := engNew(t, engBasic(), engLimits(tt.severity), checker.EngineOptions{})
			fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{input})
			if err != nil {
				t.Fatal(err)
			}
			var g []got
			for _, f := range fs {
				g = append(g, got{f.Check, f.Severity})
			}
			if diff := cmp.Diff(tt.want, g); diff != "" {
				t.Errorf("severities (-want +got):\n%s", diff)
			}
		})
	}
}

func TestNewEngineRejectsBadSeverityOverride(t *testing.T) {
	_, err := checker.NewEngine(context.Background(), engBasic(), engLimits(map[string]any{"care.feeding.missed": "urgent"}), checker.EngineOptions{})
	want := "limits: severity.care.feeding.missed: urgent is not significant, minor, note or off"
	if err == nil || err.Error() != want {
		t.Errorf("error = %v, want %q", err, want)
	}
}

func TestEvaluateRunsAndEvidence(t *testing.T) {
	e := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{})
	// 2026-01-01, -02, -03 are consecutive calendar days and -05 is not
	// next to -03 (Gregorian calendar), so two runs.
	in := engDays("E-01", "2026-01-01", "2026-01-02", "2026-01-03", "2026-01-05")
	fs, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{in})
	if err != nil {
		t.Fatal(err)
	}
	want := []checker.Finding{
		{
			Check: "care.observation.missed", Domain: "care", Subject: "E-01",
			On: engDay("2026-01-01"), Until: engDay("2026-01-03"), Severity: checker.Minor,
			Message:  "E-01 was not observed",
			Evidence: []records.Ref{"daily_care.csv:10", "daily_care.csv:11", "daily_care.csv:12"},
			Title:    "Observation missed",
			Source:   "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112",
			Local:    true, // test rules, not the shipped files
		},
		{
			Check: "care.observation.missed", Domain: "care", Subject: "E-01",
			On: engDay("2026-01-05"), Severity: checker.Minor,
			Message:  "E-01 was not observed",
			Evidence: []records.Ref{"daily_care.csv:13"},
			Title:    "Observation missed",
			Source:   "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112",
			Local:    true, // test rules, not the shipped files
		},
	}
	if diff := cmp.Diff(want, fs); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}

	// Runs the policy reports itself ("until") join runs of later
	// findings that touch or overlap them, and evidence is merged in line
	// order (9 before 10) without repeats.
	site := map[string]any{"id": "S-1", "runs": []any{
		map[string]any{"from": "2026-01-10", "to": "2026-01-12", "min_wind_chill_c": -31, "refs": []any{"weather.csv:10", "weather.csv:9"}},
		map[string]any{"from": "2026-01-13", "to": "2026-01-13", "min_wind_chill_c": -29, "refs": []any{"weather.csv:10", "weather.csv:12"}},
		map[string]any{"from": "2026-01-20", "to": "2026-01-20", "min_wind_chill_c": -20, "refs": []any{"weather.csv:20"}},
	}}
	fs, err = e.Evaluate(context.Background(), "site", []map[string]any{site})
	if err != nil {
		t.Fatal(err)
	}
	wantSite := []checker.Finding{{
		Check: "cold.frostbite.risk", Domain: "cold", Subject: "S-1",
		On: engDay("2026-01-10"), Until: engDay("2026-01-13"), Severity: checker.Note,
		Message:  "wind chill down to -31",
		Evidence: []records.Ref{"weather.csv:9", "weather.csv:10", "weather.csv:12"},
		Title:    "Frostbite risk",
		Source:   "Environment and Climate Change Canada wind chill hazard bands",
		Local:    true,
	}}
	if diff := cmp.Diff(wantSite, fs); diff != "" {
		t.Errorf("site findings (-want +got):\n%s", diff)
	}
}

func TestEvaluateOrderAndParallel(t *testing.T) {
	var inputs []map[string]any
	// Subjects given in reverse order, each with findings from two checks.
	for i := 40; i >= 1; i-- {
		in := engDays(fmt.Sprintf("E-%02d", i), "2026-01-02", "2026-01-04")
		in["days"].([]any)[1].(map[string]any)["fed"] = false
		in["days"].([]any)[1].(map[string]any)["unfed_run"] = 1
		in["days"].([]any)[0].(map[string]any)["water"] = "frozen"
		inputs = append(inputs, in)
	}
	serial := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{Workers: 1})
	parallel := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{Workers: 8})
	want, err := serial.Evaluate(context.Background(), "enclosure", inputs)
	if err != nil {
		t.Fatal(err)
	}
	// 40 subjects × (2 observation days + 1 feeding + 1 water).
	if len(want) != 160 {
		t.Fatalf("got %d findings, want 160", len(want))
	}
	for i := 1; i < len(want); i++ {
		a, b := want[i-1], want[i]
		ka := []string{a.Domain, a.Check, a.Subject, a.On.String()}
		kb := []string{b.Domain, b.Check, b.Subject, b.On.String()}
		if strings.Join(ka, "|") > strings.Join(kb, "|") {
			t.Fatalf("findings %d and %d out of order: %v then %v", i-1, i, ka, kb)
		}
	}
	if want[0].Check != "care.feeding.missed" || want[0].Subject != "E-01" {
		t.Errorf("first finding = %s %s, want care.feeding.missed E-01", want[0].Check, want[0].Subject)
	}
	for run := range 3 {
		got, err := parallel.Evaluate(context.Background(), "enclosure", inputs)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(want, got); diff != "" {
			t.Errorf("run %d: 8 workers differ from 1 (-want +got):\n%s", run, diff)
		}
	}
}

func TestEvaluateConcurrentCalls(t *testing.T) {
	e := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{Workers: 2})
	in := []map[string]any{engDays("E-01", "2026-01-01", "2026-01-02")}
	want, err := e.Evaluate(context.Background(), "enclosure", in)
	if err != nil {
		t.Fatal(err)
	}
	errs := make(chan error, 8)
	for range 8 {
		go func() {
			got, err := e.Evaluate(context.Background(), "enclosure", in)
			if err == nil && !cmp.Equal(want, got) {
				err = fmt.Errorf("concurrent call differs: %s", cmp.Diff(want, got))
			}
			errs <- err
		}()
	}
	for range 8 {
		if err := <-errs; err != nil {
			t.Error(err)
		}
	}
}

// quickRule is a package with one findings rule that gives every subject
// a finding at once.
func quickRule(pkg string) string {
	return strings.Replace(strings.Replace(engHeader, "welfare.sandbox", "welfare."+pkg, 1), "sandbox.probe.fired", pkg+".probe.fired", 1) +
		"findings contains f if {\n" +
		"\tf := {\"check\": \"" + pkg + ".probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
}

// failingRule is a package whose findings rule fails on every subject (a
// built-in error, an error under strict built-in errors).
func failingRule(pkg string) string {
	return strings.Replace(strings.Replace(engHeader, "welfare.sandbox", "welfare."+pkg, 1), "sandbox.probe.fired", pkg+".probe.fired", 1) +
		"findings contains f if {\n\tto_number(\"not a number\") > 0\n" +
		"\tf := {\"check\": \"" + pkg + ".probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
}

// TestOneQueryPerKindNamesThePackage: the packages of a kind are evaluated
// in one query per subject, yet a time-out or an error is the package's
// own, named as when each package had an evaluation of its own, whether it
// comes first (before any mark between packages) or after others.
func TestOneQueryPerKindNamesThePackage(t *testing.T) {
	tests := []struct {
		name  string
		files map[string]string
		want  string
	}{
		{"slow first", map[string]string{"a.rego": slowRule("slow"), "b.rego": quickRule("quick")},
			"welfare.slow: subject E-01: the 200ms time budget ran out"},
		{"slow last", map[string]string{"a.rego": quickRule("quick"), "b.rego": quickRule("quick2"), "c.rego": slowRule("slow")},
			"welfare.slow: subject E-01: the 200ms time budget ran out"},
		// A rule's own print call (internal.print, which the compiler
		// leaves in) is not a mark between packages, even at the column
		// of the query's first mark (after "f0 = data.welfare.slow.findings; ").
		{"slow, printing", map[string]string{"a.rego": strings.Replace(slowRule("slow"), "findings contains f if {\n",
			"findings contains f if {\n"+strings.Repeat(" ", len("f0 = data.welfare.slow.findings; "))+"internal.print([{\"1\"}])\n", 1),
			"b.rego": quickRule("quick"), "c.rego": quickRule("quick2")},
			"welfare.slow: subject E-01: the 200ms time budget ran out"},
		{"failing first", map[string]string{"a.rego": failingRule("bad"), "b.rego": quickRule("quick")},
			"welfare.bad: subject E-01: "},
		{"failing between", map[string]string{"a.rego": quickRule("quick"), "b.rego": failingRule("bad"), "c.rego": quickRule("quick2")},
			"welfare.bad: subject E-01: "},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e := engNew(t, engUser(tt.files), nil, checker.EngineOptions{Timeout: 200 * time.Millisecond, Workers: 2})
			_, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-01"}, {"id": "E-02"}})
			if err == nil || !strings.HasPrefix(err.Error(), tt.want) {
				t.Fatalf("error = %v, want it to start with %q", err, tt.want)
			}
			if strings.Contains(tt.name, "slow") != errors.Is(err, checker.ErrTimeBudget) {
				t.Errorf("error = %v: wraps ErrTimeBudget %v", err, errors.Is(err, checker.ErrTimeBudget))
			}
		})
	}
}

// TestOneQueryPerKindFindings: the findings of the packages evaluated in
// one query are every package's, each checked against its own package (a
// check id of another package is a malformed finding of the package that
// gave it).
func TestOneQueryPerKindFindings(t *testing.T) {
	stray := strings.Replace(quickRule("stray"), `"check": "stray.probe.fired"`, `"check": concat(".", ["quick", "probe.fired"])`, 1)
	e := engNew(t, engUser(map[string]string{"a.rego": quickRule("quick"), "b.rego": stray, "c.rego": quickRule("quick2")}), nil,
		checker.EngineOptions{})
	got, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-02"}, {"id": "E-01"}})
	if err != nil {
		t.Fatal(err)
	}
	var rows []string
	for _, f := range got {
		rows = append(rows, f.Check+" "+f.Subject)
		if f.Check == checker.MalformedCheck && !strings.Contains(f.Message, "welfare.stray gave a finding") {
			t.Errorf("malformed finding not of welfare.stray: %s", f.Message)
		}
	}
	want := []string{"quick.probe.fired E-01", "quick.probe.fired E-02", "quick2.probe.fired E-01", "quick2.probe.fired E-02",
		checker.MalformedCheck + " E-01", checker.MalformedCheck + " E-02"}
	if diff := cmp.Diff(want, rows); diff != "" {
		t.Errorf("findings (-want +got):\n%s", diff)
	}
}

// TestOneQueryPerKindPackageBudget: the budget of a package evaluated in
// one query with the other packages of its kind is still its own: the
// time of its part of each subject's evaluation, added up, runs out and
// the error names it, not the package evaluated with it.
func TestOneQueryPerKindPackageBudget(t *testing.T) {
	packageBudgetRunsOut(t, engUser(map[string]string{"a.rego": quickRule("quick"), "b.rego": squareRule("square")}))
}
