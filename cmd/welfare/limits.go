package main

import (
	"context"
	"flag"
	"fmt"
	"io"

	"welfare/checker"
	"welfare/rules"
)

type limitsOpts struct {
	replace   string
	rules     listFlag
	rulesOnly bool
}

func limitsFlags() (*flag.FlagSet, *limitsOpts) {
	o := &limitsOpts{}
	fs := flag.NewFlagSet("limits", flag.ContinueOnError)
	fs.StringVar(&o.replace, "limits-replace", "", "check: a whole limits `FILE` (used instead of the built-in limits, as check --limits-replace reads it)")
	fs.Var(&o.rules, "rules", "check: severity overrides may also name the checks of the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "check: only the --rules folders' checks, not the built-in ones")
	return fs, o
}

// runLimits prints the built-in limits for a committee to copy and edit, or
// checks a limits file the same way check reads it: laid over the
// defaults (or whole, with --limits-replace), strictly decoded and
// validated, its severity overrides held to the checks of the rules.
func runLimits(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := limitsFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if o.replace != "" && len(pos) == 1 && pos[0] == "check" {
		pos = append(pos, "")
	}
	if len(pos) == 0 || pos[0] == "show" {
		if len(pos) > 1 {
			return &usageError{cmd: "limits", msg: "limits show takes no other arguments, got " + fmt.Sprint(pos[1:])}
		}
		_, err := stdout.Write(rules.DefaultLimits())
		return err
	}
	if pos[0] != "check" {
		return &usageError{cmd: "limits", msg: unknownVerb(pos[0], "show", "check")}
	}
	if len(pos) != 2 {
		return &usageError{cmd: "limits", msg: "limits check " + countMsg("one FILE", pos[1:])}
	}
	files := limitsFiles{over: pos[1], replace: o.replace}
	l, err := loadLimits(files)
	if err != nil {
		return err
	}
	sources, err := ruleSources(o.rules, o.rulesOnly)
	if err != nil {
		return err
	}
	if _, err := checker.Compile(ctx, l, sources, checker.Options{}); err != nil {
		return err
	}
	name := l.Name()
	fmt.Fprintf(stdout, "%s: valid; species profiles: %v\n", name, l.SpeciesCodes())
	if !l.Overlay() {
		fmt.Fprintln(stdout, "read as a whole limits file (--limits-replace)")
	}
	changes := l.Changes()
	if len(changes) == 0 {
		fmt.Fprintln(stdout, "no limit differs from the built-in limits")
		return nil
	}
	noun := "limits differ"
	if len(changes) == 1 {
		noun = "limit differs"
	}
	fmt.Fprintf(stdout, "%d %s from the built-in limits (old → new):\n", len(changes), noun)
	for _, c := range changes {
		fmt.Fprintf(stdout, "  %s\n", c.Line())
	}
	return nil
}
