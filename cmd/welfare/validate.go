package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"strings"

	"welfare/records"
)

type validateOpts struct {
	limits  limitsFiles
	timings bool
}

func validateFlags() (*flag.FlagSet, *validateOpts) {
	o := &validateOpts{}
	fs := flag.NewFlagSet("validate", flag.ContinueOnError)
	addLimitsFlags(fs, &o.limits)
	fs.BoolVar(&o.timings, "timings", false, "print each step's wall time, peak heap and CPU time to stderr")
	return fs, o
}

// runValidate prints the accounting and every problem; it exits 1 when any
// row was rejected so a record keeper can script "fix until clean".
func runValidate(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := validateFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "validate", msg: countMsg("one records folder", pos)}
	}
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	ph := newPhases(stderr, o.timings)
	defer ph.finish()
	ph.enter("load", "rows")
	paceLoad(folderBytes(pos[0]))
	_, set, err := loadRecordsCounted(ctx, pos[0], lim, ph.add)
	if err != nil {
		return err
	}
	ph.enter("report", "")
	printAccounting(stdout, set)
	printProblems(stdout, set)
	if set.Rejected() > 0 {
		return errFindings
	}
	return nil
}

// printAccounting writes the per-file table: read = accepted + rejected.
func printAccounting(w io.Writer, set *records.Set) {
	width := len("total")
	for _, c := range set.Accounting {
		width = max(width, len(c.File))
	}
	row := func(name string, read, acc, rej any, note string) {
		fmt.Fprintf(w, "%-*s  %8v  %8v  %8v  %s\n", width, name, read, acc, rej, note)
	}
	row("file", "read", "accepted", "rejected", "")
	var read, acc, rej int
	for _, c := range set.Accounting {
		row(c.File, c.Read, c.Accepted, c.Rejected, c.Failed)
		read, acc, rej = read+c.Read, acc+c.Accepted, rej+c.Rejected
	}
	row("total", read, acc, rej, "")
}

func printProblems(w io.Writer, set *records.Set) {
	if len(set.Warnings) > 0 {
		fmt.Fprintf(w, "\n%d warning(s):\n", len(set.Warnings))
		for _, x := range set.Warnings {
			fmt.Fprintf(w, "  %s\n", x)
		}
	}
	if len(set.Problems) > 0 {
		fmt.Fprintf(w, "\n%d rejected row(s) and file problem(s):\n", len(set.Problems))
		// A problem repeated on many rows is shown once with their lines;
		// --json and --csv of check still list every row.
		for _, g := range records.GroupProblems(set.Problems) {
			fmt.Fprintf(w, "  %s\n", strings.ReplaceAll(g.String(), "\n", "\n    "))
		}
	} else {
		fmt.Fprintln(w, "\nEvery row was accepted.")
	}
}
