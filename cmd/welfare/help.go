package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
)

// errHelp is returned when -h was asked for: usage was printed, exit 0.
var errHelp = errors.New("help shown")

var commands = []struct{ name, usage, summary string }{
	{"validate", "welfare validate [--limits FILE] RECORDS",
		"Read a records folder, print the row accounting and every rejected row with file, line, column and reason."},
	{"check", "welfare check [flags] RECORDS",
		"Check the records against the rules and limits; print a summary and write JSON, CSV and PDF reports."},
	{"demo", "welfare demo [DIR]",
		"Write the built-in demo records (an invented station) to DIR (default welfare-demo) and check them."},
	{"rules", "welfare rules list|test [--rules DIR]... [--rules-only] | rules input KIND",
		"List the checks in force with their sources, run the rules' own tests, or show the input a rule reads for a subject KIND."},
	{"limits", "welfare limits [show | check FILE]",
		"Print the default limits (to copy and edit), or validate a limits file."},
	{"help", "welfare help [COMMAND]", "Show this help, or one command's flags."},
}

func printHelp(w io.Writer) {
	fmt.Fprint(w, `welfare checks the husbandry and welfare records of a facility keeping foxes,
mink and similar carnivores against editable policy rules and the facility's own
welfare limits, and writes an audit report for the attending veterinarian.

Usage:
`)
	for _, c := range commands {
		fmt.Fprintf(w, "  %-58s\n      %s\n", c.usage, c.summary)
	}
	fmt.Fprint(w, `
Exit codes: 0 nothing at or above --fail-on; 1 findings at or above it (or rejected
rows, for validate); 2 usage error, unreadable folder, or rules or limits that do
not load.

This is a records check, not a veterinary judgement: the attending veterinarian,
the animal-care committee and local law decide.
`)
}

func runHelp(args []string, stdout io.Writer) error {
	if len(args) == 0 {
		printHelp(stdout)
		return nil
	}
	var fs *flag.FlagSet
	switch args[0] {
	case "check":
		fs, _ = checkFlags()
	case "validate":
		fs, _ = validateFlags()
	case "demo":
		fs, _ = demoFlags()
	case "rules":
		fs, _ = rulesFlags("rules")
	case "limits", "help":
	default:
		return usagef("no help for unknown command %q", args[0])
	}
	for _, c := range commands {
		if c.name == args[0] {
			fmt.Fprintf(stdout, "Usage: %s\n\n%s\n", c.usage, c.summary)
		}
	}
	if fs != nil {
		fmt.Fprintln(stdout, "\nFlags:")
		fs.SetOutput(stdout)
		fs.PrintDefaults()
	}
	return nil
}

// parseFlags parses a subcommand's flags; -h prints its usage and stops.
func parseFlags(fs *flag.FlagSet, args []string, stdout io.Writer) error {
	fs.SetOutput(io.Discard)
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			for _, c := range commands {
				if c.name == fs.Name() {
					fmt.Fprintf(stdout, "Usage: %s\n\n%s\n\nFlags:\n", c.usage, c.summary)
				}
			}
			fs.SetOutput(stdout)
			fs.PrintDefaults()
			return errHelp
		}
		return usagef("%s: %v", fs.Name(), err)
	}
	return nil
}

// listFlag collects a repeatable flag.
type listFlag []string

func (l *listFlag) String() string     { return strings.Join(*l, ",") }
func (l *listFlag) Set(v string) error { *l = append(*l, v); return nil }
