package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"welfare/checker"
	"welfare/rules"
)

type rulesOpts struct {
	rules     listFlag
	rulesOnly bool
	limits    limitsFiles
	verbose   bool
	json      bool
}

func rulesFlags() (*flag.FlagSet, *rulesOpts) {
	o := &rulesOpts{}
	fs := flag.NewFlagSet("rules", flag.ContinueOnError)
	fs.Var(&o.rules, "rules", "add the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "use only the --rules folders, not the built-in rules")
	addLimitsFlags(fs, &o.limits)
	fs.BoolVar(&o.verbose, "v", false, "test: print every test, the shipped ones too, not only failures")
	fs.BoolVar(&o.json, "json", false, "list: write the checks as JSON")
	return fs, o
}

// runRules lists the checks in force, or runs the rules' own tests: what a
// welfare committee does before it trusts an edited rule.
func runRules(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := rulesFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) == 0 {
		return &usageError{cmd: "rules", msg: "needs list, test, new, export or input"}
	}
	verb := pos[0]
	switch verb {
	case "input":
		return printInput(pos[1:], stdout)
	case "new":
		return newRulePackage(pos[1:], stdout)
	case "export":
		return exportRules(pos[1:], stdout)
	case "list", "test":
	default:
		return &usageError{cmd: "rules", msg: unknownVerb(verb, "list", "test", "new", "export", "input")}
	}
	// "welfare rules test DIR" reads naturally: a bare folder is a --rules folder.
	o.rules = append(o.rules, pos[1:]...)
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	sources, err := ruleSources(o.rules, o.rulesOnly)
	if err != nil {
		return err
	}
	policy, err := checker.Compile(ctx, lim, sources, checker.Options{})
	if err != nil {
		return err
	}
	if verb == "list" {
		return printChecks(stdout, listChecks(policy.Checks(), lim.Severity), o.json)
	}
	return testRules(ctx, policy, sources, o.rules, !o.rulesOnly, o.verbose, stdout)
}

// printInput prints the input document of one subject kind as a table: the
// fields a committee's rule can read, from the schema the compiler checks
// rules against.
func printInput(args []string, w io.Writer) error {
	if len(args) != 1 {
		return usagef("rules input needs one subject KIND (%s)", strings.Join(rules.InputKinds(), ", "))
	}
	s, err := rules.InputSchema(args[0])
	if err != nil {
		return usagef("rules input: %v", err)
	}
	fmt.Fprintf(w, "input (%s): %s\n\n", args[0], s.Description)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "field\ttype\tmeaning")
	for _, f := range s.Fields() {
		fmt.Fprintf(tw, "input.%s\t%s\t%s\n", f.Path, f.Type, f.Description)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nA list's entries are written NAME[]; a map's keys {KEY}. A rule that reads a field not listed here does not compile.")
	return nil
}
