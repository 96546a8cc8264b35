package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"

	"welfare/records"
)

type validateOpts struct{ limits string }

func validateFlags() (*flag.FlagSet, *validateOpts) {
	o := &validateOpts{}
	fs := flag.NewFlagSet("validate", flag.ContinueOnError)
	fs.StringVar(&o.limits, "limits", "", "limits `FILE` whose species profiles are known (default: the built-in limits)")
	return fs, o
}

// runValidate prints the accounting and every problem; it exits 1 when any
// row was rejected so a record keeper can script "fix until clean".
func runValidate(_ context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := validateFlags()
	if err := parseFlags(fs, args, stdout); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		return usagef("validate needs one records folder")
	}
	lim, err := loadLimits(o.limits)
	if err != nil {
		return err
	}
	_, set, err := loadRecords(fs.Arg(0), lim)
	if err != nil {
		return err
	}
	printAccounting(stdout, set)
	printProblems(stdout, set)
	if set.Rejected() > 0 {
		return errFindings
	}
	return nil
}

// printAccounting writes the per-file table: read = accepted + rejected.
func printAccounting(w io.Writer, set *records.Set) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "file\tread\taccepted\trejected\t")
	var read, acc, rej int
	for _, c := range set.Accounting {
		fmt.Fprintf(tw, "%s\t%d\t%d\t%d\t%s\n", c.File, c.Read, c.Accepted, c.Rejected, c.Failed)
		read, acc, rej = read+c.Read, acc+c.Accepted, rej+c.Rejected
	}
	fmt.Fprintf(tw, "total\t%d\t%d\t%d\t\n", read, acc, rej)
	tw.Flush()
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
		for _, p := range set.Problems {
			fmt.Fprintf(w, "  %s\n", p.Error())
		}
	} else {
		fmt.Fprintln(w, "\nEvery row was accepted.")
	}
}
