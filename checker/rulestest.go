package checker

import (
	"context"
	"fmt"
	"io"
	"sort"
	"strings"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/tester"
)

// testTimeout is the time budget of one Rego test, the same as one
// evaluation's default budget.
const testTimeout = 5 * time.Second

// runTests runs the Rego tests (files ending in _test.rego) of sources
// together with the rules they test, under the same sandbox as NewEngine
// and with limits as data.limits. It writes one PASS, FAIL or SKIP line per
// test to w, in file order, then a summary; verbose adds each test's print
// output and duration. A rule set that does not parse or compile is
// returned as a *RulesError; failing tests are counted, not returned.
func runTests(ctx context.Context, sources []Source, limits map[string]any, w io.Writer, verbose bool) (passed, failed int, err error) {
	modules, _, err := parseSources(sources, true)
	if err != nil {
		return 0, 0, err
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
		return 0, 0, err
	}
	store := limitsStore(limits)
	// print output is shown for failing tests (and all tests when
	// verbose); the engine itself drops print calls.
	// The rules under test are typed as they are for a check.
	schemas, err := typeInputs(modules)
	if err != nil {
		return 0, 0, err
	}
	compiler := newCompiler(sandboxCapabilities()).WithEnablePrintStatements(true).
		WithSchemas(schemas).WithUseTypeCheckAnnotations(true)
	runner := tester.NewRunner().
		SetCompiler(compiler).
		SetStore(store).
		SetModules(modules).
		SetTimeout(testTimeout).
		CapturePrintOutput(true).
		RaiseBuiltinErrors(true)
	ch, err := runner.RunTests(ctx, nil)
	if err != nil {
		// The runner compiles the modules itself; its compile errors come
		// back here unformatted.
		if compiler.Failed() {
			return 0, 0, compileError(compiler.Errors)
		}
		return 0, 0, fmt.Errorf("running rule tests: %w", err)
	}
	var results []*tester.Result
	for r := range ch {
		results = append(results, r)
	}
	if err := ctx.Err(); err != nil {
		return 0, 0, err
	}
	// Results arrive in any order; sort them so the output is stable.
	sort.Slice(results, func(i, j int) bool {
		a, b := results[i], results[j]
		if a.Location.File != b.Location.File {
			return a.Location.File < b.Location.File
		}
		if a.Location.Row != b.Location.Row {
			return a.Location.Row < b.Location.Row
		}
		return a.Name < b.Name
	})
	skipped := 0
	for _, r := range results {
		where := fmt.Sprintf("%s:%d", r.Location.File, r.Location.Row)
		name := strings.TrimPrefix(r.Package, "data.") + "." + r.Name
		status := "PASS"
		switch {
		case r.Skip:
			status = "SKIP"
			skipped++
		case r.Error != nil:
			status = "FAIL"
			failed++
		case r.Fail:
			status = "FAIL"
			failed++
		default:
			passed++
		}
		if verbose {
			fmt.Fprintf(w, "%s %s %s (%s)\n", status, where, name, r.Duration.Round(time.Microsecond))
		} else {
			fmt.Fprintf(w, "%s %s %s\n", status, where, name)
		}
		if r.Error != nil {
			msg := r.Error.Error()
			if strings.Contains(msg, "eval_cancel_error") || strings.Contains(msg, "context deadline exceeded") {
				msg = fmt.Sprintf("the %s time budget ran out", testTimeout)
			}
			fmt.Fprintf(w, "    error: %s\n", msg)
		}
		if len(r.Output) > 0 && (verbose || status == "FAIL") {
			for _, line := range strings.Split(strings.TrimRight(string(r.Output), "\n"), "\n") {
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
