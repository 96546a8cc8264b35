package main

import (
	"context"
	"encoding/csv"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"

	"welfare/checker"
)

type plansOpts struct{ out string }

func plansFlags() (*flag.FlagSet, *plansOpts) {
	o := &plansOpts{}
	fs := flag.NewFlagSet("plans", flag.ContinueOnError)
	fs.StringVar(&o.out, "out", "", "write the starter corrective_actions.csv to `FILE` (never overwritten; default: standard output)")
	return fs, o
}

// plansHeader is corrective_actions.csv's header, in the records contract's order.
var plansHeader = []string{"check", "subject", "found_on", "plan", "owner", "due_on", "closed_on", "verified_by"}

// runPlans writes a starter corrective_actions.csv: one row per significant
// finding of a findings file, with check, subject and found_on filled and
// the plan, owner and due date left for the committee.
func runPlans(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := plansFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "plans", msg: countMsg("one findings file (JSON written by 'welfare check --json')", pos)}
	}
	prev, err := readPrevious(pos[0])
	if err != nil {
		return errors.New(trimFlag(err.Error()))
	}
	var rows [][]string
	for _, f := range prev.Findings {
		if f.Severity == checker.Significant {
			rows = append(rows, []string{f.Check, f.Subject, f.On.String(), "", "", "", "", ""})
		}
	}
	write := func(w io.Writer) error {
		cw := csv.NewWriter(w)
		if err := cw.Write(plansHeader); err != nil {
			return err
		}
		if err := cw.WriteAll(rows); err != nil {
			return err
		}
		cw.Flush()
		return cw.Error()
	}
	if o.out == "" {
		return write(stdout)
	}
	if _, err := os.Stat(o.out); err == nil {
		return &usageError{cmd: "plans", msg: fmt.Sprintf("--out %s exists and is not overwritten (it may hold the committee's plans): give a new file name", o.out)}
	}
	if err := checkOutputPath(o.out); err != nil {
		return &usageError{cmd: "plans", msg: fmt.Sprintf("--out %s: %v", o.out, err)}
	}
	if err := writeFile(ctx, o.out, write); err != nil {
		return err
	}
	fmt.Fprintf(stderr, "wrote %s: %d significant findings to plan; fill in plan, owner and due_on, and put it in the records folder\n", o.out, len(rows))
	return nil
}

// trimFlag drops the "--previous: " a shared reader's error starts with.
func trimFlag(s string) string {
	const p = "--previous: "
	if len(s) > len(p) && s[:len(p)] == p {
		return s[len(p):]
	}
	return s
}
