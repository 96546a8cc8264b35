package main

import (
	"errors"
	"flag"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/rules"
)

func TestParseArgs(t *testing.T) {
	type got struct {
		Pos           []string
		Name, Out     string
		Verbose       bool
		Err           string
		HelpRequested bool
	}
	tests := []struct {
		name string
		args []string
		want got
	}{
		{"flags after the positional", []string{"RECS", "--name", "x", "--out=o.pdf"},
			got{Pos: []string{"RECS"}, Name: "x", Out: "o.pdf"}},
		{"flags before the positional", []string{"--name=x", "--out", "o.pdf", "RECS"},
			got{Pos: []string{"RECS"}, Name: "x", Out: "o.pdf"}},
		{"flags around two positionals", []string{"a", "-name", "x", "b", "-out=o"},
			got{Pos: []string{"a", "b"}, Name: "x", Out: "o"}},
		{"a boolean flag does not take the next argument", []string{"-v", "RECS"},
			got{Pos: []string{"RECS"}, Verbose: true}},
		{"a boolean flag set explicitly", []string{"RECS", "--v=false"},
			got{Pos: []string{"RECS"}}},
		{"-- ends the flags", []string{"--name", "x", "--", "--out", "-v"},
			got{Pos: []string{"--out", "-v"}, Name: "x"}},
		{"a value may start with a dash", []string{"--name", "-x-", "RECS"},
			got{Pos: []string{"RECS"}, Name: "-x-"}},
		{"a lone dash is a positional (standard input)", []string{"-"},
			got{Pos: []string{"-"}}},
		{"a value is required", []string{"RECS", "--out"},
			got{Err: "flag --out needs a value (--out FILE)"}},
		{"a close unknown flag gets a suggestion", []string{"RECS", "--naem", "x"},
			got{Err: "unknown flag --naem (did you mean --name?)"}},
		{"a far unknown flag gets none", []string{"--colour", "RECS"},
			got{Err: "unknown flag --colour"}},
		{"a bad boolean value", []string{"--v=perhaps"},
			got{Err: `--v "perhaps": want true or false`}},
		{"-h anywhere asks for help", []string{"RECS", "--name", "x", "-h"},
			got{HelpRequested: true}},
		{"--help too", []string{"--help", "RECS"},
			got{HelpRequested: true}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			fs := flag.NewFlagSet("check", flag.ContinueOnError)
			var g got
			fs.StringVar(&g.Name, "name", "", "a `NAME`")
			fs.StringVar(&g.Out, "out", "", "write to `FILE`")
			fs.BoolVar(&g.Verbose, "v", false, "verbose")
			pos, err := parseArgs(fs, tc.args)
			if len(pos) > 0 {
				g.Pos = pos
			}
			var h helpRequested
			switch {
			case errors.As(err, &h):
				g = got{HelpRequested: true}
			case err != nil:
				g = got{Err: err.Error()}
			}
			if diff := cmp.Diff(tc.want, g); diff != "" {
				t.Errorf("parseArgs(%q) (-want +got):\n%s", tc.args, diff)
			}
		})
	}
}

