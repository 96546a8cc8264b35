package checker_test

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"slices"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// facilityRule is a committee package judging the facility with one
// findings rule on line 15 whose evidence is the given Rego list.
func facilityRule(evidence string) string {
	return `# METADATA
# title: Committee rules
# description: A committee's own check.
# custom:
#   subjects: [facility]
package welfare.ourcommittee

# METADATA
# title: Committee check
# description: Cites the given rows.
# custom:
#   id: ourcommittee.rows.cited
#   severity: note
#   source: facility choice
findings contains f if {
	f := {"check": "ourcommittee.rows.cited", "subject": input.id, "on": "2026-01-02", "message": "cited", "evidence": ` + evidence + `}
}
`
}

func demoPeriod(t *testing.T) checker.Period {
	t.Helper()
	from, err := records.ParseDay("2026-01-01")
	if err != nil {
		t.Fatal(err)
	}
	to, err := records.ParseDay("2026-01-31")
	if err != nil {
		t.Fatal(err)
	}
	return checker.Period{From: from, To: to}
}

func compileWith(t *testing.T, limitsText []byte, sources ...checker.Source) *checker.Policy {
	t.Helper()
	lim, err := rules.ParseLimits("limits.yaml", limitsText)
	if err != nil {
		t.Fatal(err)
	}
	p, err := checker.Compile(context.Background(), lim, sources, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestEvidenceRefsNameRecordRows: a finding's evidence must name rows of
// the record files the loader read (animals.csv of the demo has 118 lines:
// its header and 117 rows). Any other ref makes the finding malformed,
// positioned at the rule, and the rest of the check still reports.
func TestEvidenceRefsNameRecordRows(t *testing.T) {
	n := bytes.Count(mustRead(t, "animals.csv"), []byte("\n"))
	tests := []struct {
		name, evidence string
		want           string // "" when the finding is kept
	}{
		{"a row of a file read", `["animals.csv:2", "facility.yaml:1"]`, ""},
		{"the last line", fmt.Sprintf(`["animals.csv:%d"]`, n), ""},
		{"beyond the file", fmt.Sprintf(`["animals.csv:%d"]`, n+1), fmt.Sprintf(`field "evidence": "animals.csv:%d" names no record row: animals.csv has %d lines`, n+1, n)},
		{"line zero", `["animals.csv:0"]`, `field "evidence": "animals.csv:0" names no record row: it is not FILE:LINE`},
		{"not a line", `["animals.csv:two"]`, `field "evidence": "animals.csv:two" names no record row: it is not FILE:LINE`},
		{"a file not read", `["notes.txt:1"]`, `field "evidence": "notes.txt:1" names no record row: notes.txt is not a record file that was read`},
		{"outside the folder", `["../../etc/passwd:1"]`, `field "evidence": "../../etc/passwd:1" names no record row: ../../etc/passwd is not a record file that was read`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := compileWith(t, rules.DefaultLimits(), checker.Source{Name: "rules", FS: rules.FS()},
				checker.Source{Name: "ours", FS: fstest.MapFS{"ours.rego": {Data: []byte(facilityRule(tt.evidence))}}})
			res, err := p.Check(context.Background(), demo.FS(), demoPeriod(t), []string{"ourcommittee"})
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, f := range res.Findings {
				if f.Check != checker.RejectedCheck {
					got = append(got, f.Check+" "+f.Message)
				}
			}
			want := []string{"ourcommittee.rows.cited cited"}
			if tt.want != "" {
				want = []string{checker.MalformedCheck + " ours/ours.rego:15: welfare.ourcommittee gave a finding that was not reported: " + tt.want +
					`; the finding: {"check":"ourcommittee.rows.cited","evidence":[` + strings.Trim(tt.evidence, "[]") + `],"message":"cited","on":"2026-01-02","subject":"Birchfall Fur Research Station"}`}
				want[0] = strings.ReplaceAll(want[0], `", "`, `","`)
			}
			if diff := cmp.Diff(want, got); diff != "" {
				t.Errorf("findings (-want +got):\n%s", diff)
			}
			if tt.want != "" && !slices.ContainsFunc(res.Checks, func(c checker.CheckInfo) bool { return c.ID == checker.MalformedCheck }) {
				t.Error("the result's checks do not list " + checker.MalformedCheck)
			}
		})
	}
}

func mustRead(t *testing.T, name string) []byte {
	t.Helper()
	var b bytes.Buffer
	f, err := demo.FS().Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if _, err := b.ReadFrom(f); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// TestRejectedRowsAlwaysListed: the rows the loader rejected (five in the
// demo, testdata/demo/PLANTED.md) are findings of every run, whatever
// --only, leaving the shipped rules out, or a severity override "off" say.
func TestRejectedRowsAlwaysListed(t *testing.T) {
	want := []string{"animals.csv:114", "daily_care.csv:88", "handling.csv:75", "outdoor_work.csv:51", "weather.csv:135"}
	shipped := checker.Source{Name: "rules", FS: rules.FS()}
	ours := checker.Source{Name: "ours", FS: fstest.MapFS{"ours.rego": {Data: []byte(facilityRule(`["animals.csv:2"]`))}}}
	off := bytes.Replace(rules.DefaultLimits(), []byte("\nseverity: {}\n"), []byte("\nseverity: {records.row.rejected: \"off\"}\n"), 1)
	if bytes.Equal(off, rules.DefaultLimits()) {
		t.Fatal("limits.yaml no longer has severity: {}")
	}
	tests := []struct {
		name    string
		limits  []byte
		sources []checker.Source
		only    []string
	}{
		{"all checks", rules.DefaultLimits(), []checker.Source{shipped}, nil},
		{"only another domain", rules.DefaultLimits(), []checker.Source{shipped}, []string{"cold"}},
		{"only a committee's rules", rules.DefaultLimits(), []checker.Source{ours}, nil},
		{"severity off", off, []checker.Source{shipped}, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := compileWith(t, tt.limits, tt.sources...)
			res, err := p.Check(context.Background(), demo.FS(), demoPeriod(t), tt.only)
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, f := range res.Findings {
				if f.Check == checker.RejectedCheck {
					got = append(got, f.Subject)
					if f.Severity != checker.Minor {
						t.Errorf("%s: severity %s, want minor", f.Subject, f.Severity)
					}
				}
			}
			slices.Sort(got)
			if diff := cmp.Diff(want, got); diff != "" {
				t.Errorf("rejected rows among the findings (-want +got):\n%s", diff)
			}
			var loader []string
			for _, pr := range res.Rejected {
				loader = append(loader, string(pr.Row()))
			}
			slices.Sort(loader)
			if diff := cmp.Diff(want, loader); diff != "" {
				t.Errorf("Result.Rejected (-want +got):\n%s", diff)
			}
			if !slices.ContainsFunc(res.Checks, func(c checker.CheckInfo) bool { return c.ID == checker.RejectedCheck }) {
				t.Error("the result's checks do not list " + checker.RejectedCheck)
			}
		})
	}
}

// slowRule is a package whose one findings rule takes a long time on every
// subject (3000³ ≈ 2.7·10^10 iterations).
func slowRule(pkg string) string {
	return strings.Replace(strings.Replace(engHeader, "welfare.sandbox", "welfare."+pkg, 1), "sandbox.probe.fired", pkg+".probe.fired", 1) +
		"findings contains f if {\n\tsome i in numbers.range(1, 3000)\n\tsome j in numbers.range(1, 3000)\n" +
		"\tsome k in numbers.range(1, 3000)\n\ti + j + k < 0\n" +
		"\tf := {\"check\": \"" + pkg + ".probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
}

// squareRule is a package whose findings rule does input.n² steps on a
// subject.
func squareRule(pkg string) string {
	header := strings.Replace(engHeader, "# scope: package\n", "# schemas:\n#   - input: {type: object}\n# scope: package\n", 1)
	return strings.Replace(strings.Replace(header, "welfare.sandbox", "welfare."+pkg, 1), "sandbox.probe.fired", pkg+".probe.fired", 1) +
		"findings contains f if {\n\tsome i in numbers.range(1, input.n)\n\tsome j in numbers.range(1, input.n)\n\ti + j < 0\n" +
		"\tf := {\"check\": \"" + pkg + ".probe.fired\", \"subject\": input.id, \"on\": \"2026-01-01\", \"message\": \"m\", \"evidence\": []}\n}\n"
}

// TestPackageBudget: a package that takes a while on every subject, each
// well within the per-subject budget, runs out of the budget of the whole
// package (its subjects' times added up) part-way through, and the error
// names the package and the subject where it ran out.
func TestPackageBudget(t *testing.T) {
	packageBudgetRunsOut(t, engUser(map[string]string{"square.rego": squareRule("square")}))
}

// packageBudgetRunsOut evaluates src's welfare.square package (and any
// other package of src) on 60 subjects, each sized to take at least 20 ms
// on this machine, against a package budget of 8 of them: the error must
// be welfare.square's budget, whatever else src evaluates with it.
func packageBudgetRunsOut(t *testing.T, src []checker.Source) {
	t.Helper()
	// Find a size that takes at least 20 ms on this machine.
	calib := engNew(t, src, nil, checker.EngineOptions{Workers: 1})
	n, per := 100, time.Duration(0)
	for ; n < 1_000_000; n *= 2 {
		// The fastest of three runs: the first warms the engine up, and a
		// busy machine slows one run, never all three by much.
		per = time.Hour
		for range 3 {
			started := time.Now()
			if _, err := calib.Evaluate(context.Background(), "enclosure", []map[string]any{{"id": "E-00", "n": n}}); err != nil {
				t.Fatal(err)
			}
			per = min(per, time.Since(started))
		}
		if per >= 20*time.Millisecond {
			break
		}
	}
	inputs := make([]map[string]any, 60)
	for i := range inputs {
		inputs[i] = map[string]any{"id": fmt.Sprintf("E-%02d", i+1), "n": n}
	}
	// 60 subjects of about per each against a budget of 8 of them: the
	// budget still runs out when the calibration was slowed by a busy
	// machine (per overestimated several times over).
	budget := (8 * per).Round(time.Millisecond)
	e := engNew(t, src, nil, checker.EngineOptions{Timeout: time.Minute, PackageBudget: budget, Workers: 1})
	_, err := checker.EvaluateRun(context.Background(), e, "enclosure", inputs)
	if !errors.Is(err, checker.ErrTimeBudget) {
		t.Fatalf("error = %v, want one wrapping ErrTimeBudget", err)
	}
	want := "welfare.square: the " + budget.String() + " time budget ran out for the whole package, across its subjects (it ran out at subject E-"
	if !strings.HasPrefix(err.Error(), want) {
		t.Fatalf("error = %q,\nwant it to start with %q", err, want)
	}
	// Which subject it ran out at depends on the machine's load; that it is
	// the package's budget (each subject had a minute of its own) is what
	// the message above proves.
}

// TestTotalBudget: the whole evaluation has its own budget, named with the
// package and subject where it ran out.
func TestTotalBudget(t *testing.T) {
	e := engNew(t, engUser(map[string]string{"slow.rego": slowRule("slow")}), nil,
		checker.EngineOptions{Timeout: 10 * time.Second, TotalBudget: 250 * time.Millisecond, Workers: 1})
	_, err := checker.EvaluateRun(context.Background(), e, "enclosure", []map[string]any{{"id": "E-01"}, {"id": "E-02"}})
	if !errors.Is(err, checker.ErrTimeBudget) {
		t.Fatalf("error = %v, want one wrapping ErrTimeBudget", err)
	}
	want := "welfare.slow: subject E-01: the 250ms time budget ran out for the whole evaluation"
	if !strings.HasPrefix(err.Error(), want) {
		t.Errorf("error = %q,\nwant it to start with %q", err, want)
	}
}

// TestEvaluationStopsOnCancel: Ctrl-C (the context cancelled) stops an
// evaluation of a looping rule within a second, with the per-subject
// budget far away.
func TestEvaluationStopsOnCancel(t *testing.T) {
	e := engNew(t, engUser(map[string]string{"slow.rego": slowRule("slow")}), nil,
		checker.EngineOptions{Timeout: time.Minute, Workers: 2})
	ctx, cancel := context.WithCancel(context.Background())
	time.AfterFunc(200*time.Millisecond, cancel)
	started := time.Now()
	_, err := e.Evaluate(ctx, "enclosure", []map[string]any{{"id": "E-01"}, {"id": "E-02"}, {"id": "E-03"}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("error = %v, want context.Canceled", err)
	}
	if d := time.Since(started); d > 1200*time.Millisecond {
		t.Errorf("stopped %v after the start, %v after Ctrl-C; want within a second", d, d-200*time.Millisecond)
	}
}
