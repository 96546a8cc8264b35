package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"

	"welfare/checker"
)

type rulesOpts struct {
	rules     listFlag
	rulesOnly bool
	limits    string
	verbose   bool
}

func rulesFlags() (*flag.FlagSet, *rulesOpts) {
	o := &rulesOpts{}
	fs := flag.NewFlagSet("rules", flag.ContinueOnError)
	fs.Var(&o.rules, "rules", "add the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "use only the --rules folders, not the built-in rules")
	fs.StringVar(&o.limits, "limits", "", "limits `FILE` the rules read as data.limits (default: the built-in limits)")
	fs.BoolVar(&o.verbose, "v", false, "test: print every test, not only failures")
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
		return &usageError{cmd: "rules", msg: "needs list or test"}
	}
	verb := pos[0]
	if verb != "list" && verb != "test" {
		return &usageError{cmd: "rules", msg: unknownVerb(verb, "list", "test")}
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
	switch verb {
	case "list":
		engine, err := checker.NewEngine(ctx, sources, lim.data, checker.EngineOptions{})
		if err != nil {
			return err
		}
		printChecks(stdout, engine.Checks(), lim.limits.Severity)
		return nil
	case "test":
		// RunTests prints each test and the closing "N passed, M failed".
		_, failed, err := checker.RunTests(ctx, sources, lim.data, stdout, o.verbose)
		if err != nil {
			return err
		}
		if failed > 0 {
			return errFindings
		}
		return nil
	}
	return nil
}

func printChecks(w io.Writer, checks []checker.CheckInfo, overrides map[string]string) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "check\tseverity\ttitle\tsource")
	for _, c := range checks {
		sev := string(c.Severity)
		if o, ok := overrides[c.ID]; ok {
			sev = o + " (limits override; rule: " + sev + ")"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", c.ID, sev, c.Title, c.Source)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nSources marked 'from memory' are to be verified against the current text before relying on them.")
}