func TestClosest(t *testing.T) {
	names := []string{"check", "demo", "help", "limits", "rules", "validate"}
	tests := []struct{ in, want string }{
		{"chek", "check"},  // one letter left out
		{"cehck", "check"}, // two letters swapped count as one slip
		{"valdiate", "validate"},
		{"rule", "rules"},
		{"Demo", "demo"}, // case is not a slip worth refusing to name
		{"inspect", ""},  // nothing near
		{"x", ""},        // one letter is near everything
		{"lmts", ""},     // too far for a four-letter word
	}
	for _, tc := range tests {
		if got := closest(tc.in, names); got != tc.want {
			t.Errorf("closest(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

var timings = regexp.MustCompile(`\([0-9.]+(ns|µs|ms|s|m)\)`)

// Every subcommand, typed with its flags after and before its arguments,
// does the same thing.
func TestArgumentOrderEverySubcommand(t *testing.T) {
	tmp := t.TempDir()
	limits := filepath.Join(tmp, "limits.yaml")
	if err := os.WriteFile(limits, rules.DefaultLimits(), 0o644); err != nil {
		t.Fatal(err)
	}
	ourRules := filepath.Join(tmp, "our-rules")
	if err := os.Mkdir(ourRules, 0o755); err != nil {
		t.Fatal(err)
	}
	pdf := filepath.Join(tmp, "audit.pdf")
	demoDir := filepath.Join(tmp, "demo")
	tests := []struct {
		name          string
		after, before []string
		want          int
	}{
		{"validate", []string{"validate", demoRecords, "--limits", limits}, []string{"validate", "--limits=" + limits, demoRecords}, exitFindings},
		{"check", []string{"check", demoRecords, "--on", "2026-01-15", "--only", "cold", "--pdf", pdf, "--generated-at", "2026-02-01T00:00:00Z"},
			[]string{"check", "--pdf", pdf, "--generated-at=2026-02-01T00:00:00Z", "--on=2026-01-15", "--only", "cold", demoRecords}, exitFindings},
		{"check with a boolean flag before the folder", []string{"check", demoRecords, "--rules", ourRules, "--rules-only", "--fail-on", "never"},
			[]string{"check", "--rules-only", demoRecords, "--fail-on", "never", "--rules", ourRules}, exitOK},
		{"demo", []string{"demo", demoDir, "--generated-at", "2026-02-02T08:00:00Z"}, []string{"demo", "--generated-at", "2026-02-02T08:00:00Z", demoDir}, exitOK},
		{"rules list", []string{"rules", "list", "--limits", limits}, []string{"rules", "--limits", limits, "list"}, exitOK},
		{"rules test", []string{"rules", "test", ourRules, "-v"}, []string{"rules", "-v", "test", ourRules}, exitOK},
		{"limits show", []string{"limits", "show"}, []string{"limits", "--", "show"}, exitOK},
		{"limits check", []string{"limits", "check", limits}, []string{"limits", "check", "--", limits}, exitOK},
		{"limits -h", []string{"limits", "check", limits, "-h"}, []string{"limits", "-h", "check", limits}, exitOK},
		{"help", []string{"help", "check"}, []string{"help", "--", "check"}, exitOK},
		{"help -h", []string{"help", "check", "-h"}, []string{"help", "-h", "check"}, exitOK},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			codeA, outA, errA := runMain(t, tc.after...)
			codeB, outB, errB := runMain(t, tc.before...)
			if codeA != tc.want || codeB != tc.want {
				t.Errorf("exit %d and %d, want %d\nwelfare %s\n%s\nwelfare %s\n%s",
					codeA, codeB, tc.want, strings.Join(tc.after, " "), errA, strings.Join(tc.before, " "), errB)
			}
			// Rule tests print their timings; those may differ.
			outA, outB = timings.ReplaceAllString(outA, "(TIME)"), timings.ReplaceAllString(outB, "(TIME)")
			if diff := cmp.Diff(outA, outB); diff != "" {
				t.Errorf("the two orders print different output (-after +before):\n%s", diff)
			}
			if diff := cmp.Diff(errA, errB); diff != "" {
				t.Errorf("the two orders print different diagnostics (-after +before):\n%s", diff)
			}
		})
	}
}

// What a user sees for a slip in the command line: one line saying what
// is wrong, the likely intended word when there is one, and where to read
// more. Exit 2, before any work.
func TestCommandLineMistakes(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"chek", demoRecords},
			"welfare: unknown command \"chek\" (did you mean \"check\"?)\nRun 'welfare help' for usage.\n"},
		{[]string{"inspect"},
			"welfare: unknown command \"inspect\"\nRun 'welfare help' for usage.\n"},
		{[]string{"check", demoRecords, "--pfd", "a.pdf"},
			"welfare check: unknown flag --pfd (did you mean --pdf?)\nRun 'welfare help check' for usage.\n"},
		{[]string{"check", demoRecords, "--form", "2026-01-01"},
			"welfare check: unknown flag --form (did you mean --from?)\nRun 'welfare help check' for usage.\n"},
		// (--on alone is today: TestTodayClock.)
		{[]string{"check", demoRecords, "--from"},
			"welfare check: flag --from needs a value (--from DAY)\nRun 'welfare help check' for usage.\n"},
		{[]string{"check"},
			"welfare check: needs one records folder, got none\nRun 'welfare help check' for usage.\n"},
		{[]string{"check", demoRecords, "2026-01-15"},
			"welfare check: needs one records folder, got 2: " + demoRecords + " 2026-01-15\nRun 'welfare help check' for usage.\n"},
		{[]string{"check", demoRecords, "--max", "many"},
			"welfare check: --max \"many\": want a whole number\nRun 'welfare help check' for usage.\n"},
		{[]string{"validate", demoRecords, "--limit", "x.yaml"},
			"welfare validate: unknown flag --limit (did you mean --limits?)\nRun 'welfare help validate' for usage.\n"},
		{[]string{"rules", "lsit"},
			"welfare rules: unknown verb \"lsit\" (did you mean \"list\"?)\nRun 'welfare help rules' for usage.\n"},
		{[]string{"limits", "--pdf", "x"},
			"welfare limits: unknown flag --pdf\nRun 'welfare help limits' for usage.\n"},
		{[]string{"help", "chekc"},
			"welfare: help: no command \"chekc\" (did you mean \"check\"?)\nRun 'welfare help' for usage.\n"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			code, stdout, stderr := runMain(t, tc.args...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d", code, exitUsage)
			}
			if stdout != "" {
				t.Errorf("a usage error printed to stdout:\n%s", stdout)
			}
			if diff := cmp.Diff(tc.want, stderr); diff != "" {
				t.Errorf("stderr (-want +got):\n%s", diff)
			}
		})
	}
}
