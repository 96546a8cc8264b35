package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"os"

	"welfare/rules"
)

func limitsFlags() *flag.FlagSet { return flag.NewFlagSet("limits", flag.ContinueOnError) }

// runLimits prints the built-in limits for a committee to copy and edit, or
// checks an edited file the same strict way check reads it.
func runLimits(_ context.Context, args []string, stdout, stderr io.Writer) error {
	pos, err := parseArgs(limitsFlags(), args)
	if err != nil {
		return err
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
	b, err := os.ReadFile(pos[1])
	if err != nil {
		return err
	}
	l, err := rules.LoadLimits(bytes.NewReader(b), pos[1])
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "%s: valid; species profiles: %v\n", pos[1], l.SpeciesCodes())
	return nil
}
