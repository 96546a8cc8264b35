package checker_test

import (
	"context"
	"errors"
	"fmt"
	"os"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records"
)

// engBasic is the engine test rule set in testdata/policies/basic.
func engBasic() []checker.Source {
	return []checker.Source{{Name: "rules", FS: os.DirFS("testdata/policies/basic")}}
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
			name: "check id in two packages",
			files: map[string]string{
				"a.rego": engHeader + "findings contains \"x\" if false\n",
				"b.rego": strings.Replace(engHeader, "welfare.sandbox", "welfare.other", 1) + "findings contains \"x\" if false\n",
			},
			want: []string{"user/b.rego:9:1: check sandbox.probe.fired is already defined in package welfare.sandbox (user/a.rego)"},
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

func TestEvaluateBadFindings(t *testing.T) {
	tests := []struct {
		name, object, want string
	}{
		{"missing on", `{"check": "sandbox.probe.fired", "subject": "E-01", "message": "m", "evidence": []}`,
			`welfare.sandbox: subject E-01: finding {"check":"sandbox.probe.fired","evidence":[],"message":"m","subject":"E-01"}: missing "on"`},
		{"bad date", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-02-30", "message": "m", "evidence": []}`,
			`welfare.sandbox: subject E-01: finding {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-02-30","subject":"E-01"}: on: "2026-02-30" is not a date (YYYY-MM-DD)`},
		{"check without metadata", `{"check": "sandbox.probe.other", "subject": "E-01", "on": "2026-01-01", "message": "m", "evidence": []}`,
			`welfare.sandbox: subject E-01: finding {"check":"sandbox.probe.other","evidence":[],"message":"m","on":"2026-01-01","subject":"E-01"}: check "sandbox.probe.other" has no METADATA (title, description, custom.id, custom.severity, custom.source)`},
		{"misspelt field", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-01", "untill": "2026-01-02", "message": "m", "evidence": []}`,
			`welfare.sandbox: subject E-01: finding {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","subject":"E-01","untill":"2026-01-02"}: unknown field "untill" (fields: check, subject, on, until, message, evidence, severity)`},
		{"bad own severity", `{"check": "sandbox.probe.fired", "subject": "E-01", "on": "2026-01-01", "message": "m", "evidence": [], "severity": "high"}`,
			`welfare.sandbox: subject E-01: finding {"check":"sandbox.probe.fired","evidence":[],"message":"m","on":"2026-01-01","severity":"high","subject":"E-01"}: severity "high" is not significant, minor or note`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			src := engHeader + "findings contains " + tt.object + "\n"
			e := engNew(t, engUser(map[string]string{"p.rego": src}), nil, checker.EngineOptions{})
			_, err := e.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-01"}})
			if err == nil {
				t.Fatal("Evaluate accepted a bad finding")
			}
			if got := err.Error(); got != tt.want {
				t.Errorf("error:\n got %s\nwant %s", got, tt.want)
			}
		})
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
		},
		{
			Check: "care.observation.missed", Domain: "care", Subject: "E-01",
			On: engDay("2026-01-05"), Severity: checker.Minor,
			Message:  "E-01 was not observed",
			Evidence: []records.Ref{"daily_care.csv:13"},
			Title:    "Observation missed",
			Source:   "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112",
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

func TestEngineChecksAndKinds(t *testing.T) {
	e := engNew(t, engBasic(), engLimits(nil), checker.EngineOptions{})
	want := []checker.CheckInfo{
		{
			ID: "care.feeding.missed", Domain: "care", Title: "Feeding missed",
			Description: "An occupied enclosure was not fed; significant from the second unfed day.",
			Severity:    checker.Minor, Source: "common practice", Package: "welfare.care",
			File: "rules/care.rego", Needs: []string{"daily_care.csv", "animals.csv"},
			Subjects: []string{"enclosure"},
		},
		{
			ID: "care.observation.missed", Domain: "care", Title: "Observation missed",
			Description: "An occupied enclosure had no observation round that day.",
			Severity:    checker.Minor,
			Source:      "Guide for the Care and Use of Laboratory Animals, 8th ed. (2011), p. 112",
			Package:     "welfare.care", File: "rules/care.rego", Needs: []string{"daily_care.csv"},
			Runs: true, Subjects: []string{"enclosure"},
		},
		{
			ID: "care.water.unavailable", Domain: "care", Title: "Water unavailable",
			Description: "A round found water empty or frozen and it was not restored.",
			Severity:    checker.Significant, Source: "OLAW, inoperative watering is a significant deficiency",
			Package: "welfare.care", File: "rules/care.rego", Subjects: []string{"enclosure"},
		},
		{
			ID: "cold.frostbite.risk", Domain: "cold", Title: "Frostbite risk",
			Description: "Minimum wind chill at or below the frostbite limit.",
			Severity:    checker.Note, Source: "Environment and Climate Change Canada wind chill hazard bands",
			Package: "welfare.cold", File: "rules/cold.rego", Runs: true,
			Subjects: []string{"site", "enclosure"},
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
# description: Enclosure cleaning.
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

func TestEngineLimitsFromYAMLMaps(t *testing.T) {
	// YAML decoders may give map[any]any for tables with non-string keys;
	// the rules must still see them as data.limits objects.
	limits := map[string]any{"cold": map[any]any{"frostbite_wind_chill_c": -28, 16: "km/h column"}}
	e := engNew(t, engBasic(), limits, checker.EngineOptions{})
	site := map[string]any{"id": "S-1", "runs": []any{
		map[string]any{"from": "2026-01-10", "to": "2026-01-10", "min_wind_chill_c": -30, "refs": []any{}},
	}}
	fs, err := e.Evaluate(context.Background(), "site", []map[string]any{site})
	if err != nil {
		t.Fatal(err)
	}
	if len(fs) != 1 || fs[0].Check != "cold.frostbite.risk" {
		t.Errorf("findings = %+v, want one cold.frostbite.risk", fs)
	}
}
