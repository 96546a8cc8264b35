package checker

import (
	"context"
	"fmt"
	"io"
	"regexp"
	"sort"
	"strings"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/storage"
	"github.com/open-policy-agent/opa/v1/tester"
	"github.com/open-policy-agent/opa/v1/topdown"
)

// testTimeout is the time budget of one Rego test, the same as one
// evaluation's default budget.
const testTimeout = 5 * time.Second

// RuleTest is the outcome of one Rego test.
type RuleTest struct {
	Name   string // welfare.care_test.test_unobserved_day_is_minor
	File   string
	Row    int
	Status string // PASS, FAIL or SKIP
	Error  string // why it could not run to the end (FAIL)
	Output string // its print output
	// Produced says, for a test that failed (not one that errored), the
	// expression of the test that did not hold, as FILE:ROW: EXPR, and
	// the values of the test's variables there, as NAME = VALUE: what
	// the rule under test produced.
	Produced []string
	Duration time.Duration
}

// ruleTests runs the Rego tests (files ending in _test.rego) of sources
// together with the rules they test, under the same sandbox and input
// schemas as newEngine and with limits as data.limits, and returns one
// result per test in file order. A rule set that does not parse or compile
// is returned as a *RulesError; failing tests are results, not errors.
func ruleTests(ctx context.Context, sources []Source, limits map[string]any) ([]RuleTest, error) {
	modules, _, err := parseSources(sources, true)
	if err != nil {
		return nil, err
	}
	// Bad METADATA in the rules under test is reported here too, so a
	// committee editing rules hears of it before the next inspection.
	rulesOnly := map[string]*ast.Module{}
	for name, m := range modules {
		if !strings.HasSuffix(name, "_test.rego") {
			rulesOnly[name] = m
		}
	}
	if _, _, err := readMetadata(rulesOnly); err != nil {
		return nil, err
	}
	store := limitsStore(limits)
	// print output is shown for failing tests (and all tests when
	// verbose); the engine itself drops print calls.
	// The rules under test are typed as they are for a check.
	schemas, err := typeInputs(modules)
	if err != nil {
		return nil, err
	}
	raw, err := runTester(ctx, modules, schemas, store, "")
	if err != nil {
		return nil, err
	}
	results := make([]RuleTest, 0, len(raw))
	for _, r := range raw {
		t := RuleTest{
			Name: strings.TrimPrefix(r.Package, "data.") + "." + r.Name,
			File: r.Location.File, Row: r.Location.Row,
			Status: "PASS", Output: string(r.Output), Duration: r.Duration,
		}
		switch {
		case r.Skip:
			t.Status = "SKIP"
		case r.Error != nil:
			t.Status = "FAIL"
			t.Error = r.Error.Error()
			if strings.Contains(t.Error, "eval_cancel_error") || strings.Contains(t.Error, "context deadline exceeded") {
				t.Error = fmt.Sprintf("the %s time budget ran out", testTimeout)
			}
		case r.Fail:
			t.Status = "FAIL"
		}
		results = append(results, t)
	}
	if err := explainFailures(ctx, modules, schemas, store, results); err != nil {
		return nil, err
	}
	// Results arrive in any order; sort them so the output is stable.
	sort.Slice(results, func(i, j int) bool {
		a, b := results[i], results[j]
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Row != b.Row {
			return a.Row < b.Row
		}
		return a.Name < b.Name
	})
	return results, nil
}

