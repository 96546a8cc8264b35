// Command welfare checks a facility's husbandry and welfare records against
// policy rules and the facility's own limits, and writes an audit report.
//
// Run "welfare help" for the commands.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	err := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(exitCode(err, os.Stderr))
}

// Exit codes: 0 clean, 1 findings at or above --fail-on (or rejected rows
// for validate), 2 usage errors and inputs that cannot be used at all.
const (
	exitOK       = 0
	exitFindings = 1
	exitUsage    = 2
)

// usageError is a mistake in the command line.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, args ...any) error { return &usageError{fmt.Sprintf(format, args...)} }

// errFindings reports that the run worked and found what --fail-on counts;
// everything has already been printed.
var errFindings = errors.New("findings at or above the --fail-on severity")

// exitCode maps run's error to the process exit code, in one place.
func exitCode(err error, stderr io.Writer) int {
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, errFindings):
		return exitFindings
	case errors.Is(err, errHelp):
		return exitOK
	}
	var ue *usageError
	if errors.As(err, &ue) {
		fmt.Fprintf(stderr, "welfare: %v\nRun 'welfare help' for usage.\n", err)
		return exitUsage
	}
	fmt.Fprintf(stderr, "welfare: %v\n", err)
	return exitUsage
}

// run is the whole program, testable in process: it reads args and writes
// only to stdout and stderr.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		printHelp(stderr)
		return usagef("no command given")
	}
	cmd, rest := args[0], args[1:]
	switch cmd {
	case "help", "-h", "-help", "--help":
		return runHelp(rest, stdout)
	case "validate":
		return runValidate(ctx, rest, stdout, stderr)
	case "check":
		return runCheck(ctx, rest, stdout, stderr)
	case "demo":
		return runDemo(ctx, rest, stdout, stderr)
	case "rules":
		return runRules(ctx, rest, stdout, stderr)
	case "limits":
		return runLimits(rest, stdout, stderr)
	case "init":
		return runInit(ctx, rest, stdout, stderr)
	}
	return usagef("unknown command %q", cmd)
}
