// Command welfare checks a facility's husbandry and welfare records against
// policy rules and the facility's own limits, and writes an audit report.
//
// Run "welfare help" for the commands; the usage text is usage.txt.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
)

func main() {
	gcAuto = os.Getenv("GOGC") == "" && os.Getenv("GOMEMLIMIT") == ""
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	go func() {
		// After the first Ctrl-C the run winds down and says "interrupted";
		// a second one ends the process at once, as users expect.
		<-ctx.Done()
		stop()
	}()
	err := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(exitCode(err, os.Stderr))
}

// Exit codes: 0 clean, 1 findings at or above --fail-on (or rejected rows
// for validate), 2 usage errors and inputs that cannot be used at all, 130
// interrupted (128 + SIGINT, as shells report it).
const (
	exitOK          = 0
	exitFindings    = 1
	exitUsage       = 2
	exitInterrupted = 130
)

// usageError is a mistake in the command line; cmd names the subcommand
// whose help the message points to, when there is one.
type usageError struct{ cmd, msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, args ...any) error { return &usageError{msg: fmt.Sprintf(format, args...)} }

// errFindings reports that the run worked and found what --fail-on counts;
// everything has already been printed.
var errFindings = errors.New("findings at or above the --fail-on severity")

// errInterrupted is what a run cancelled by Ctrl-C returns, whatever the
// step it was in.
var errInterrupted = errors.New("interrupted")

// exitCode maps run's error to the process exit code, in one place.
func exitCode(err error, stderr io.Writer) int {
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, errFindings):
		return exitFindings
	case errors.Is(err, errInterrupted):
		fmt.Fprintln(stderr, "welfare: interrupted")
		return exitInterrupted
	}
	var ue *usageError
	if errors.As(err, &ue) {
		if ue.cmd != "" {
			fmt.Fprintf(stderr, "welfare %s: %v\nRun 'welfare help %s' for usage.\n", ue.cmd, err, ue.cmd)
		} else {
			fmt.Fprintf(stderr, "welfare: %v\nRun 'welfare help' for usage.\n", err)
		}
		return exitUsage
	}
	fmt.Fprintf(stderr, "welfare: %v\n", err)
	return exitUsage
}

// command is one subcommand: what runs it and the flags it takes (nil for
// none), for its help. Every command has a section in usage.txt (tested).
type command struct {
	run   func(ctx context.Context, args []string, stdout, stderr io.Writer) error
	flags func() *flag.FlagSet
}

var commands map[string]command

func init() {
	// Assigned in init: help reads this table, and the table holds help.
	commands = map[string]command{
		"validate": {runValidate, func() *flag.FlagSet { fs, _ := validateFlags(); return fs }},
		"today":    {runToday, func() *flag.FlagSet { fs, _ := todayFlags(); return fs }},
		"check":    {runCheck, func() *flag.FlagSet { fs, _ := checkFlags(); return fs }},
		"generate": {runGenerate, func() *flag.FlagSet { fs, _ := generateFlags(); return fs }},
		"demo":     {runDemo, func() *flag.FlagSet { fs, _ := demoFlags(); return fs }},
		"rules":    {runRules, func() *flag.FlagSet { fs, _ := rulesFlags(); return fs }},
		"limits":   {runLimits, func() *flag.FlagSet { fs, _ := limitsFlags(); return fs }},
		"init":     {runInit, initFlags},
		"plans":    {runPlans, func() *flag.FlagSet { fs, _ := plansFlags(); return fs }},
		"help":     {runHelp, helpFlags},
	}
}

func commandNames() []string {
	var names []string
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// run is the whole program, testable in process: it reads args and writes
// only to stdout and stderr.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	out := &checkedWriter{w: stdout}
	err := dispatch(ctx, args, out, stderr)
	var h helpRequested
	if errors.As(err, &h) {
		_, err = io.WriteString(out, h.text)
	}
	if ctx.Err() != nil {
		// Whatever step noticed the cancellation, and however it put it (or
		// none did, and the results may be partial): no file was renamed
		// into place after it, and the run does not claim to be complete.
		return errInterrupted
	}
	if out.err != nil && (err == nil || errors.Is(err, errFindings) || errors.Is(err, out.err)) {
		return fmt.Errorf("writing to standard output: %w", out.err)
	}
	return err
}

func dispatch(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		io.WriteString(stderr, overviewHelp())
		return usagef("no command given")
	}
	name, rest := args[0], args[1:]
	switch name {
	case "-h", "-help", "--help":
		name = "help"
	}
	c, ok := commands[name]
	if !ok {
		if s := closest(name, commandNames()); s != "" {
			return usagef("unknown command %q (did you mean %q?)", name, s)
		}
		return usagef("unknown command %q", name)
	}
	return c.run(ctx, rest, stdout, stderr)
}

// checkedWriter keeps the first write error on standard output (a full
// disk, a closed pipe), so the run does not report success after losing
// its output.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	if err != nil {
		c.err = err
	}
	return n, err
}