// runTests runs the tests as ruleTests does and writes one PASS, FAIL or
// SKIP line per test to w, in file order, then a summary; verbose adds each
// test's print output and duration.
func runTests(ctx context.Context, sources []Source, limits map[string]any, w io.Writer, verbose bool) (passed, failed int, err error) {
	results, err := ruleTests(ctx, sources, limits)
	if err != nil {
		return 0, 0, err
	}
	skipped := 0
	for _, r := range results {
		where := fmt.Sprintf("%s:%d", r.File, r.Row)
		switch r.Status {
		case "SKIP":
			skipped++
		case "FAIL":
			failed++
		default:
			passed++
		}
		if verbose {
			fmt.Fprintf(w, "%s %s %s (%s)\n", r.Status, where, r.Name, r.Duration.Round(time.Microsecond))
		} else {
			fmt.Fprintf(w, "%s %s %s\n", r.Status, where, r.Name)
		}
		if len(r.Produced) > 0 {
			fmt.Fprintf(w, "    did not hold: %s\n", r.Produced[0])
			for _, v := range r.Produced[1:] {
				fmt.Fprintf(w, "      %s\n", v)
			}
		}
		if r.Error != "" {
			fmt.Fprintf(w, "    error: %s\n", r.Error)
		}
		if len(r.Output) > 0 && (verbose || r.Status == "FAIL") {
			for _, line := range strings.Split(strings.TrimRight(r.Output, "\n"), "\n") {
				fmt.Fprintf(w, "    %s\n", line)
			}
		}
	}
	if len(results) == 0 {
		fmt.Fprintln(w, "no rule tests found (tests are test_ rules in files ending in _test.rego)")
	}
	fmt.Fprintf(w, "%d passed, %d failed", passed, failed)
	if skipped > 0 {
		fmt.Fprintf(w, ", %d skipped", skipped)
	}
	fmt.Fprintln(w)
	return passed, failed, nil
}

// runTester runs the tests of modules (those matching filter, a regular
// expression over package.name, when not empty), with tracing when a
// filter is given: a second run explains failures, the first stays fast.
func runTester(ctx context.Context, modules map[string]*ast.Module, schemas *ast.SchemaSet, store storage.Store, filter string) ([]*tester.Result, error) {
	compiler := newCompiler(sandboxCapabilities()).WithEnablePrintStatements(true).
		WithSchemas(schemas).WithUseTypeCheckAnnotations(true)
	runner := tester.NewRunner().
		SetCompiler(compiler).
		SetStore(store).
		SetModules(modules).
		SetTimeout(testTimeout).
		CapturePrintOutput(true).
		RaiseBuiltinErrors(true)
	if filter != "" {
		runner = runner.Filter(filter).EnableTracing(true)
	}
	ch, err := runner.RunTests(ctx, nil)
	if err != nil {
		// The runner compiles the modules itself; its compile errors come
		// back here unformatted.
		if compiler.Failed() {
			return nil, compileError(compiler.Errors)
		}
		return nil, fmt.Errorf("running rule tests: %w", err)
	}
	var raw []*tester.Result
	for r := range ch {
		raw = append(raw, r)
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return raw, nil
}

// explainFailures runs the failed tests again with tracing and fills their
// Produced lines from the last expression of the test's own file that did
// not hold.
func explainFailures(ctx context.Context, modules map[string]*ast.Module, schemas *ast.SchemaSet, store storage.Store, results []RuleTest) error {
	var names []string
	index := map[string]int{}
	for i, r := range results {
		if r.Status == "FAIL" && r.Error == "" {
			names = append(names, regexp.QuoteMeta(r.Name))
			index[r.Name] = i
		}
	}
	if len(names) == 0 {
		return nil
	}
	raw, err := runTester(ctx, modules, schemas, store, `(^|\.)(`+strings.Join(names, "|")+`)$`)
	if err != nil {
		return err
	}
	for _, r := range raw {
		i, ok := index[strings.TrimPrefix(r.Package, "data.")+"."+r.Name]
		if !ok {
			continue
		}
		results[i].Produced = failedAt(r.Trace, r.Location.File)
	}
	return nil
}

// failedAt reads a test's trace: the last failing expression in file, and
// the test's own variables bound there.
func failedAt(trace []*topdown.Event, file string) []string {
	for k := len(trace) - 1; k >= 0; k-- {
		e := trace[k]
		if e.Op != topdown.FailOp || e.Location == nil || e.Location.File != file {
			continue
		}
		if _, isExpr := e.Node.(*ast.Expr); !isExpr {
			continue
		}
		out := []string{fmt.Sprintf("%s:%d: %s", e.Location.File, e.Location.Row, strings.TrimSpace(string(e.Location.Text)))}
		var vars []string
		if e.Locals != nil {
			e.Locals.Iter(func(k, v ast.Value) bool {
				name := k.String()
				if md, ok := e.LocalMetadata[ast.Var(name)]; ok {
					name = string(md.Name)
				}
				if strings.HasPrefix(name, "__") || strings.HasPrefix(name, "$") {
					return false
				}
				vars = append(vars, fmt.Sprintf("%s = %s", name, shorten(v.String(), 600)))
				return false
			})
		}
		sort.Strings(vars)
		return append(out, vars...)
	}
	return nil
}
