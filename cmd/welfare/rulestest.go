package main

import (
	"context"
	"fmt"
	"io"
	"strings"
	"time"

	"welfare/checker"
)

// testRules runs the rule tests of the sources in force and reports them
// by source: a committee member running "welfare rules test our-rules"
// sees their own tests (failures of any source are always shown); -v
// shows every test. It returns errFindings when a test fails.
func testRules(ctx context.Context, policy *checker.Policy, sources []checker.Source, dirs []string, shipped, verbose bool, w io.Writer) error {
	results, err := policy.RuleTests(ctx)
	if err != nil {
		return err
	}
	// The sources whose tests are shown and counted: the folders named, or
	// the shipped rules when none is. The shipped rules, when in force,
	// are sources[0] (ruleSources).
	shown := sources
	if len(dirs) > 0 && len(sources) > len(dirs) {
		shown = sources[len(sources)-len(dirs):]
	}
	sourceOf := func(file string) int {
		for i, s := range sources {
			if strings.HasPrefix(file, s.Name+"/") {
				return i
			}
		}
		return -1
	}
	isShown := func(i int) bool {
		for _, s := range shown {
			if i >= 0 && sources[i].Name == s.Name {
				return true
			}
		}
		return false
	}
	passed, failed := make([]int, len(sources)), make([]int, len(sources))
	hiddenFailed := 0
	for _, r := range results {
		src := sourceOf(r.File)
		if src >= 0 {
			switch r.Status {
			case "PASS":
				passed[src]++
			case "FAIL":
				failed[src]++
			}
		}
		if r.Status == "FAIL" && !isShown(src) {
			hiddenFailed++
		}
		if !verbose && r.Status != "FAIL" {
			continue
		}
		line := fmt.Sprintf("%s %s:%d %s", r.Status, r.File, r.Row, r.Name)
		if verbose {
			line += fmt.Sprintf(" (%s)", r.Duration.Round(time.Microsecond))
		}
		fmt.Fprintln(w, line)
		if len(r.Produced) > 0 {
			fmt.Fprintf(w, "    did not hold: %s\n", r.Produced[0])
			for _, v := range r.Produced[1:] {
				fmt.Fprintf(w, "      %s\n", v)
			}
		}
		if r.Error != "" {
			fmt.Fprintf(w, "    error: %s\n", r.Error)
		}
		if out := strings.TrimRight(r.Output, "\n"); out != "" && (verbose || r.Status == "FAIL") {
			for _, l := range strings.Split(out, "\n") {
				fmt.Fprintf(w, "    print: %s\n", l)
			}
		}
	}
	anyFailed := hiddenFailed > 0
	for i, s := range sources {
		if !isShown(i) && !verbose {
			continue
		}
		name := s.Name
		if shipped && i == 0 {
			name = "the shipped rules"
		}
		total := passed[i] + failed[i]
		switch {
		case total == 0:
			fmt.Fprintf(w, "Rule tests in %s: none (a test is a rule named test_… in a file ending in _test.rego)\n", name)
		case failed[i] == 0:
			fmt.Fprintf(w, "Rule tests in %s: %d of %d passed\n", name, passed[i], total)
		default:
			anyFailed = true
			fmt.Fprintf(w, "Rule tests in %s: %d of %d passed, %d failed\n", name, passed[i], total, failed[i])
		}
	}
	switch {
	case hiddenFailed == 1:
		fmt.Fprintln(w, "1 other rule test failed (shown above)")
	case hiddenFailed > 1:
		fmt.Fprintf(w, "%d other rule tests failed (shown above)\n", hiddenFailed)
	}
	if anyFailed {
		return errFindings
	}
	return nil
}
